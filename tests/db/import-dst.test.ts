/**
 * Local wall-clock times across daylight-saving changes.
 *
 * The change dates and instants come from the IANA tz database rules (as implemented by the platform's
 * Intl): the United States move clocks forward at 02:00 local on the second Sunday of March and back at
 * 02:00 local on the first Sunday of November (America/New_York: 2026-03-08 07:00 UTC and 2026-11-01
 * 06:00 UTC); the European Union changes at 01:00 UTC on the last Sunday of March and of October
 * (Europe/Berlin: 2026-03-29 and 2026-10-25). Every expected UTC time is also checked against Intl, so
 * the test fails if the hand-worked values and the platform's tz data disagree.
 */
import { describe, expect, it } from 'vitest';
import { importText, lines, utc } from './helpers.ts';

const formats = new Map<string, Intl.DateTimeFormat>();

/** Wall-clock "yyyy-MM-dd HH:mm" and UTC offset ("GMT-05:00") of an instant in a zone, by Intl. */
function intlWall(ms: number, zone: string): { wall: string; offset: string } {
  let fmt = formats.get(zone);
  if (!fmt) {
    fmt = new Intl.DateTimeFormat('en-CA', {
      timeZone: zone,
      year: 'numeric',
      month: '2-digit',
      day: '2-digit',
      hour: '2-digit',
      minute: '2-digit',
      hourCycle: 'h23',
      timeZoneName: 'longOffset',
    });
    formats.set(zone, fmt);
  }
  const parts = fmt.formatToParts(new Date(ms));
  const get = (t: string) => parts.find((p) => p.type === t)!.value;
  return { wall: `${get('year')}-${get('month')}-${get('day')} ${get('hour')}:${get('minute')}`, offset: get('timeZoneName') };
}

/** Checks the hand-worked expectation against Intl: the instant shows the row's wall time with that offset. */
function expectIntl(zone: string, local: string, expectedUtc: string, offset: string) {
  const w = intlWall(utc(expectedUtc), zone);
  expect(w.wall).toBe(local);
  expect(w.offset).toBe(offset);
}

