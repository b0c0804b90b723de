/**
 * Format variants a thermostat export comes in, imported with importLog into real store files.
 *
 * Expected values are worked out by hand from the rows written here: °F → °C by the definition of the
 * Fahrenheit scale (°C = (°F − 32) / 1.8), UTC offsets of the zones from the IANA tz database rules
 * (Central European Time is UTC+1 in January; US Central Standard Time is UTC−6 in January).
 */
import { describe, expect, it } from 'vitest';
import { importLog, readMappingFile } from '../../db/index.ts';
import { importText, lines, newStore, utc, writeLog } from './helpers.ts';

const f2c = (f: number) => (f - 32) / 1.8;

describe('delimiters, decimal marks, quoting, line endings', () => {
  it('reads a comma CSV with ISO times and °F in the header', async () => {
    const csv = lines(
      'Time,Indoor Temp (F),Outdoor Temp (°F),Heat Setpoint (F),Heat Runtime (s)',
      '2026-01-05T06:00:00-06:00,68,30.2,68,0',
      '2026-01-05T06:05:00-06:00,68.5,30.0,70,300',
    );
    const { store, zoneId, result } = await importText(csv);
    expect(result).toMatchObject({ rowsAccepted: 2, rowsRejected: 0, duplicates: 0, units: 'F', intervalMinutes: 5 });
    expect(result.mapping).toMatchObject({
      time: 'Time',
      indoor: 'Indoor Temp (F)',
      outdoor: 'Outdoor Temp (°F)',
      heatSetpoint: 'Heat Setpoint (F)',
      heating: { column: 'Heat Runtime (s)', as: 'seconds' },
      units: 'F',
      delimiter: ',',
      decimal: '.',
    });
    const s = store.loadSeries(zoneId);
    expect(Array.from(s.time)).toEqual([utc('2026-01-05T12:00:00Z'), utc('2026-01-05T12:05:00Z')]);
    expect(s.indoor[0]).toBeCloseTo(20, 12);
    expect(s.indoor[1]).toBeCloseTo(f2c(68.5), 12);
    expect(s.outdoor[0]).toBeCloseTo(-1, 12);
    expect(s.heatSetpoint[1]).toBeCloseTo(f2c(70), 12);
    expect(Array.from(s.heat)).toEqual([0, 1]);
    expect(store.zoneUnits(zoneId)).toBe('F');
    expect(result.warnings.join(' ')).not.toMatch(/unit/);
  });

  it('reads semicolons with decimal commas, German headers and separate date and time columns', async () => {
    const csv = lines(
      'Datum;Uhrzeit;Raumtemperatur (°C);Außentemperatur (°C);Sollwert Heizen (°C);Heizung (%)',
      '05.01.2026;06:00;20,5;-3,2;21,0;45',
      '05.01.2026;06:05;20,7;-3,4;21,0;100',
      '05.01.2026;06:10;20,9;-3,5;21,0;0',
    );
    const { store, zoneId, result } = await importText(csv, { timezone: 'Europe/Berlin' });
    expect(result.mapping).toMatchObject({
      time: ['Datum', 'Uhrzeit'],
      indoor: 'Raumtemperatur (°C)',
      outdoor: 'Außentemperatur (°C)',
      heatSetpoint: 'Sollwert Heizen (°C)',
      heating: { column: 'Heizung (%)', as: 'percent' },
      delimiter: ';',
      decimal: ',',
      timezone: 'Europe/Berlin',
      units: 'C',
    });
    const s = store.loadSeries(zoneId);
    // 06:00 CET (UTC+1 in January) = 05:00 UTC.
    expect(Array.from(s.time)).toEqual([utc('2026-01-05T05:00:00Z'), utc('2026-01-05T05:05:00Z'), utc('2026-01-05T05:10:00Z')]);
    expect(Array.from(s.indoor)).toEqual([20.5, 20.7, 20.9]);
    expect(Array.from(s.outdoor)).toEqual([-3.2, -3.4, -3.5]);
    expect(Array.from(s.heat)).toEqual([0.45, 1, 0]);
  });

  it('reads tab-separated values with a UTF-8 BOM, quoted fields and CRLF line ends', async () => {
    const text = '\uFEFF' + ['"time"\t"indoor_c"\t"note"', '2026-01-05T06:00:00Z\t"21.0"\t"door ""open"""', '2026-01-05T06:05:00Z\t21.5\t"tab\there"'].join('\r\n') + '\r\n';
    const { store, zoneId, result } = await importText(text);
    expect(result.mapping.delimiter).toBe('\t');
    expect(result.mapping.time).toBe('time'); // the BOM is not part of the first header name
    expect(result.rowsAccepted).toBe(2);
    expect(Array.from(store.loadSeries(zoneId).indoor)).toEqual([21, 21.5]);
  });

  it('counts physical lines through quoted fields that hold line breaks', async () => {
    const csv = lines(
      'time,indoor_c,comment',
      '2026-01-05T06:00:00Z,20,"first line',
      'second line of the same field"',
      '2026-01-05T06:05:00Z,oops,plain',
      '2026-01-05T06:10:00Z,20.4,"a,b"',
    );
    const { result } = await importText(csv);
    expect(result.rowsAccepted).toBe(2);
    expect(result.rejected).toEqual([{ line: 4, column: 2, columnName: 'indoor_c', reason: "'oops' is not a number" }]);
  });

  it('skips a preamble before the header and blank lines between rows', async () => {
    const csv = lines(
      'Thermostat export',
      'Exported for: invented test site',
      '',
      'time,indoor_c,outdoor_c',
      '2026-01-05T06:00:00Z,20,1',
      '',
      '2026-01-05T06:05:00Z,20.1,1',
    );
    const { result } = await importText(csv);
    expect(result.rowsAccepted).toBe(2);
    expect(result.rowsRejected).toBe(0);
    expect(result.warnings.join(' ')).toMatch(/Skipped 2 lines before the header on line 4/);
  });

  it('reads blanks and missing-value markers in optional columns as missing', async () => {
    const csv = lines(
      'time,indoor_c,outdoor_c,heat_setpoint_c,cool_setpoint_c',
      '2026-01-05T06:00:00Z,20,,21,',
      '2026-01-05T06:05:00Z,20.1,--,N/A,25',
      '2026-01-05T06:10:00Z,20.2, ,null,25',
    );
    const { store, zoneId, result } = await importText(csv);
    expect(result.rowsAccepted).toBe(3);
    const s = store.loadSeries(zoneId);
    expect(Array.from(s.outdoor)).toEqual([NaN, NaN, NaN]);
    expect(Array.from(s.heatSetpoint)).toEqual([21, NaN, NaN]);
    expect(Array.from(s.coolSetpoint)).toEqual([NaN, 25, 25]);
  });
});

