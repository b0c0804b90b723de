/**
 * `npm run bench`: speed and memory figures, printed (never asserted).
 *   npm run bench              readable table
 *   npm run bench -- --json    one JSON object
 *
 * Measures, on a one-year 5-minute log (105,120 rows) written by the reference simulator:
 * - CSV-to-SQLite import rows per second through db/ importLog, and the same rows loaded by the
 *   sqlite3 command-line shell's own `.import` in the same run (the native limit), with the ratio;
 * - the time to fit one year (fitResponse, intervals and held-out check included): steady, and the
 *   first fit of a fresh process; with the solar term; one node only; with the two-node search forced;
 *   and the year of a heavy building (two-node truth), where the search runs and is chosen;
 * - microseconds per exact step (core/step.ts);
 * - the solar gain proxy of the one-year log (core/solar.ts solarGainProxy);
 * - peak resident memory;
 * - whole `heatlag` processes: --help against bare node, `fit` of the one-year log, and the refusal of
 *   the same log in local times without a zone;
 * - last, the history chart of a one-year log in the browser mode (tests/bench/chart.bench.ts, own process).
 */
import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { defaultWorkers, fitPortfolio } from '../../app/cli/portfolio.ts';
import { bundleIsFresh } from '../../app/launch.mjs';
import { fitResponse } from '../../core/fit/index.ts';
import { solarGainProxy } from '../../core/solar.ts';
import { FixedStep, stepExact } from '../../core/step.ts';
import { importLog, openStore } from '../../db/index.ts';
import { simulateZone } from '../support/zone-sim.ts';

const json = process.argv.includes('--json');
const log = (s: string): void => {
  if (!json) process.stdout.write(`${s}\n`);
};
const work = fs.mkdtempSync(path.join(os.tmpdir(), 'heatlag-bench-'));

function median(xs: number[]): number {
  const s = xs.slice().sort((a, b) => a - b);
  return s[s.length >> 1];
}

// ── The one-year log ─────────────────────────────────────────────────────────
log('Writing a one-year 5-minute log with the reference simulator …');
const sim = simulateZone({
  model: { tauHours: 32, heatRate: 3, coolRate: 0, gain: 0.15 },
  days: 365,
  stepSeconds: 60,
  start: '2025-01-01T00:00:00Z',
  weather: { meanC: 4, dailyRangeK: 9 },
  log: { intervalMinutes: 5, units: 'F', indoorResolution: 1, runtime: 'seconds' },
});
const csvFile = path.join(work, 'year.csv');
fs.writeFileSync(csvFile, sim.csv);
const rows = sim.rowsWritten;
const bytes = fs.statSync(csvFile).size;

// ── Import through db/ ───────────────────────────────────────────────────────
const importTimes: number[] = [];
let dbFile = '';
for (let run = 0; run < 3; run++) {
  dbFile = path.join(work, `bench-${run}.db`);
  const store = openStore(dbFile);
  const zone = store.getOrCreateZone('Bench site', 'Year');
  const t0 = performance.now();
  await importLog(store, csvFile, { zoneId: zone.id });
  importTimes.push(performance.now() - t0);
  store.close();
}
const importMs = median(importTimes);
const importRowsPerSecond = rows / (importMs / 1000);

// ── The native limit: the sqlite3 shell's CSV import of the same file ─────────
let nativeRowsPerSecond: number | null = null;
let shell = spawnSync('sqlite3', ['-version'], { encoding: 'utf8' });
if (shell.status !== 0) {
  // The native baseline needs Debian's sqlite3 shell: install it when missing (root on these machines).
  log('Installing the sqlite3 shell from Debian for the native baseline …');
  spawnSync('sh', ['-c', 'apt-get update -qq && DEBIAN_FRONTEND=noninteractive apt-get install -y -qq sqlite3'], { stdio: 'ignore' });
  shell = spawnSync('sqlite3', ['-version'], { encoding: 'utf8' });
}
if (shell.status === 0) {
  const header = sim.header;
  const times: number[] = [];
  for (let run = 0; run < 3; run++) {
    const nativeDb = path.join(work, `native-${run}.db`);
    const cols = header.map((h, i) => `"c${i}" ${i === 0 ? 'TEXT' : 'REAL'}`).join(', ');
    const script = `PRAGMA journal_mode=WAL;\nCREATE TABLE raw (${cols});\n.import --csv --skip 1 ${csvFile} raw\n`;
    const t0 = performance.now();
    const r = spawnSync('sqlite3', [nativeDb], { input: script, encoding: 'utf8' });
    times.push(performance.now() - t0);
    if (r.status !== 0) throw new Error(`sqlite3 shell failed: ${r.stderr}`);
  }
  nativeRowsPerSecond = rows / (median(times) / 1000);
} else {
  log('The sqlite3 shell is not installed (apt-get install sqlite3): no native baseline.');
}

