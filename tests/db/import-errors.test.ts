/**
 * Bad input: rows that cannot be read (kept as rejected rows naming line and column), files that cannot
 * be imported at all (ImportError with a plain message, store unchanged), and all-or-nothing commits.
 */
import { join } from 'node:path';
import Database from 'better-sqlite3';
import { describe, expect, it } from 'vitest';
import { ImportError, importLog, previewLog, type Store } from '../../db/index.ts';
import { dumpTables, fileHash, importText, lines, newStore, writeLog } from './helpers.ts';

/** Runs an import that must fail; returns the error. */
async function failing(store: Store, path: string, zoneId: number, options: object = {}): Promise<ImportError> {
  try {
    await importLog(store, path, { zoneId, ...options });
  } catch (err) {
    expect(err).toBeInstanceOf(ImportError);
    return err as ImportError;
  }
  throw new Error('the import did not fail');
}

/** A store with one earlier good import, plus its file's state, to check a failing import changes nothing. */
async function storeWithData() {
  const { store, file, dir } = newStore();
  const zone = store.getOrCreateZone('Site', 'Zone');
  const good = writeLog(dir, 'good.csv', lines('time,indoor_c,outdoor_c', '2026-01-05T06:00:00Z,20,1', '2026-01-05T06:05:00Z,20.1,1'));
  await importLog(store, good, { zoneId: zone.id });
  const snapshot = () => ({ tables: dumpTables(file), main: fileHash(file), wal: fileHash(`${file}-wal`) });
  return { store, file, dir, zoneId: zone.id, before: snapshot(), snapshot };
}