describe('text encodings', () => {
  const header = 'Zeit;Raumtemperatur (°C);Außentemperatur (°C)';
  const rows = ['2026-01-05T06:00:00+01:00;20,5;-1,5', '2026-01-05T06:05:00+01:00;20,6;-1,6'];
  const text = [header, ...rows].join('\n') + '\n';

  const check = async (bytes: Uint8Array, encoding: string) => {
    const { store, zoneId, result } = await importText(bytes);
    expect(result.encoding).toBe(encoding);
    expect(result.mapping).toMatchObject({ indoor: 'Raumtemperatur (°C)', outdoor: 'Außentemperatur (°C)' });
    expect(Array.from(store.loadSeries(zoneId).indoor)).toEqual([20.5, 20.6]);
    expect(Array.from(store.loadSeries(zoneId).time)).toEqual([utc('2026-01-05T05:00:00Z'), utc('2026-01-05T05:05:00Z')]);
  };

  it('reads Latin-1 (Windows-1252) bytes', async () => {
    const bytes = Buffer.from(text, 'latin1');
    expect(bytes.includes(0xb0)).toBe(true); // ° as one byte, not valid UTF-8
    await check(bytes, 'windows-1252');
  });

  it('reads UTF-16 LE with a BOM', async () => {
    await check(Buffer.concat([Buffer.from([0xff, 0xfe]), Buffer.from(text, 'utf16le')]), 'utf-16le');
  });

  it('reads UTF-16 LE without a BOM, recognised by its zero bytes', async () => {
    await check(Buffer.from(text, 'utf16le'), 'utf-16le');
  });

  it('reads UTF-16 BE with a BOM', async () => {
    const le = Buffer.from(text, 'utf16le');
    const be = Buffer.alloc(le.length);
    for (let i = 0; i < le.length; i += 2) {
      be[i] = le[i + 1];
      be[i + 1] = le[i];
    }
    await check(Buffer.concat([Buffer.from([0xfe, 0xff]), be]), 'utf-16be');
  });

  it('decodes a multi-byte character split between two read chunks', async () => {
    // importLog reads 1 MiB chunks: put the "°" (2 bytes in UTF-8) of an indoor cell "20.5°F" across the
    // first chunk boundary; decoded wrongly, the cell would not be a number and the row would be rejected.
    const t0 = utc('2026-01-05T00:00:00Z');
    const time = (i: number) => `${new Date(t0 + i * 60_000).toISOString().slice(0, 19)}Z`;
    const parts = ['time,indoor,comment\n'];
    let bytes = parts[0].length; // all ASCII so far
    let i = 0;
    while (bytes < 1024 * 1024 - 400) {
      parts.push(`${time(i++)},68,x\n`);
      bytes += parts[parts.length - 1].length;
    }
    const before = `${time(i++)},68,`;
    const boundary = `${time(i)},`.length + '20.5'.length; // offset of "°" within the boundary row
    parts.push(before + 'y'.repeat(1024 * 1024 - 1 - boundary - bytes - before.length - 1) + '\n');
    parts.push(`${time(i++)},20.5°F,x\n`);
    parts.push(`${time(i++)},68,z\n`);
    const body = parts.join('');
    expect(Buffer.from(body).subarray(1024 * 1024 - 1, 1024 * 1024 + 1).toString()).toBe('°');
    const { store, zoneId, result } = await importText(body, { units: 'F' });
    expect(result.rowsRejected).toBe(0);
    const s = store.loadSeries(zoneId);
    expect(s.time.length).toBe(i);
    expect(s.indoor[i - 2]).toBeCloseTo(f2c(20.5), 12);
  });
});

