/**
 * Crash safety (issue: fast and unbreakable): an import process is killed with SIGKILL at random
 * moments, 50 times in a row; after each kill the database passes SQLite's `PRAGMA integrity_check`
 * and holds either the whole log or none of it (the import is one transaction; WAL journaling).
 */
import { spawn } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import Database from 'better-sqlite3';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Prng, simulateZone } from '../support/zone-sim.ts';

const CHILD = path.resolve('tests/support/import-child.mjs');
let dir = '';
let csv = '';
let rows = 0;

/** Runs the child; kills it `killAfterMs` after it reports "start" (null: let it finish). */
function runChild(dbFile: string, killAfterMs: number | null): Promise<{ finished: boolean; importMs: number }> {
  return new Promise((resolve, reject) => {
    const child = spawn(process.execPath, [CHILD, dbFile, csv], { stdio: ['ignore', 'pipe', 'pipe'] });
    let out = '';
    let startedAt = 0;
    let err = '';
    child.stderr.on('data', (d) => (err += d));
    child.stdout.on('data', (d) => {
      out += d;
      if (startedAt === 0 && out.includes('start')) {
        startedAt = performance.now();
        if (killAfterMs !== null) setTimeout(() => child.kill('SIGKILL'), killAfterMs);
      }
    });
    child.on('error', reject);
    child.on('exit', (code, signal) => {
      if (signal === null && code !== 0) reject(new Error(`import child failed: ${err}`));
      else resolve({ finished: out.includes('done'), importMs: performance.now() - startedAt });
    });
  });
}

function inspect(dbFile: string): { integrity: string; samples: number; logs: number } {
  const db = new Database(dbFile);
  try {
    const integrity = (db.pragma('integrity_check') as Array<{ integrity_check: string }>).map((r) => r.integrity_check).join('; ');
    const samples = (db.prepare('SELECT count(*) AS n FROM samples').get() as { n: number }).n;
    const logs = (db.prepare('SELECT count(*) AS n FROM logs').get() as { n: number }).n;
    return { integrity, samples, logs };
  } finally {
    db.close();
  }
}

beforeAll(() => {
  dir = fs.mkdtempSync(path.join(os.tmpdir(), 'heatlag-crash-'));
  const sim = simulateZone({
    model: { tauHours: 30, heatRate: 3, coolRate: 0, gain: 0.1 }, days: 60, stepSeconds: 60,
    log: { intervalMinutes: 5, units: 'F', indoorResolution: 1, runtime: 'seconds' },
  });
  csv = path.join(dir, 'log.csv');
  fs.writeFileSync(csv, sim.csv);
  rows = sim.rowsWritten;
});

afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

describe('an import killed at random points', () => {
  it('leaves a sound database with the whole log or none of it, 50 kills in a row', async () => {
    // One undisturbed run: how long the import takes, and the row count a complete import leaves.
    const fullDb = path.join(dir, 'full.db');
    const full = await runChild(fullDb, null);
    expect(full.finished).toBe(true);
    const complete = inspect(fullDb);
    expect(complete.integrity).toBe('ok');
    expect(complete.samples).toBe(rows);

    const random = new Prng(20261202);
    let whole = 0;
    let none = 0;
    const kills = 50;
    const runOne = async (k: number) => {
      const db = path.join(dir, `kill-${k}.db`);
      // Kill anywhere from the start of reading to just past the usual commit.
      const delay = random.next() * full.importMs * 1.15;
      await runChild(db, delay);
      if (!fs.existsSync(db)) {
        none++;
        return;
      }
      const after = inspect(db);
      expect(after.integrity).toBe('ok');
      expect([0, rows]).toContain(after.samples);
      expect(after.logs).toBe(after.samples === 0 ? 0 : 1);
      if (after.samples === rows) whole++;
      else none++;
    };
    // Two at a time (two cores).
    for (let k = 0; k < kills; k += 2) await Promise.all([runOne(k), runOne(k + 1)]);
    expect(whole + none).toBe(kills);
    console.log(`crash safety: ${kills} kills, ${whole} left the whole log, ${none} left none; integrity ok after every one`);
  }, 240_000);
});