describe('rows that cannot be read are rejected with line, column and reason', () => {
  it('text in numbers, blank indoor, absurd temperatures, bad timestamps, wrong field counts', async () => {
    const csv = lines(
      'time,indoor_f,outdoor_f,heat_setpoint_f,heat_runtime_s', // line 1
      '2026-01-05T06:00:00Z,68,30,68,0', // 2 ok
      '2026-01-05T06:05:00Z,abc,30,68,0', // 3 text indoor
      '2026-01-05T06:10:00Z,,30,68,0', // 4 blank indoor
      '2026-01-05T06:15:00Z,250,30,68,0', // 5 absurd indoor (121 °C)
      '2026-01-05T06:20:00Z,68,-150,68,0', // 6 absurd outdoor (−101 °C)
      '2026-01-05T06:25:00Z,68,warm,68,0', // 7 text outdoor
      'yesterday noon,68,30,68,0', // 8 bad time
      '2026-02-30T06:00:00Z,68,30,68,0', // 9 impossible date
      '2026-01-05T06:30:00Z,68,30,68,0,extra', // 10 too many fields
      '2026-01-05T06:35:00Z,68,30', // 11 too few fields
      '2026-01-05T06:40:00Z,68,30,x,0', // 12 text setpoint
      '2026-01-05T06:45:00Z,68,30,68,-5', // 13 negative runtime
      '1970-01-01T00:00:00Z,68,30,68,0', // 14 time out of range
      ',68,30,68,0', // 15 blank time
      '2026-01-05T06:50:00Z,68.5,30,68,300', // 16 ok
    );
    const { store, zoneId, result } = await importText(csv);
    expect(result.rowsAccepted).toBe(2);
    expect(result.rejected).toEqual([
      { line: 3, column: 2, columnName: 'indoor_f', reason: "'abc' is not a number" },
      { line: 4, column: 2, columnName: 'indoor_f', reason: 'the indoor temperature is blank' },
      { line: 5, column: 2, columnName: 'indoor_f', reason: 'indoor 250 °F is outside the plausible -60…70 °C' },
      { line: 6, column: 3, columnName: 'outdoor_f', reason: 'outdoor -150 °F is outside the plausible -80…70 °C' },
      { line: 7, column: 3, columnName: 'outdoor_f', reason: "'warm' is not a number" },
      { line: 8, column: 1, columnName: 'time', reason: "'yesterday noon' is not a date and time (expected ISO 8601 such as 2026-01-05T06:00:00-05:00)" },
      { line: 9, column: 1, columnName: 'time', reason: "'2026-02-30T06:00:00Z' is not a date and time (expected ISO 8601 such as 2026-01-05T06:00:00-05:00)" },
      { line: 10, column: 6, columnName: null, reason: 'the row has 6 fields, the header has 5' },
      { line: 11, column: 4, columnName: 'heat_setpoint_f', reason: 'the row has 3 fields, the header has 5' },
      { line: 12, column: 4, columnName: 'heat_setpoint_f', reason: "'x' is not a number" },
      { line: 13, column: 5, columnName: 'heat_runtime_s', reason: 'runtime -5 is negative' },
      { line: 14, column: 1, columnName: 'time', reason: 'the time 1970-01-01 00:00 UTC is outside 1980–2100' },
      { line: 15, column: 1, columnName: 'time', reason: 'the time is blank' },
    ]);
    const stored = store.rejectedRows(result.logId, 100);
    expect(stored).toHaveLength(13);
    expect(stored[0]).toEqual({ line: 3, column: 2, columnName: 'indoor_f', reason: "'abc' is not a number", raw: '2026-01-05T06:05:00Z,abc,30,68,0' });
    expect(store.loadSeries(zoneId).time.length).toBe(2);
    expect(result.warnings.join(' ')).toMatch(/13 rows could not be read/);
  });

  it('a file cut off in the middle of its last row', async () => {
    const csv = 'time,indoor_c,outdoor_c\n2026-01-05T06:00:00Z,20,1\n2026-01-05T06:05:00Z,20.1,1\n2026-01-05T06:10:00Z,20';
    const { result } = await importText(csv);
    expect(result.rowsAccepted).toBe(2);
    expect(result.rejected).toEqual([
      { line: 4, column: 3, columnName: 'outdoor_c', reason: 'the row has 2 fields, the header has 3 (the file may be cut off)' },
    ]);
    expect(result.warnings.join(' ')).toMatch(/last row of the file is incomplete/);
  });

  it('a file cut off inside a quoted field', async () => {
    const csv = 'time,indoor_c,note\n2026-01-05T06:00:00Z,20,ok\n2026-01-05T06:05:00Z,20.1,"unfinished';
    const { result } = await importText(csv);
    expect(result.rowsAccepted).toBe(1);
    expect(result.rejected).toEqual([{ line: 3, column: 3, columnName: 'note', reason: 'a quoted field is not closed (the file may be cut off)' }]);
  });

  it('rejects runtime outside its range and unknown on/off words', async () => {
    const csv = lines('time,indoor_c,heat_pct,cool_state', '2026-01-05T06:00:00Z,20,50,on', '2026-01-05T06:05:00Z,20,150,off', '2026-01-05T06:10:00Z,20,10,maybe');
    const { result } = await importText(csv, {
      mapping: { time: 'time', indoor: 'indoor_c', heating: { column: 'heat_pct', as: 'percent' }, cooling: { column: 'cool_state', as: 'onoff' } },
    });
    expect(result.rejected.map((r) => [r.line, r.column, r.reason])).toEqual([
      [3, 3, 'runtime 150 % is more than 100 %'],
      [4, 4, "'maybe' is not an on/off state (expected 1/0, on/off, true/false, heat/cool/idle)"],
    ]);
  });
});