describe('units', () => {
  it('guesses °F from indoor values when the header says nothing, and warns', async () => {
    const csv = lines('time,indoor,outdoor', '2026-01-05T06:00:00Z,71,20', '2026-01-05T06:05:00Z,70,20');
    const { store, zoneId, result } = await importText(csv);
    expect(result.units).toBe('F');
    expect(result.warnings.join(' ')).toMatch(/around 70\.5 were taken as °F/);
    expect(store.loadSeries(zoneId).indoor[0]).toBeCloseTo(f2c(71), 12);
  });

  it('guesses °C from indoor values around 20, and warns', async () => {
    const csv = lines('time,indoor,outdoor', '2026-01-05T06:00:00Z,21.5,3', '2026-01-05T06:05:00Z,21.4,3');
    const { result } = await importText(csv);
    expect(result.units).toBe('C');
    expect(result.warnings.join(' ')).toMatch(/taken as °C/);
  });

  it('lets the units option override the header', async () => {
    const csv = lines('time,indoor (C)', '2026-01-05T06:00:00Z,68', '2026-01-05T06:05:00Z,68');
    const { store, zoneId, result } = await importText(csv, { units: 'F' });
    expect(result.units).toBe('F');
    expect(store.loadSeries(zoneId).indoor[0]).toBeCloseTo(20, 12);
    expect(result.warnings.join(' ')).toMatch(/read as °F as asked/);
  });

  it('reads a unit written in the cells', async () => {
    const csv = lines('time,indoor,outdoor', '2026-01-05T06:00:00Z,68 °F,14°F', '2026-01-05T06:05:00Z,20.5°C,-10 °C');
    const { store, zoneId } = await importText(csv);
    const s = store.loadSeries(zoneId);
    expect(s.indoor[0]).toBeCloseTo(20, 12);
    expect(s.outdoor[0]).toBeCloseTo(-10, 12);
    expect(s.indoor[1]).toBe(20.5);
    expect(s.outdoor[1]).toBe(-10);
  });
});

