/**
 * `heatlag report`'s printer: the browser-mode server (app/server/server.ts, the one the app uses)
 * started in this process on 127.0.0.1 with a fresh token against the given database, the report's
 * print route opened in headless Chromium through playwright-core, and the page printed to PDF with
 * the report's print stylesheet, paper size, margins and footer (app/api/report.ts) — the same page
 * and stylesheet the desktop app prints with Electron's printToPDF.
 */
import { copyFileSync, existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import {
  PAPER_SIZE_IN,
  REPORT_HEADER_TEMPLATE,
  REPORT_MARGINS_IN,
  reportFooterTemplate,
  reportSearch,
  type Paper,
} from '../api/report.ts';
import { buildRenderer, rendererIsBuilt } from '../backend/renderer-build.ts';
import { openBackend } from '../backend/backend.ts';
import { SETTINGS_FILE } from '../backend/paths.ts';
import { startServer } from '../server/server.ts';
import { locateChromium } from './chromium.mjs';
import { CliError, inputError } from './options.ts';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../..');

/** The flags Chromium runs headless with here (no sandbox user namespace, no GPU, no network chatter). */
export const CHROMIUM_ARGS = [
  '--headless',
  '--no-sandbox',
  '--disable-gpu',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
  '--no-first-run',
];

export const NO_CHROMIUM =
  'Chromium was not found: install it (on Debian or Ubuntu: sudo apt-get install chromium) or set the CHROMIUM environment variable to the browser\'s path.';

/**
 * The Chromium to print with: $CHROMIUM when set, else the usual places (./chromium.mjs).
 * @throws CliError (exit 2) with one sentence on how to install it when there is none
 */
export function findChromium(env: NodeJS.ProcessEnv = process.env, platform: string = process.platform): string {
  const found = locateChromium(env, platform);
  if (found.path !== undefined) return found.path;
  if (env.CHROMIUM?.trim()) throw inputError(`${found.missing} ${NO_CHROMIUM}`);
  throw inputError(NO_CHROMIUM);
}

export interface PrintOptions {
  db: string;
  site: string;
  zone: string;
  out: string;
  /** Default: Letter for a °F zone, A4 otherwise. */
  paper?: Paper;
  units?: 'C' | 'F';
  /** Recovery conditions, °C, from the report's units (all three or none). */
  conditions?: (units: 'C' | 'F') => { fromC: number; toC: number; outdoorC: number };
  whatIf?: { capacityFactor: number; heatLossFactor: number };
  chromium: string;
  /** How long to wait for the report to be ready, ms (a first fit takes a few seconds). */
  timeoutMs?: number;
  log?: (message: string) => void;
}

export interface PrintResult {
  file: string;
  paper: Paper;
  units: 'C' | 'F';
  pages: number;
  bytes: number;
}

/** Pages of a PDF Chromium wrote (its page objects; Chromium never compresses them into object streams). */
function pageCount(pdf: Buffer): number {
  return (pdf.toString('latin1').match(/\/Type\s*\/Page(?![s\w])/g) ?? []).length;
}

/**
 * Prints the zone report of `site/zone` in `db` to `out`.
 * @throws CliError (exit 2) when the database or zone is missing or the report cannot be made
 */
export async function printReport(o: PrintOptions): Promise<PrintResult> {
  if (!existsSync(o.db)) throw inputError(`${o.db}: no such database file.`);
  const log = o.log ?? ((m: string) => process.stderr.write(`${m}\n`));
  const { chromium } = await import('playwright-core');

  if (!rendererIsBuilt(root)) {
    log('Building the user interface first (one moment)…');
    await buildRenderer(root);
  }
  // A scratch data folder, so nothing beside the database is written; the settings file of the
  // database's own folder (where the app keeps it) is copied in, so the demo site is still marked invented.
  const dataDir = mkdtempSync(path.join(tmpdir(), 'heatlag-report-'));
  const settings = path.join(path.dirname(path.resolve(o.db)), SETTINGS_FILE);
  if (existsSync(settings)) copyFileSync(settings, path.join(dataDir, SETTINGS_FILE));
  const pkg = JSON.parse(readFileSync(path.join(root, 'package.json'), 'utf8')) as { version: string };
  const backend = await openBackend({
    dataDir,
    databaseFile: o.db,
    mode: 'browser',
    version: pkg.version,
    demoDir: path.join(root, 'assets', 'demo'),
    demo: false,
    log,
  });
  let server: Awaited<ReturnType<typeof startServer>> | null = null;
  let browser: Awaited<ReturnType<typeof chromium.launch>> | null = null;
  try {
    const zone = backend.ctx.store.findZone(o.site, o.zone);
    if (!zone) {
      const known = backend.ctx.store.listZones().map((z) => `${z.site}/${z.name}`);
      throw inputError(`${o.db}: no zone '${o.site}/${o.zone}'.${known.length ? ` Zones: ${known.join(', ')}.` : ' The database has no zones yet.'}`);
    }
    const units = o.units ?? backend.ctx.store.zoneUnits(zone.id);
    const paper: Paper = o.paper ?? (units === 'F' ? 'letter' : 'a4');
    server = await startServer({
      handlers: backend.handlers,
      uploads: backend.ctx.uploads,
      staticDir: path.join(root, 'dist', 'renderer'),
      port: 0,
      log,
    });
    try {
      browser = await chromium.launch({ executablePath: o.chromium, args: CHROMIUM_ARGS, headless: true });
    } catch (err) {
      throw inputError(`Chromium (${o.chromium}) did not start: ${(err as Error).message.split('\n')[0]}`);
    }
    const size = PAPER_SIZE_IN[paper];
    const page = await browser.newPage({ viewport: { width: Math.round(size.width * 96), height: Math.round(size.height * 96) } });
    const pageErrors: string[] = [];
    page.on('pageerror', (e) => pageErrors.push(e.message));
    const search = reportSearch({
      zoneId: zone.id,
      units,
      paper,
      ...(o.conditions ? o.conditions(units) : {}),
      ...(o.whatIf ?? {}),
    });
    await page.goto(`${server.origin}/${search}#token=${server.token}`);
    const timeout = o.timeoutMs ?? 180_000;
    try {
      await page.waitForFunction(
        () => {
          const state = document.querySelector('[data-report-state]')?.getAttribute('data-report-state');
          if (state === 'failed') return true;
          if (state !== 'ready') return false;
          return [...document.querySelectorAll('canvas[data-chart]')].every((c) => c.getAttribute('data-chart-ready') === 'true');
        },
        undefined,
        { timeout, polling: 100 },
      );
    } catch {
      throw new CliError(2, `The report did not finish within ${Math.round(timeout / 1000)} s${pageErrors.length ? `: ${pageErrors[0]}` : '.'}`);
    }
    const failure = await page.locator('[data-testid="report-failure"]').textContent({ timeout: 100 }).catch(() => null);
    if (failure) throw inputError(`${o.site}/${o.zone}: ${failure.trim()}`);
    if (pageErrors.length) throw new CliError(3, `internal error: the report page failed: ${pageErrors[0]} (please report this with the command you ran)`);
    const title = `Zone report · ${o.site} › ${o.zone}`;
    const m = REPORT_MARGINS_IN;
    const pdf = await page.pdf({
      format: paper === 'a4' ? 'A4' : 'Letter',
      printBackground: true,
      displayHeaderFooter: true,
      headerTemplate: REPORT_HEADER_TEMPLATE,
      footerTemplate: reportFooterTemplate(title),
      margin: { top: `${m.top}in`, right: `${m.right}in`, bottom: `${m.bottom}in`, left: `${m.left}in` },
      outline: true,
      tagged: true,
    });
    writeFileSync(o.out, pdf);
    return { file: o.out, paper, units, pages: pageCount(pdf), bytes: pdf.length };
  } finally {
    await browser?.close().catch(() => {});
    await server?.close();
    backend.close();
    rmSync(dataDir, { recursive: true, force: true });
  }
}
