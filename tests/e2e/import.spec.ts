/**
 * Import: a semicolon-separated log with decimal commas and split date/time columns (chosen with the
 * file input), and a log with bad rows (dropped on the page). The counts, the rejected rows with
 * their reasons and the fitted response are checked against the `heatlag` command's output for the
 * same files.
 */
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { cli, demoDir, expect, fmt, screenshot, startHeatlag, test, type Heatlag } from './support.ts';

let server: Heatlag;
let scratch: string;
test.beforeAll(async () => {
  server = await startHeatlag({ demo: false });
  scratch = mkdtempSync(path.join(tmpdir(), 'heatlag-import-'));
});
test.afterAll(async () => {
  await server.stop();
  rmSync(scratch, { recursive: true, force: true });
});

async function newZone(page: import('@playwright/test').Page, site: string, zone: string) {
  await page.goto(server.url);
  await page.getByTestId('nav-sites').click();
  await page.getByTestId('new-site-name').fill(site);
  await page.getByTestId('create-site').click();
  await page.getByTestId('site-card').filter({ hasText: site }).getByTestId('new-zone-name').fill(zone);
  await page.getByTestId('site-card').filter({ hasText: site }).getByTestId('create-zone').click();
  await expect(page.getByTestId('sites-message')).toContainText(`Zone “${zone}” created`);
}

interface CliImport {
  rowsAccepted: number;
  rowsRejected: number;
  duplicates: number;
  rejected: Array<{ line: number; column: number | null; reason: string }>;
}

test('a semicolon log with decimal commas: detected, mapped, saved, imported and fitted like the CLI', async ({ page }) => {
  await newZone(page, 'Annex building', 'Office');
  await page.getByTestId('nav-import').click();
  const file = path.join(demoDir, 'office-annex.csv');
  await page.getByTestId('file-input').setInputFiles(file);

  // Detected: semicolon, decimal comma, date and time of day in two columns; local times need a zone.
  await expect(page.getByTestId('preview-table')).toBeVisible();
  await expect(page.getByTestId('opt-delimiter')).toHaveValue(';');
  await expect(page.getByTestId('opt-decimal')).toHaveValue(',');
  await expect(page.getByTestId('role-0')).toHaveValue('date');
  await expect(page.getByTestId('role-1')).toHaveValue('clock');
  await expect(page.getByTestId('role-2')).toHaveValue('indoor');
  await expect(page.getByTestId('role-3')).toHaveValue('outdoor');
  await expect(page.getByTestId('preview-table').locator('tbody tr').first()).toContainText('16,0');
  await page.getByTestId('opt-timezone').fill('Europe/Berlin');
  await page.getByTestId('save-mapping-name').fill('Annex BMS export');
  await page.getByTestId('save-mapping').click();
  await expect(page.getByTestId('mapping-note')).toContainText('Saved the mapping as “Annex BMS export”');
  // With the time zone given, the preview is read again and nothing stops the import.
  await expect(page.getByTestId('preview-problems')).toHaveCount(0);
  await screenshot(page, 'import-preview');

  await page.getByTestId('import-button').click();
  await expect(page.getByTestId('import-summary')).toBeVisible();
  const fromCli = await cli<CliImport>('import', file, '--db', path.join(scratch, 'a.db'), '--zone', 'A/B', '--tz', 'Europe/Berlin');
  await expect(page.getByTestId('rows-accepted')).toHaveText(fromCli.rowsAccepted.toLocaleString('en-US'));
  await expect(page.getByTestId('rows-rejected')).toHaveText(String(fromCli.rowsRejected));
  await expect(page.getByTestId('rows-duplicate')).toHaveText(String(fromCli.duplicates));
  await screenshot(page, 'import-summary');

  // Fit: the numbers shown are the CLI's for the same log (°C, as the app is set).
  await page.getByTestId('go-history').click();
  await page.getByTestId('nav-response').click();
  // One fit rule: a zone without a current fit is fitted on first need, with its progress shown.
  await expect(page.getByTestId('fit-progress')).toBeVisible();
  await expect(page.getByTestId('fit-when')).toContainText('Response fitted');
  const fit = await cli<{ timeConstantHours: number; timeConstantHoursCI: [number, number]; heatingRatePerHour: number; heatingLift: number; rmse: number; gainPerHour: number }>(
    'fit', file, '--tz', 'Europe/Berlin', '--units', 'C',
  );
  await expect(page.getByTestId('tau-value')).toHaveText(`${fmt(fit.timeConstantHours, 1)} h`);
  await expect(page.getByTestId('tau-ci')).toHaveText(`95 % interval ${fmt(fit.timeConstantHoursCI[0], 1)} to ${fmt(fit.timeConstantHoursCI[1], 1)} h`);
  await expect(page.getByTestId('heat-value')).toHaveText(`${fmt(fit.heatingRatePerHour, 2)} K/h`);
  await expect(page.getByTestId('lift-value')).toHaveText(`${fmt(fit.heatingLift, 1)} K`);
  await expect(page.getByTestId('gain-value')).toHaveText(`${fmt(fit.gainPerHour, 2)} K/h`);
  await expect(page.getByTestId('rmse-value')).toHaveText(`${fmt(fit.rmse, 2)} K`);
  await expect(page.getByTestId('overlay-chart').locator('canvas')).toBeVisible();
  await screenshot(page, 'response');

  // The saved mapping is offered for the next file.
  await page.getByTestId('nav-import').click();
  await page.getByTestId('file-input').setInputFiles(file);
  await expect(page.getByTestId('use-saved')).toContainText('Annex BMS export');
});