describe('timestamps', () => {
  it('reads epoch seconds and epoch milliseconds by magnitude', async () => {
    const t0 = utc('2026-01-05T06:00:00Z');
    const sec = await importText(lines('epoch,indoor_c', `${t0 / 1000},20`, `${t0 / 1000 + 300},20.5`));
    expect(Array.from(sec.store.loadSeries(sec.zoneId).time)).toEqual([t0, t0 + 300_000]);
    const ms = await importText(lines('timestamp,indoor_c', `${t0},20`, `${t0 + 300_000},20.5`));
    expect(Array.from(ms.store.loadSeries(ms.zoneId).time)).toEqual([t0, t0 + 300_000]);
    expect(ms.result.warnings.join(' ')).not.toMatch(/time zone/);
  });

  it('reads US month/day/year with AM/PM in a given time zone', async () => {
    const csv = lines('Date/Time,Indoor Temp (F)', '1/5/2026 6:00 AM,68', '1/5/2026 12:05 PM,69', '1/13/2026 11:55 PM,70');
    const { store, zoneId, result } = await importText(csv, { timezone: 'America/Chicago' });
    expect(result.mapping.dateFormat).toBe('M/d/yyyy h:mm a');
    // CST is UTC−6 in January.
    expect(Array.from(store.loadSeries(zoneId).time)).toEqual([utc('2026-01-05T12:00:00Z'), utc('2026-01-05T18:05:00Z'), utc('2026-01-14T05:55:00Z')]);
  });

  it('tells day/month from month/day by the steps between rows', async () => {
    // 12 Jan to 13 Jan every 12 hours: read day-first the steps are 12 h; month-first they would jump months.
    const csv = lines('time,indoor_c', '12/01/2026 00:00,20', '12/01/2026 12:00,20', '13/01/2026 00:00,20', '13/01/2026 12:00,20');
    const { store, zoneId, result } = await importText(csv, { timezone: 'UTC' });
    expect(result.mapping.dateFormat).toBe('d/M/yyyy H:mm');
    expect(store.loadSeries(zoneId).time[2]).toBe(utc('2026-01-13T00:00:00Z'));
  });

  it('reads local ISO times in the zone of the mapping, and UTC when the header says so', async () => {
    const csv = lines('time,indoor_c', '2026-07-01 12:00,24', '2026-07-01 12:05,24');
    const a = await importText(csv, { mapping: { time: 'time', indoor: 'indoor_c', timezone: 'America/New_York' } });
    // EDT is UTC−4 in July.
    expect(a.store.loadSeries(a.zoneId).time[0]).toBe(utc('2026-07-01T16:00:00Z'));
    const b = await importText(lines('Time (UTC),indoor_c', '2026-07-01 12:00,24', '2026-07-01 12:05,24'));
    expect(b.store.loadSeries(b.zoneId).time[0]).toBe(utc('2026-07-01T12:00:00Z'));
    expect(b.result.warnings.join(' ')).toMatch(/says the times are UTC/);
  });

  it('reads an explicit LDML dateFormat with the fast parser and one with month names via luxon', async () => {
    const a = await importText(lines('when,indoor_c', '2026.01.05 06h00,20', '2026.01.05 06h05,20'), {
      mapping: { time: 'when', indoor: 'indoor_c', dateFormat: "yyyy.MM.dd HH'h'mm", timezone: 'UTC' },
    });
    expect(a.store.loadSeries(a.zoneId).time[1]).toBe(utc('2026-01-05T06:05:00Z'));
    const b = await importText(lines('when,indoor_c', '05 Jan 2026 06:00,20', '05 Jan 2026 06:05,20'), {
      mapping: { time: 'when', indoor: 'indoor_c', dateFormat: 'dd MMM yyyy HH:mm', timezone: 'Europe/Berlin' },
    });
    expect(b.store.loadSeries(b.zoneId).time[0]).toBe(utc('2026-01-05T05:00:00Z'));
  });
});

