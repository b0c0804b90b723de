/**
 * Hostile inputs (issue: fast and unbreakable). Every file of the corpus (tests/fixtures/hostile/corpus.ts)
 * ends in one of two ways: an import with exactly the stated readings, or a refusal (ImportError) whose
 * message names the file and the line and column where it has them, with the database unchanged:
 * the row count of every table and a hash of every row are compared before and after. Each file also
 * goes through the command line once (`heatlag import … --json` and `heatlag fit … --json`): a refusal
 * is exit 2 with one line on stderr and no stack trace. The 50 MB single-line files are written at
 * test time into a temporary folder and imported in a child process whose peak memory is bounded.
 *
 * Expected instants of local times are checked against the platform's Intl (IANA tz rules) as well as
 * written by hand in the corpus; °F readings are expected as (F − 32) / 1.8 (the definition of the scales).
 */
import { execFile, spawn } from 'node:child_process';
import { createHash } from 'node:crypto';
import { copyFileSync, existsSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import Database from 'better-sqlite3';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ImportError, importLog, openStore, type ImportResult, type Store } from '../../db/index.ts';
import { bigCorpus, smallCorpus, type Accepted, type BigCase, type HostileCase, type Refused } from '../fixtures/hostile/corpus.ts';
import { dumpTables } from './helpers.ts';

const root = path.resolve(import.meta.dirname, '../..');
const CLI = path.join(root, 'app', 'cli', 'heatlag.mjs');
const CHILD = path.join(root, 'tests', 'support', 'hostile-child.mjs');

const small = smallCorpus();
const big = bigCorpus();
let dir = '';
let dbFile = '';
let store: Store;
let siteId = 0;
/** A store file with one good import, copied for each command-line run. */
let cliBase = '';

interface Snapshot {
  counts: Record<string, number>;
  hash: string;
}

/** Row count of every table and a SHA-256 of all their rows (read through a separate connection). */
function snapshot(file: string): Snapshot {
  const db = new Database(file, { readonly: true });
  const counts: Record<string, number> = {};
  try {
    const tables = db.prepare("SELECT name FROM sqlite_schema WHERE type = 'table' ORDER BY name").pluck().all() as string[];
    // Table names come from the schema of our own test file; quoted as identifiers.
    for (const t of tables) counts[t] = db.prepare(`SELECT count(*) FROM "${t.replaceAll('"', '""')}"`).pluck().get() as number;
  } finally {
    db.close();
  }
  return { counts, hash: createHash('sha256').update(dumpTables(file)).digest('hex') };
}

const pathOf = (c: { file: string }) => path.join(dir, c.file);

/** The instant's wall clock in a zone by Intl ("yyyy-MM-dd HH:mm"). */
function intlWall(ms: number, zone: string): string {
  const parts = new Intl.DateTimeFormat('en-CA', {
    timeZone: zone, year: 'numeric', month: '2-digit', day: '2-digit', hour: '2-digit', minute: '2-digit', hourCycle: 'h23',
  }).formatToParts(new Date(ms));
  const get = (t: string) => parts.find((p) => p.type === t)!.value;
  return `${get('year')}-${get('month')}-${get('day')} ${get('hour')}:${get('minute')}`;
}

function checkRefusal(err: unknown, c: { file: string; expect: Refused }): void {
  expect(err, `${c.file} must be refused with an ImportError`).toBeInstanceOf(ImportError);
  const e = err as ImportError;
  expect(e.message).toMatch(c.expect.message);
  expect(e.file).toBe(c.file);
  expect(e.line).toBe(c.expect.line);
  expect(e.column).toBe(c.expect.column);
  expect(e.message.startsWith(c.file)).toBe(true);
}

function checkImport(r: ImportResult, zoneId: number, x: Accepted, c: HostileCase): void {
  const s = store.loadSeries(zoneId);
  const want = x.time.map((iso) => Date.parse(iso));
  expect(want.every((v) => Number.isFinite(v))).toBe(true);
  expect(Array.from(s.time)).toEqual(want);
  expect(s.indoor.length).toBe(x.indoorC.length);
  // Readings are stored as read: 1e-9 K allows only for the rounding of the °F → °C conversion.
  x.indoorC.forEach((v, i) => expect(Math.abs(s.indoor[i] - v), `indoor #${i}`).toBeLessThan(1e-9));
  x.outdoorC?.forEach((v, i) => {
    if (Number.isNaN(v)) expect(s.outdoor[i], `outdoor #${i}`).toBeNaN();
    else expect(Math.abs(s.outdoor[i] - v), `outdoor #${i}`).toBeLessThan(1e-9);
  });
  expect(r.rowsAccepted).toBe(x.time.length);
  const rejected = x.rejected ?? [];
  expect(r.rowsRejected).toBe(rejected.length);
  expect(r.rejected.map((q) => [q.line, q.column])).toEqual(rejected.map(([line, column]) => [line, column]));
  r.rejected.forEach((q, i) => {
    const reason = rejected[i][2];
    if (typeof reason === 'string') expect(q.reason).toBe(reason);
    else expect(q.reason).toMatch(reason);
  });
  expect(r.duplicates).toBe(x.duplicates ?? 0);
  for (const w of x.warnings ?? []) expect(r.warnings.some((s) => w.test(s)), `a warning like ${w}; got ${JSON.stringify(r.warnings)}`).toBe(true);
  if (x.walls) {
    // The hand-written instants agree with the IANA rules as the platform applies them.
    expect(want.map((ms) => intlWall(ms, c.timezone!))).toEqual(x.walls);
  }
}

