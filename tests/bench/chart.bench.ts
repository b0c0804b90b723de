/**
 * `npm run bench:chart`: how long the zone history chart of a one-year 5-minute log (105,120 readings)
 * takes to appear in the browser mode. Printed, never asserted (goal: within 300 ms).
 *   npm run bench:chart              readable lines
 *   npm run bench:chart -- --json    one JSON object
 *
 * A year written by the reference simulator (invented data) is imported with db/ importLog into a
 * temporary database; `serve.mjs` serves it on 127.0.0.1 (building the renderer first if it is not
 * built); Debian's Chromium opens it through Playwright. Each run clicks the zone in the sidebar (which
 * opens its history) from inside the page, so the clock starts at the click, and stops at the first
 * animation frame after chart.js has drawn the chart on the canvas (chart.js marks its canvas with
 * `$chartjs` when it builds a chart; the app draws without animation, so the drawing is done in that same
 * task) plus one more frame, by which the drawn frame has been painted. The time is split into the data
 * (until the zoneHistory reply, the whole log min–max decimated by the backend, is parsed) and the rest
 * (the client's check of the reply against the contract, Svelte update, chart.js build and draw,
 * paint). The first run is reported apart (cold caches: the backend reads the year from SQLite); then
 * the median of the runs after it. Last, the redraw of the whole year after "Last week" → "All" (a new
 * zoneHistory request for the wider window, drawn on the same chart).
 */
import { spawn, type ChildProcess } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { createInterface } from 'node:readline';
import { fileURLToPath } from 'node:url';
import { chromium, type Page } from '@playwright/test';
import { importLog, openStore } from '../../db/index.ts';
import { simulateZone } from '../support/zone-sim.ts';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../..');
const json = process.argv.includes('--json');
const RUNS = 6;
const log = (s: string): void => {
  if (!json) process.stdout.write(`${s}\n`);
};
const median = (xs: number[]) => {
  const s = xs.slice().sort((a, b) => a - b);
  return s.length % 2 ? s[s.length >> 1] : (s[s.length / 2 - 1] + s[s.length / 2]) / 2;
};

const work = fs.mkdtempSync(path.join(os.tmpdir(), 'heatlag-bench-chart-'));
let server: ChildProcess | null = null;
let browser: Awaited<ReturnType<typeof chromium.launch>> | null = null;