describe('runtime', () => {
  const times = ['2026-01-05T06:00:00Z', '2026-01-05T06:05:00Z', '2026-01-05T06:10:00Z', '2026-01-05T06:20:00Z'];

  it('turns seconds into the fraction of the interval since the previous reading (the first uses the typical interval)', async () => {
    const csv = lines('time,indoor_c,heat_runtime_s', ...[150, 300, 60, 300].map((v, i) => `${times[i]},20,${v}`));
    const { store, zoneId, result } = await importText(csv);
    expect(result.intervalMinutes).toBe(5);
    // 150/300, 300/300, 60/300, 300/600 (10 minutes since the previous reading).
    expect(Array.from(store.loadSeries(zoneId).heat)).toEqual([0.5, 1, 0.2, 0.5]);
  });

  it('reads minutes, fractions, percent and on/off words', async () => {
    const csv = lines(
      'time,indoor_c,heat_minutes,cool_fraction',
      ...[
        ['2.5', '0'],
        ['5', '0.25'],
        ['1', '1'],
        ['10', ''],
      ].map(([h, c], i) => `${times[i]},20,${h},${c}`),
    );
    const m = await importText(csv);
    expect(m.result.mapping.heating).toEqual({ column: 'heat_minutes', as: 'minutes' });
    expect(m.result.mapping.cooling).toEqual({ column: 'cool_fraction', as: 'fraction' });
    const s = m.store.loadSeries(m.zoneId);
    expect(Array.from(s.heat)).toEqual([0.5, 1, 0.2, 1]);
    expect(Array.from(s.cool)).toEqual([0, 0.25, 1, NaN]);

    const state = lines('time,indoor_c,HVAC State', ...['heating', 'idle', 'cooling', 'Heating'].map((v, i) => `${times[i]},20,${v}`));
    const o = await importText(state);
    expect(o.result.mapping.heating).toEqual({ column: 'HVAC State', as: 'onoff' });
    expect(o.result.mapping.cooling).toEqual({ column: 'HVAC State', as: 'onoff' });
    const so = o.store.loadSeries(o.zoneId);
    expect(Array.from(so.heat)).toEqual([1, 0, 0, 1]);
    expect(Array.from(so.cool)).toEqual([0, 0, 1, 0]);

    const words = lines('time,indoor_c,heat_on', ...['ON', 'off', 'true', 'false'].map((v, i) => `${times[i]},20,${v}`));
    const w = await importText(words, { mapping: { time: 'time', indoor: 'indoor_c', heating: { column: 'heat_on', as: 'onoff' } } });
    expect(Array.from(w.store.loadSeries(w.zoneId).heat)).toEqual([1, 0, 1, 0]);
  });

  it('moves runtime that belongs to the interval starting at a row onto the next reading', async () => {
    const csv = lines('time,indoor_c,heat_pct', ...[50, 100, 20, 50].map((v, i) => `${times[i]},20,${v}`));
    const { store, zoneId, result } = await importText(csv, {
      mapping: { time: 'time', indoor: 'indoor_c', heating: { column: 'heat_pct', as: 'percent' }, runtimeInterval: 'starting' },
    });
    expect(Array.from(store.loadSeries(zoneId).heat)).toEqual([NaN, 0.5, 1, 0.2]);
    expect(result.warnings.join(' ')).toMatch(/interval that starts at each row/);
  });

  it('caps seconds beyond the interval at 100 % and says so', async () => {
    const csv = lines('time,indoor_c,heat_runtime_s', `${times[0]},20,0`, `${times[1]},20,400`, `${times[2]},20,300`);
    const { store, zoneId, result } = await importText(csv);
    expect(Array.from(store.loadSeries(zoneId).heat)).toEqual([0, 1, 1]);
    expect(result.warnings.join(' ')).toMatch(/1 reading reported more heating runtime than the time since the previous reading/);
  });
});

