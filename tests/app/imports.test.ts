/**
 * The import service as the screens use it: an uploaded file previewed, imported as a background job
 * whose progress rises with the bytes the importer has read, then its rejected rows; a cancelled and a
 * failing import that leave the zone as it was.
 */
import { createReadStream, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { ImportStatus } from '../../app/api/contract.ts';
import { openBackend, type OpenBackend } from '../../app/backend/backend.ts';
import { dispatch } from '../../app/backend/dispatch.ts';

const root = path.resolve(import.meta.dirname, '../..');
let dir: string;
let backend: OpenBackend;

async function call<T>(method: string, input: unknown): Promise<T> {
  const r = await dispatch(backend.handlers, method, input, { checkOutput: true, log: () => {} });
  if (!r.ok) throw new Error(`${r.error.code}: ${r.error.message}`);
  return r.value as T;
}

beforeAll(async () => {
  dir = mkdtempSync(path.join(tmpdir(), 'heatlag-imports-'));
  backend = await openBackend({ dataDir: dir, mode: 'browser', version: 'test', demoDir: path.join(root, 'assets', 'demo'), demo: false });
});
afterAll(() => {
  backend.close();
  rmSync(dir, { recursive: true, force: true });
});

async function upload(file: string, name: string) {
  return backend.ctx.uploads.receive(name, createReadStream(file));
}

async function finish(jobId: string, seen: ImportStatus[] = []): Promise<ImportStatus> {
  for (;;) {
    const s = await call<ImportStatus>('importStatus', { jobId });
    seen.push(s);
    if (s.state !== 'running') return s;
    await new Promise((r) => setImmediate(r));
  }
}

describe('import service', () => {
  it('reports progress as the file is read, then the result', async () => {
    // 6 MB of invented 1-minute readings, so the importer reads it in several chunks.
    const lines = ['time,indoor_c,outdoor_c'];
    const t0 = Date.UTC(2024, 0, 1);
    for (let i = 0; i < 150_000; i++) lines.push(`${new Date(t0 + i * 60_000).toISOString()},${(20 + Math.sin(i / 300)).toFixed(2)},${(5 + 3 * Math.sin(i / 900)).toFixed(2)}`);
    const file = path.join(dir, 'minutes.csv');
    writeFileSync(file, lines.join('\n') + '\n');
    const site = await call<{ id: number }>('createSite', { name: 'Progress' });
    const zone = await call<{ id: number }>('createZone', { siteId: site.id, name: 'Z' });
    const ref = await upload(file, 'minutes.csv');
    const preview = await call<{ mapping: object }>('previewLog', { fileId: ref.fileId });
    const { jobId } = await call<{ jobId: string }>('startImport', { fileId: ref.fileId, zoneId: zone.id, mapping: preview.mapping });
    const seen: ImportStatus[] = [];
    const last = await finish(jobId, seen);
    expect(last.state).toBe('done');
    expect(last.result?.rowsAccepted).toBe(150_000);
    const dones = seen.map((s) => s.done);
    for (let i = 1; i < dones.length; i++) expect(dones[i]!).toBeGreaterThanOrEqual(dones[i - 1]!);
    expect(seen.some((s) => s.state === 'running' && s.done > 0 && s.done < s.total)).toBe(true);
    expect(last.done).toBe(last.total);
    // The uploaded copy is gone once imported.
    await expect(call('previewLog', { fileId: ref.fileId })).rejects.toThrow(/no longer available/);
  });

  it('lists rejected rows with line, column and reason', async () => {
    const file = path.join(dir, 'bad.csv');
    writeFileSync(file, 'time,indoor_c,outdoor_c\n2024-01-01T00:00:00Z,20.0,5.0\n2024-01-01T00:05:00Z,abc,5.0\n2024-01-01T00:10:00Z,20.2,5.1\n');
    const site = await call<{ id: number }>('createSite', { name: 'Rejects' });
    const zone = await call<{ id: number }>('createZone', { siteId: site.id, name: 'Z' });
    const ref = await upload(file, 'bad.csv');
    const preview = await call<{ mapping: object }>('previewLog', { fileId: ref.fileId });
    const { jobId } = await call<{ jobId: string }>('startImport', { fileId: ref.fileId, zoneId: zone.id, mapping: preview.mapping });
    const done = await finish(jobId);
    expect(done.result).toMatchObject({ rowsAccepted: 2, rowsRejected: 1 });
    const rejected = await call<{ total: number; rows: Array<{ line: number; column: number; columnName: string; reason: string; raw: string }> }>('rejectedRows', { logId: done.result!.logId });
    expect(rejected.total).toBe(1);
    expect(rejected.rows[0]).toMatchObject({ line: 3, column: 2, columnName: 'indoor_c', raw: '2024-01-01T00:05:00Z,abc,5.0' });
    expect(rejected.rows[0]!.reason).toContain('abc');
  });

  it('a cancelled import adds nothing, says so, and the same file can then be imported', async () => {
    const lines = ['time,indoor_c,outdoor_c'];
    const t0 = Date.UTC(2024, 0, 1);
    for (let i = 0; i < 100_000; i++) lines.push(`${new Date(t0 + i * 60_000).toISOString()},${(20 + Math.sin(i / 300)).toFixed(2)},5.0`);
    const file = path.join(dir, 'cancel.csv');
    writeFileSync(file, lines.join('\n') + '\n');
    const site = await call<{ id: number }>('createSite', { name: 'Cancel' });
    const zone = await call<{ id: number }>('createZone', { siteId: site.id, name: 'Z' });
    const ref = await upload(file, 'cancel.csv');
    const preview = await call<{ mapping: object }>('previewLog', { fileId: ref.fileId });
    const { jobId } = await call<{ jobId: string }>('startImport', { fileId: ref.fileId, zoneId: zone.id, mapping: preview.mapping });
    // Cancelled before the importer has read its first chunk (the job runs in the background).
    const asked = await call<ImportStatus>('cancelImport', { jobId });
    expect(asked.state).toBe('running');
    const end = await finish(jobId);
    expect(end.state).toBe('cancelled');
    expect(end.error?.message).toMatch(/cancel\.csv: the import was cancelled; nothing was added/);
    expect(await call<unknown[]>('listLogs', { zoneId: zone.id })).toHaveLength(0);
    expect(backend.ctx.store.loadSeries(zone.id).time.length).toBe(0);
    // Cancelling a finished job changes nothing; the upload is still there to import.
    expect((await call<ImportStatus>('cancelImport', { jobId })).state).toBe('cancelled');
    const again = await finish((await call<{ jobId: string }>('startImport', { fileId: ref.fileId, zoneId: zone.id, mapping: preview.mapping })).jobId);
    expect(again.state).toBe('done');
    expect(again.result?.rowsAccepted).toBe(100_000);
    await expect(call('cancelImport', { jobId: 'no-such-job' })).rejects.toThrow(/no longer known/);
  });

  it('a file that cannot be imported fails the job with the file and leaves the zone empty', async () => {
    const file = path.join(dir, 'empty.csv');
    writeFileSync(file, 'time,indoor_c\n');
    const site = await call<{ id: number }>('createSite', { name: 'Empty' });
    const zone = await call<{ id: number }>('createZone', { siteId: site.id, name: 'Z' });
    const ref = await upload(file, 'empty.csv');
    const { jobId } = await call<{ jobId: string }>('startImport', { fileId: ref.fileId, zoneId: zone.id, mapping: { time: 'time', indoor: 'indoor_c' } });
    const failed = await finish(jobId);
    expect(failed.state).toBe('failed');
    expect(failed.error?.message).toContain('empty.csv');
    const logs = await call<unknown[]>('listLogs', { zoneId: zone.id });
    expect(logs).toHaveLength(0);
  });

  it('a re-import of the same file adds no log, says so, and counts nothing twice', async () => {
    // Invented 10-minute readings.
    const lines = ['time,indoor_c,outdoor_c'];
    const t0 = Date.UTC(2024, 1, 1);
    for (let i = 0; i < 300; i++) lines.push(`${new Date(t0 + i * 600_000).toISOString()},${(20 + Math.sin(i / 30)).toFixed(2)},5.0`);
    const file = path.join(dir, 'again.csv');
    writeFileSync(file, lines.join('\n') + '\n');
    const site = await call<{ id: number }>('createSite', { name: 'Again' });
    const zone = await call<{ id: number }>('createZone', { siteId: site.id, name: 'Z' });
    const once = async () => {
      const ref = await upload(file, 'again.csv');
      const preview = await call<{ mapping: object }>('previewLog', { fileId: ref.fileId });
      const { jobId } = await call<{ jobId: string }>('startImport', { fileId: ref.fileId, zoneId: zone.id, mapping: preview.mapping });
      return finish(jobId);
    };
    const first = await once();
    expect(first.result?.rowsAccepted).toBe(300);
    expect(first.result?.logAdded).toBe(true);
    const second = await once();
    expect(second.state).toBe('done');
    expect(second.result?.rowsAccepted).toBe(0);
    expect(second.result?.logAdded).toBe(false);
    expect(second.result?.warnings.join(' ')).toMatch(/This file was imported into the zone before \(log #\d+, .* UTC\) and every reading of it is there already: it added no readings, so no log was added\./);
    // The log that holds the readings: the first import's.
    expect(second.result?.logId).toBe(first.result?.logId);
    const logs = await call<Array<{ samples: number }>>('listLogs', { zoneId: zone.id });
    expect(logs.map((l) => l.samples)).toEqual([300]);
    const sites = await call<Array<{ id: number; zones: Array<{ samples: number; logs: number }> }>>('listSites', {});
    const z = sites.find((x) => x.id === site.id)!.zones[0]!;
    expect([z.samples, z.logs]).toEqual([300, 1]);
  });
});