async function startServer(dbFile: string): Promise<{ url: string }> {
  const child = spawn(process.execPath, [path.join(root, 'app', 'server', 'serve.mjs'), '--json', '--data-dir', work, '--db', dbFile, '--no-demo'], {
    cwd: root,
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  server = child;
  let stderr = '';
  child.stderr!.on('data', (d) => (stderr += String(d)));
  const line = await new Promise<string>((resolve, reject) => {
    const timer = setTimeout(() => reject(new Error(`the browser mode did not start in 180 s: ${stderr}`)), 180_000);
    createInterface({ input: child.stdout! }).once('line', (l) => {
      clearTimeout(timer);
      resolve(l);
    });
    child.once('exit', (code) => reject(new Error(`the browser mode exited with ${code}: ${stderr}`)));
  });
  return JSON.parse(line) as { url: string };
}

/** Clicks the zone in the sidebar (a new chart) or a range button of the history (a redraw) and times it to the painted frame. */
function timedOpen(page: Page, how: { zone?: string; button?: string }): Promise<{ totalMs: number; dataMs: number | null }> {
  return page.evaluate(async ({ zone, button }) => {
    const w = window as unknown as { __seriesParsedAt?: number };
    w.__seriesParsedAt = undefined;
    const box = () => document.querySelector<HTMLCanvasElement>('[data-testid="history-chart"] canvas');
    const target = zone
      ? [...document.querySelectorAll<HTMLButtonElement>('nav .zone-link')].find((b) => b.textContent?.trim() === zone)
      : [...document.querySelectorAll<HTMLButtonElement>('[data-testid="screen-history"] button')].find((b) => b.textContent?.trim() === button);
    if (!target) throw new Error(`no button ${zone ?? button}`);
    const old = box();
    const frame = () => new Promise<number>((r) => requestAnimationFrame(r));
    const t0 = performance.now();
    target.click();
    if (zone) {
      // A new chart: wait for a canvas chart.js has built (not one left from before).
      for (;;) {
        await frame();
        const c = box() as (HTMLCanvasElement & { $chartjs?: unknown }) | null;
        if (c && c !== old && c.$chartjs) break;
        if (performance.now() - t0 > 60_000) throw new Error('the chart did not appear in 60 s');
      }
    } else {
      // The same chart: the new window is asked of the backend, and drawn in the task that reads the reply.
      for (;;) {
        await frame();
        if (w.__seriesParsedAt !== undefined) break;
        if (performance.now() - t0 > 60_000) throw new Error('the chart was not redrawn in 60 s');
      }
    }
    await frame(); // the frame with the drawn chart has been painted
    return { totalMs: performance.now() - t0, dataMs: w.__seriesParsedAt === undefined ? null : w.__seriesParsedAt - t0 };
  }, how);
}

try {
  // ── A year of 5-minute readings in a temporary database ─────────────────────
  log('Writing and importing a one-year 5-minute log …');
  const sim = simulateZone({
    model: { tauHours: 32, heatRate: 3, coolRate: 0, gain: 0.15 },
    days: 365,
    stepSeconds: 60,
    start: '2025-01-01T00:00:00Z',
    weather: { meanC: 4, dailyRangeK: 9 },
    log: { intervalMinutes: 5, units: 'F', indoorResolution: 1, runtime: 'seconds' },
  });
  const csv = path.join(work, 'year.csv');
  fs.writeFileSync(csv, sim.csv);
  const dbFile = path.join(work, 'chart.db');
  const store = openStore(dbFile);
  const imported = await importLog(store, csv, { zoneId: store.getOrCreateZone('Bench site', 'Year').id });
  store.close();

  log('Starting the browser mode and Chromium …');
  const { url } = await startServer(dbFile);
  browser = await chromium.launch({
    executablePath: '/usr/bin/chromium',
    headless: true,
    args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update', '--disable-sync', '--no-first-run'],
  });
  const page = await browser.newPage({ viewport: { width: 1280, height: 800 }, locale: 'en-US' });
  // tsx keeps function names with a __name helper, which functions sent into the page call too.
  await page.addInitScript('window.__name = (f) => f;');
  // When the zoneHistory reply has been parsed (the client reads every reply with Response.json()).
  await page.addInitScript(() => {
    const json = Response.prototype.json;
    Response.prototype.json = async function (this: Response) {
      const value = await json.call(this);
      if (this.url.endsWith('/api/zoneHistory')) (window as unknown as { __seriesParsedAt?: number }).__seriesParsedAt = performance.now();
      return value;
    };
  });
  await page.goto(url);
  await page.locator('nav .zone-link', { hasText: 'Year' }).waitFor();

  const runs: { totalMs: number; dataMs: number | null }[] = [];
  for (let i = 0; i < RUNS; i++) {
    if (i > 0) {
      await page.getByTestId('nav-sites').click();
      await page.getByTestId('screen-sites').waitFor();
    }
    runs.push(await timedOpen(page, { zone: 'Year' }));
  }
  await page.getByTestId('history-count').waitFor();
  const shown = await page.getByTestId('history-count').textContent();
  // The canvas really holds a drawing: count its painted pixels (outside the timings).
  const painted = await page.evaluate(() => {
    const c = document.querySelector<HTMLCanvasElement>('[data-testid="history-chart"] canvas')!;
    const d = c.getContext('2d')!.getImageData(0, 0, c.width, c.height).data;
    let n = 0;
    for (let i = 3; i < d.length; i += 4) if (d[i] !== 0) n++;
    return n;
  });
  await timedOpen(page, { button: 'Last week' });
  const all: number[] = [];
  for (let i = 0; i < 3; i++) {
    await timedOpen(page, { button: 'Last week' });
    all.push((await timedOpen(page, { button: 'All' })).totalMs);
  }

  const warm = runs.slice(1);
  const dataWarm = warm.map((r) => r.dataMs).filter((v): v is number => v !== null);
  const figures = {
    readings: imported.rowsAccepted,
    readingsShown: shown,
    chartDrawMs: Number(median(warm.map((r) => r.totalMs)).toFixed(1)),
    chartDataMs: dataWarm.length ? Number(median(dataWarm).toFixed(1)) : null,
    chartRenderMs: dataWarm.length ? Number(median(warm.map((r) => r.totalMs - (r.dataMs ?? 0))).toFixed(1)) : null,
    chartFirstDrawMs: Number(runs[0].totalMs.toFixed(1)),
    chartRedrawAllMs: Number(median(all).toFixed(1)),
    chartRuns: runs.map((r) => Number(r.totalMs.toFixed(1))),
    paintedPixels: painted,
  };
  if (json) process.stdout.write(`${JSON.stringify(figures)}\n`);
  else {
    log('');
    log(`History chart of a one-year 5-minute log (${figures.readings.toLocaleString('en-US')} readings; shown: ${shown}), browser mode in Chromium`);
    log(`  click to painted chart        ${figures.chartDrawMs} ms  (median of ${warm.length}; goal within 300 ms)`);
    log(`    of which the data           ${figures.chartDataMs ?? '?'} ms  (zoneHistory request and JSON)`);
    log(`    and the rest                ${figures.chartRenderMs ?? '?'} ms  (reply check, Svelte, chart.js, paint)`);
    log(`  first time (cold)             ${figures.chartFirstDrawMs} ms`);
    log(`  redraw of the whole year      ${figures.chartRedrawAllMs} ms  ("Last week" → "All", median of 3)`);
  }
} finally {
  await browser?.close();
  const s = server as ChildProcess | null; // set inside startServer
  if (s && s.exitCode === null) {
    await new Promise<void>((resolve) => {
      s.once('exit', () => resolve());
      s.kill('SIGTERM');
    });
  }
  fs.rmSync(work, { recursive: true, force: true });
}
