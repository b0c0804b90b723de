/**
 * First launch: a new database opens on the invented demo site, clearly labelled as demo data, with
 * the zone's history drawn; the reading counts shown match what the `heatlag import` command reads
 * from the same demo logs with the same mappings.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { cli, demoDir, expect, screenshot, startHeatlag, test, type Heatlag } from './support.ts';

let server: Heatlag;
test.beforeAll(async () => {
  server = await startHeatlag();
});
test.afterAll(async () => server.stop());

/** rowsAccepted of the demo log of `zone` imported by the CLI into a scratch database. */
async function cliCount(file: string, mapping: string): Promise<number> {
  const dir = mkdtempSync(path.join(tmpdir(), 'heatlag-cli-'));
  try {
    const r = await cli<{ rowsAccepted: number }>('import', path.join(demoDir, file), '--db', path.join(dir, 'x.db'), '--zone', 'Demo/Zone', '--columns', path.join(demoDir, mapping));
    return r.rowsAccepted;
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

test('opens the demo site, labelled as invented, on a zone history with the right reading count', async ({ page }) => {
  await page.goto(server.url);
  await expect(page.getByTestId('demo-badge')).toHaveText(/invented data/);
  await expect(page.getByTestId('current-zone')).toContainText('Kestelbrück Community House › Café Kitchen');
  await expect(page.getByTestId('screen-history')).toBeVisible();
  // The token left the address bar once read.
  expect(page.url()).not.toContain('token=');

  const expected = await cliCount('cafe-kitchen.tsv', 'cafe-kitchen.mapping.json');
  await expect(page.getByTestId('history-count')).toHaveText(expected.toLocaleString('en-US'));
  await expect(page.getByTestId('history-chart').locator('canvas')).toBeVisible();
  await screenshot(page, 'history');

  // Every demo zone is listed with its readings.
  await page.getByTestId('nav-sites').click();
  await expect(page.getByTestId('site-card')).toHaveCount(1);
  await expect(page.getByTestId('site-card')).toContainText('demo: invented data');
  const rows = page.getByTestId('zone-row');
  await expect(rows).toHaveCount(3);
  const greatHall = await cliCount('great-hall.csv', 'great-hall.mapping.json');
  await expect(rows.filter({ hasText: 'Great Hall' })).toContainText(greatHall.toLocaleString('en-US'));
  await screenshot(page, 'sites');
});

test('the history chart zooms to the last day and back, and is reachable by keyboard', async ({ page }) => {
  await page.goto(server.url);
  await page.getByRole('button', { name: 'Great Hall' }).click();
  await expect(page.getByTestId('screen-history')).toBeVisible();
  await page.getByRole('button', { name: 'Last day' }).click();
  await screenshot(page, 'history-last-day');
  await page.getByRole('button', { name: 'All', exact: true }).click();
  // Keyboard: the chart takes focus and pans with the arrow keys without errors.
  const canvas = page.getByTestId('history-chart').locator('canvas');
  await canvas.focus();
  await page.keyboard.press('+');
  await page.keyboard.press('ArrowLeft');
  await expect(canvas).toBeFocused();
});

test('reads well on a 4K screen', async ({ browser }) => {
  const context = await browser.newContext({ viewport: { width: 1920, height: 1080 }, deviceScaleFactor: 2, locale: 'en-US', timezoneId: 'Europe/Berlin' });
  const page = await context.newPage();
  const errors: string[] = [];
  page.on('console', (m) => m.type() === 'error' && errors.push(m.text()));
  await page.goto(server.url);
  await expect(page.getByTestId('screen-history')).toBeVisible();
  await expect(page.getByTestId('history-chart').locator('canvas')).toBeVisible();
  await screenshot(page, 'history-4k');
  expect(errors).toEqual([]);
  await context.close();
});
