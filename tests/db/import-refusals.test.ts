/**
 * Refusals the first rows decide come from the sample (the first 256 KB) before the rest is read, and
 * a zero byte anywhere in a text file is refused with its line and byte offset. (How fast a refusal
 * comes is a benchmark figure, `refusalSeconds` in `npm run bench`, never a timed test.)
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { checkLog, ImportError, importLog, openStore } from '../../db/index.ts';
import { SAMPLE_BYTES } from '../../db/import/plan.ts';

let dir = '';
beforeAll(() => {
  dir = fs.mkdtempSync(path.join(os.tmpdir(), 'heatlag-refusals-'));
});
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

/** Rows of 5-minute readings from 2025-01-06 00:00 UTC (invented data), local or exact times. */
function rows(n: number, local: boolean, from = 0): string {
  let s = '';
  for (let i = from; i < from + n; i++) {
    const iso = new Date(Date.UTC(2025, 0, 6) + i * 300_000).toISOString().slice(0, 16);
    s += `${local ? iso.replace('T', ' ') : `${iso}:00Z`},${(20 + (i % 7) / 10).toFixed(1)},${(2 + (i % 11) / 10).toFixed(1)}\n`;
  }
  return s;
}

async function refusal(file: string, timezone?: string): Promise<ImportError> {
  const store = openStore(':memory:');
  try {
    const zone = store.getOrCreateZone('Test site', 'Zone');
    const e = await importLog(store, file, { zoneId: zone.id, ...(timezone ? { timezone } : {}) }).then(() => null, (err: unknown) => err);
    expect(e).toBeInstanceOf(ImportError);
    expect(store.listLogs(zone.id)).toEqual([]);
    return e as ImportError;
  } finally {
    store.close();
  }
}

describe('refusals decided by the first rows', () => {
  it('refuses local times without a zone from the sample: a zero byte after it is never reached', async () => {
    const head = `time,indoor_c,outdoor_c\n${rows(12_000, true)}`;
    expect(Buffer.byteLength(head)).toBeGreaterThan(SAMPLE_BYTES + 1000);
    const file = path.join(dir, 'local-then-binary.csv');
    fs.writeFileSync(file, Buffer.concat([Buffer.from(head), Buffer.from([0, 1, 2, 0]), Buffer.from(rows(10, true, 12_000))]));
    const e = await refusal(file);
    expect(e.message).toMatch(/^local-then-binary\.csv line 2, column 1 \(time\): the times are local wall-clock times without a UTC offset/);
    // With the zone given, the same file reads on and meets the zero byte: the later part fails differently.
    const late = await refusal(file, 'Europe/Berlin');
    expect(late.message).toContain('zero byte');
  });

  it('refuses a header that maps no indoor column from the sample, whatever comes later', async () => {
    const file = path.join(dir, 'no-indoor.csv');
    fs.writeFileSync(file, Buffer.concat([Buffer.from(`time,humidity,pressure\n${rows(12_000, false)}`), Buffer.from([0, 0, 0])]));
    const e = await refusal(file);
    expect(e.message).not.toContain('zero byte');
    expect(e.message).toMatch(/^no-indoor\.csv/);
  });
});

describe('checkLog: the first rows checked before any store is opened', () => {
  it('refuses with the message importLog gives, and importLog takes its result', async () => {
    const local = path.join(dir, 'check-local.csv');
    fs.writeFileSync(local, `time,indoor_c,outdoor_c\n${rows(5_000, true)}`);
    const e = await checkLog(local).then(() => null, (err: unknown) => err);
    expect(e).toBeInstanceOf(ImportError);
    expect((e as ImportError).message).toBe((await refusal(local)).message);

    const checked = await checkLog(local, { timezone: 'Europe/Berlin' });
    expect(checked.plan.timezone).toBe('Europe/Berlin');
    const store = openStore(':memory:');
    try {
      const zone = store.getOrCreateZone('Test site', 'Zone');
      // The check of another file is not taken for this one.
      const other = path.join(dir, 'check-other.csv');
      fs.writeFileSync(other, `time,indoor_c,outdoor_c\n${rows(10, false)}`);
      await expect(importLog(store, other, { zoneId: zone.id, checked })).rejects.toThrow(/options\.checked is the check of/);
      const r = await importLog(store, local, { zoneId: zone.id, timezone: 'Europe/Berlin', checked });
      expect(r.rowsAccepted).toBe(5_000);
      // 2025-01-06 00:00 in Berlin (CET, UTC+1 in January; IANA tzdb) is 2025-01-05 23:00 UTC.
      expect(r.firstTime).toBe(Date.UTC(2025, 0, 5, 23, 0));
    } finally {
      store.close();
    }
  });

  it('splits on past the first rows when they hold too few data rows (2,300 blank rows after the header)', async () => {
    // The detection splits the first 2,200 rows of the sample at first; here they hold no data row.
    const file = path.join(dir, 'blank-rows.csv');
    fs.writeFileSync(file, `time,indoor_c,outdoor_c\n${',,\n'.repeat(2_300)}${rows(3_000, false)}`);
    const checked = await checkLog(file);
    expect(checked.plan.mapping).toMatchObject({ time: 'time', indoor: 'indoor_c', outdoor: 'outdoor_c' });
    expect(checked.plan.timeFormat).toBe('ISO 8601 with UTC offset');
    // 5-minute rows, so the typical interval of the sample is 300 s.
    expect(checked.plan.sampleIntervalMs).toBe(300_000);
    const store = openStore(':memory:');
    try {
      const zone = store.getOrCreateZone('Test site', 'Zone');
      expect((await importLog(store, file, { zoneId: zone.id })).rowsAccepted).toBe(3_000);
    } finally {
      store.close();
    }
  });
});

describe('a zero byte', () => {
  it('in the first rows: names its line and byte offset', async () => {
    const text = `time,indoor_c,outdoor_c\n${rows(3, false)}`;
    const file = path.join(dir, 'nul-early.csv');
    // Line 4 is "2025-01-06T00:10:00Z,…": the zero byte replaces its sixth character.
    const at = text.indexOf('2025-01-06T00:10') + 5;
    const bytes = Buffer.from(text);
    bytes[at] = 0;
    fs.writeFileSync(file, bytes);
    const e = await refusal(file, 'UTC');
    expect(e.line).toBe(4);
    expect(e.message).toBe(`nul-early.csv line 4: the file holds binary data (a zero byte on line 4, at byte offset ${at}), not text. Export the log as CSV or TSV text.`);
  });

  it('past the sample: names its line and byte offset too (nothing imported)', async () => {
    const body = `time,indoor_c,outdoor_c\n${rows(20_000, false)}`;
    const lines = body.split('\n');
    const line = 15_001; // a line past the first 256 KB
    const at = lines.slice(0, line - 1).join('\n').length + 1 + 3;
    expect(at).toBeGreaterThan(SAMPLE_BYTES);
    const bytes = Buffer.from(body);
    bytes[at] = 0;
    const file = path.join(dir, 'nul-late.csv');
    fs.writeFileSync(file, bytes);
    const e = await refusal(file, 'UTC');
    expect(e.line).toBe(line);
    expect(e.message).toContain(`(a zero byte on line ${line}, at byte offset ${at})`);
  });
});
