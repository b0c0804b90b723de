/**
 * Quick estimate: τ from two readings, the temperature after a time, the time to reach a temperature,
 * in °C and °F. Expected values: Newton's law of cooling at a constant ambient,
 * T(t) = Ta + (T0 − Ta)·e^(−t/τ) and τ = Δt / ln((T0 − Ta)/(T1 − Ta)) (Incropera et al., Fundamentals of
 * Heat and Mass Transfer, §5.2; derived), computed here, and the `heatlag estimate` command's output.
 */
import { cli, expect, fmt, fmtDuration, screenshot, startHeatlag, test, type Heatlag } from './support.ts';

let server: Heatlag;
test.beforeAll(async () => {
  server = await startHeatlag({ demo: false });
});
test.afterAll(async () => server.stop());

test('τ, the temperature after a time and the time to reach a temperature match the law of cooling and the CLI', async ({ page }) => {
  await page.goto(server.url);
  await page.getByTestId('nav-estimate').click();
  await page.getByTestId('qe-first').fill('21');
  await page.getByTestId('qe-second').fill('18.5');
  await page.getByTestId('qe-gap-hours').fill('3');
  await page.getByTestId('qe-gap-minutes').fill('0');
  await page.getByTestId('qe-outdoor').fill('0');

  // Closed form (derived): τ = 3 h / ln(21/18.5).
  const tau = 3 / Math.log(21 / 18.5);
  const fromCli = await cli<{ timeConstantHours: number; temperatureAt: number; hoursToTarget: number }>(
    'estimate', '--start', '21', '--later', '18.5', '--hours', '3', '--ambient', '0', '--at', '8', '--target', '16', '--units', 'C',
  );
  expect(Math.abs(fromCli.timeConstantHours - tau)).toBeLessThan(1e-9); // both are the same closed form
  await expect(page.getByTestId('qe-tau')).toHaveText(`${fmt(tau, 1)} h`);

  await page.getByTestId('qe-start').fill('21');
  await page.getByTestId('qe-ambient').fill('0');
  await page.getByTestId('qe-after').fill('8');
  await page.getByTestId('qe-target').fill('16');
  const tempAt = 21 * Math.exp(-8 / tau); // T(8 h), Ta = 0
  const toTarget = tau * Math.log(21 / 16);
  expect(Math.abs(fromCli.temperatureAt - tempAt)).toBeLessThan(1e-9);
  expect(Math.abs(fromCli.hoursToTarget - toTarget)).toBeLessThan(1e-9);
  await expect(page.getByTestId('qe-temp-at')).toHaveText(`${fmt(tempAt, 1)} °C`);
  await expect(page.getByTestId('qe-time-to')).toHaveText(fmtDuration(toTarget));
  await screenshot(page, 'quick-estimate');

  // A target beyond the ambient is never reached, and the page says why.
  await page.getByTestId('qe-target').fill('-2');
  await expect(page.getByTestId('qe-time-to')).toHaveText('Never');
  await expect(page.getByTestId('qe-never')).toContainText('never reaches');

  // Readings that move away from the ambient are not a free drift.
  await page.getByTestId('qe-second').fill('22');
  await expect(page.getByTestId('qe-tau-problem')).toContainText('further from the outdoor temperature');
});

test('in °F the same room gives the same τ; inputs and results are in °F', async ({ page }) => {
  await page.goto(server.url);
  await page.getByTestId('nav-estimate').click();
  await page.getByTestId('unit-switch').getByText('°F').click();
  // 20 °C → 7.357588823 °C over 10 h at 0 °C is τ = 10 h exactly (20·e^−1, derived); in °F:
  const f = (c: number) => c * 1.8 + 32;
  await page.getByTestId('qe-first').fill(String(f(20)));
  await page.getByTestId('qe-second').fill(String(f(20 * Math.exp(-1))));
  await page.getByTestId('qe-gap-hours').fill('10');
  await page.getByTestId('qe-gap-minutes').fill('0');
  await page.getByTestId('qe-outdoor').fill('32');
  await expect(page.getByTestId('qe-tau')).toHaveText('10.0 h');
  const fromCli = await cli<{ timeConstantHours: number }>('estimate', '--start', '68', '--later', String(f(20 * Math.exp(-1))), '--hours', '10', '--ambient', '32', '--units', 'F');
  expect(fromCli.timeConstantHours).toBeCloseTo(10, 6);

  await page.getByTestId('qe-start').fill('68');
  await page.getByTestId('qe-ambient').fill('32');
  await page.getByTestId('qe-after').fill('10');
  // After one τ the difference to the ambient is e^−1 of the start's: 32 + 36·e^−1 °F.
  await expect(page.getByTestId('qe-temp-at')).toHaveText(`${fmt(32 + 36 * Math.exp(-1), 1)} °F`);
  await screenshot(page, 'quick-estimate-fahrenheit');
});
