/**
 * Refreshes the README's screenshot (assets/screenshots/response.png): the Response screen of the
 * invented demo's Great Hall, fitted on first need. Skipped unless HEATLAG_README_SHOT=1, so an
 * ordinary test run never rewrites a file of the repository:
 *   node app/main/build.mjs && HEATLAG_README_SHOT=1 npx playwright test tests/e2e/readme-screenshot.spec.ts
 */
import path from 'node:path';
import { expect, root, settled, startHeatlag, test } from './support.ts';

test.skip(process.env.HEATLAG_README_SHOT !== '1', 'set HEATLAG_README_SHOT=1 to refresh the README screenshot');

test('README screenshot of the Response screen', async ({ page }) => {
  const server = await startHeatlag();
  try {
    await page.setViewportSize({ width: 1280, height: 1040 });
    await page.goto(server.url);
    await page.getByRole('navigation').getByRole('button', { name: 'Great Hall' }).click();
    await page.getByTestId('nav-response').click();
    await expect(page.getByTestId('fit-when')).toBeVisible();
    await expect(page.getByTestId('fit-quality')).toBeVisible();
    await settled(page);
    await page.screenshot({ path: path.join(root, 'assets', 'screenshots', 'response.png') });
  } finally {
    await server.stop();
  }
});
