/**
 * The browser's time zone in browser mode: the server runs with TZ=UTC, the page in Asia/Tokyo (the
 * auditor's laptop), and the zone names no time zone of its own (the invented demo's great-hall.csv
 * has ISO-8601 offsets and no zone name; its site's zone is not set). The Setback plan must lay the
 * weeks out in the browser's zone, as the page shows times, not in the server computer's: its figures
 * are checked against `heatlag plan --db … --tz Asia/Tokyo --json`. Then the week shown follows the
 * zone: a week chosen for one zone is not kept when another zone is opened.
 */
import path from 'node:path';
import { cli, demoDir, expect, fmt, root, screenshot, startHeatlag, test, type Heatlag } from './support.ts';

const SITE = 'Harbour Depot';
const BROWSER = 'Asia/Tokyo';
const LOG = path.join(demoDir, 'great-hall.csv');
const SCHEDULE = path.join(root, 'assets', 'plans', 'great-hall.json');

test.use({ timezoneId: BROWSER });

let server: Heatlag;
test.beforeAll(async () => {
  server = await startHeatlag({ demo: false, env: { TZ: 'UTC' } });
});
test.afterAll(async () => server.stop());

interface CliPlan {
  outdoor: { kind: string; weekStart: string; timeZone: string };
  week: { savedHeatHours: number };
}

test("the Setback plan of a zone without a time zone uses the browser's, and its week follows the zone", async ({ page }) => {
  test.setTimeout(180_000);
  await page.goto(server.url);
  await page.getByTestId('new-site-name').fill(SITE);
  await page.getByTestId('create-site').click();
  for (const zone of ['North', 'South']) {
    await page.getByTestId('new-zone-name').fill(zone);
    await page.getByTestId('new-zone-name').press('Enter');
    await page.getByTestId('zone-row').filter({ hasText: zone }).getByRole('button', { name: 'Import a log' }).click();
    await page.getByTestId('file-input').setInputFiles(LOG);
    await page.getByTestId('import-button').click();
    await expect(page.getByTestId('import-summary')).toBeVisible();
    await page.getByTestId('nav-sites').click();
  }
  await expect(page.getByTestId('site-tz-note')).toHaveText(`Not set: times shown in this computer's time zone (${BROWSER}).`);

  // North: the weeks and the plan in Tokyo's days, the figures those of the command line in Tokyo.
  await page.getByTestId('zone-row').filter({ hasText: 'North' }).getByRole('button', { name: 'North' }).click();
  await page.getByTestId('nav-plan').click();
  // One fit rule: the zone is fitted on first need.
  await expect(page.getByTestId('fit-when')).toContainText('Response fitted', { timeout: 60_000 });
  await page.getByTestId('schedule-file').setInputFiles(SCHEDULE);
  await expect(page.getByTestId('outdoor-history')).toBeChecked();
  await expect(page.locator('label[for="outdoor-week"]')).toHaveText(`Week (Monday to Sunday, ${BROWSER})`);
  const db = path.join(server.dataDir, 'heatlag.db');
  const planIn = (tz: string, week?: string) =>
    cli<CliPlan>('plan', '--db', db, '--zone', `${SITE}/North`, '--schedule', SCHEDULE, ...(week ? ['--week', week] : []), '--tz', tz);
  const [tokyo, utc] = await Promise.all([planIn(BROWSER), planIn('UTC')]);
  expect(tokyo.outdoor.timeZone).toBe(BROWSER);
  // Different zones give different weeks of readings: matching Tokyo's figures means something.
  expect(tokyo.week.savedHeatHours).not.toBe(utc.week.savedHeatHours);
  await expect(page.getByTestId('plan-status')).toHaveText('Up to date');
  await expect(page.getByTestId('plan-basis')).toContainText(`the week from ${tokyo.outdoor.weekStart} (${BROWSER})`);
  await expect(page.getByTestId('fig-heat-saved').locator('.value')).toHaveText(`${fmt(tokyo.week.savedHeatHours, 1)} h`);

  // An earlier week chosen for North …
  const week = page.getByTestId('outdoor-week');
  const older = await week.locator('option:not([disabled])').nth(2).getAttribute('value');
  expect(older).toMatch(/^\d{4}-\d{2}-\d{2}$/);
  await week.selectOption(older!);
  await expect(page.getByTestId('plan-basis')).toContainText(`the week from ${older} (${BROWSER})`);
  await screenshot(page, 'browser-time-zone-plan');

  // … is not the week shown for South: it opens on its own latest week.
  await page.locator('.zone-link', { hasText: 'South' }).click();
  await expect(page.getByTestId('current-zone')).toHaveText(`${SITE} › South`);
  // One fit rule: the zone is fitted on first need.
  await expect(page.getByTestId('fit-when')).toContainText('Response fitted', { timeout: 60_000 });
  await page.getByTestId('schedule-file').setInputFiles(SCHEDULE);
  await expect(week).toHaveValue('');
  await expect(page.getByTestId('plan-status')).toHaveText('Up to date');
  await expect(page.getByTestId('plan-basis')).toContainText(`the week from ${tokyo.outdoor.weekStart} (${BROWSER})`);
});