describe('America/New_York', () => {
  it('spring forward 2026-03-08: times in the skipped hour are rejected with a reason', async () => {
    const zone = 'America/New_York';
    const rows: [string, string | null, string][] = [
      ['2026-03-08 01:30', '2026-03-08T06:30:00Z', 'GMT-05:00'],
      ['2026-03-08 01:55', '2026-03-08T06:55:00Z', 'GMT-05:00'],
      ['2026-03-08 02:00', null, ''],
      ['2026-03-08 02:30', null, ''],
      ['2026-03-08 03:00', '2026-03-08T07:00:00Z', 'GMT-04:00'],
      ['2026-03-08 03:05', '2026-03-08T07:05:00Z', 'GMT-04:00'],
    ];
    for (const [local, u, off] of rows) if (u) expectIntl(zone, local, u, off);
    const csv = lines('time,indoor_c', ...rows.map(([local]) => `${local},20`));
    const { store, zoneId, result } = await importText(csv, { timezone: zone });
    expect(Array.from(store.loadSeries(zoneId).time)).toEqual(rows.filter((r) => r[1]).map((r) => utc(r[1]!)));
    expect(result.rejected).toEqual([
      { line: 4, column: 1, columnName: 'time', reason: '2026-03-08 02:00 does not exist in America/New_York: clocks moved forward from 02:00 to 03:00 that day' },
      { line: 5, column: 1, columnName: 'time', reason: '2026-03-08 02:30 does not exist in America/New_York: clocks moved forward from 02:00 to 03:00 that day' },
    ]);
    expect(result.warnings.join(' ')).toContain(
      '2 readings named a local time in the skipped hour of 2026-03-08 02:00–03:00 America/New_York (clocks moved forward), which does not exist; they were rejected.',
    );
  });

  it('fall back 2026-11-01: the repeated hour is placed by row order, first pass EDT, second EST', async () => {
    const zone = 'America/New_York';
    const rows: [string, string, string][] = [
      ['2026-11-01 00:30', '2026-11-01T04:30:00Z', 'GMT-04:00'],
      ['2026-11-01 01:00', '2026-11-01T05:00:00Z', 'GMT-04:00'],
      ['2026-11-01 01:30', '2026-11-01T05:30:00Z', 'GMT-04:00'],
      ['2026-11-01 01:00', '2026-11-01T06:00:00Z', 'GMT-05:00'],
      ['2026-11-01 01:30', '2026-11-01T06:30:00Z', 'GMT-05:00'],
      ['2026-11-01 02:00', '2026-11-01T07:00:00Z', 'GMT-05:00'],
    ];
    for (const [local, u, off] of rows) expectIntl(zone, local, u, off);
    const csv = lines('time,indoor_c', ...rows.map(([local], i) => `${local},${20 + i / 10}`));
    const { store, zoneId, result } = await importText(csv, { timezone: zone });
    const s = store.loadSeries(zoneId);
    expect(Array.from(s.time)).toEqual(rows.map((r) => utc(r[1])));
    expect(Array.from(s.indoor)).toEqual([20, 20.1, 20.2, 20.3, 20.4, 20.5]);
    expect(result).toMatchObject({ rowsAccepted: 6, duplicates: 0, rowsRejected: 0 });
    expect(result.warnings).toContain(
      '4 readings fell in the repeated hour of 2026-11-01 01:00–02:00 America/New_York (clocks went back) and were placed by row order: the first pass at UTC−04:00, the second at UTC−05:00.',
    );
  });

  it('fall back in a file that runs newest first: the first pass in the file is the later offset', async () => {
    const zone = 'America/New_York';
    const rows: [string, string][] = [
      ['2026-11-01 02:00', '2026-11-01T07:00:00Z'],
      ['2026-11-01 01:30', '2026-11-01T06:30:00Z'],
      ['2026-11-01 01:00', '2026-11-01T06:00:00Z'],
      ['2026-11-01 01:30', '2026-11-01T05:30:00Z'],
      ['2026-11-01 01:00', '2026-11-01T05:00:00Z'],
      ['2026-11-01 00:30', '2026-11-01T04:30:00Z'],
    ];
    const csv = lines('time,indoor_c', ...rows.map(([local]) => `${local},20`));
    const { store, zoneId } = await importText(csv, { timezone: zone });
    expect(Array.from(store.loadSeries(zoneId).time)).toEqual(rows.map((r) => utc(r[1])).reverse());
  });

  it('hourly readings: the same local 01:00 twice is EDT then EST', async () => {
    const csv = lines('time,indoor_c', '2026-11-01 00:00,20', '2026-11-01 01:00,20', '2026-11-01 01:00,20', '2026-11-01 02:00,20');
    const { store, zoneId, result } = await importText(csv, { timezone: 'America/New_York' });
    expect(Array.from(store.loadSeries(zoneId).time)).toEqual(
      ['2026-11-01T04:00:00Z', '2026-11-01T05:00:00Z', '2026-11-01T06:00:00Z', '2026-11-01T07:00:00Z'].map(utc),
    );
    expect(result.duplicates).toBe(0);
  });

  it('times with their own offset need no rule: both passes are exact', async () => {
    const csv = lines('time,indoor_c', '2026-11-01T01:30:00-04:00,20', '2026-11-01T01:30:00-05:00,20');
    const { store, zoneId, result } = await importText(csv);
    expect(Array.from(store.loadSeries(zoneId).time)).toEqual([utc('2026-11-01T05:30:00Z'), utc('2026-11-01T06:30:00Z')]);
    expect(result.warnings.join(' ')).not.toMatch(/repeated/);
  });
});