// ── Fit one year ─────────────────────────────────────────────────────────────
const store = openStore(dbFile);
const zone = store.findZone('Bench site', 'Year')!;
const series = store.loadSeries(zone.id);
store.close();
// The first fit in a fresh process (what one `heatlag fit` pays: V8 compiles the fitter as it goes),
// then the steady figure (a desktop session or a portfolio batch): median of 15 after 10 warm-up fits.
const c0 = performance.now();
let tau = fitResponse(series).tauHours;
const fitOneYearColdMs = performance.now() - c0;
for (let run = 0; run < 10; run++) fitResponse(series);
const fitTimes: number[] = [];
for (let run = 0; run < 15; run++) {
  const t0 = performance.now();
  tau = fitResponse(series).tauHours;
  fitTimes.push(performance.now() - t0);
}
const fitOneYearMs = median(fitTimes);
// The same with the solar term (a site with a location), and the one-node model alone: median of 5 after 3.
function medianFit(options: Parameters<typeof fitResponse>[1]): number {
  for (let run = 0; run < 3; run++) fitResponse(series, options);
  const ts: number[] = [];
  for (let run = 0; run < 5; run++) {
    const t0 = performance.now();
    fitResponse(series, options);
    ts.push(performance.now() - t0);
  }
  return median(ts);
}
const fitOneYearSolarMs = medianFit({ solarProxy: (t) => solarGainProxy(t, 40, -90) });
const fitOneYearOneNodeMs = medianFit({ models: 'one-node' });
const fitOneYearSearchedMs = medianFit({ models: 'two-node' });
const roundingBoundPercent = fitResponse(series).selection.roundingBoundPercent ?? null;

// A heavy building's year (air node and building mass: the two-node search runs and is chosen).
log('Writing a one-year log of a heavy building (two-node truth) …');
const massSim = simulateZone({
  model: { tauHours: 60, heatRate: 3, coolRate: 0, gain: 0.15 },
  mass: { airMassHours: 2, massOutdoorHours: 50, massShare: 0.8 },
  days: 365,
  stepSeconds: 60,
  start: '2025-01-01T00:00:00Z',
  weather: { meanC: 4, dailyRangeK: 9 },
  log: { intervalMinutes: 5, units: 'F', indoorResolution: 1, runtime: 'seconds' },
});
const massCsv = path.join(work, 'mass-year.csv');
fs.writeFileSync(massCsv, massSim.csv);
const massSeries = (() => {
  const s = openStore(path.join(work, 'mass.db'));
  const z = s.getOrCreateZone('Bench site', 'Heavy year');
  return importLog(s, massCsv, { zoneId: z.id, mapping: massSim.mapping as never }).then(() => {
    const out = s.loadSeries(z.id);
    s.close();
    return out;
  });
})();
const heavy = await massSeries;
for (let run = 0; run < 2; run++) fitResponse(heavy);
const heavyTimes: number[] = [];
let heavyModel = '';
for (let run = 0; run < 5; run++) {
  const t0 = performance.now();
  heavyModel = fitResponse(heavy).model;
  heavyTimes.push(performance.now() - t0);
}
const fitOneYearTwoNodeMs = median(heavyTimes);