describe('files that cannot be imported leave the store as it was', () => {
  it('refuses an empty file, a blank file and a header without rows', async () => {
    const { store, dir, zoneId, before, snapshot } = await storeWithData();
    expect((await failing(store, writeLog(dir, 'empty.csv', ''), zoneId)).message).toBe('empty.csv: the file is empty');
    expect((await failing(store, writeLog(dir, 'blank.csv', '\n \r\n\t\n'), zoneId)).message).toBe('blank.csv: the file holds no text (only blanks or line breaks)');
    const header = await failing(store, writeLog(dir, 'header.csv', 'time,indoor_c,outdoor_c\n'), zoneId);
    expect(header.message).toBe('header.csv line 1: the file has a header but no data rows');
    expect(snapshot()).toEqual(before);
  });

  it('refuses binary files with a plain reason', async () => {
    const { store, dir, zoneId, before, snapshot } = await storeWithData();
    const garbage = new Uint8Array(4096);
    for (let i = 0; i < garbage.length; i++) garbage[i] = (i * 7919 + 13) % 256;
    const e1 = await failing(store, writeLog(dir, 'noise.bin', garbage), zoneId);
    // The zero byte is named by its line (as ImportError.line too) and byte offset.
    const at = garbage.indexOf(0);
    expect(e1.message).toBe(`noise.bin line ${e1.line}: the file holds binary data (a zero byte on line ${e1.line}, at byte offset ${at}), not text. Export the log as CSV or TSV text.`);
    expect(e1.line).toBeGreaterThanOrEqual(1);
    const zip = Buffer.concat([Buffer.from([0x50, 0x4b, 0x03, 0x04]), Buffer.alloc(100, 1)]);
    const e2 = await failing(store, writeLog(dir, 'export.xlsx', zip), zoneId);
    expect(e2.message).toMatch(/ZIP archive \(an \.xlsx or \.ods workbook is one\): save the sheet as CSV first/);
    expect(snapshot()).toEqual(before);
  });

  it('refuses a file in which no row is readable, naming the first bad row', async () => {
    const { store, dir, zoneId, before, snapshot } = await storeWithData();
    const p = writeLog(dir, 'log.csv', lines('time,Indoor,outdoor_c', '2026-01-05T06:00:00Z,abc,1', '2026-01-05T06:05:00Z,,1'));
    const e = await failing(store, p, zoneId);
    expect(e.message).toBe("log.csv line 2, column 2 (Indoor): no row could be imported (2 rejected); the first: 'abc' is not a number");
    expect({ line: e.line, column: e.column, file: e.file }).toEqual({ line: 2, column: 2, file: 'log.csv' });
    expect(snapshot()).toEqual(before);
  });

  it('refuses local times without a time zone, asking for --tz or "timezone"', async () => {
    const { store, dir, zoneId, before, snapshot } = await storeWithData();
    const p = writeLog(dir, 'local.csv', lines('time,indoor_c', '2026-01-05 06:00,20', '2026-01-05 06:05,20'));
    const e = await failing(store, p, zoneId);
    expect(e.message).toMatch(/local\.csv line 2, column 1 \(time\): the times are local wall-clock times without a UTC offset \(e\.g\. '2026-01-05 06:00'\)/);
    expect(e.message).toMatch(/--tz/);
    expect(e.message).toMatch(/"timezone" in the mapping/);
    expect(snapshot()).toEqual(before);
    const bad = await failing(store, p, zoneId, { timezone: 'Mars/Olympus_Mons' });
    expect(bad.message).toMatch(/"Mars\/Olympus_Mons" is not a known IANA time zone/);
  });

  it('refuses a file without an indoor column, or a mapping that names a missing column', async () => {
    const { store, dir, zoneId, before, snapshot } = await storeWithData();
    const p = writeLog(dir, 'x.csv', lines('time,humidity,pressure', '2026-01-05T06:00:00Z,40,1013', '2026-01-05T06:05:00Z,41,1013'));
    const e = await failing(store, p, zoneId);
    expect(e.message).toBe('x.csv line 1: could not tell which column holds the indoor temperature; give "indoor" in a mapping (columns: "time", "humidity", "pressure")');
    const m = await failing(store, p, zoneId, { mapping: { time: 'time', indoor: 'Indoor Temp' } });
    expect(m.message).toMatch(/the mapping's "indoor" names the column "Indoor Temp", which is not in the header/);
    expect(snapshot()).toEqual(before);
  });

  it('refuses a file whose first line holds readings instead of names', async () => {
    const { store, dir, zoneId } = await storeWithData();
    const p = writeLog(dir, 'nohead.csv', lines('2026-01-05T06:00:00Z,20,1', '2026-01-05T06:05:00Z,20.1,1'));
    const e = await failing(store, p, zoneId);
    expect(e.message).toMatch(/nohead\.csv: line 1 holds readings .* the file needs a header row naming its columns/);
  });

  it('refuses a missing file and an unknown zone', async () => {
    const { store, dir, zoneId } = await storeWithData();
    const e = await failing(store, join(dir, 'nope.csv'), zoneId);
    expect(e.message).toMatch(/^nope\.csv: the file does not exist/);
    const p = writeLog(dir, 'ok.csv', lines('time,indoor_c', '2026-01-05T07:00:00Z,20'));
    expect((await failing(store, p, 4242)).message).toBe('ok.csv: there is no zone #4242 to import into');
  });

  it('a failure in the middle of writing rolls back the whole import', async () => {
    const { store, file, dir, zoneId, before, snapshot } = await storeWithData();
    const t0 = Date.UTC(2026, 1, 1);
    const body: string[] = [];
    for (let i = 0; i < 3000; i++) body.push(`${new Date(t0 + i * 300_000).toISOString()},20,1`);
    const p = writeLog(dir, 'big.csv', lines('time,indoor_c,outdoor_c', ...body));
    // Another connection adds a trigger that aborts the insert of reading 2500.
    const other = new Database(file);
    // (A trigger cannot take parameters; the time is a number computed here.)
    other.exec(`CREATE TRIGGER boom BEFORE INSERT ON samples WHEN NEW.time = ${t0 + 2500 * 300_000} BEGIN SELECT RAISE(ABORT, 'injected failure'); END`);
    other.close();
    const mid = snapshot();
    const e = await failing(store, p, zoneId);
    expect(e.message).toMatch(/^big\.csv: writing to the store failed, nothing was added: injected failure/);
    const after = snapshot();
    expect(after.tables).toBe(mid.tables);
    expect(after.main).toBe(mid.main);
    // Dropping the trigger, the same file imports whole.
    const db = new Database(file);
    db.exec('DROP TRIGGER boom');
    db.close();
    const ok = await importLog(store, p, { zoneId });
    expect(ok.rowsAccepted).toBe(3000);
    expect(store.loadSeries(zoneId).time.length).toBe(2 + 3000);
    expect(before.tables).not.toBe(snapshot().tables);
  });

  it('a cancelled import adds nothing', async () => {
    const { store, dir, zoneId, before, snapshot } = await storeWithData();
    const p = writeLog(dir, 'c.csv', lines('time,indoor_c', '2026-01-05T07:00:00Z,20', '2026-01-05T07:05:00Z,20'));
    const ac = new AbortController();
    const e = await failing(store, p, zoneId, { signal: ac.signal, onProgress: () => ac.abort() });
    expect(e.message).toBe('c.csv: the import was cancelled; nothing was added');
    expect(snapshot()).toEqual(before);
  });

  it('the preview does not touch the store and lists problems instead of throwing', async () => {
    const { dir } = newStore();
    const p = writeLog(dir, 'local.csv', lines('Zeit,Raumtemperatur', '2026-01-05 06:00,20', '2026-01-05 06:05,20'));
    const pv = await previewLog(p);
    expect(pv.needsTimezone).toBe(true);
    expect(pv.problems).toHaveLength(1);
    expect(pv.problems[0]).toMatch(/^line 2, column 1 \(Zeit\): the times are local wall-clock times/);
    await expect(previewLog(writeLog(dir, 'e.csv', ''))).rejects.toThrow('e.csv: the file is empty');
  });
});

describe('importing again', () => {
  it('the same file twice adds nothing the second time, no empty log either, and says so', async () => {
    const csv = lines(
      'time,indoor_c',
      '2026-01-05T06:00:00Z,20', '2026-01-05T06:05:00Z,20.1', 'later,20.15', '2026-01-05T06:10:00Z,20.2', '2026-01-05T06:15:00Z,20.3', '2026-01-05T06:20:00Z,20.3',
    );
    const { store, zoneId, path, result, dir } = await importText(csv);
    expect(result).toMatchObject({ rowsAccepted: 5, rowsRejected: 1, logAdded: true, alreadyImportedAt: null });
    const first = store.listLogs(zoneId)[0]!;
    const tables = dumpTables(join(dir, 'test.heatlag'));
    const again = await importLog(store, path, { zoneId });
    expect(again).toMatchObject({ rowsAccepted: 0, duplicates: 5, rowsRejected: 1, logAdded: false, alreadyImportedAt: first.importedAt });
    // The log that holds the file's readings (and its rejected row).
    expect(again.logId).toBe(first.id);
    const at = new Date(first.importedAt).toISOString().slice(0, 16).replace('T', ' ');
    expect(again.warnings).toContain(`This file was imported into the zone before (log #${first.id}, ${at} UTC) and every reading of it is there already: it added no readings, so no log was added.`);
    expect(again.warnings).toContain('1 row could not be read and was rejected.');
    expect(again.warnings.join(' ')).not.toMatch(/not added again|see the rejected rows/);
    // One log, the same readings and rejected rows: the store is as the first import left it.
    expect(store.listLogs(zoneId).map((l) => [l.id, l.rowsAccepted, l.duplicates])).toEqual([[first.id, 5, 0]]);
    expect(store.loadSeries(zoneId).time.length).toBe(5);
    expect(dumpTables(join(dir, 'test.heatlag'))).toEqual(tables);
  });

  it('another file whose readings are all in the zone adds no log either', async () => {
    const { store, zoneId, dir } = await importText(lines('time,indoor_c', '2026-01-05T06:00:00Z,20', '2026-01-05T06:05:00Z,20.1'));
    const logs = store.listLogs(zoneId);
    const p = writeLog(dir, 'subset.csv', lines('time,indoor_c', '2026-01-05T06:05:00Z,25'));
    const r = await importLog(store, p, { zoneId });
    expect(r).toMatchObject({ rowsAccepted: 0, duplicates: 1, logAdded: false, alreadyImportedAt: null, logId: logs[0]!.id });
    expect(r.warnings).toContain('All 1 readings were in the zone already: the file added no readings, so no log was added.');
    expect(store.listLogs(zoneId)).toEqual(logs);
    expect(Array.from(store.loadSeries(zoneId).indoor)).toEqual([20, 20.1]);
  });

  it('an overlapping file adds only the new times; the stored readings are not replaced', async () => {
    const { store, zoneId, dir } = await importText(lines('time,indoor_c', '2026-01-05T06:00:00Z,20', '2026-01-05T06:05:00Z,20.1'));
    const p = writeLog(dir, 'next.csv', lines('time,indoor_c', '2026-01-05T06:05:00Z,25', '2026-01-05T06:10:00Z,20.2'));
    const r = await importLog(store, p, { zoneId });
    expect(r).toMatchObject({ rowsAccepted: 1, duplicates: 1 });
    expect(Array.from(store.loadSeries(zoneId).indoor)).toEqual([20, 20.1, 20.2]);
  });
});

describe('the fast path and the quoted-field path agree', () => {
  it('gives the same readings and the same rejected rows with and without a quote in the file', async () => {
    const body = [
      '2026-01-05T06:00:00Z,68,30,68,0',
      '2026-01-05T06:05:00Z,abc,30,68,0',
      '2026-01-05T06:10:00Z,,30,68,0',
      '2026-01-05T06:15:00Z,250,30,68,0',
      '2026-01-05T06:20:00Z, 68.5 ,N/A,,60',
      '2026-01-05T06:25:00Z,68 °F,-2,68,1:30',
      'not a time,68,30,68,0',
      '2026-01-05T06:30:00Z,68,30,68,0,extra',
      '2026-01-05T06:35:00Z,68,30',
      ',,,,',
      '',
      '2026-01-05T06:40:00Z,69,30,68,-5',
      '2026-01-05T06:45:00Z,69.25,31.5,68,300',
      '2026-01-05T06:50:00Z,69.5,31.5,68,1e2',
      '2026-01-05T06:55:00Z,69',
    ];
    const plain = lines('time,indoor_f,outdoor_f,heat_setpoint_f,heat_runtime_s', ...body);
    const quoted = lines('"time",indoor_f,outdoor_f,heat_setpoint_f,heat_runtime_s', ...body);
    const a = await importText(plain);
    const b = await importText(quoted);
    expect(b.result.rejected).toEqual(a.result.rejected);
    expect(a.result.rejected.map((r) => r.line)).toEqual([3, 4, 5, 8, 9, 10, 13, 16]);
    expect(b.store.rejectedRows(b.result.logId).map((r) => r.raw)).toEqual(a.store.rejectedRows(a.result.logId).map((r) => r.raw));
    expect(b.store.loadSeries(b.zoneId)).toEqual(a.store.loadSeries(a.zoneId));
    const s = a.store.loadSeries(a.zoneId);
    expect(s.time.length).toBe(5);
    expect(s.indoor[1]).toBeCloseTo((68.5 - 32) / 1.8, 12);
    expect(s.heat[2]).toBe(90 / 300);
    expect(a.result.warnings).toEqual(b.result.warnings);
  });
});