beforeAll(async () => {
  dir = mkdtempSync(path.join(tmpdir(), 'heatlag-hostile-'));
  for (const c of small) writeFileSync(pathOf(c), c.bytes);
  for (const c of small) if (c.mapping) writeFileSync(pathOf(c) + '.mapping.json', JSON.stringify(c.mapping));
  for (const c of big) c.write(pathOf(c));
  // A store that already holds a log, so "unchanged" means something.
  const good = path.join(dir, 'good.csv');
  writeFileSync(good, 'time,indoor_c,outdoor_c\n2026-01-04T06:00:00Z,20,1\n2026-01-04T06:05:00Z,20.1,1\n');
  cliBase = path.join(dir, 'cli-base.db');
  const base = openStore(cliBase);
  await importLog(base, good, { zoneId: base.getOrCreateZone('Hostile', 'Good').id });
  base.close();
  dbFile = path.join(dir, 'hostile.db');
  store = openStore(dbFile);
  const zone = store.getOrCreateZone('Hostile', 'Good');
  siteId = zone.siteId;
  await importLog(store, good, { zoneId: zone.id });
});

afterAll(() => {
  store?.close();
  if (dir) rmSync(dir, { recursive: true, force: true });
});

describe('each hostile file imports correctly or is refused with the store unchanged', () => {
  for (const c of small) {
    it(`${c.file}: ${c.about}`, async () => {
      const zone = store.createZone(siteId, c.file);
      const before = snapshot(dbFile);
      let result: ImportResult | null = null;
      let error: unknown = null;
      try {
        result = await importLog(store, pathOf(c), { zoneId: zone.id, timezone: c.timezone, mapping: c.mapping });
      } catch (err) {
        error = err;
      }
      const after = snapshot(dbFile);
      if (c.expect.kind === 'refuse') {
        checkRefusal(error, { file: c.file, expect: c.expect });
        expect(after).toEqual(before);
        return;
      }
      if (error) throw error;
      checkImport(result!, zone.id, c.expect, c);
      // Exactly the log, its readings and its rejected rows were added; nothing else changed.
      expect(after.counts).toEqual({
        ...before.counts,
        logs: before.counts.logs + 1,
        samples: before.counts.samples + c.expect.time.length,
        rejected_rows: before.counts.rejected_rows + (c.expect.rejected?.length ?? 0),
      });
    });
  }
});

describe('50 MB on a single line', () => {
  function child(file: string, zoneId: number): Promise<{ ok: boolean; message?: string; line: number | null; column: number | null; maxRssMB: number }> {
    return new Promise((resolve, reject) => {
      const p = spawn(process.execPath, [CHILD, dbFile, file, String(zoneId)], { stdio: ['ignore', 'pipe', 'pipe'] });
      let out = '';
      let err = '';
      p.stdout.on('data', (d) => (out += d));
      p.stderr.on('data', (d) => (err += d));
      p.on('error', reject);
      p.on('exit', (code) => (code === 0 ? resolve(JSON.parse(out)) : reject(new Error(`the import child failed (${code}): ${err}`))));
    });
  }

  for (const c of big) {
    it(`${c.file}: ${c.about}`, async () => {
      const zone = store.createZone(siteId, c.file);
      const before = snapshot(dbFile);
      const r = await child(pathOf(c), zone.id);
      expect(snapshot(dbFile)).toEqual(before);
      expect(r.ok).toBe(false);
      expect(r.message).toMatch(c.expect.message);
      expect(r.line).toBe(c.expect.line ?? null);
      // A sanity bound far above what streaming needs (about 100–250 MB here), far below a 50 MB
      // file held several times over as strings.
      expect(r.maxRssMB).toBeLessThan(1024);
      console.log(`${c.file}: refused, peak resident memory ${r.maxRssMB} MB`);
    });
  }
});

