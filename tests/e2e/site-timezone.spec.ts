/**
 * A site's time zone, set on the Sites and zones screen, as an auditor in New York works on a building
 * in Denver: the zone's log has ISO-8601 offsets (the demo's great-hall.csv, imported without a
 * mapping, names no time zone), so before the site's zone is set its times follow the browser's
 * (America/New_York here); after, its History shows times in America/Denver and its Setback plan is
 * laid out in Denver's days. The plan's figures are checked against `heatlag plan --db <the app's
 * database> --tz America/Denver --json`; the time shown against Intl's own formatting of the log's
 * first timestamp.
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { cli, demoDir, expect, fmt, root, screenshot, startHeatlag, test, type Heatlag } from './support.ts';

const SITE = 'Front Range Office';
const ZONE = 'Hall';
const DENVER = 'America/Denver';
const NEW_YORK = 'America/New_York';
const LOG = path.join(demoDir, 'great-hall.csv');
const SCHEDULE = path.join(root, 'assets', 'plans', 'great-hall.json');

// The auditor's computer.
test.use({ timezoneId: NEW_YORK });

let server: Heatlag;
test.beforeAll(async () => {
  server = await startHeatlag({ demo: false });
});
test.afterAll(async () => server.stop());

/** The log's first timestamp as Intl writes it in a zone, "YYYY-MM-DD HH:MM" (the app's format). */
function firstReadingIn(timeZone: string): string {
  const first = readFileSync(LOG, 'utf8').split('\n')[1]!.split(',')[0]!; // e.g. 2025-03-10T00:00:00+01:00
  const parts = Object.fromEntries(
    new Intl.DateTimeFormat('en-US', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit', hour: '2-digit', minute: '2-digit', hourCycle: 'h23' })
      .formatToParts(new Date(first))
      .map((p) => [p.type, p.value]),
  );
  return `${parts.year}-${parts.month}-${parts.day} ${parts.hour}:${parts.minute}`;
}

interface CliPlan {
  outdoor: { kind: string; weekStart: string; timeZone: string };
  week: { savedHeatHours: number; heatHours: number };
  days: Array<{ recoveries: Array<{ status: string; optimalStartLabel: string | null; occupancyLabel: string }> }>;
}

test("a site's time zone: set on the Sites screen, then the History and the Setback plan use it", async ({ page }) => {
  test.setTimeout(150_000);
  await page.goto(server.url);
  await expect(page.getByTestId('screen-sites')).toBeVisible();

  // A site and a zone, and the log imported into it.
  await page.getByTestId('new-site-name').fill(SITE);
  await page.getByTestId('create-site').click();
  await page.getByTestId('new-zone-name').fill(ZONE);
  await page.getByTestId('new-zone-name').press('Enter');
  await expect(page.getByTestId('zone-row')).toHaveCount(1);
  await page.getByTestId('zone-row').getByRole('button', { name: 'Import a log' }).click();
  await page.getByTestId('file-input').setInputFiles(LOG);
  await page.getByTestId('import-button').click();
  await expect(page.getByTestId('import-summary')).toBeVisible();

  // Before: the History is in this computer's time zone.
  await page.getByTestId('go-history').click();
  const history = page.getByTestId('screen-history');
  await expect(history.locator('.lede')).toContainText(`times in this computer's time zone (${NEW_YORK})`);
  const logRow = history.locator('tr', { hasText: 'great-hall.csv' });
  await expect(logRow.locator('td').nth(2)).toHaveText(firstReadingIn(NEW_YORK));

  // The Sites screen says the time zone is not set, and whose is used.
  await page.getByTestId('nav-sites').click();
  const note = page.getByTestId('site-tz-note');
  await expect(note).toHaveText(`Not set: times shown in this computer's time zone (${NEW_YORK}).`);
  await expect(page.locator(`#site-tz-list option[value="${DENVER}"]`)).toHaveCount(1);

  // A name that is not a time zone gets a plain message and changes nothing.
  const input = page.getByTestId('site-tz-input');
  await input.fill('Denver');
  await input.press('Enter');
  await expect(page.getByTestId('site-tz-problem')).toHaveText('“Denver” is not a time zone Heatlag knows: use an IANA name such as America/Denver or Europe/Berlin.');
  await expect(input).toHaveAttribute('aria-invalid', 'true');
  await expect(note).toContainText('Not set');
  await screenshot(page, 'site-timezone-invalid');

  // Set with the keyboard: type, Tab to the button, Enter.
  await input.fill(DENVER);
  await expect(page.getByTestId('site-tz-problem')).toHaveCount(0);
  await input.press('Tab');
  await expect(page.getByTestId('site-tz-save')).toBeFocused();
  await page.keyboard.press('Enter');
  await expect(page.getByTestId('sites-message')).toHaveText(`Time zone of “${SITE}” set to ${DENVER}: its zones' times and setback plans use it.`);
  await expect(note).toHaveText(`Times of its zones are shown and planned in ${DENVER}.`);
  await expect(input).toHaveValue(DENVER);
  await screenshot(page, 'site-timezone-sites');

  // After: the History is in the site's time zone.
  await page.getByTestId('zone-row').getByRole('button', { name: ZONE }).click();
  await expect(history.locator('.lede')).toContainText(`times in the site's time zone (${DENVER})`);
  await expect(logRow.locator('td').nth(2)).toHaveText(firstReadingIn(DENVER));
  expect(firstReadingIn(DENVER)).not.toBe(firstReadingIn(NEW_YORK));
  await screenshot(page, 'site-timezone-history');

  // The Setback plan: the weeks and the outdoor readings are taken in Denver's days.
  await page.getByTestId('nav-plan').click();
  await expect(page.getByTestId('fit-when')).toBeVisible(); // fitted on first need
  await expect(page.getByTestId('schedule-editor')).toBeVisible();
  await page.getByTestId('schedule-file').setInputFiles(SCHEDULE);
  await expect(page.getByTestId('plan-notice')).toContainText('Loaded great-hall.json');
  await expect(page.getByTestId('outdoor-history')).toBeChecked();
  await expect(page.locator('label[for="outdoor-week"]')).toHaveText(`Week (Monday to Sunday, ${DENVER})`);

  const db = path.join(server.dataDir, 'heatlag.db');
  const planIn = (tz: string) => cli<CliPlan>('plan', '--db', db, '--zone', `${SITE}/${ZONE}`, '--schedule', SCHEDULE, '--outdoor', 'history', '--tz', tz);
  const [denver, newYork] = await Promise.all([planIn(DENVER), planIn(NEW_YORK)]);
  expect(denver.outdoor.timeZone).toBe(DENVER);
  // The two zones give different weeks of outdoor readings, so matching Denver's figures means something.
  expect(denver.week.heatHours).not.toBe(newYork.week.heatHours);

  await expect(page.getByTestId('plan-status')).toHaveText('Up to date');
  await expect(page.getByTestId('plan-basis')).toContainText(`the log's outdoor readings for the week from ${denver.outdoor.weekStart} (${DENVER})`);
  await expect(page.getByTestId('fig-heat-saved').locator('.value')).toHaveText(`${fmt(denver.week.savedHeatHours, 1)} h`);
  for (let d = 0; d < denver.days.length; d++) {
    for (const r of denver.days[d]!.recoveries.filter((x) => x.status === 'met')) {
      await expect(page.getByTestId(`plan-day-${d}`).locator('td').nth(1)).toContainText(`heating starts ${r.optimalStartLabel!.slice(-5)}`);
    }
  }
  await screenshot(page, 'site-timezone-plan');

  // A log of local wall-clock times imported into the site is offered the site's time zone.
  await page.getByTestId('nav-sites').click();
  await page.getByTestId('new-zone-name').fill('Office');
  await page.getByTestId('new-zone-name').press('Enter');
  await page.getByTestId('zone-row').filter({ hasText: 'Office' }).getByRole('button', { name: 'Import a log' }).click();
  await page.getByTestId('file-input').setInputFiles(path.join(demoDir, 'office-annex.csv'));
  await expect(page.getByTestId('opt-timezone')).toHaveValue(DENVER);

  // Cleared: back to this computer's time zone.
  await page.getByTestId('nav-sites').click();
  await page.getByTestId('site-tz-clear').click();
  await expect(page.getByTestId('sites-message')).toHaveText(`Time zone of “${SITE}” cleared.`);
  await expect(note).toHaveText(`Not set: times shown in this computer's time zone (${NEW_YORK}).`);
  await expect(input).toHaveValue('');
});
