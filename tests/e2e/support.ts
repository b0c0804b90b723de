/**
 * Shared helpers of the end-to-end tests: a browser-mode server per spec file (fresh temp data
 * folder, free port, its own token), a page fixture that fails the test on any console error or
 * uncaught exception, screenshots of every screen into test-results/screens, and the CLI run on the
 * same log as an outside check of the numbers shown.
 */
import { execFile, spawn, type ChildProcess } from 'node:child_process';
import { mkdirSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { createInterface } from 'node:readline';
import { fileURLToPath } from 'node:url';
import { promisify } from 'node:util';
import { test as base, expect, type Page } from '@playwright/test';

export const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../..');
export const demoDir = path.join(root, 'assets', 'demo');
export const screensDir = path.join(root, 'test-results', 'screens');

export interface Heatlag {
  url: string;
  origin: string;
  token: string;
  dataDir: string;
  stop(): Promise<void>;
}

/** Starts `node app/server/serve.mjs --json` on a free port with its own data folder. */
export async function startHeatlag(options: { demo?: boolean; dataDir?: string; env?: Record<string, string> } = {}): Promise<Heatlag> {
  const dataDir = options.dataDir ?? mkdtempSync(path.join(tmpdir(), 'heatlag-e2e-'));
  const args = [path.join(root, 'app', 'server', 'serve.mjs'), '--json', '--data-dir', dataDir];
  if (options.demo === false) args.push('--no-demo');
  const child: ChildProcess = spawn(process.execPath, args, { cwd: root, stdio: ['ignore', 'pipe', 'pipe'], env: { ...process.env, HEATLAG_CHECK_OUTPUT: '1', ...options.env } });
  let stderr = '';
  child.stderr!.on('data', (d) => (stderr += String(d)));
  const line = await new Promise<string>((resolve, reject) => {
    const rl = createInterface({ input: child.stdout! });
    const timer = setTimeout(() => reject(new Error(`the server did not start in 60 s: ${stderr}`)), 60_000);
    rl.once('line', (l) => {
      clearTimeout(timer);
      resolve(l);
    });
    child.once('exit', (code) => reject(new Error(`the server exited with ${code}: ${stderr}`)));
  });
  const info = JSON.parse(line) as { url: string; origin: string; token: string };
  return {
    ...info,
    dataDir,
    stop: () =>
      new Promise<void>((resolve) => {
        if (child.exitCode !== null) return resolve();
        child.once('exit', () => resolve());
        child.kill('SIGTERM');
      }).then(() => {
        if (!options.dataDir) rmSync(dataDir, { recursive: true, force: true });
      }),
  };
}

const run = promisify(execFile);

/** Calls the browser-mode API of a running server from a test (the same token and contract as the page). */
export async function callApi<T>(server: Heatlag, method: string, input: unknown): Promise<T> {
  const res = await fetch(`${server.origin}/api/${method}`, {
    method: 'POST',
    headers: { 'Content-Type': 'application/json', 'x-heatlag-token': server.token },
    body: JSON.stringify(input),
  });
  const env = (await res.json()) as { ok: boolean; value?: T; error?: { message: string } };
  if (!env.ok) throw new Error(`${method}: ${env.error?.message}`);
  return env.value as T;
}

/** Runs the `heatlag` command line and parses its --json output. */
export async function cli<T = Record<string, unknown>>(...args: string[]): Promise<T> {
  const { stdout } = await run(process.execPath, [path.join(root, 'app', 'cli', 'heatlag.mjs'), ...args, '--json'], { cwd: root, maxBuffer: 64 * 1024 * 1024 });
  return JSON.parse(stdout) as T;
}

/** Saves a full-page screenshot as test-results/screens/<name>.png. */
export async function screenshot(page: Page, name: string): Promise<void> {
  mkdirSync(screensDir, { recursive: true });
  await settled(page);
  await page.screenshot({ path: path.join(screensDir, `${name}.png`), fullPage: true });
}

/**
 * Waits until the page has settled, so a screenshot shows the finished screen rather than one half
 * loaded: no API request in flight for 500 ms (screens that redraw after a short pause, up to 350 ms,
 * ask again after the last change), nothing marked aria-busy, and two animation frames drawn. Counts
 * the requests through the fetch wrapper that the `test` fixture installs.
 */
export async function settled(page: Page): Promise<void> {
  await page.waitForFunction(() => {
    const w = window as unknown as { __inflight?: number; __lastFetch?: number };
    return (w.__inflight ?? 0) === 0 && performance.now() - (w.__lastFetch ?? 0) > 500 && !document.querySelector('[aria-busy="true"]');
  }, undefined, { timeout: 15_000, polling: 50 });
  await page.evaluate(() => new Promise<void>((r) => requestAnimationFrame(() => requestAnimationFrame(() => r()))));
}

/** Formats like the app: fixed decimals, en-US grouping, U+2212 minus. */
export function fmt(value: number, digits: number): string {
  return new Intl.NumberFormat('en-US', { minimumFractionDigits: digits, maximumFractionDigits: digits })
    .format(value)
    .replace('-', '−');
}

/** Hours as the app writes a duration: "2 h 05 min" or "45 min". */
export function fmtDuration(hours: number): string {
  const total = Math.round(hours * 60);
  const h = Math.floor(total / 60);
  const m = total % 60;
  return h === 0 ? `${m} min` : `${h} h ${String(m).padStart(2, '0')} min`;
}

/** A page that fails its test on any console error or uncaught exception. */
export const test = base.extend<{ errors: string[] }>({
  errors: [
    async ({ page }, use) => {
      // Count the page's requests in flight, for settled() before a screenshot.
      await page.addInitScript(() => {
        const w = window as unknown as { __inflight: number; __lastFetch: number };
        w.__inflight = 0;
        w.__lastFetch = 0;
        const plain = window.fetch.bind(window);
        window.fetch = async (...args: Parameters<typeof fetch>) => {
          w.__inflight++;
          w.__lastFetch = performance.now();
          try {
            return await plain(...args);
          } finally {
            w.__inflight--;
            w.__lastFetch = performance.now();
          }
        };
      });
      const errors: string[] = [];
      page.on('console', (msg) => {
        if (msg.type() === 'error') errors.push(`console: ${msg.text()}`);
      });
      page.on('pageerror', (err) => errors.push(`page error: ${err.message}`));
      await use(errors);
      expect(errors, 'the page logged errors').toEqual([]);
    },
    { auto: true },
  ],
});

export { expect };