// ── Whole processes: start-up, a one-year fit and a refusal (what a person waits for) ──
// Each the median of a few runs of the command as a person runs it (node app/cli/heatlag.mjs: the
// bundle in dist/cli when it is up to date, else the sources through tsx), with bare node alongside.
function processSeconds(args: string[], runs: number, expectCode = 0): number {
  const times: number[] = [];
  for (let run = 0; run < runs; run++) {
    const p0 = performance.now();
    const r = spawnSync(process.execPath, args, { encoding: 'utf8', maxBuffer: 64 * 1024 * 1024 });
    times.push((performance.now() - p0) / 1000);
    if (r.status !== expectCode) throw new Error(`${args.join(' ')} exited ${r.status}: ${r.stderr}`);
  }
  return median(times);
}
const heatlagBin = path.join(import.meta.dirname, '../../app/cli/heatlag.mjs');
// Whether those runs used the bundle (else the sources through tsx: run `npm run build` first).
const cliBundled = bundleIsFresh('cli');
const localCsvFile = path.join(work, 'year-local.csv');
fs.writeFileSync(localCsvFile, sim.csv.replace(/T(\d\d:\d\d):00Z/g, ' $1')); // the same log in local wall-clock times
log('Timing whole heatlag processes (help, one-year fit, refusal) …');
const nodeBareSeconds = processSeconds(['-e', '0'], 7);
const cliHelpSeconds = processSeconds([heatlagBin, '--help'], 7);
const cliFitOneYearSeconds = processSeconds([heatlagBin, 'fit', csvFile, '--tz', 'UTC', '--json'], 3);
const refusalSeconds = processSeconds([heatlagBin, 'fit', localCsvFile], 5, 2);

// ── Exact steps ──────────────────────────────────────────────────────────────
const steps = 20_000_000;
const fixed = new FixedStep(5 / 60, 32);
let T = 20;
let t0 = performance.now();
for (let i = 0; i < steps; i++) T = fixed.step(T, 0, 0.01, (i & 7) === 0 ? 3 : 0.1);
const stepMicroseconds = ((performance.now() - t0) * 1000) / steps;
t0 = performance.now();
for (let i = 0; i < steps / 10; i++) T = stepExact(T, 5 / 60, 32, 0, 0.01, (i & 7) === 0 ? 3 : 0.1);
const stepExactMicroseconds = ((performance.now() - t0) * 1000) / (steps / 10);
if (!Number.isFinite(T)) throw new Error('step diverged');

// ── Solar gain proxy of the one-year log (40° N, 90° W): median of 15 after 5 warm-up runs ──
for (let run = 0; run < 5; run++) solarGainProxy(series.time, 40, -90);
const solarTimes: number[] = [];
for (let run = 0; run < 15; run++) {
  const s0 = performance.now();
  solarGainProxy(series.time, 40, -90);
  solarTimes.push(performance.now() - s0);
}
const solarProxyOneYearMs = median(solarTimes);

// ── Portfolio: 200 one-month zones on 1 worker and on all cores ───────────────
log('Writing 200 one-month zones for the portfolio batch …');
const portfolioDb = path.join(work, 'portfolio.db');
{
  const monthFiles: string[] = [];
  for (let k = 0; k < 10; k++) {
    const month = simulateZone({
      model: { tauHours: 12 + 6 * k, heatRate: 2 + 0.3 * k, coolRate: 0, gain: 0.1 },
      days: 30, stepSeconds: 60, seed: 100 + k, start: '2025-01-06T00:00:00Z',
      weather: { meanC: 2, dailyRangeK: 8 },
      log: { intervalMinutes: 5, units: 'F', indoorResolution: 1, runtime: 'seconds' },
    });
    const f = path.join(work, `month-${k}.csv`);
    fs.writeFileSync(f, month.csv);
    monthFiles.push(f);
  }
  const pstore = openStore(portfolioDb);
  for (let z = 0; z < 200; z++) {
    const zone = pstore.getOrCreateZone(`Campus ${Math.floor(z / 20) + 1}`, `Zone ${z + 1}`);
    await importLog(pstore, monthFiles[z % 10], { zoneId: zone.id });
  }
  pstore.close();
}
const portfolioIds = (() => {
  const s = openStore(portfolioDb);
  const ids = s.listZones().map((z) => z.id);
  s.close();
  return ids;
})();
const allWorkers = defaultWorkers();
// What `fit --all` does after start-up: workers read the zones, this thread saves each batch.
const runPortfolio = async (workers: number) => {
  const writer = openStore(portfolioDb);
  const t = performance.now();
  const items = await fitPortfolio(portfolioDb, writer.listZoneIds(), { workers, store: writer });
  const seconds = (performance.now() - t) / 1000;
  writer.close();
  return { items, seconds };
};
const { items: one, seconds: portfolioSeconds1 } = await runPortfolio(1);
const { items: all, seconds: portfolioSecondsAll } = await runPortfolio(allWorkers);
const portfolioFailures = [...one, ...all].filter((x) => x.response === null).length;

