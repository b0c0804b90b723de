/**
 * How the command line starts: the built bundle or the sources (app/launch.mjs), what each command
 * loads, the root help against the command modules, inputs checked before tools (`heatlag report`
 * without Chromium), and the test command's preflight (tests/preflight.mjs) with tools hidden.
 */
import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { Command } from 'commander';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { bundleIsFresh } from '../../app/launch.mjs';
import { COMMANDS } from '../../app/cli/program.ts';
import { simulateZone } from '../support/zone-sim.ts';

const ROOT = path.resolve(import.meta.dirname, '../..');
const BIN = path.join(ROOT, 'app/cli/heatlag.mjs');
const TRACE = path.join(ROOT, 'tests/cli/support/trace-imports.mjs');
let dir = '';

function run(args: string[], env: Record<string, string> = {}, nodeArgs: string[] = []) {
  const r = spawnSync(process.execPath, [...nodeArgs, BIN, ...args], { encoding: 'utf8', cwd: dir, env: { ...process.env, ...env } });
  return { code: r.status ?? -1, stdout: r.stdout, stderr: r.stderr };
}

/**
 * The modules a heatlag run loads: the URLs it resolves and, for files of a bundle in dist/, the
 * packages bundled into them (esbuild marks each with a `// node_modules/<package>/…` comment).
 */
function modulesOf(traceFile: string): string[] {
  const urls = fs.readFileSync(traceFile, 'utf8').split('\n').filter(Boolean);
  const out = [...urls];
  for (const u of urls) {
    if (!u.startsWith('file:') || !u.includes('/dist/')) continue;
    const text = fs.readFileSync(new URL(u), 'utf8');
    // The path is relative to the project, with a prefix when node_modules is a link (`../main/node_modules/…`).
    for (const m of text.matchAll(/^\/\/ (?:\S*\/)?(node_modules\/(?:@[^/\s]+\/)?[^/\s]+\/)/gm)) out.push(`bundled:${m[1]}`);
    // And the project's own folders bundled in (`// core/fit/pass.ts`, `// db/store.ts` …).
    for (const m of text.matchAll(/^\/\/ ((?:core|db|app)\/\S+)$/gm)) out.push(`bundled:${m[1]}`);
  }
  return out;
}

function loaded(args: string[], env: Record<string, string> = {}): string[] {
  const trace = path.join(dir, `trace-${Math.random().toString(36).slice(2)}.txt`);
  const r = run(args, { ...env, HEATLAG_TRACE: trace }, ['--import', TRACE]);
  expect(r.code, r.stderr).toBe(0);
  return modulesOf(trace);
}

beforeAll(() => {
  dir = fs.mkdtempSync(path.join(os.tmpdir(), 'heatlag-cli-startup-'));
});
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

