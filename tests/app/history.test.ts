/**
 * The zoneHistory method (app/backend/responses.ts over core/history.ts) on an invented
 * four-day log with a gap and heating runtime: the summary agrees with the stored readings, the whole
 * log comes decimated but with its extremes, a narrow window comes whole and equal to the stored
 * values, the reply passes the contract, and the kept series follows imports and deletions.
 */
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { History } from '../../app/api/contract.ts';
import { openBackend, type OpenBackend } from '../../app/backend/backend.ts';
import { dispatch } from '../../app/backend/dispatch.ts';
import { importLog, openStore } from '../../db/index.ts';

const root = path.resolve(import.meta.dirname, '../..');
const MIN = 60_000;
let dir: string;
let backend: OpenBackend;
let zoneId: number;

/** 5-minute rows from `startDay` for `days` days, leaving out 02:00–08:00 of the second day. */
function writeLog(file: string, startDay: number, days: number): void {
  const lines = ['time,indoor_c,outdoor_c,heat_setpoint_c,heat_runtime_s'];
  for (let m = 0; m < days * 24 * 60; m += 5) {
    if (m >= 24 * 60 + 120 && m < 24 * 60 + 480) continue;
    const t = new Date(Date.UTC(2026, 0, startDay, 0, m)).toISOString();
    const indoor = 19 + 2 * Math.sin((2 * Math.PI * m) / 1440) + (m === 2000 ? 6 : 0);
    const run = Math.floor(m / 5) % 3 === 0 ? 300 : 0;
    lines.push(`${t},${indoor.toFixed(2)},${(-3 + m / 2000).toFixed(2)},${m % 1440 < 360 ? 16 : 20},${run}`);
  }
  writeFileSync(file, lines.join('\n') + '\n');
}

async function history(input: Record<string, unknown>): Promise<History> {
  const r = await dispatch(backend.handlers, 'zoneHistory', { zoneId, buckets: 100, runtimeBinHours: 1, ...input }, { checkOutput: true });
  if (!r.ok) throw new Error(r.error.message);
  return r.value as History;
}

beforeAll(async () => {
  dir = mkdtempSync(path.join(tmpdir(), 'heatlag-history-'));
  writeLog(path.join(dir, 'a.csv'), 5, 4);
  writeLog(path.join(dir, 'b.csv'), 9, 1);
  backend = await openBackend({ dataDir: path.join(dir, 'data'), mode: 'browser', version: 'test', demoDir: path.join(root, 'assets', 'demo'), demo: false, log: () => {} });
  const site = backend.ctx.store.createSite('Ashgrove Depot');
  zoneId = backend.ctx.store.createZone(site.id, 'Workshop').id;
  await importLog(backend.ctx.store, path.join(dir, 'a.csv'), { zoneId });
});

afterAll(() => {
  backend.close();
  rmSync(dir, { recursive: true, force: true });
});

describe('zoneHistory', () => {
  it('summarises the stored readings and sends the whole log decimated, extremes kept', async () => {
    const stored = backend.ctx.store.loadSeries(zoneId);
    const h = await history({});
    expect(h.summary.readings).toBe(stored.time.length);
    expect(h.summary.readings).toBe(4 * 288 - 72);
    expect(h.summary.firstTime).toBe(stored.time[0]);
    expect(h.summary.stepMs).toBe(5 * MIN);
    expect(h.summary.indoor!.max).toBeCloseTo(Math.max(...stored.indoor), 9);
    expect(h.summary.indoor!.min).toBeCloseTo(Math.min(...stored.indoor), 9);
    expect(h.summary.has).toEqual({ outdoor: true, heatSetpoint: true, coolSetpoint: false, heat: true, cool: false });
    // A third of the 5-minute intervals ran: a third of the hours logged (the 6 h gap counts as neither).
    // n − 1 intervals: n − 2 of 5 min and the gap, capped at 3 × 5 min.
    expect(h.summary.loggedHours).toBeCloseTo(((stored.time.length - 2) * 5 + 15) / 60, 6);
    expect(h.summary.heatHours / h.summary.loggedHours).toBeCloseTo(1 / 3, 2);
    expect(h.window).toMatchObject({ fromMs: stored.time[0], toMs: stored.time[stored.time.length - 1], readings: stored.time.length, whole: false });
    // Decimated: at most 4 points a bucket (+ the break at the gap), the spike at +6 K among them.
    expect(h.indoor.x.length).toBeLessThanOrEqual(4 * 101 + 1);
    expect(Math.max(...(h.indoor.y.filter((v) => v !== null) as number[]))).toBeCloseTo(Math.max(...stored.indoor), 3);
    expect(h.indoor.y.filter((v) => v === null)).toHaveLength(1);
    expect(h.coolSetpoint.x).toHaveLength(0);
    // Hourly runtime: each bin's average of the readings whose interval ends in it, brute force.
    const bins = new Map<number, number[]>();
    stored.time.forEach((t, i) => {
      const b = Math.floor((t - 1) / 3_600_000) * 3_600_000;
      bins.set(b, [...(bins.get(b) ?? []), stored.heat[i]!]);
    });
    const points = h.heatRuntime.x.map((x, i) => [x, h.heatRuntime.y[i]] as const);
    for (const [b, v] of bins) {
      const mean = (100 * v.reduce((a, c) => a + c, 0)) / v.length;
      expect(points.find(([x]) => x === b)?.[1]).toBeCloseTo(mean, 1);
    }
    // Bins, a break in the gap, a closing point after the last bin.
    expect(points.filter(([, y]) => y !== null)).toHaveLength(bins.size + 2);
  });

  it('sends every reading of a narrow window, equal to the stored values', async () => {
    const from = Date.UTC(2026, 0, 6, 12);
    const to = from + 3 * 3_600_000;
    const h = await history({ fromMs: from, toMs: to, runtimeBinHours: 3 });
    const part = backend.ctx.store.loadSeries(zoneId, from, to);
    expect(h.window).toMatchObject({ readings: part.time.length, whole: true });
    // One reading of margin either side of the window.
    expect(h.indoor.x.slice(1, -1)).toEqual(Array.from(part.time));
    expect(h.indoor.y.slice(1, -1)).toEqual(Array.from(part.indoor, (v) => Math.round(v * 1000) / 1000));
    expect(h.runtimeBinHours).toBe(3);
  });

  it('follows an import and a deletion of readings, and refuses a window that ends before it starts', async () => {
    const before = (await history({})).summary.readings;
    const imported = await importLog(backend.ctx.store, path.join(dir, 'b.csv'), { zoneId });
    expect((await history({})).summary.readings).toBe(before + imported.rowsAccepted);
    backend.ctx.store.deleteLog(imported.logId);
    expect((await history({})).summary.readings).toBe(before);
    // Another process (here another connection, as the command line would be) imports into the same file.
    const other = openStore(backend.ctx.databasePath);
    try {
      const again = await importLog(other, path.join(dir, 'b.csv'), { zoneId });
      expect((await history({})).summary.readings).toBe(before + again.rowsAccepted);
    } finally {
      other.close();
    }
    const r = await dispatch(backend.handlers, 'zoneHistory', { zoneId, fromMs: 10, toMs: 5, buckets: 100, runtimeBinHours: 1 });
    expect(r.ok).toBe(false);
  });
});