test('a log with bad rows: the good rows go in, the bad ones are listed with line, column and reason, and export', async ({ page }) => {
  // Great Hall's log (°F, ISO times with offsets) with four rows spoilt on purpose.
  const lines = readFileSync(path.join(demoDir, 'great-hall.csv'), 'utf8').split('\n').slice(0, 600);
  const spoil = (n: number, f: (cells: string[]) => string[]) => {
    lines[n - 1] = f(lines[n - 1]!.split(',')).join(',');
  };
  spoil(10, (c) => [c[0]!, 'n/a', ...c.slice(2)]);
  spoil(500, (c) => ['2025-13-45T99:00:00+01:00', ...c.slice(1)]); // past the 400 rows the time format is detected from
  spoil(30, (c) => [c[0]!, 'seventy', ...c.slice(2)]);
  spoil(40, (c) => [c[0]!, c[1]!, c[2]!, c[3]!, 'lots']);
  const text = lines.join('\n') + '\n';
  const file = path.join(scratch, 'bad-rows.csv');
  writeFileSync(file, text);
  const fromCli = await cli<CliImport>('import', file, '--db', path.join(scratch, 'b.db'), '--zone', 'A/B');
  expect(fromCli.rowsRejected).toBeGreaterThanOrEqual(3);

  await newZone(page, 'Hall building', 'Hall');
  await page.getByTestId('nav-import').click();
  // Drop the file on the page.
  const dataTransfer = await page.evaluateHandle((content) => {
    const dt = new DataTransfer();
    dt.items.add(new File([content], 'bad-rows.csv', { type: 'text/csv' }));
    return dt;
  }, text);
  await page.getByTestId('dropzone').dispatchEvent('drop', { dataTransfer });
  await expect(page.getByTestId('preview-table')).toBeVisible();
  await page.getByTestId('import-button').click();
  await expect(page.getByTestId('import-summary')).toBeVisible();
  await expect(page.getByTestId('rows-accepted')).toHaveText(fromCli.rowsAccepted.toLocaleString('en-US'));
  await expect(page.getByTestId('rows-rejected')).toHaveText(String(fromCli.rowsRejected));

  const rows = page.getByTestId('rejected-table').locator('tbody tr');
  await expect(rows).toHaveCount(fromCli.rowsRejected);
  for (const [i, r] of fromCli.rejected.entries()) {
    await expect(rows.nth(i).locator('td').first()).toHaveText(String(r.line));
    await expect(rows.nth(i)).toContainText(r.reason);
  }
  await screenshot(page, 'import-rejected');

  const download = page.waitForEvent('download');
  await page.getByTestId('export-rejected').click();
  const saved = await (await download).path();
  const csv = readFileSync(saved!, 'utf8').trim().split(/\r?\n/);
  expect(csv[0]).toBe('line,column,column_name,reason,row');
  expect(csv).toHaveLength(fromCli.rowsRejected + 1);
  for (const [i, r] of fromCli.rejected.entries()) expect(csv[i + 1]!.startsWith(`${r.line},`)).toBe(true);
});