describe('duplicates and order', () => {
  it('counts repeated times once and stores out-of-order rows in time order', async () => {
    const csv = lines(
      'time,indoor_c',
      '2026-01-05T06:10:00Z,20.2',
      '2026-01-05T06:00:00Z,20.0',
      '2026-01-05T06:05:00Z,20.1',
      '2026-01-05T06:05:00Z,20.9',
      '2026-01-05T06:15:00Z,20.3',
    );
    const { store, zoneId, result } = await importText(csv);
    expect(result).toMatchObject({ rowsAccepted: 4, duplicates: 1, rowsRejected: 0 });
    const s = store.loadSeries(zoneId);
    expect(Array.from(s.time)).toEqual([0, 5, 10, 15].map((m) => utc(`2026-01-05T06:${String(m).padStart(2, '0')}:00Z`)));
    expect(s.indoor[1]).toBe(20.1); // the first row of a repeated time is kept
    expect(result.warnings.join(' ')).toMatch(/1 row repeated a time already in the file.*different readings/);
    expect(result.warnings.join(' ')).toMatch(/out of time order/);
  });

  it('reads a file that runs newest first', async () => {
    const csv = lines('time,indoor_c', '2026-01-05T06:10:00Z,20.2', '2026-01-05T06:05:00Z,20.1', '2026-01-05T06:00:00Z,20.0');
    const { store, zoneId, result } = await importText(csv);
    expect(Array.from(store.loadSeries(zoneId).indoor)).toEqual([20, 20.1, 20.2]);
    expect(result.warnings.join(' ')).toMatch(/newest first/);
  });
});

describe('mappings', () => {
  it('imports with a mapping file whose names differ from any detection word', async () => {
    const { store, dir } = newStore();
    const zone = store.getOrCreateZone('S', 'Z');
    const log = writeLog(dir, 'odd.csv', lines('A,B,C,D', '2026-01-05 06:00,19.5,x1,0.5', '2026-01-05 06:05,19.7,x2,0.25'));
    const mapFile = writeLog(
      dir,
      'odd.json',
      JSON.stringify({ time: 'A', indoor: 'B', heating: { column: 'D', as: 'fraction' }, units: 'C', timezone: 'Asia/Tokyo' }, null, 2),
    );
    const mapping = await readMappingFile(mapFile);
    const r = await importLog(store, log, { zoneId: zone.id, mapping });
    expect(r.rowsAccepted).toBe(2);
    const s = store.loadSeries(zone.id);
    // JST is UTC+9 all year (no daylight saving since 1951, IANA tz database).
    expect(s.time[0]).toBe(utc('2026-01-04T21:00:00Z'));
    expect(Array.from(s.heat)).toEqual([0.5, 0.25]);
    expect(r.mapping).toMatchObject({ time: 'A', indoor: 'B', timezone: 'Asia/Tokyo', units: 'C' });
  });

  it('detects roles the mapping leaves out, and says so', async () => {
    const csv = lines('time,room,Outdoor Temp,Heat Setpoint', '2026-01-05T06:00:00Z,20,1,21', '2026-01-05T06:05:00Z,20,1,21');
    const { result } = await importText(csv, { mapping: { time: 'time', indoor: 'room' } });
    expect(result.mapping).toMatchObject({ indoor: 'room', outdoor: 'Outdoor Temp', heatSetpoint: 'Heat Setpoint' });
    expect(result.warnings.join(' ')).toMatch(/Not in the mapping but detected from the header: "Outdoor Temp" as "outdoor"/);
  });
});
