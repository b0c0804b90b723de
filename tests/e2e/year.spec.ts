/**
 * A year of 5-minute readings (105 120 rows, invented for this test): the import shows real
 * progress, the count matches the CLI's, and the history chart draws it decimated and zooms by
 * keyboard. Timings are printed as figures, not asserted.
 */
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { cli, expect, screenshot, startHeatlag, test, type Heatlag } from './support.ts';

let server: Heatlag;
let scratch: string;
let file: string;
test.beforeAll(async () => {
  server = await startHeatlag({ demo: false });
  scratch = mkdtempSync(path.join(tmpdir(), 'heatlag-year-'));
  file = path.join(scratch, 'year-5min.csv');
  // Invented: a daily swing around 20 °C, outdoor with a daily and a yearly cycle, runtime in seconds.
  const lines = ['timestamp,zone_temp_C,outside_temp_C,heat_setpoint_C,heat_run_seconds'];
  const t0 = Date.UTC(2024, 0, 1);
  for (let i = 0; i < 365 * 288; i++) {
    const d = i / 288;
    const outdoor = 5 + 6 * Math.sin(2 * Math.PI * (d - 0.3)) - 10 * Math.cos((2 * Math.PI * d) / 365);
    const indoor = 20 + 0.8 * Math.sin(2 * Math.PI * d * 3);
    lines.push([new Date(t0 + i * 300_000).toISOString().replace('.000Z', 'Z'), indoor.toFixed(1), outdoor.toFixed(1), '20.0', String((i * 37) % 301)].join(','));
  }
  writeFileSync(file, lines.join('\n') + '\n');
});
test.afterAll(async () => {
  await server.stop();
  rmSync(scratch, { recursive: true, force: true });
});

test('a year of 5-minute data imports with a progress bar and draws fluidly', async ({ page }) => {
  await page.goto(server.url);
  await page.getByTestId('new-site-name').fill('Year test');
  await page.getByTestId('create-site').click();
  await page.getByTestId('new-zone-name').fill('Zone');
  await page.getByTestId('create-zone').click();
  await page.getByTestId('nav-import').click();
  await page.getByTestId('file-input').setInputFiles(file);
  await expect(page.getByTestId('preview-table')).toBeVisible();

  // Record every value the progress bar shows.
  await page.evaluate(() => {
    const seen: number[] = [];
    (window as unknown as { seen: number[] }).seen = seen;
    new MutationObserver(() => {
      const bar = document.querySelector<HTMLProgressElement>('#import-progress-bar');
      if (bar) seen.push(bar.value);
    }).observe(document.body, { subtree: true, childList: true, attributes: true, attributeFilter: ['value'] });
  });
  const started = Date.now();
  await page.getByTestId('import-button').click();
  await expect(page.getByTestId('import-summary')).toBeVisible({ timeout: 60_000 });
  const importMs = Date.now() - started;
  const seen = await page.evaluate(() => (window as unknown as { seen: number[] }).seen);
  // The bar was shown; that its values come from the importer, chunk by chunk, is checked in tests/app/imports.test.ts.
  expect(seen.length, 'the progress bar was shown').toBeGreaterThan(0);

  const fromCli = await cli<{ rowsAccepted: number }>('import', file, '--db', path.join(scratch, 'y.db'), '--zone', 'A/B');
  expect(fromCli.rowsAccepted).toBe(105_120);
  await expect(page.getByTestId('rows-accepted')).toHaveText('105,120');

  const t1 = Date.now();
  await page.getByTestId('go-history').click();
  await expect(page.getByTestId('history-count')).toHaveText('105,120');
  await expect(page.getByTestId('history-chart').locator('canvas')).toBeVisible();
  const drawMs = Date.now() - t1;
  const canvas = page.getByTestId('history-chart').locator('canvas');
  await canvas.focus();
  const t2 = Date.now();
  for (let i = 0; i < 5; i++) await page.keyboard.press('+');
  for (let i = 0; i < 5; i++) await page.keyboard.press('ArrowLeft');
  const zoomMs = (Date.now() - t2) / 10;
  // Runtime bins follow the zoom (core/history.ts runtimeBinHours): about four months on ~900 px is
  // 3.2 h a pixel, so 12-hour bins (3.75 px); the whole year gets daily bins.
  await expect(page.getByTestId('history-runtime-note')).toContainText('share of each 12-hour period');
  await screenshot(page, 'history-year-zoomed');
  await page.getByRole('button', { name: 'All', exact: true }).click();
  await expect(page.getByTestId('history-runtime-note')).toContainText('share of each day');
  await screenshot(page, 'history-year');
  console.log(`year of 5-min data: import ${importMs} ms (${seen.length} progress updates), history shown in ${drawMs} ms, ${zoomMs.toFixed(0)} ms per zoom or pan step`);
});