const peakRssMB = process.resourceUsage().maxRSS / 1024;
fs.rmSync(work, { recursive: true, force: true });

// ── The history chart in the browser mode (its own process: Chromium and the server) ──
log('Timing the history chart in the browser mode (tests/bench/chart.bench.ts) …');
const chartRun = spawnSync(process.execPath, [path.join(import.meta.dirname, '../../app/cli/run-ts.mjs'), path.join(import.meta.dirname, 'chart.bench.ts'), '--json'], {
  encoding: 'utf8',
  timeout: 600_000,
});
let chart: { chartDrawMs: number; chartDataMs: number | null; chartRenderMs: number | null } | null = null;
try {
  chart = JSON.parse(chartRun.stdout.trim().split('\n').pop() ?? '');
} catch {
  log(`The chart benchmark did not run: ${(chartRun.stderr ?? '').trim().split('\n')[0] ?? ''}`);
}

const figures = {
  rows,
  csvBytes: bytes,
  importRowsPerSecond: Math.round(importRowsPerSecond),
  nativeImportRowsPerSecond: nativeRowsPerSecond === null ? null : Math.round(nativeRowsPerSecond),
  importRatioVsNative: nativeRowsPerSecond === null ? null : Number((nativeRowsPerSecond / importRowsPerSecond).toFixed(2)),
  fitOneYearMs: Number(fitOneYearMs.toFixed(1)),
  fitOneYearColdMs: Number(fitOneYearColdMs.toFixed(1)),
  fitOneYearSolarMs: Number(fitOneYearSolarMs.toFixed(1)),
  fitOneYearOneNodeMs: Number(fitOneYearOneNodeMs.toFixed(1)),
  fitOneYearSearchedMs: Number(fitOneYearSearchedMs.toFixed(1)),
  roundingBoundPercent: roundingBoundPercent === null ? null : Number(roundingBoundPercent.toFixed(2)),
  fitOneYearTwoNodeMs: Number(fitOneYearTwoNodeMs.toFixed(1)),
  heavyYearModel: heavyModel,
  fittedTauHours: Number(tau.toFixed(2)),
  stepMicroseconds: Number(stepMicroseconds.toFixed(4)),
  stepExactMicroseconds: Number(stepExactMicroseconds.toFixed(4)),
  solarProxyOneYearMs: Number(solarProxyOneYearMs.toFixed(2)),
  peakRssMB: Math.round(peakRssMB),
  portfolioZones: portfolioIds.length,
  portfolioZonesPerSecond1: Number((portfolioIds.length / portfolioSeconds1).toFixed(1)),
  portfolioZonesPerSecondAll: Number((portfolioIds.length / portfolioSecondsAll).toFixed(1)),
  portfolioSpeedup: Number((portfolioSeconds1 / portfolioSecondsAll).toFixed(2)),
  portfolioWorkers: allWorkers,
  portfolioFailures,
  nodeBareSeconds: Number(nodeBareSeconds.toFixed(3)),
  cliHelpSeconds: Number(cliHelpSeconds.toFixed(3)),
  cliHelpVsNode: Number((cliHelpSeconds / nodeBareSeconds).toFixed(2)),
  cliFitOneYearSeconds: Number(cliFitOneYearSeconds.toFixed(3)),
  refusalSeconds: Number(refusalSeconds.toFixed(3)),
  cliBundled,
  cores: os.cpus().length,
  chartDrawMs: chart?.chartDrawMs ?? null,
};