describe('Europe/Berlin', () => {
  it('spring forward 2026-03-29: 02:00–03:00 CET does not exist', async () => {
    const zone = 'Europe/Berlin';
    expectIntl(zone, '2026-03-29 01:30', '2026-03-29T00:30:00Z', 'GMT+01:00');
    expectIntl(zone, '2026-03-29 03:00', '2026-03-29T01:00:00Z', 'GMT+02:00');
    const csv = lines('Datum;Uhrzeit;Raumtemperatur', '29.03.2026;01:30;20,5', '29.03.2026;02:15;20,6', '29.03.2026;03:00;20,7');
    const { store, zoneId, result } = await importText(csv, {
      mapping: { time: ['Datum', 'Uhrzeit'], dateFormat: 'dd.MM.yyyy HH:mm', indoor: 'Raumtemperatur', timezone: zone },
    });
    expect(Array.from(store.loadSeries(zoneId).time)).toEqual([utc('2026-03-29T00:30:00Z'), utc('2026-03-29T01:00:00Z')]);
    expect(result.rejected).toEqual([
      { line: 3, column: 1, columnName: 'Datum', reason: '2026-03-29 02:15 does not exist in Europe/Berlin: clocks moved forward from 02:00 to 03:00 that day' },
    ]);
  });

  it('fall back 2026-10-25: 02:00–03:00 repeats, first CEST then CET', async () => {
    const zone = 'Europe/Berlin';
    const rows: [string, string, string][] = [
      ['2026-10-25 01:30', '2026-10-24T23:30:00Z', 'GMT+02:00'],
      ['2026-10-25 02:00', '2026-10-25T00:00:00Z', 'GMT+02:00'],
      ['2026-10-25 02:30', '2026-10-25T00:30:00Z', 'GMT+02:00'],
      ['2026-10-25 02:00', '2026-10-25T01:00:00Z', 'GMT+01:00'],
      ['2026-10-25 02:30', '2026-10-25T01:30:00Z', 'GMT+01:00'],
      ['2026-10-25 03:00', '2026-10-25T02:00:00Z', 'GMT+01:00'],
    ];
    for (const [local, u, off] of rows) expectIntl(zone, local, u, off);
    const csv = lines('Zeit;Raumtemperatur', ...rows.map(([local]) => `${local.slice(8, 10)}.10.2026 ${local.slice(11)};21,0`));
    const { store, zoneId, result } = await importText(csv, { timezone: zone });
    expect(result.mapping.dateFormat).toBe('d.M.yyyy H:mm');
    expect(Array.from(store.loadSeries(zoneId).time)).toEqual(rows.map((r) => utc(r[1])));
    expect(result.warnings.join(' ')).toContain('4 readings fell in the repeated hour of 2026-10-25 02:00–03:00 Europe/Berlin');
  });

  it('a year of hourly local readings in Berlin maps onto every UTC hour exactly once', async () => {
    // Wall times written by Intl for each UTC hour of 2026, so the file repeats 02:00 in October and
    // skips 02:00 in March exactly as a logger on local time would.
    const zone = 'Europe/Berlin';
    const start = utc('2026-01-01T00:00:00Z');
    const hours = 365 * 24;
    const body: string[] = [];
    for (let h = 0; h < hours; h++) body.push(`${intlWall(start + h * 3_600_000, zone).wall},20`);
    const { store, zoneId, result } = await importText(lines('time,indoor_c', ...body), { timezone: zone });
    expect(result).toMatchObject({ rowsAccepted: hours, rowsRejected: 0, duplicates: 0 });
    const t = store.loadSeries(zoneId).time;
    for (let h = 0; h < hours; h++) if (t[h] !== start + h * 3_600_000) throw new Error(`hour ${h}: ${t[h]}`);
    expect(result.warnings.join(' ')).toContain('2 readings fell in the repeated hour of 2026-10-25 02:00–03:00 Europe/Berlin');
  });
});
