/**
 * The portfolio batch (`heatlag fit --db FILE --all`, app/cli/portfolio.ts): workers read their zones
 * themselves and this thread saves each batch; a worker that dies mid-batch loses nothing and saves
 * nothing twice. Logs are invented, written by the reference simulator (tests/support/zone-sim.ts).
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { fitPortfolio } from '../../app/cli/portfolio.ts';
import { fitOptionsFor } from '../../app/backend/fit-options.ts';
import { fitResponse } from '../../core/fit/index.ts';
import { importLog, openStore, type Store } from '../../db/index.ts';
import { simulateZone } from '../support/zone-sim.ts';

let dir = '';
let dbFile = '';
let ids: number[] = [];

beforeAll(async () => {
  dir = fs.mkdtempSync(path.join(os.tmpdir(), 'heatlag-portfolio-'));
  dbFile = path.join(dir, 'site.db');
  const store = openStore(dbFile);
  for (let k = 0; k < 3; k++) {
    const sim = simulateZone({
      model: { tauHours: 20 + 8 * k, heatRate: 2.5, coolRate: 0, gain: 0.1 },
      days: 8, seed: 40 + k, start: '2026-01-05T00:00:00Z', weather: { meanC: 0, dailyRangeK: 8 },
      log: { intervalMinutes: 15, units: 'C', indoorResolution: 0.1, runtime: 'seconds' },
    });
    fs.writeFileSync(path.join(dir, `z${k}.csv`), sim.csv);
  }
  for (let z = 0; z < 8; z++) {
    const zone = store.getOrCreateZone('Invented Campus', `Zone ${z + 1}`);
    await importLog(store, path.join(dir, `z${z % 3}.csv`), { zoneId: zone.id });
  }
  ids = store.listZoneIds();
  store.close();
}, 60_000);

afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

/** Number of saved responses of each zone. */
const counts = (store: Store): number[] => ids.map((id) => store.listResponses(id).length);

/** Runs one batch into the store and returns the items with the new response count of every zone. */
async function run(options: Parameters<typeof fitPortfolio>[2]) {
  const store = openStore(dbFile);
  try {
    const before = counts(store);
    const items = await fitPortfolio(dbFile, ids, { ...options, store });
    const added = counts(store).map((n, i) => n - before[i]);
    return { items, added };
  } finally {
    store.close();
  }
}

describe('fitPortfolio', () => {
  it('fits and saves every zone once, the same response as a fit on this thread', async () => {
    const { items, added } = await run({ workers: 2, batchSize: 3 });
    expect(items.map((x) => x.zoneId)).toEqual(ids);
    expect(items.every((x) => x.error === null && x.response !== null)).toBe(true);
    expect(added).toEqual(ids.map(() => 1));
    const store = openStore(dbFile);
    try {
      const direct = fitResponse(store.loadSeries(ids[4]), fitOptionsFor(store, ids[4]));
      // Same rows, same options, same code: bit-identical.
      expect(items[4].response!.tauHours).toBe(direct.tauHours);
      expect(store.latestResponse(ids[4])!.tauHours).toBe(direct.tauHours);
    } finally {
      store.close();
    }
  }, 120_000);

  it('a worker that exits mid-batch: its zones are fitted by another worker, each saved exactly once', async () => {
    // The first worker stops after 2 replies of its first batch of 4.
    for (const workers of [1, 2]) {
      const lost: Array<{ reason: string; requeued: number[] }> = [];
      const { items, added } = await run({
        workers, batchSize: 4, faults: { firstExitsAfter: 2 }, onWorkerLost: (reason, requeued) => lost.push({ reason, requeued }),
      });
      // One worker holds two batches: with one worker, zones 3–8 go back; with two, zones 3–4 of its first batch and its second (9+: none).
      expect(lost).toEqual([{ reason: 'exit code 3', requeued: workers === 1 ? ids.slice(2) : ids.slice(2, 4) }]);
      expect(items.map((x) => x.error)).toEqual(ids.map(() => null));
      expect(added).toEqual(ids.map(() => 1));
    }
  }, 120_000);

  it('a zone that stops every worker is reported as failed, the others saved once', async () => {
    const bad = ids[2];
    const { items, added } = await run({ workers: 2, batchSize: 4, faults: { exitOnZone: bad } });
    for (const [i, item] of items.entries()) {
      if (item.zoneId === bad) {
        expect(item.response).toBeNull();
        expect(item.error).toMatch(/worker fitting this zone stopped twice \(exit code 3\)/);
        expect(added[i]).toBe(0);
      } else {
        expect(item.error).toBeNull();
        expect(added[i]).toBe(1);
      }
    }
  }, 120_000);
});
