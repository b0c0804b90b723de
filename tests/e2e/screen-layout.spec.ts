/**
 * Layout an auditor can use: on the Setback plan the floating prediction bar never covers a row of the
 * day table, however the page is scrolled to it (a jump straight to a row, as the keyboard, find in
 * page or a screen reader makes, as well as the wheel).
 */
import path from 'node:path';
import type { Locator } from '@playwright/test';
import { expect, root, startHeatlag, test, type Heatlag } from './support.ts';


let server: Heatlag;
test.beforeAll(async () => {
  server = await startHeatlag();
});
test.afterAll(async () => server.stop());

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
