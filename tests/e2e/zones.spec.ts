/**
 * Sites and zones: create, rename, delete with a confirmation that says what goes with it (checked
 * against the `heatlag import` command's count for the same log).
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { cli, demoDir, expect, screenshot, startHeatlag, test, type Heatlag } from './support.ts';

let server: Heatlag;
test.beforeAll(async () => {
  server = await startHeatlag({ demo: false });
});
test.afterAll(async () => server.stop());

test('create a site and a zone, rename the zone, import into it, delete with counts', async ({ page }) => {
  await page.goto(server.url);
  await expect(page.getByTestId('screen-sites')).toBeVisible();
  await expect(page.getByText('No sites yet')).toBeVisible();

  await page.getByTestId('new-site-name').fill('Elm Road Library');
  await page.getByTestId('create-site').click();
  await expect(page.getByTestId('sites-message')).toContainText('Site “Elm Road Library” created');
  await page.getByTestId('new-zone-name').fill('Reading room');
  await page.getByTestId('new-zone-name').press('Enter');
  await expect(page.getByTestId('zone-row')).toHaveCount(1);
  await expect(page.getByRole('navigation').getByRole('button', { name: 'Reading room' })).toBeVisible();

  // A second zone of the same name is refused with a plain message.
  await page.getByTestId('new-zone-name').fill('reading room');
  await page.getByTestId('create-zone').click();
  await expect(page.getByTestId('sites-message')).toContainText('already');

  // Rename.
  await page.getByTestId('zone-row').getByRole('button', { name: 'Rename' }).click();
  await page.getByTestId('rename-input').fill('Reading Room East');
  await page.getByTestId('rename-input').press('Enter');
  await expect(page.getByTestId('zone-row')).toContainText('Reading Room East');
  await screenshot(page, 'sites-created');

  // Import a log into it.
  await page.getByTestId('zone-row').getByRole('button', { name: 'Import a log' }).click();
  await page.getByTestId('file-input').setInputFiles(path.join(demoDir, 'great-hall.csv'));
  await page.getByTestId('import-button').click();
  await expect(page.getByTestId('import-summary')).toBeVisible();
  const dir = mkdtempSync(path.join(tmpdir(), 'heatlag-cli-'));
  const fromCli = await cli<{ rowsAccepted: number }>('import', path.join(demoDir, 'great-hall.csv'), '--db', path.join(dir, 'x.db'), '--zone', 'A/B');
  rmSync(dir, { recursive: true, force: true });
  await expect(page.getByTestId('rows-accepted')).toHaveText(fromCli.rowsAccepted.toLocaleString('en-US'));

  // Delete the zone: the confirmation counts what goes with it.
  await page.getByTestId('nav-sites').click();
  await page.getByTestId('delete-zone').click();
  const dialog = page.getByTestId('confirm-dialog');
  await expect(dialog).toBeVisible();
  await expect(page.getByTestId('delete-counts')).toHaveText(
    `This also deletes 1 imported log, ${fromCli.rowsAccepted.toLocaleString('en-US')} readings, 0 fitted responses.`,
  );
  await screenshot(page, 'sites-delete-confirm');
  // Escape cancels; nothing is deleted.
  await page.keyboard.press('Escape');
  await expect(dialog).toBeHidden();
  await expect(page.getByTestId('zone-row')).toHaveCount(1);
  await page.getByTestId('delete-zone').click();
  await page.getByTestId('confirm-button').click();
  await expect(page.getByTestId('sites-message')).toContainText('Zone “Reading Room East” deleted');
  await expect(page.getByTestId('zone-row')).toHaveCount(0);

  // Delete the site.
  await page.getByTestId('delete-site').click();
  await expect(page.getByTestId('delete-counts')).toHaveText('This also deletes 0 zones, 0 imported logs, 0 readings, 0 fitted responses.');
  await page.getByTestId('confirm-button').click();
  await expect(page.getByTestId('site-card')).toHaveCount(0);
});
