/**
 * The zone report as a person hands it over.
 *
 * 1. `heatlag report` prints the demo's Great Hall (with its schedule saved) to PDF through headless
 *    Chromium; poppler's pdftotext reads the text layer back and it holds the command line's own
 *    figures (`heatlag fit --json`, `heatlag recovery --json`, `heatlag plan --json`); pdftoppm turns
 *    the pages into PNGs (test-results/screens/report-page-N.png) and pdfinfo says Letter.
 * 2. In the app, the Recovery screen's "what if" (heating output +50 %) matches the closed form of the
 *    lumped model with h scaled by 1.5 (t = τ·ln((T_eq − T0)/(T_eq − T1)), T_eq = T_out + (h + g)·τ,
 *    derived from the linear first-order ODE); the report screen carries it, prints on A4 through the
 *    same print stylesheet with no app chrome, and exports a chart as PNG at three times its size and
 *    the recovery table as CSV with units in the header.
 */
import { execFile } from 'node:child_process';
import { mkdirSync, mkdtempSync, readFileSync, readdirSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { promisify } from 'node:util';
import Papa from 'papaparse';
import { cli, expect, fmt, fmtDuration, root, screensDir, screenshot, startHeatlag, test, type Heatlag } from './support.ts';

const run = promisify(execFile);
let server: Heatlag;
let scratch: string;
test.beforeAll(async () => {
  server = await startHeatlag();
  scratch = mkdtempSync(path.join(tmpdir(), 'heatlag-report-e2e-'));
});
test.afterAll(async () => {
  await server.stop();
  rmSync(scratch, { recursive: true, force: true });
});

const ZONE = 'Kestelbrück Community House/Great Hall';
const pdftotext = async (file: string) => (await run('pdftotext', ['-layout', file, '-'], { maxBuffer: 16 * 1024 * 1024 })).stdout;
const pdfinfo = async (file: string) => (await run('pdfinfo', [file])).stdout;
/** Width and height of a PNG from its IHDR chunk (PNG specification, ISO/IEC 15948 §11.2.2). */
const pngSize = (b: Buffer) => ({ width: b.readUInt32BE(16), height: b.readUInt32BE(20) });
/** pdftotext -layout keeps columns apart with runs of spaces and wraps paragraphs: one space for all. */
const squash = (s: string) => s.replace(/\s+/g, ' ');
const escape = (s: string) => s.replace(/[.*+?^${}()|[\]\\]/g, '\\$&');

test('heatlag report prints the Great Hall with the command line’s figures', async ({ page }) => {
  // Save the demo's schedule for the Great Hall through the API, as the Setback plan screen does.
  await page.goto(server.url);
  const token = server.token;
  const schedule = JSON.parse(readFileSync(path.join(root, 'assets', 'plans', 'great-hall.json'), 'utf8')) as unknown;
  const saved = await page.evaluate(async ({ token, schedule }) => {
    const call = async (method: string, body: unknown) =>
      (await (await fetch(`./api/${method}`, { method: 'POST', headers: { 'content-type': 'application/json', 'x-heatlag-token': token }, body: JSON.stringify(body) })).json()) as { ok: boolean; value: any };
    const sites = await call('listSites', {});
    const zone = sites.value.flatMap((s: any) => s.zones).find((z: any) => z.name === 'Great Hall');
    return call('saveSchedules', { entries: [{ zoneId: zone.id, schedule }] });
  }, { token, schedule });
  expect(saved.ok).toBe(true);

  const db = path.join(server.dataDir, 'heatlag.db');
  const out = path.join(scratch, 'great-hall.pdf');
  const made = await cli<{ file: string; paper: string; units: string; pages: number }>(
    'report', '--db', db, '--zone', ZONE, '--out', out, '--from', '58', '--to', '68', '--outdoor', '20', '--units', 'F',
  );
  expect(made).toMatchObject({ file: out, paper: 'letter', units: 'F' });
  expect(made.pages).toBeGreaterThanOrEqual(4);
  // US Letter is 612 × 792 pt (8.5 × 11 in at 72 pt/in).
  expect(await pdfinfo(out)).toMatch(/Page size:\s+612 x 792 pts \(letter\)/);
  expect(await pdfinfo(out)).toMatch(new RegExp(`Pages:\\s+${made.pages}\\b`));

  const [fit, rec, plan] = await Promise.all([
    cli<{ timeConstantHours: number; timeConstantHoursCI: [number, number]; heatingRatePerHour: number; heatingRatePerHourCI: [number, number]; heatingLift: number }>(
      'fit', '--db', db, '--zone', ZONE, '--units', 'F',
    ),
    cli<{ recoveryHours: number; equilibrium: number }>('recovery', '--db', db, '--zone', ZONE, '--from', '58', '--to', '68', '--outdoor', '20', '--units', 'F'),
    cli<{ equipment: { uaWPerK: number }; week: { heatHours: number; baselineHeatHours: number } }>(
      'plan', '--db', db, '--zone', ZONE, '--schedule', path.join(root, 'assets', 'plans', 'great-hall.json'),
    ),
  ]);

  const layout = await pdftotext(out);
  const text = squash(layout);
  // The fitted response, as `heatlag fit --json` gives it (rounded as printed: τ 0.1 h, rates 0.01 °F/h).
  expect(text).toContain(`Time constant τ ${fmt(fit.timeConstantHours, 1)} h ${fmt(fit.timeConstantHoursCI[0], 1)} – ${fmt(fit.timeConstantHoursCI[1], 1)} h`);
  expect(text).toContain(`Heating rate h ${fmt(fit.heatingRatePerHour, 2)} °F/h ${fmt(fit.heatingRatePerHourCI[0], 2)} – ${fmt(fit.heatingRatePerHourCI[1], 2)} °F/h`);
  expect(text).toContain(`Heating lift h·τ ${fmt(fit.heatingLift, 1)} °F`);
  // The recovery, as `heatlag recovery --json` gives it: the headline, the sentence and the table's
  // 20 °F row under the 10 °F setback (from 58 °F to 68 °F: the same recovery).
  const duration = fmtDuration(rec.recoveryHours);
  expect(text).toContain(`reaches the target in ${duration}`);
  expect(text).toContain(`level off at ${fmt(rec.equilibrium, 1)} °F`);
  const row20 = layout.split('\n').find((l) => l.trim().startsWith('20 °F '));
  expect(row20, 'the 20 °F row of the recovery table').toBeDefined();
  expect(row20!).toMatch(new RegExp(`\\s{2}${escape(duration)}(\\s|$)`));
  // The plan and the envelope, as `heatlag plan --json` gives them.
  expect(text).toContain(`${fmt(plan.equipment.uaWPerK, 0)} W/K`);
  expect(text).toContain(`Heating runtime: ${fmt(plan.week.heatHours, 1)} h with the setback, ${fmt(plan.week.baselineHeatHours, 1)} h without`);
  // The log's quality, the cautions, the method and the note on estimates; no app chrome.
  expect(text).toContain('7,992 from 1 log (great-hall.csv)');
  expect(text).toMatch(/Gaps 1 longer than 60 min/);
  expect(text).toContain('Demo site: these readings are invented');
  expect(text).toContain('Cautions');
  expect(text).toContain('Sun through windows, occupants');
  expect(text).toContain('They defer to local codes and licensed HVAC professionals.');
  expect(text).toMatch(/Page 1 of \d/);
  expect(text).not.toContain('Sites and zones');
  expect(text).not.toContain('Quick estimate');

  // Every page as a PNG for a person to look at.
  mkdirSync(screensDir, { recursive: true });
  for (const f of readdirSync(screensDir)) if (/^report-page-\d+\.png$/.test(f)) rmSync(path.join(screensDir, f));
  await run('pdftoppm', ['-r', '80', '-png', out, path.join(screensDir, 'report-page')]);
  const pngs = readdirSync(screensDir).filter((f) => /^report-page-\d+\.png$/.test(f));
  expect(pngs).toHaveLength(made.pages);
  for (const f of pngs) {
    const b = readFileSync(path.join(screensDir, f));
    // 8.5 × 11 in at 80 dpi = 680 × 880 px; a page of text and charts is far from blank (> 20 kB).
    expect(pngSize(b)).toEqual({ width: 680, height: 880 });
    expect(statSync(path.join(screensDir, f)).size).toBeGreaterThan(20_000);
  }
});

test('what if on the Recovery screen, then the report on A4 with its exports', async ({ page }) => {
  await page.goto(server.url);
  await page.getByRole('navigation').getByRole('button', { name: 'Office Annex' }).click();
  await page.getByTestId('nav-recovery').click();
  // The screen fits the zone on first need when it has no current fit.
  await expect(page.getByTestId('fit-when')).toBeVisible();
  await expect(page.getByTestId('rec-time')).toBeVisible();

  const db = path.join(server.dataDir, 'heatlag.db');
  const zone = 'Kestelbrück Community House/Office Annex';
  const fit = await cli<{ timeConstantHours: number; heatingRatePerHour: number; gainPerHour: number }>('fit', '--db', db, '--zone', zone, '--units', 'C');
  const { timeConstantHours: tau, heatingRatePerHour: h, gainPerHour: g } = fit;

  await page.getByTestId('rec-start').fill('15');
  await page.getByTestId('rec-target').fill('21');
  await page.getByTestId('rec-outdoor').fill('-8');
  const closed = (hRate: number, tauH: number) => {
    const teq = -8 + (hRate + g) * tauH;
    return tauH * Math.log((teq - 15) / (teq - 21));
  };
  await expect(page.getByTestId('rec-time')).toHaveText(fmtDuration(closed(h, tau)));
  await page.getByTestId('whatif-bigger').click();
  await expect(page.getByTestId('whatif-capacity')).toHaveText('150 %');
  await expect(page.getByTestId('whatif-today-time')).toHaveText(fmtDuration(closed(h, tau)));
  await expect(page.getByTestId('whatif-time')).toHaveText(fmtDuration(closed(1.5 * h, tau))); // h·1.5, τ unchanged
  await page.getByTestId('whatif-insulate').click();
  await expect(page.getByTestId('whatif-tau')).toHaveText(`${fmt(tau / 0.75, 1)} h`); // τ = C/UA with UA·0.75
  await expect(page.getByTestId('whatif-time')).toHaveText(fmtDuration(closed(h, tau / 0.75)));
  await screenshot(page, 'recovery-what-if');

  // The chart's PNG is drawn at three device pixels per CSS pixel.
  const box = await page.getByTestId('whatif-chart').locator('canvas').boundingBox();
  const pngAt = page.waitForEvent('download');
  await page.getByTestId('whatif-png').click();
  const png = await pngAt;
  expect(png.suggestedFilename()).toBe('kestelbruck-community-house-office-annex-what-if.png');
  const size = pngSize(readFileSync((await png.path())!));
  expect(Math.abs(size.width - box!.width * 3)).toBeLessThanOrEqual(3); // chart.js rounds the CSS size

  // To the report, with the comparison.
  await page.getByTestId('whatif-report').click();
  await expect(page.getByTestId('screen-report')).toBeVisible();
  const report = page.getByTestId('report');
  await expect(report.getByTestId('report-tau')).toHaveText(`${fmt(tau, 1)} h`);
  await expect(report.getByTestId('report-recovery')).toHaveText(fmtDuration(closed(h, tau)));
  await expect(report.getByTestId('report-whatif-recovery')).toHaveText(fmtDuration(closed(h, tau / 0.75)));
  await page.getByTestId('paper-a4').check();
  // The overlay, the recovery backtest, the recovery and the night-without-heat charts (no schedule saved: no plan chart).
  await expect(page.locator('canvas[data-chart][data-chart-ready="true"]')).toHaveCount(4);
  await screenshot(page, 'report-screen');

  // The recovery table as CSV: header units, and the −10 °C row under the 6 K setback (from 15 °C).
  const csvAt = page.waitForEvent('download');
  await page.getByTestId('export-recovery-csv').click();
  const csvText = readFileSync((await (await csvAt).path())!, 'utf8');
  expect(csvText.startsWith('\ufeffOutdoor (°C),1 K setback from 20 °C to 21 °C: recovery (h),')).toBe(true);
  const csv = Papa.parse<string[]>(csvText.replace(/^\ufeff/, '').trim()).data;
  const col = csv[0]!.findIndex((c) => c.startsWith('6 K setback from 15 °C'));
  expect(col).toBeGreaterThan(0);
  const row = csv.find((r) => r[0] === '-10')!;
  const teq = -10 + (h + g) * tau;
  expect(Number(row[col])).toBeCloseTo(tau * Math.log((teq - 15) / (teq - 21)), 3); // closed form, 4 decimals in the file

  // Printed through the print stylesheet on A4: the report only, no app chrome.
  const pdfFile = path.join(scratch, 'office-annex.pdf');
  writeFileSync(pdfFile, await page.pdf({ format: 'A4', printBackground: true, preferCSSPageSize: true }));
  // ISO A4 is 210 × 297 mm = 595.28 × 841.89 pt; Chromium rounds the page to whole CSS pixels (±0.5 pt).
  const a4 = /Page size:\s+([\d.]+) x ([\d.]+) pts \(A4\)/.exec(await pdfinfo(pdfFile));
  expect(a4).not.toBeNull();
  expect(Math.abs(Number(a4![1]) - 595.28)).toBeLessThan(0.5);
  expect(Math.abs(Number(a4![2]) - 841.89)).toBeLessThan(0.5);
  await run('pdftoppm', ['-r', '60', '-png', pdfFile, path.join(screensDir, 'report-a4-page')]);
  const text = squash(await pdftotext(pdfFile));
  expect(text).toContain(`Time constant τ ${fmt(tau, 1)} h`);
  expect(text).toContain('What if');
  expect(text).not.toContain('Sites and zones');
  expect(text).not.toContain('Paper');
  expect(text).not.toContain('Print or save as PDF');
});
