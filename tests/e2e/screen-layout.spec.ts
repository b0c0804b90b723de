/**
 * Layout an auditor can use: on the Setback plan the floating prediction bar never covers a row of the
 * day table, however the page is scrolled to it (a jump straight to a row, as the keyboard, find in
 * page or a screen reader makes, as well as the wheel); on the Site timeline the week's day cells are
 * big enough to read and click (about 28 × 24 px at least, a readable label) and a click on one shows
 * that day, as the day buttons above do.
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import type { Locator } from '@playwright/test';
import { callApi, expect, root, screenshot, startHeatlag, test, type Heatlag } from './support.ts';

const SITE = 'Kestelbrück Community House';

let server: Heatlag;
test.beforeAll(async () => {
  server = await startHeatlag();
});
test.afterAll(async () => server.stop());

const api = <T>(method: string, input: unknown): Promise<T> => callApi<T>(server, method, input);

async function zoneId(name: string): Promise<number> {
  const sites = await api<Array<{ name: string; zones: Array<{ id: number; name: string }> }>>('listSites', {});
  const z = sites.find((s) => s.name === SITE)?.zones.find((x) => x.name === name);
  if (!z) throw new Error(`no zone ${name}`);
  return z.id;
}

/** Where a row is on screen, what is drawn at its centre, and where the floating bar is (null: not shown). */
function rowAndBar(row: Locator) {
  return row.evaluate((el) => {
    const r = el.getBoundingClientRect();
    const hit = document.elementFromPoint(r.left + r.width / 2, r.top + r.height / 2);
    const bar = document.querySelector('[data-testid="plan-sticky"]');
    const b = bar ? bar.getBoundingClientRect() : null;
    return {
      inView: r.top >= -1 && r.bottom <= window.innerHeight + 1,
      centreIsRow: hit !== null && el.contains(hit),
      overlap: b !== null && r.bottom > b.top && r.top < b.bottom && r.right > b.left && r.left < b.right,
    };
  });
}

test('setback plan: the floating prediction bar never covers a row of the day table', async ({ page }) => {
  await page.setViewportSize({ width: 1280, height: 800 });
  await page.goto(server.url);
  await page.getByRole('navigation').getByRole('button', { name: 'Office Annex' }).click();
  await page.getByTestId('nav-plan').click();
  await expect(page.getByTestId('plan-status')).toHaveText('Up to date', { timeout: 60_000 });
  const rows = page.getByTestId('plan-days').locator('tbody tr');
  await expect(rows).toHaveCount(8); // seven days and the week
  const bar = page.getByTestId('plan-sticky');
  await expect(bar).toBeVisible();
  await page.screenshot({ path: path.join(root, 'test-results', 'screens', 'plan-sticky-bar.png') });

  for (let i = 0; i < 8; i++) {
    // At the top of the screen the results are out of sight below: the bar sums them up.
    await page.evaluate(() => window.scrollTo(0, 0));
    await expect(bar).toBeVisible();
    // A jump straight to the row, with the row at the bottom edge of the window, where the bar floats.
    await rows.nth(i).evaluate((el) => el.scrollIntoView({ block: 'end' }));
    await expect.poll(() => rowAndBar(rows.nth(i)), { message: `row ${i} of the day table` }).toEqual({ inView: true, centreIsRow: true, overlap: false });
  }

  // Scrolled down with the wheel from the top, a little at a time: no row is ever under the bar.
  await page.evaluate(() => window.scrollTo(0, 0));
  await expect(bar).toBeVisible();
  await page.mouse.move(640, 400);
  for (let step = 0; step < 40; step++) {
    await page.mouse.wheel(0, 120);
    await page.evaluate(() => new Promise<void>((r) => requestAnimationFrame(() => requestAnimationFrame(() => r()))));
    for (let i = 0; i < 8; i++) {
      const seen = await rowAndBar(rows.nth(i));
      if (seen.inView) expect(seen, `row ${i} after ${step + 1} wheel steps`).toMatchObject({ centreIsRow: true, overlap: false });
    }
  }
  await rows.nth(7).evaluate((el) => el.scrollIntoView({ block: 'end' }));
  await page.waitForTimeout(300);
  await page.screenshot({ path: path.join(root, 'test-results', 'screens', 'plan-table-bottom.png') });
});