if (json) {
  process.stdout.write(`${JSON.stringify(figures, null, 2)}\n`);
} else {
  log('');
  log(`One-year 5-minute log: ${rows.toLocaleString('en-US')} rows, ${(bytes / 1e6).toFixed(1)} MB`);
  log(`  import (db/ importLog)        ${figures.importRowsPerSecond.toLocaleString('en-US')} rows/s  (median of 3)`);
  if (figures.nativeImportRowsPerSecond !== null) {
    log(`  sqlite3 shell .import         ${figures.nativeImportRowsPerSecond.toLocaleString('en-US')} rows/s  (native limit, same file)`);
    log(`  ratio native / ours           ${figures.importRatioVsNative} ×  (goal: within 2 ×)`);
  }
  log(`  fit one year                  ${figures.fitOneYearMs} ms  (model choice, intervals, held-out check, backtest; median of 15 after 10 warm-up fits; goal under 150 ms; τ = ${figures.fittedTauHours} h, truth 32 h)`);
  log(`    with the solar term         ${figures.fitOneYearSolarMs} ms  (median of 5)`);
  log(`    one node only               ${figures.fitOneYearOneNodeMs} ms  (median of 5)`);
  log(`    (the two-node search was skipped: rounding leaves at most ${figures.roundingBoundPercent} % of the one-node error to remove)`);
  log(`    two-node search forced      ${figures.fitOneYearSearchedMs} ms  (models: two-node; median of 5)`);
  log(`  fit a heavy building's year   ${figures.fitOneYearTwoNodeMs} ms  (two-node truth, search run, ${figures.heavyYearModel} chosen; median of 5)`);
  log(`    first fit in a fresh process ${figures.fitOneYearColdMs} ms  (V8 still compiling the fitter)`);
  log(`  exact step (FixedStep)        ${figures.stepMicroseconds} µs  (goal < 0.2 µs)`);
  log(`  exact step (stepExact)        ${figures.stepExactMicroseconds} µs  (with exp per step)`);
  log(`  solar gain proxy, one year    ${figures.solarProxyOneYearMs} ms  (median of 15; goal well under 20 ms)`);
  log(`  peak resident memory          ${figures.peakRssMB} MB`);
  log('');
  log(`Whole heatlag processes (node app/cli/heatlag.mjs, ${cliBundled ? 'the bundle in dist/cli' : 'the sources through tsx: the bundle is out of date, run npm run build'}; median of 7, 3 and 5 runs)`);
  log(`  bare node (node -e 0)         ${figures.nodeBareSeconds} s`);
  log(`  heatlag --help                ${figures.cliHelpSeconds} s  (${figures.cliHelpVsNode} × bare node; goal within 2.5 ×)`);
  log(`  heatlag fit <one year> --tz   ${figures.cliFitOneYearSeconds} s  (import, fit, JSON; goal under 0.4 s)`);
  log(`  refusal: local times, no zone ${figures.refusalSeconds} s  (the one-year log without --tz; goal within 0.2 s)`);
  log('');
  log(`Portfolio batch: ${figures.portfolioZones} one-month 5-minute zones (fit --all)`);
  log(`  1 worker                      ${figures.portfolioZonesPerSecond1} zones/s`);
  log(`  ${allWorkers} workers (all cores)         ${figures.portfolioZonesPerSecondAll} zones/s`);
  log(`  speed-up                      ${figures.portfolioSpeedup} ×${portfolioFailures ? `  (${portfolioFailures} fits failed!)` : ''}`);
  log('');
  log('History chart of the one-year log, browser mode in Chromium (npm run bench:chart for details)');
  log(`  click to painted chart        ${chart ? `${chart.chartDrawMs} ms  (data ${chart.chartDataMs ?? '?'} ms, the rest ${chart.chartRenderMs ?? '?'} ms; goal within 300 ms)` : 'not measured'}`);
}
