/**
 * Model fit quality, plausibility warnings and the one fit rule, on the demo's Great Hall: the zone is
 * fitted on first need (progress shown, then when it was fitted); the card shows RMSE and held-out RMSE
 * in the display unit's degrees as `heatlag fit --db` gives them, the free-floating share and which
 * model was chosen, and no Guideline 14 claim. A stored response with a recovery backtest and an
 * implausible heating lift (invented figures, written into the app's database as a later fit would)
 * then shows its scatter chart and the plausibility box on Response, Recovery, Setback plan and the report.
 */
import path from 'node:path';
import { openStore } from '../../db/store.ts';
import type { ZoneResponse } from '../../core/types.ts';
import { cli, expect, fmt, screenshot, startHeatlag, test, type Heatlag } from './support.ts';

let server: Heatlag;
test.beforeAll(async () => {
  server = await startHeatlag();
});
test.afterAll(async () => server.stop());

const ZONE = 'Kestelbrück Community House/Great Hall';

test('the Response screen fits on first need and shows the model fit quality card', async ({ page }) => {
  await page.goto(server.url);
  await page.getByRole('navigation').getByRole('button', { name: 'Great Hall' }).click();
  await page.getByTestId('nav-response').click();
  await expect(page.getByTestId('fit-progress')).toBeVisible();
  await expect(page.getByTestId('fit-when')).toContainText('Response fitted');
  await expect(page.getByTestId('fit-again')).toBeEnabled();

  const fit = await cli<{ rmse: number; heldOutRmse: number; freeFloatShare: number; modelReason: string; recoveryBacktest: { cases: number } | null }>('fit', '--db', path.join(server.dataDir, 'heatlag.db'), '--zone', ZONE, '--units', 'C');
  const card = page.getByTestId('fit-quality');
  await expect(card.getByRole('heading')).toHaveText('Model fit quality');
  await expect(page.getByTestId('fq-rmse')).toHaveText(`${fmt(fit.rmse, 2)} K`);
  await expect(page.getByTestId('fq-heldout')).toHaveText(`${fmt(fit.heldOutRmse, 2)} K`);
  await expect(page.getByTestId('fq-free')).toHaveText(`${fmt(100 * fit.freeFloatShare, 0)} %`);
  await expect(page.getByTestId('fq-model-reason')).toHaveText(fit.modelReason);
  // The demo's log holds a morning recovery every day: the backtest of the same database as the CLI's.
  expect(fit.recoveryBacktest).not.toBeNull();
  await expect(page.getByTestId('fq-backtest')).toHaveText(`${fit.recoveryBacktest!.cases} mornings`);
  await expect(page.getByTestId('backtest-chart')).toBeVisible();
  await expect(page.getByTestId('screen-response')).not.toContainText('Guideline 14');

  // In °F the errors are °F differences.
  await page.getByTestId('unit-switch').getByText('°F').click();
  await expect(page.getByTestId('fq-rmse')).toHaveText(`${fmt(fit.rmse * 1.8, 2)} °F`);
  await page.getByTestId('unit-switch').getByText('°C').click();
});

test('a response with a backtest and an implausible lift: scatter chart and warnings on every screen', async ({ page }) => {
  // A fit stored the way the app stores one, with invented backtest mornings and the heating rate
  // multiplied so that h·τ is far above any design temperature difference.
  const store = openStore(path.join(server.dataDir, 'heatlag.db'));
  try {
    const zone = store.listZones().find((z) => z.name === 'Great Hall')!;
    const base = store.latestResponse(zone.id) as ZoneResponse;
    expect(base).not.toBeNull();
    const r: ZoneResponse = {
      ...base,
      heatRate: base.heatRate * 40,
      recoveryBacktest: {
        cases: 3, medianErrorMinutes: 12, p90ErrorMinutes: 31, medianBiasMinutes: 4,
        mornings: [
          { startMs: base.firstTime, fromC: 15, toC: 20, outdoorC: -3, actualMinutes: 95, predictedMinutes: 104 },
          { startMs: base.firstTime + 86_400_000, fromC: 16, toC: 20, outdoorC: 2, actualMinutes: 62, predictedMinutes: 50 },
          { startMs: base.firstTime + 2 * 86_400_000, fromC: 14, toC: 20, outdoorC: -6, actualMinutes: 140, predictedMinutes: 171 },
        ],
      },
      recoveryBacktestReason: null,
    };
    store.saveResponse(zone.id, r);
  } finally {
    store.close();
  }

  await page.goto(server.url);
  await page.getByRole('navigation').getByRole('button', { name: 'Great Hall' }).click();
  await page.getByTestId('nav-response').click();
  await expect(page.getByTestId('fit-when')).toBeVisible();
  await expect(page.getByTestId('fq-backtest')).toHaveText('3 mornings');
  await expect(page.getByTestId('fit-quality')).toContainText('error median 12 min, 90th percentile 31 min');
  await expect(page.getByTestId('backtest-chart').locator('canvas')).toHaveAttribute('data-chart-ready', 'true');
  await expect(page.getByTestId('plausibility')).toContainText('heating lift');
  await expect(page.getByTestId('plausibility')).toContainText(' K ');
  await screenshot(page, 'response-fit-quality');

  await page.getByTestId('nav-recovery').click();
  await expect(page.getByTestId('plausibility')).toContainText('heating lift');
  await page.getByTestId('nav-plan').click();
  await expect(page.getByTestId('plausibility')).toContainText('heating lift');
  await page.getByTestId('nav-report').click();
  await expect(page.getByTestId('report').getByTestId('plausibility')).toContainText('heating lift');
  await expect(page.getByTestId('report').locator('canvas[data-chart="backtest"]')).toHaveAttribute('data-chart-ready', 'true');
  await expect(page.getByTestId('report')).not.toContainText('Guideline 14');
  await screenshot(page, 'report-fit-quality');
});
