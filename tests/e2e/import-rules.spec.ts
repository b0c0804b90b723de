/**
 * Import and time zones, with the demo site present: a new site sorts above nothing by accident (the
 * demo is listed last), the add-zone form names its site; a log of local clock times on a site with no
 * time zone waits for one (nothing filled in silently, Import disabled), the typed zone is offered as
 * the site's, the header names the zone imported into, and the same file imported again adds no log,
 * says so, and shows the earlier import's time in the zone's time zone. The sidebar's selected zone
 * stays readable under the pointer.
 */
import path from 'node:path';
import { demoDir, expect, screenshot, startHeatlag, test, type Heatlag } from './support.ts';

let server: Heatlag;
test.beforeAll(async () => {
  server = await startHeatlag();
});
test.afterAll(async () => server.stop());

test('new site, a local-time log, its time zone, and a re-import that adds nothing', async ({ page }) => {
  await page.goto(server.url);
  await page.getByTestId('nav-sites').click();
  await page.getByTestId('new-site-name').fill('Annex building');
  await page.getByTestId('create-site').click();
  const card = page.getByTestId('site-card').filter({ hasText: 'Annex building' });
  await expect(card.getByTestId('new-zone-label')).toHaveText('Add a zone to Annex building');
  await card.getByTestId('new-zone-name').fill('Office');
  await card.getByTestId('create-zone').click();
  await expect(page.getByTestId('sites-message')).toContainText('Zone “Office” created');
  // The demo site is listed after the new one (sites by name, demo last).
  await expect(page.getByTestId('site-card').first()).toContainText('Annex building');
  await expect(page.locator('.side-site-name').first()).toContainText('Annex building');

  // Still on the demo's zone; import into the new one.
  await page.getByRole('navigation').getByRole('button', { name: 'Great Hall' }).click();
  await expect(page.getByTestId('current-zone')).toContainText('Great Hall');
  await page.getByTestId('nav-import').click();
  await page.getByTestId('import-zone').selectOption({ label: 'Annex building › Office' });
  const file = path.join(demoDir, 'office-annex.csv');
  await page.getByTestId('file-input').setInputFiles(file);
  await expect(page.getByTestId('preview-table')).toBeVisible();
  // Local clock times and no site time zone: nothing guessed, Import waits.
  await expect(page.getByTestId('opt-timezone')).toHaveValue('');
  await expect(page.getByTestId('tz-needed')).toBeVisible();
  await expect(page.getByTestId('import-button')).toBeDisabled();
  await page.getByTestId('opt-timezone').fill('Europe/Berlin');
  await expect(page.getByTestId('import-button')).toBeEnabled();
  await expect(page.getByTestId('offer-site-tz')).toContainText('Also make Europe/Berlin the time zone of Annex building');
  await expect(page.getByTestId('make-site-tz')).toBeChecked();
  await page.getByTestId('import-button').click();
  await expect(page.getByTestId('import-summary')).toBeVisible();
  await expect(page.getByTestId('current-zone')).toHaveText('Annex building › Office');

  // The same file again: nothing new, no log kept; the earlier import's time is local like the rest.
  await page.getByRole('button', { name: 'Import another file' }).click();
  await page.getByTestId('file-input').setInputFiles(file);
  await expect(page.getByTestId('opt-timezone')).toHaveValue('Europe/Berlin'); // the site's now
  await page.getByTestId('import-button').click();
  await expect(page.getByTestId('import-nothing-new')).toBeVisible();
  const notes = page.getByTestId('import-warnings');
  await expect(notes).toContainText('(Europe/Berlin)');
  await expect(notes).not.toContainText('UTC');
  await expect(notes).toContainText('it added no readings, so no log was added.');
  await screenshot(page, 'import-nothing-new');
  await page.getByTestId('go-history').click();
  await expect(page.getByTestId('screen-history').locator('table tbody tr')).toHaveCount(1);

  // The site now has the time zone typed for the log.
  await page.getByTestId('nav-sites').click();
  await expect(page.getByTestId('site-card').filter({ hasText: 'Annex building' }).getByTestId('site-tz-input')).toHaveValue('Europe/Berlin');
});

test('the selected zone in the sidebar stays readable under the pointer', async ({ page }) => {
  await page.goto(server.url);
  const link = page.getByRole('navigation').getByRole('button', { name: 'Great Hall' });
  await link.click();
  await link.hover();
  const [color, background] = await link.evaluate((el) => [getComputedStyle(el).color, getComputedStyle(el).backgroundColor]);
  expect(color).not.toBe(background);
  expect(background).not.toBe('rgba(0, 0, 0, 0)');
  // The text is the accent's dark ink, the background a light grey-blue (not the button hover's dark fill).
  const lum = (c: string) => { const [r, g, b] = c.match(/\d+/g)!.map(Number); return 0.2126 * r! + 0.7152 * g! + 0.0722 * b!; };
  expect(lum(background) - lum(color)).toBeGreaterThan(100);
});
