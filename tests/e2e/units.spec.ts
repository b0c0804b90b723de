/**
 * The °F / °C switch: every temperature, difference and rate follows it (1 K = 1.8 °F exactly; τ in
 * hours does not change), and the choice is remembered across pages and across restarts of the app.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { cli, demoDir, expect, fmt, screenshot, startHeatlag, test } from './support.ts';

test('switching to °F converts the figures and is remembered after a restart', async ({ page }) => {
  const dataDir = mkdtempSync(path.join(tmpdir(), 'heatlag-units-'));
  let server = await startHeatlag({ dataDir });
  try {
    await page.goto(server.url);
    await page.getByRole('navigation').getByRole('button', { name: 'Office Annex' }).click();
    await page.getByTestId('nav-response').click();
    await expect(page.getByTestId('fit-when')).toBeVisible(); // fitted on first need
    const fitF = await cli<{ timeConstantHours: number; heatingRatePerHour: number; heatingLift: number; rmse: number }>(
      'fit', path.join(demoDir, 'office-annex.csv'), '--columns', path.join(demoDir, 'office-annex.mapping.json'), '--units', 'F',
    );
    await expect(page.getByTestId('heat-value')).toHaveText(`${fmt(fitF.heatingRatePerHour / 1.8, 2)} K/h`);

    await page.getByTestId('unit-switch').getByText('°F').click();
    await expect(page.getByTestId('tau-value')).toHaveText(`${fmt(fitF.timeConstantHours, 1)} h`);
    await expect(page.getByTestId('heat-value')).toHaveText(`${fmt(fitF.heatingRatePerHour, 2)} °F/h`);
    await expect(page.getByTestId('lift-value')).toHaveText(`${fmt(fitF.heatingLift, 1)} °F`);
    await expect(page.getByTestId('rmse-value')).toHaveText(`${fmt(fitF.rmse, 2)} °F`);
    await screenshot(page, 'response-fahrenheit');

    await page.getByTestId('nav-recovery').click();
    await expect(page.getByTestId('rec-target')).toHaveValue('68'); // opened in °F: 20 °C = 68 °F, round in both units
    await expect(page.getByTestId('recovery-table')).toContainText('°F setback');
    await screenshot(page, 'recovery-fahrenheit');
    // Inputs follow the switch: 68 °F = 20 °C, and back.
    await page.getByTestId('unit-switch').getByText('°C').click();
    await expect(page.getByTestId('rec-target')).toHaveValue('20');
    await expect(page.getByTestId('recovery-table')).toContainText('K setback');
    await page.getByTestId('unit-switch').getByText('°F').click();
    await expect(page.getByTestId('rec-target')).toHaveValue('68');

    // Restart the app on the same data folder: still °F.
    await server.stop();
    server = await startHeatlag({ dataDir });
    await page.goto(server.url);
    await expect(page.getByTestId('unit-switch').locator('label.checked')).toHaveText('°F');
    await expect(page.getByTestId('history-figures')).toContainText('°F');
    await page.getByTestId('unit-switch').getByText('°C').click();
    await expect(page.getByTestId('history-figures')).toContainText('°C');
  } finally {
    await server.stop();
    rmSync(dataDir, { recursive: true, force: true });
  }
});