describe('what a command loads', () => {
  const heavy = /node_modules\/(papaparse|luxon|better-sqlite3|zod|playwright-core)\//;

  // From the sources (tsx) and from whatever the launcher picks (the bundle after a build).
  for (const [how, env] of [['the sources', { HEATLAG_FROM_SOURCE: '1' }], ['the launcher\'s pick', {}]] as const) {
    it(`--help and estimate load no CSV, date or database library (${how}; the same trace sees what zones loads)`, () => {
      const help = loaded(['--help'], env);
      expect(help.some((u) => u.includes('node_modules/commander/'))).toBe(true);
      expect(help.filter((u) => heavy.test(u))).toEqual([]);
      const estimate = loaded(['estimate', '--start', '68', '--later', '64', '--hours', '3', '--ambient', '30'], env);
      expect(estimate.filter((u) => heavy.test(u))).toEqual([]);
      // The same trace on `heatlag zones` shows the database and CSV libraries, so the checks above can fail.
      const trace = path.join(dir, `trace-zones-${how.length}.txt`);
      run(['zones', '--db', 'missing.db'], { ...env, HEATLAG_TRACE: trace }, ['--import', TRACE]);
      const zones = modulesOf(trace);
      expect(zones.some((u) => /node_modules\/better-sqlite3\//.test(u))).toBe(true);
      expect(zones.some((u) => /node_modules\/papaparse\//.test(u))).toBe(true);
    });
  }

  // A log that its first rows refuse is refused before the store, the fitter or the mapping schema
  // is loaded (app/cli/source.ts), so the refusal does not wait for them, whatever the file's size.
  for (const [how, env] of [['the sources', { HEATLAG_FROM_SOURCE: '1' }], ['the launcher\'s pick', {}]] as const) {
    it(`fit of a log of local times without --tz is refused without loading the store or the fitter (${how})`, () => {
      const log = path.join(dir, 'local.csv');
      // Invented readings in local wall-clock time with no offset: the refusal is decided by line 2.
      const rows = ['time,indoor_f,outdoor_f,heat_runtime_s'];
      for (let i = 0; i < 3000; i++) rows.push(`2025-01-${String(1 + Math.floor(i / 288)).padStart(2, '0')} ${String(Math.floor((i % 288) / 12)).padStart(2, '0')}:${String((i % 12) * 5).padStart(2, '0')},68,40,0`);
      fs.writeFileSync(log, `${rows.join('\n')}\n`);
      const trace = path.join(dir, `trace-refusal-${how.length}.txt`);
      const r = run(['fit', log], { ...env, HEATLAG_TRACE: trace }, ['--import', TRACE]);
      expect(r.code).toBe(2);
      expect(r.stderr.trim()).toBe(
        "heatlag: local.csv line 2, column 1 (time): the times are local wall-clock times without a UTC offset (e.g. '2025-01-01 00:00'): " +
          'say which time zone they are in with --tz (e.g. --tz America/Chicago) or "timezone" in the mapping',
      );
      const mods = modulesOf(trace);
      expect(mods.filter((u) => /node_modules\/(better-sqlite3|zod)\/|core\/fit\/|db\/store/.test(u))).toEqual([]);
      // The same trace sees the CSV library that made the check, so the check above can fail.
      expect(mods.some((u) => /node_modules\/papaparse\//.test(u))).toBe(true);
      // With --tz the same command goes on to load the store and the fitter (and fits).
      const traceTz = path.join(dir, `trace-fit-${how.length}.txt`);
      const fit = run(['fit', log, '--tz', 'America/Chicago', '--json'], { ...env, HEATLAG_TRACE: traceTz }, ['--import', TRACE]);
      const fitMods = modulesOf(traceTz);
      expect(fitMods.some((u) => /node_modules\/better-sqlite3\//.test(u)), fit.stderr).toBe(true);
      expect(fitMods.some((u) => /core\/fit\//.test(u))).toBe(true);
    });
  }

  it('fit --all runs its worker threads from the bundle while it is up to date, else through tsx', () => {
    const db = path.join(dir, 'workers.db');
    // A short invented log from the reference simulator (quick to fit), in two zones.
    const sim = simulateZone({
      model: { tauHours: 30, heatRate: 3, coolRate: 0, gain: 0.1 }, days: 6, seed: 4, start: '2026-01-05T00:00:00Z',
      weather: { meanC: 0, dailyRangeK: 8 }, log: { intervalMinutes: 15, units: 'C', indoorResolution: 0.1, runtime: 'seconds' },
    });
    const log = path.join(dir, 'short.csv');
    fs.writeFileSync(log, sim.csv);
    for (const zone of ['East', 'West']) {
      const r = run(['import', log, '--db', db, '--site', 'Hall site', '--zone', zone]);
      expect(r.code, r.stderr).toBe(0);
    }
    const workers = (env: Record<string, string>) => {
      const trace = path.join(dir, `trace-workers-${Object.keys(env).length}.txt`);
      const r = run(['fit', '--db', db, '--all', '--workers', '2', '--json'], { ...env, HEATLAG_TRACE: trace }, ['--import', TRACE]);
      expect(r.code, r.stderr).toBe(0);
      expect(JSON.parse(r.stdout).map((z: { error: string | null }) => z.error)).toEqual([null, null]);
      // The trace hooks run in the worker threads too (they inherit --import): each worker's entry is there.
      const urls = fs.readFileSync(trace, 'utf8').split('\n');
      expect(urls.filter((u) => u.endsWith('/app/cli/fit-worker.mjs'))).toHaveLength(2);
      return urls;
    };
    const picked = workers({});
    if (bundleIsFresh('cli')) {
      expect(picked.filter((u) => u.endsWith('/dist/cli/fit-worker.js'))).toHaveLength(2);
      expect(picked.filter((u) => /node_modules\/tsx\//.test(u))).toEqual([]);
    } else {
      expect(picked.some((u) => u.endsWith('/app/cli/fit-worker.ts'))).toBe(true);
    }
    // The fallback: from the sources the workers load the TypeScript worker through tsx.
    const source = workers({ HEATLAG_FROM_SOURCE: '1' });
    expect(source.some((u) => /node_modules\/tsx\//.test(u))).toBe(true);
    expect(source.filter((u) => u.endsWith('/app/cli/fit-worker.ts'))).toHaveLength(2);
  });

  it('lists each command in the root help as its own module defines it', async () => {
    for (const [name, entry] of Object.entries(COMMANDS)) {
      const program = new Command('heatlag');
      (await entry.load()).register(program);
      const cmd = program.commands.find((c) => c.name() === name)!;
      expect(cmd, name).toBeDefined();
      expect(cmd.description(), name).toBe(entry.description);
      expect(cmd.registeredArguments.map((a) => (a.required ? `<${a.name()}>` : `[${a.name()}]`)), name).toEqual(entry.args);
      expect(cmd.options.some((o) => o.long === '--json'), name).toBe(true);
    }
    const help = run(['--help']);
    expect(help.code).toBe(0);
    for (const name of Object.keys(COMMANDS)) expect(help.stdout).toContain(`${name} [options]`);
  });
});

describe('bundle or sources', () => {
  it('uses a bundle only while every source it lists keeps the time it was built with', () => {
    const root = path.join(dir, 'project');
    fs.mkdirSync(path.join(root, 'dist', 'cli'), { recursive: true });
    fs.mkdirSync(path.join(root, 'app'), { recursive: true });
    const src = path.join(root, 'app', 'a.ts');
    fs.writeFileSync(src, 'export const a = 1;\n');
    const manifest = (inputs: Record<string, number>) =>
      fs.writeFileSync(path.join(root, 'dist', 'cli', 'manifest.json'), JSON.stringify({ builtAt: Date.now(), inputs }));
    expect(bundleIsFresh('cli', root)).toBe(false); // no manifest
    manifest({ 'app/a.ts': fs.statSync(src).mtimeMs });
    expect(bundleIsFresh('cli', root)).toBe(true);
    fs.utimesSync(src, new Date(), new Date(Date.now() + 5000)); // the source is edited
    expect(bundleIsFresh('cli', root)).toBe(false);
    manifest({ 'app/a.ts': fs.statSync(src).mtimeMs, 'app/gone.ts': 1 });
    expect(bundleIsFresh('cli', root)).toBe(false); // a source it was built from is gone
  });

  it('runs the same from the sources as from whatever the launcher picks', () => {
    const args = ['estimate', '--start', '68', '--later', '64', '--hours', '3', '--ambient', '30', '--json'];
    const picked = run(args);
    const source = run(args, { HEATLAG_FROM_SOURCE: '1' });
    expect(picked.code).toBe(0);
    expect(source.stdout).toBe(picked.stdout);
  });
});

describe('inputs before tools', () => {
  const noChromium = () => ({ CHROMIUM: path.join(dir, 'no-such-browser') });

  it('names a missing database even when Chromium cannot be found', () => {
    const r = run(['report', '--db', 'missing.db', '--zone', 'A/B', '--out', 'r.pdf'], noChromium());
    expect(r.code).toBe(2);
    expect(r.stderr.trim()).toBe('heatlag: missing.db: no such database file.');
  });

  it('names an unknown zone and a missing output folder before looking for Chromium', () => {
    const db = path.join(dir, 'site.db');
    const imp = run(['import', path.join(ROOT, 'assets/demo/great-hall.csv'), '--db', db, '--site', 'Hall site', '--zone', 'Hall']);
    expect(imp.code, imp.stderr).toBe(0);
    const zone = run(['report', '--db', db, '--zone', 'Hall site/Attic', '--out', 'r.pdf'], noChromium());
    expect(zone.code).toBe(2);
    expect(zone.stderr).toContain("no zone 'Hall site/Attic'. Zones: Hall site/Hall.");
    const out = run(['report', '--db', db, '--zone', 'Hall site/Hall', '--out', 'no-such-folder/r.pdf'], noChromium());
    expect(out.code).toBe(2);
    expect(out.stderr).toContain('no-such-folder/r.pdf: the folder');
    // With every input right, the missing browser is what is reported.
    const tool = run(['report', '--db', db, '--zone', 'Hall site/Hall', '--out', 'r.pdf'], noChromium());
    expect(tool.code).toBe(2);
    expect(tool.stderr).toContain('CHROMIUM is set to');
    expect(fs.existsSync(path.join(dir, 'r.pdf'))).toBe(false);
  });
});

describe('npm test preflight', () => {
  const PREFLIGHT = path.join(ROOT, 'tests/preflight.mjs');
  const preflight = (env: Record<string, string>) => {
    const r = spawnSync(process.execPath, [PREFLIGHT], { encoding: 'utf8', env: { HOME: dir, ...env } });
    return { code: r.status ?? -1, stderr: r.stderr };
  };
  /** A folder of stand-in executables for PATH. */
  const fakeBin = (names: string[]) => {
    const bin = fs.mkdtempSync(path.join(dir, 'bin-'));
    for (const n of names) fs.writeFileSync(path.join(bin, n), '#!/bin/sh\nexit 0\n', { mode: 0o755 });
    return bin;
  };

  it('stops with one message naming each missing tool and the apt-get line that installs it', () => {
    const r = preflight({ PATH: fakeBin(['pdftoppm']), CHROMIUM: path.join(dir, 'no-such-browser') });
    expect(r.code).toBe(1);
    expect(r.stderr).toContain('Chromium');
    expect(r.stderr).toContain(`CHROMIUM is set to ${path.join(dir, 'no-such-browser')}`);
    expect(r.stderr).toContain('pdftotext');
    expect(r.stderr).toContain('sqlite3');
    expect(r.stderr).not.toContain('- pdftoppm');
    expect(r.stderr).toContain('apt-get install -y chromium poppler-utils sqlite3');
    expect(r.stderr).toMatch(/setting CHROMIUM to its path/);
  });

  it('passes quietly when every tool is there (Chromium from $CHROMIUM)', () => {
    const bin = fakeBin(['pdftoppm', 'pdftotext', 'sqlite3', 'my-chrome']);
    const r = preflight({ PATH: bin, CHROMIUM: path.join(bin, 'my-chrome') });
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
  });
});
