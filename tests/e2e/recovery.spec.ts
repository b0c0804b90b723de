/**
 * Response and recovery on the demo's Great Hall: the fitted figures match `heatlag fit`, the
 * recovery time matches `heatlag recovery` and the closed form t = τ·ln((T_eq − T0)/(T_eq − T1)) with
 * T_eq = T_out + (h + g)·τ (the linear first-order ODE's solution, derived), the curve redraws as a
 * slider moves, and the table of recovery times follows the same closed form.
 */
import path from 'node:path';
import { cli, demoDir, expect, fmt, fmtDuration, screenshot, startHeatlag, test, type Heatlag } from './support.ts';

let server: Heatlag;
test.beforeAll(async () => {
  server = await startHeatlag();
});
test.afterAll(async () => server.stop());

const log = path.join(demoDir, 'great-hall.csv');
const mapping = path.join(demoDir, 'great-hall.mapping.json');

interface CliFit {
  timeConstantHours: number;
  timeConstantHoursCI: [number, number];
  heatingRatePerHour: number;
  heatingRatePerHourCI: [number, number];
  gainPerHour: number;
  heatingLift: number;
  rmse: number;
  heldOutRmse: number;
}

test('fit the Great Hall, then read recovery times that match the CLI and the closed form', async ({ page }) => {
  await page.goto(server.url);
  await page.getByRole('navigation').getByRole('button', { name: 'Great Hall' }).click();
  await page.getByTestId('nav-recovery').click();
  // One fit rule: a zone without a current fit is fitted on first need, with its progress shown.
  await expect(page.getByTestId('fit-progress')).toBeVisible();
  await expect(page.getByTestId('fit-when')).toContainText('Response fitted');
  await expect(page.getByTestId('rec-time')).toBeVisible();

  const fit = await cli<CliFit>('fit', log, '--columns', mapping, '--units', 'C', '--tz', 'Europe/Berlin');
  const tau = fit.timeConstantHours;
  const h = fit.heatingRatePerHour;
  const g = fit.gainPerHour;
  await expect(page.getByTestId('recovery-model')).toContainText(`τ = ${fmt(tau, 1)} h`);

  await page.getByTestId('rec-start').fill('16');
  await page.getByTestId('rec-target').fill('21');
  await page.getByTestId('rec-outdoor').fill('-5');
  const rec = await cli<{ recoveryHours: number }>('recovery', log, '--columns', mapping, '--from', '16', '--to', '21', '--outdoor', '-5', '--units', 'C');
  const teq = -5 + (h + g) * tau;
  const closed = tau * Math.log((teq - 16) / (teq - 21));
  expect(Math.abs(rec.recoveryHours - closed)).toBeLessThan(1e-6); // CLI against the closed form
  await expect(page.getByTestId('rec-time')).toHaveText(fmtDuration(closed));
  await screenshot(page, 'recovery');

  // Live: one step of the outdoor slider (0.5 °C warmer) redraws with the shorter recovery.
  await page.getByTestId('rec-outdoor-slider').focus();
  await page.keyboard.press('ArrowRight');
  const teqWarmer = -4.5 + (h + g) * tau;
  await expect(page.getByTestId('rec-time')).toHaveText(fmtDuration(tau * Math.log((teqWarmer - 16) / (teqWarmer - 21))));
  await expect(page.getByTestId('rec-outdoor')).toHaveValue('-4.5');

  // A target the heating cannot reach at this outdoor temperature is said plainly.
  await page.getByTestId('rec-target').fill(String(Math.ceil(teqWarmer + 1)));
  await expect(page.getByTestId('rec-time')).toHaveText('Not reached');
  await expect(page.getByTestId('rec-never')).toContainText('levels off');
  await page.getByTestId('rec-target').fill('21');

  // The table: row −10 °C, column "4 K setback" (from 17 °C) to 21 °C.
  const table = page.getByTestId('recovery-table');
  const header = await table.locator('thead th').allInnerTexts();
  const col = header.findIndex((t) => t.startsWith('4 K setback'));
  expect(col).toBeGreaterThan(0);
  const row = table.locator('tbody tr').filter({ has: page.getByRole('rowheader', { name: '−10 °C', exact: true }) });
  const teqCold = -10 + (h + g) * tau;
  await expect(row.locator('th, td').nth(col)).toHaveText(fmtDuration(tau * Math.log((teqCold - 17) / (teqCold - 21))));
  await expect(page.getByText('Freeze protection')).toBeVisible();

  // The response screen shows the same fit as the CLI, with its intervals and the held-out overlay.
  await page.getByTestId('nav-response').click();
  await expect(page.getByTestId('tau-value')).toHaveText(`${fmt(tau, 1)} h`);
  await expect(page.getByTestId('heat-ci')).toHaveText(`95 % interval ${fmt(fit.heatingRatePerHourCI[0], 2)} to ${fmt(fit.heatingRatePerHourCI[1], 2)} K/h`);
  await expect(page.getByTestId('lift-value')).toHaveText(`${fmt(fit.heatingLift, 1)} K`);
  await expect(page.getByTestId('heldout-rmse')).toHaveText(`on held-out days: ${fmt(fit.heldOutRmse, 2)} K`);
  await expect(page.getByTestId('overlay-note')).toContainText('Days the fit did not see');
  await screenshot(page, 'response-great-hall');
});
