/**
 * Units and labels across screens (demo site): Quick estimate and Recovery open on the same values in
 * °C and °F (switching converts them, 20 °C = 68 °F exactly by °F = °C·9/5 + 32), the History legend
 * names both setpoints drawn and the on-time of the equipment, and the schedule editor uses the app's
 * own setpoint words.
 */
import { expect, fmt, startHeatlag, test, type Heatlag } from './support.ts';

let server: Heatlag;
test.beforeAll(async () => {
  server = await startHeatlag();
});
test.afterAll(async () => server.stop());

test('Quick estimate and Recovery keep their values when the unit changes and open on the same ones', async ({ page }) => {
  await page.goto(server.url);
  // The first click can land before the app has wired its navigation: click until the screen opens.
  await expect(async () => {
    await page.getByTestId('nav-estimate').click();
    await expect(page.getByTestId('qe-tau')).toBeVisible({ timeout: 2_000 });
  }).toPass({ timeout: 30_000 });
  // τ = 6 h / ln(20 / 15) at 0 °C outdoors (Newton's law of cooling, derived).
  const tau = `${fmt(6 / Math.log(20 / 15), 1)} h`;
  await expect(page.getByTestId('qe-tau')).toHaveText(tau);
  await expect(page.getByTestId('qe-first')).toHaveValue('20');
  await page.getByTestId('unit-switch').getByText('°F').click();
  await expect(page.getByTestId('qe-first')).toHaveValue('68');
  await expect(page.getByTestId('qe-tau')).toHaveText(tau);
  // Opened afresh in °F (the unit is remembered): the same room.
  await page.reload();
  await page.getByTestId('nav-estimate').click();
  await expect(page.getByTestId('qe-first')).toHaveValue('68');
  await expect(page.getByTestId('qe-tau')).toHaveText(tau);

  await page.getByRole('navigation').getByRole('button', { name: 'Office Annex' }).click();
  await page.getByTestId('nav-recovery').click();
  await expect(page.getByTestId('fit-when')).toBeVisible();
  await expect(page.getByTestId('rec-start')).toHaveValue('59');
  await expect(page.getByTestId('rec-target')).toHaveValue('68');
  await expect(page.getByTestId('rec-outdoor')).toHaveValue('23');
  await page.getByTestId('unit-switch').getByText('°C').click();
  await expect(page.getByTestId('rec-start')).toHaveValue('15');
  await expect(page.getByTestId('rec-target')).toHaveValue('20');
  await expect(page.getByTestId('rec-outdoor')).toHaveValue('-5');
  await expect(page.getByTestId('screen-recovery')).toContainText('below about 13 °C (55 °F)');
});

test('History names both setpoints and the on-time; the schedule editor uses our own words', async ({ page }) => {
  await page.goto(server.url);
  // The café kitchen's log has both setpoints and both runtimes (assets/demo/cafe-kitchen.mapping.json).
  await page.getByRole('navigation').getByRole('button', { name: 'Café Kitchen' }).click();
  await page.getByTestId('nav-history').click();
  const legend = page.getByTestId('legend-setpoints');
  await expect(legend).toContainText('Heating setpoint');
  await expect(legend).toContainText('Cooling setpoint');
  await expect(page.getByTestId('swatch-cool-setpoint')).toBeVisible();
  await expect(page.getByTestId('screen-history')).toContainText('Equipment on-time (heating, cooling)');

  await page.getByTestId('nav-plan').click();
  await expect(page.getByTestId('schedule-editor')).toBeVisible();
  const editor = page.getByTestId('schedule-editor');
  await expect(editor).not.toContainText('Heat to');
  await expect(editor).not.toContainText('Cool to');
  await expect(editor.locator('.sp-label.heat').first()).toHaveText('Heating setpoint');
  await expect(page.getByTestId('copy-mon-weekdays')).toHaveText('Same as Monday for the working week');
});

test('the plan marks its figures as recomputing as soon as the week changes', async ({ page }) => {
  await page.goto(server.url);
  await page.getByRole('navigation').getByRole('button', { name: 'Office Annex' }).click();
  await page.getByTestId('nav-plan').click();
  await expect(page.getByTestId('plan-status')).toHaveText('Up to date', { timeout: 60_000 });
  await expect(page.getByTestId('plan-recomputing')).toHaveCount(0);
  let asked = false;
  page.on('request', (r) => {
    if (r.url().includes('/api/planZone')) asked = true;
  });
  await page.getByTestId('outdoor-week').selectOption('2025-03-17');
  // Marked at once, before the pause that gathers edits into one request has ended (the request is
  // not sent yet), and cleared when the new week is in.
  await expect(page.getByTestId('plan-recomputing')).toBeVisible();
  expect(asked).toBe(false);
  await expect(page.getByTestId('plan-results')).toHaveAttribute('aria-busy', 'true');
  await expect(page.getByTestId('plan-status')).toHaveText('Up to date');
  await expect(page.getByTestId('plan-recomputing')).toHaveCount(0);
  await expect(page.getByTestId('plan-basis')).toContainText('2025-03-17');
});