test('site timeline: day cells big enough to read and click; a click shows that day', async ({ page }) => {
  const plans = path.join(root, 'assets', 'plans');
  const read = (f: string) => JSON.parse(readFileSync(path.join(plans, f), 'utf8'));
  const ids = { hall: await zoneId('Great Hall'), annex: await zoneId('Office Annex'), cafe: await zoneId('Café Kitchen') };
  for (const id of Object.values(ids)) await api('fitZone', { zoneId: id });
  await api('saveSchedules', {
    entries: [
      { zoneId: ids.hall, schedule: read('great-hall.json') },
      { zoneId: ids.annex, schedule: read('office-annex.json') },
      { zoneId: ids.cafe, schedule: read('cafe-kitchen.json') },
    ],
  });
  await page.setViewportSize({ width: 1280, height: 800 });
  await page.goto(server.url);
  await page.getByTestId('nav-site-plan').click();
  await expect(page.getByTestId('site-status')).toHaveText('3 of 3 zones planned', { timeout: 60_000 });

  // The week (the latest complete week of the logs): seven day cells along the axis.
  const cells = page.getByTestId('site-timeline').locator('[data-testid^="site-axis-day-"]');
  await expect(cells).toHaveCount(7);
  const track = page.getByTestId(`site-row-${ids.annex}`).getByRole('cell', { name: 'Office Annex: occupied periods and starts' });
  const trackBox = (await track.boundingBox())!;
  let right = trackBox.x;
  for (let d = 0; d < 7; d++) {
    const cell = page.getByTestId(`site-axis-day-${d}`);
    const label = (await page.getByTestId(`site-day-${d}`).innerText()).trim(); // the day button's label, "Mon 31 Mar"
    const box = (await cell.boundingBox())!;
    // About 28 × 24 px at least (a comfortable target; common practice, WCAG 2.2 asks 24 × 24 CSS px as the minimum).
    expect(box.width, `day ${d} width`).toBeGreaterThanOrEqual(28);
    expect(box.height, `day ${d} height`).toBeGreaterThanOrEqual(24);
    // Each cell covers its own day of the rows' tracks, one after the other (within a pixel of rounding).
    expect(Math.abs(box.x - right), `day ${d} starts where the day before ended`).toBeLessThanOrEqual(1);
    right = box.x + box.width;
    // A readable label, not cut off: weekday and date at 12 px or more.
    await expect(cell).toHaveText(label.replace(' ', ''));
    const fit = await cell.evaluate((el) => ({
      clipped: el.scrollWidth > el.clientWidth + 1 || el.scrollHeight > el.clientHeight + 1,
      smallest: Math.min(...[...el.querySelectorAll('span')].map((s) => Number.parseFloat(getComputedStyle(s).fontSize))),
    }));
    expect(fit.clipped, `day ${d} label fits its cell`).toBe(false);
    expect(fit.smallest, `day ${d} label size (px)`).toBeGreaterThanOrEqual(12);
    // Its tooltip and accessible name say which day it is and what a click does.
    await expect(cell).toHaveAttribute('title', `${label}: show this day, with the order of the zones' starts`);
    await expect(cell).toHaveAccessibleName(`Show ${label}`);
  }
  expect(Math.abs(right - (trackBox.x + trackBox.width)), 'the seven cells span the track').toBeLessThanOrEqual(1);
  await page.getByTestId('site-timeline').screenshot({ path: path.join(root, 'test-results', 'screens', 'site-timeline-day-cells.png') });

  // A click on Wednesday's cell shows Wednesday, as its day button does: the button pressed, the axis in hours,
  // the order of starts that day.
  const wednesday = (await page.getByTestId('site-day-2').innerText()).trim();
  await page.getByTestId('site-axis-day-2').click();
  await expect(page.getByTestId('site-day-2')).toHaveAttribute('aria-pressed', 'true');
  await expect(page.getByTestId('site-week')).toHaveAttribute('aria-pressed', 'false');
  await expect(cells).toHaveCount(0);
  await expect(page.getByTestId('site-timeline').locator('.tick').first()).toHaveText('00:00');
  await expect(page.getByTestId('site-sequence').getByRole('heading')).toHaveText(`Order of starts on ${wednesday}`);
  await screenshot(page, 'site-timeline-day-clicked');
});