interface CliRun {
  code: number | null;
  stdout: string;
  stderr: string;
}

function heatlag(args: string[]): Promise<CliRun> {
  return new Promise((resolve) => {
    execFile(process.execPath, [CLI, ...args], { cwd: dir, maxBuffer: 16 * 1024 * 1024, timeout: 120_000 }, (err, stdout, stderr) => {
      const code = err ? (typeof (err as { code?: unknown }).code === 'number' ? (err as { code: number }).code : null) : 0;
      resolve({ code, stdout, stderr });
    });
  });
}

/** Runs jobs two at a time (the machine has two cores). */
async function pool<T>(jobs: (() => Promise<T>)[], width = 2): Promise<T[]> {
  const out: T[] = new Array(jobs.length);
  let next = 0;
  await Promise.all(Array.from({ length: width }, async () => {
    while (next < jobs.length) {
      const i = next++;
      out[i] = await jobs[i]();
    }
  }));
  return out;
}

/** A refusal on the command line: exit 2, one line on stderr, the importer's message, no stack trace. */
function expectCliRefusal(run: CliRun, message: RegExp, what: string): void {
  expect(run.code, `${what}: exit code (stderr: ${run.stderr})`).toBe(2);
  const text = run.stderr.replace(/\n$/, '');
  expect(text.split('\n'), `${what}: one line on stderr`).toHaveLength(1);
  expect(text.startsWith('heatlag: '), what).toBe(true);
  expect(text.slice('heatlag: '.length)).toMatch(message);
  expect(text).not.toMatch(/\bat .*\.(ts|js|mjs):\d+|Error:/);
}

describe('the command line on every hostile file', () => {
  const cases: (HostileCase | BigCase)[] = [...small, ...big];
  const args = (c: HostileCase | BigCase): string[] => {
    const extra: string[] = [];
    if ('timezone' in c && c.timezone) extra.push('--tz', c.timezone);
    if ('mapping' in c && c.mapping) extra.push('--columns', pathOf(c) + '.mapping.json');
    return extra;
  };

  it('heatlag import: refusals exit 2 with one line and leave the database as it was; imports report the same rows', async () => {
    const runs = await pool(cases.map((c) => async () => {
      const db = path.join(dir, `cli-${c.file}.db`);
      copyFileSync(cliBase, db);
      const before = snapshot(db);
      const run = await heatlag(['import', pathOf(c), '--db', db, '--site', 'Hostile', '--zone', c.file, '--json', ...args(c)]);
      return { c, run, before, after: snapshot(db) };
    }));
    for (const { c, run, before, after } of runs) {
      if (c.expect.kind === 'refuse') {
        expectCliRefusal(run, c.expect.message, `import ${c.file}`);
        expect(run.stdout).toBe('');
        // Not even the zone or site it was to go into is left behind.
        expect(after, `import ${c.file}: the database is unchanged`).toEqual(before);
      } else {
        expect(run.code, `import ${c.file}: ${run.stderr}`).toBe(0);
        const out = JSON.parse(run.stdout) as { rowsAccepted: number; rowsRejected: number; duplicates: number };
        expect(out.rowsAccepted).toBe(c.expect.time.length);
        expect(out.rowsRejected).toBe(c.expect.rejected?.length ?? 0);
        expect(out.duplicates).toBe(c.expect.duplicates ?? 0);
      }
    }
  }, 300_000);

  it('heatlag import into a database that did not exist: a refusal leaves no file behind', async () => {
    const db = path.join(dir, 'never-made.db');
    const run = await heatlag(['import', pathOf(small[0]), '--db', db, '--site', 'S', '--zone', 'Z', '--json']);
    expectCliRefusal(run, /^empty\.csv: the file is empty$/, 'import into a new database');
    expect(existsSync(db)).toBe(false);
    expect(existsSync(`${db}-wal`)).toBe(false);
  }, 60_000);

  it('heatlag fit: a refusal exits 2 with the same one line; no file makes it fail otherwise', async () => {
    const runs = await pool(cases.map((c) => async () => ({ c, run: await heatlag(['fit', pathOf(c), '--json', ...args(c)]) })));
    for (const { c, run } of runs) {
      if (c.expect.kind === 'refuse') {
        expectCliRefusal(run, c.expect.message, `fit ${c.file}`);
        continue;
      }
      // A few readings cannot determine a time constant: exit 2 with a plain sentence, or a fit.
      expect([0, 2], `fit ${c.file}: ${run.stderr}`).toContain(run.code);
      if (run.code === 2) expectCliRefusal(run, /\S/, `fit ${c.file}`);
      else expect(() => JSON.parse(run.stdout)).not.toThrow();
    }
  }, 300_000);
});
