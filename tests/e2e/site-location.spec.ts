/**
 * A site's location, set on the Sites and zones screen: an out-of-range latitude is refused with a
 * message and nothing is saved; a valid one is kept after a reload, and the zone's next fit (the same
 * database through `heatlag fit --db … --json`) carries a solar term with an interval. Demo site
 * (invented Kestelbrück Community House).
 */
import path from 'node:path';
import { cli, expect, startHeatlag, test, type Heatlag } from './support.ts';

let server: Heatlag;
test.beforeAll(async () => {
  server = await startHeatlag();
});
test.afterAll(async () => server.stop());

test('site location: refused out of range, saved and used by the fit', async ({ page }) => {
  await page.goto(server.url);
  await page.getByTestId('nav-sites').click();
  const form = page.getByTestId('site-loc-form').first();
  await form.getByTestId('site-lat-input').fill('95');
  await form.getByTestId('site-lon-input').fill('13.4');
  await form.getByTestId('site-loc-save').click();
  await expect(form.getByTestId('site-loc-problem')).toContainText('latitude must be a number of degrees from -90 to 90');
  await form.getByTestId('site-lat-input').fill('52.52');
  await form.getByTestId('site-loc-save').click();
  await expect(form.getByTestId('site-loc-note')).toContainText('At 52.5200°, 13.4000°');
  await page.reload();
  await page.getByTestId('nav-sites').click();
  await expect(page.getByTestId('site-loc-note').first()).toContainText('At 52.5200°, 13.4000°');

  const fit = await cli<{ solarGainPerHour: number | null; solarGainPerHourCI: [number, number] | null }>(
    'fit', '--db', path.join(server.dataDir, 'heatlag.db'), '--zone', 'Kestelbrück Community House/Great Hall', '--units', 'C',
  );
  expect(fit.solarGainPerHour).not.toBeNull();
  expect(fit.solarGainPerHourCI).not.toBeNull();
});
