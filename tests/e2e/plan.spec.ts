/**
 * Setback planning on the invented demo site: the schedule editor (load a schedule file, edit it,
 * validation, save, export, the °F/°C switch) and the site timeline (every zone's start, lowest
 * temperature and savings on one design day, a zone that cannot recover flagged). Every number
 * checked on screen is compared with `heatlag plan --db <the app's database> --zone SITE/ZONE --json`
 * for the same zone, schedule and outdoor choice: the command line is the outside check of the
 * screens (both run core/plan's planZone on the stored response).
 */
import { readFileSync, writeFileSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { scheduleInUnit } from '../../app/api/schedule-units.ts';
import { callApi, cli, expect, fmt, root, screenshot, startHeatlag, test, type Heatlag } from './support.ts';

const SITE = 'Kestelbrück Community House';
const plans = path.join(root, 'assets', 'plans');

let server: Heatlag;
let scratch: string;
test.beforeAll(async () => {
  server = await startHeatlag();
  scratch = mkdtempSync(path.join(tmpdir(), 'heatlag-plan-e2e-'));
});
test.afterAll(async () => {
  await server.stop();
  rmSync(scratch, { recursive: true, force: true });
});

const api = <T>(method: string, input: unknown): Promise<T> => callApi<T>(server, method, input);

interface CliRecovery {
  status: string;
  optimalStartLabel: string | null;
  occupancyLabel: string;
  leadHours: number | null;
  cannotRecoverInTime: boolean;
  shortfallK: number;
  dayIndex: number;
  mode: 'heat' | 'cool';
}
interface CliDay {
  label: string;
  heatHours: number;
  baselineHeatHours: number;
  savedHeatHours: number;
  savedHeatPercent: number | null;
  savedPercent: number | null;
  lowestUnoccupiedC: number | null;
  recoveries: CliRecovery[];
}
interface CliPlan {
  days: CliDay[];
  week: CliDay;
  recoveries: CliRecovery[];
  equipment: { heatCapacityJPerK: number; uaWPerK: number } | null;
  cautions: Array<{ level: string; topic: string; text: string }>;
}

const dbFile = () => path.join(server.dataDir, 'heatlag.db');
const planCli = (zone: string, schedule: string, ...outdoor: string[]) =>
  cli<CliPlan>('plan', '--db', dbFile(), '--zone', `${SITE}/${zone}`, '--schedule', schedule, ...outdoor);

/** A percentage as the app writes it, "—" where the baseline did not run. */
const pct = (p: number | null) => (p === null ? '—' : `${fmt(p, 1)} %`);
/** The time of day of a label "Mon 05:19" or "Sun 22:42". */
const hhmmOf = (label: string | null) => (label ? label.slice(-5) : '');
/** A lead in hours as the app writes a duration: "2 h 11 min". */
function lead(hours: number): string {
  const total = Math.round(hours * 60);
  const h = Math.floor(total / 60);
  const m = total % 60;
  return h === 0 ? `${m} min` : `${h} h ${String(m).padStart(2, '0')} min`;
}

/** Checks the plan screen's figures, day table and cautions against the command line's plan. */
async function expectPlanMatches(page: import('@playwright/test').Page, ref: CliPlan, unit: 'C' | 'F') {
  const T = (c: number) => `${fmt(unit === 'F' ? c * 1.8 + 32 : c, 1)} °${unit}`;
  await expect(page.getByTestId('plan-status')).toHaveText('Up to date');
  await expect(page.getByTestId('fig-heat-saved').locator('.value')).toHaveText(`${fmt(ref.week.savedHeatHours, 1)} h`);
  await expect(page.getByTestId('fig-heat-saved').locator('.ci')).toContainText(`${pct(ref.week.savedHeatPercent)} of the baseline's ${fmt(ref.week.baselineHeatHours, 1)} h`);
  const lowest = Math.min(...ref.days.map((d) => d.lowestUnoccupiedC ?? Infinity));
  await expect(page.getByTestId('fig-lowest').locator('.value')).toHaveText(T(lowest));
  const met = ref.recoveries.filter((r) => r.status === 'met');
  if (met.length > 0) {
    const first = met.reduce((a, b) => (b.leadHours! > a.leadHours! + 1 / 60 ? b : a)); // the first of the longest leads
    await expect(page.getByTestId('fig-earliest').locator('.value')).toHaveText(hhmmOf(first.optimalStartLabel));
    await expect(page.getByTestId('fig-earliest').locator('.ci')).toHaveText(`${lead(first.leadHours!)} before ${first.occupancyLabel}`);
  }
  for (let d = 0; d < 7; d++) {
    const day = ref.days[d]!;
    const cells = page.getByTestId(`plan-day-${d}`).locator('td');
    await expect(cells.nth(2)).toHaveText(T(day.lowestUnoccupiedC!));
    await expect(cells.nth(3)).toHaveText(`${fmt(day.heatHours, 2)} h`);
    await expect(cells.nth(4)).toHaveText(`${fmt(day.baselineHeatHours, 2)} h`);
    await expect(cells.nth(5)).toHaveText(`${fmt(day.savedHeatHours, 2)} h (${pct(day.savedHeatPercent)})`);
    for (const r of day.recoveries.filter((x) => x.status === 'met')) {
      await expect(cells.nth(1)).toContainText(`heating starts ${hhmmOf(r.optimalStartLabel)}, ${lead(r.leadHours!)} before ${hhmmOf(r.occupancyLabel)}`);
    }
  }
  await expect(page.getByTestId('plan-week-row').locator('td').nth(3)).toHaveText(`${fmt(ref.week.heatHours, 2)} h`);
  // Every caution of the command line, word for word, where the figures are.
  const shown = await page.getByTestId('plan-cautions').locator('li .text').allInnerTexts();
  expect(shown.sort()).toEqual(ref.cautions.map((c) => c.text).sort());
  const levels = await page.getByTestId('plan-cautions').locator('li').evaluateAll((els) => els.map((e) => e.getAttribute('data-level')));
  expect(levels.sort()).toEqual(ref.cautions.map((c) => c.level).sort());
}

test('schedule editor: a schedule file loaded, edited, checked, saved and exported; figures match heatlag plan', async ({ page }) => {
  test.setTimeout(150_000); // five runs of the command line besides the page
  await page.goto(server.url);
  await page.getByRole('navigation').getByRole('button', { name: 'Office Annex' }).click();
  await page.getByTestId('nav-plan').click();
  // One fit rule: a zone without a current fit is fitted on first need, with its progress shown.
  await expect(page.getByTestId('fit-progress')).toBeVisible();
  await expect(page.getByTestId('fit-when')).toContainText('Response fitted');
  await expect(page.getByTestId('schedule-editor')).toBeVisible();
  const file = path.join(plans, 'office-annex.json');
  // The command line's plans of the file as it is (the zone is fitted now), run while the page works.
  const refs = Promise.all([
    planCli('Office Annex', file),
    planCli('Office Annex', file, '--outdoor', 'history', '--week', '2025-03-17'),
    planCli('Office Annex', file, '--low', '-6', '--high', '3'),
  ]);
  refs.catch(() => undefined); // awaited below; a failure before then is the page's

  // A schedule file of the command line, loaded as it is.
  await page.getByTestId('schedule-file').setInputFiles(file);
  await expect(page.getByTestId('plan-notice')).toContainText('Loaded office-annex.json');
  await expect(page.getByTestId('schedule-name')).toHaveValue('Office Annex, nights and weekends at 15 °C');
  await expect(page.getByTestId('p-0-0-from')).toHaveValue('07:30');
  await expect(page.getByTestId('p-4-0-heat')).toHaveValue('21');
  await expect(page.getByTestId('day-sat')).toContainText('Unoccupied all day');
  await expect(page.getByTestId('unocc-heat')).toHaveValue('15');
  await expect(page.getByTestId('setback-floor')).toHaveValue('13'); // default for a °C file
  await expect(page.getByTestId('heat-capacity')).toHaveValue('12');
  await expect(page.getByTestId('save-state')).toContainText('Unsaved changes');

  // Outdoor: by default the log's own latest complete week (as the command line without --outdoor),
  // then a chosen week of the log.
  const [latestWeek, chosenWeek, ref] = await refs;
  await expect(page.getByTestId('outdoor-history')).toBeChecked();
  await expectPlanMatches(page, latestWeek, 'C');
  await expect(page.getByTestId('plan-basis')).toContainText("the log's outdoor readings for the week from 2025-03-31 (Europe/Berlin)");
  await expect(page.getByTestId('outdoor-week').locator('option[value="2025-03-24"]')).toBeDisabled(); // a 20 h gap in its outdoor readings
  await page.getByTestId('outdoor-week').selectOption('2025-03-17');
  await expect(page.getByTestId('plan-basis')).toContainText('week from 2025-03-17');
  await expectPlanMatches(page, chosenWeek, 'C');

  // Outdoor: a daily low and high, as `--low -6 --high 3`.
  await page.getByTestId('outdoor-range').check();
  await page.getByTestId('outdoor-low').fill('-6');
  await page.getByTestId('outdoor-high').fill('3');
  await expectPlanMatches(page, ref, 'C');
  await expect(page.getByTestId('plan-heat-capacity')).toContainText(`${fmt(ref.equipment!.heatCapacityJPerK / 1e6, 1)} MJ/K`);
  await expect(page.getByTestId('plan-ua')).toContainText(`${fmt(ref.equipment!.uaWPerK, 0)} W/K`);
  await expect(page.getByTestId('plan-basis')).toContainText('not a design load calculation');
  await screenshot(page, 'plan-editor');

  // Bad input is named in the screen's words and stops saving; the prediction waits.
  await page.getByTestId('p-0-0-to').fill('25:00');
  await expect(page.getByTestId('schedule-problem')).toContainText('Monday, period 1 (to): expected a time "HH:MM" from 00:00 to 24:00, got "25:00"');
  await expect(page.getByTestId('save-schedule')).toBeDisabled();
  await expect(page.getByTestId('plan-status')).toHaveText('Fix the schedule to update the prediction.');
  await page.getByTestId('p-0-0-to').fill('18:00');
  await page.getByTestId('add-1').click();
  await page.getByTestId('p-1-1-from').fill('17:00');
  await expect(page.getByTestId('schedule-problem')).toContainText('Tuesday: occupied periods overlap');
  await page.getByTestId('day-tue').getByRole('button', { name: 'Remove Tuesday period 2' }).click();
  await expect(page.getByTestId('schedule-problem')).toHaveCount(0);

  // A deep setback (10 °C, below the 13 °C floor): exported, the file plans the same on the command line.
  await page.getByTestId('unocc-heat').fill('10');
  await expect(page.getByTestId('plan-status')).toHaveText('Up to date');
  const downloadAt = page.waitForEvent('download');
  await page.getByTestId('export-file').click();
  const download = await downloadAt;
  expect(download.suggestedFilename()).toBe('office-annex-nights-and-weekends-at-15-c.json');
  const exported = path.join(scratch, download.suggestedFilename());
  await download.saveAs(exported);
  const json = JSON.parse(readFileSync(exported, 'utf8'));
  expect(json).toEqual({
    name: 'Office Annex, nights and weekends at 15 °C',
    units: 'C',
    days: { weekdays: [{ from: '07:30', to: '18:00', heat: 21 }], weekend: [] },
    unoccupied: { heat: 10, cool: 'off' },
    deadband: 0.6,
    optimalStart: true,
    setbackFloor: 13,
    equipment: { heatingCapacity: { value: 12, unit: 'kW' } },
  });
  const inF = path.join(scratch, 'office-annex-deep-F.json');
  writeFileSync(inF, JSON.stringify(scheduleInUnit(json, 'F')));
  const deepRefs = Promise.all([
    planCli('Office Annex', exported, '--low', '-6', '--high', '3'),
    planCli('Office Annex', inF, '--low', '-6C', '--high', '3C'),
  ]);
  const [deep, deepF] = await deepRefs;
  await expectPlanMatches(page, deep, 'C');
  expect(deep.cautions.some((c) => c.topic === 'freeze' && c.level === 'danger')).toBe(true);
  await expect(page.getByTestId('plan-cautions').locator('li.danger')).toContainText(['Deep setback in freezing weather']);
  await expect(page.getByTestId('plan-cautions').locator('li.warning').first()).toContainText('below the 13.0 °C floor');

  // Saved for the zone: still there after the page is loaded again.
  await page.getByTestId('save-schedule').click();
  await expect(page.getByTestId('save-state')).toContainText('Saved for this zone');
  await page.reload();
  await page.getByRole('navigation').getByRole('button', { name: 'Office Annex' }).click();
  await page.getByTestId('nav-plan').click();
  await expect(page.getByTestId('unocc-heat')).toHaveValue('10');
  await expect(page.getByTestId('save-state')).toContainText('Saved for this zone');
  await page.getByTestId('outdoor-range').check();
  await page.getByTestId('outdoor-low').fill('-6');
  await page.getByTestId('outdoor-high').fill('3');
  await expectPlanMatches(page, deep, 'C');

  // °F: the same plan, every temperature and the cautions' sentences in °F (the command line given the
  // schedule written in °F says the same).
  await page.getByTestId('unit-switch').getByText('°F').click();
  await expect(page.getByTestId('unocc-heat')).toHaveValue('50');
  await expect(page.getByTestId('setback-floor')).toHaveValue('55.4');
  await expect(page.getByTestId('outdoor-low')).toHaveValue('21.2');
  await expectPlanMatches(page, deepF, 'F');
  await expect(page.getByTestId('plan-cautions')).toContainText('below the 55.4 °F floor');
  await page.getByTestId('chart-day-0').click();
  await expect(page.getByTestId('chart-day-0')).toHaveAttribute('aria-pressed', 'true');
  await screenshot(page, 'plan-fahrenheit-monday');
  await page.getByTestId('plan-chart').screenshot({ path: path.join(root, 'test-results', 'screens', 'plan-chart-monday.png') });
  await page.getByTestId('unit-switch').getByText('°C').click();

  // The same schedule for another zone as well, which keeps its own equipment (a heat pump).
  await api('saveSchedules', { entries: [{ zoneId: await zoneId('Café Kitchen'), schedule: JSON.parse(readFileSync(path.join(plans, 'cafe-kitchen.json'), 'utf8')) }] });
  await page.reload();
  await page.getByRole('navigation').getByRole('button', { name: 'Office Annex' }).click();
  await page.getByTestId('nav-plan').click();
  await page.getByTestId('save-several').click();
  await page.getByTestId(`pick-${await zoneId('Café Kitchen')}`).check();
  await screenshot(page, 'plan-save-several');
  await page.getByTestId('confirm-button').click();
  await expect(page.getByTestId('plan-notice')).toContainText('for Office Annex, Café Kitchen');
  const saved = await api<Array<{ zoneId: number; schedule: { name: string; unoccupied: { heat: number }; equipment?: { heatPump?: unknown; heatingCapacity?: { value: number } } } }>>('listSchedules', {});
  const byZone = new Map(saved.map((s) => [s.zoneId, s.schedule]));
  const cafeSchedule = byZone.get(await zoneId('Café Kitchen'))!;
  expect(cafeSchedule.name).toBe('Office Annex, nights and weekends at 15 °C');
  expect(cafeSchedule.unoccupied.heat).toBe(10);
  expect(cafeSchedule.equipment?.heatPump).toBeDefined();
  expect(cafeSchedule.equipment?.heatingCapacity?.value).toBe(9);
  expect(byZone.get(await zoneId('Office Annex'))!.equipment?.heatingCapacity?.value).toBe(12);
});

/** The id of a demo zone by name. */
async function zoneId(name: string): Promise<number> {
  const sites = await api<Array<{ name: string; zones: Array<{ id: number; name: string }> }>>('listSites', {});
  const z = sites.find((s) => s.name === SITE)!.zones.find((x) => x.name === name);
  if (!z) throw new Error(`no zone ${name}`);
  return z.id;
}

test('site timeline: every zone on one design day, starts in order, a zone that cannot recover flagged', async ({ page }) => {
  test.setTimeout(150_000); // three runs of the command line besides the page
  const read = (f: string) => JSON.parse(readFileSync(path.join(plans, f), 'utf8'));
  const ids = { hall: await zoneId('Great Hall'), annex: await zoneId('Office Annex'), cafe: await zoneId('Café Kitchen') };
  await api('fitZone', { zoneId: ids.hall });
  await api('fitZone', { zoneId: ids.annex });
  await api('saveSchedules', {
    entries: [
      { zoneId: ids.hall, schedule: read('great-hall.json') },
      { zoneId: ids.annex, schedule: read('office-annex.json') },
      { zoneId: ids.cafe, schedule: read('cafe-kitchen.json') },
    ],
  });

  // The command line's plans on the same design day (the Café Kitchen's fitted by the command line
  // itself, the same fit the app makes), run while the page works.
  const outdoor = ['--design-db', '-18C', '--daily-range', '0'];
  const siteRefs = Promise.all([
    planCli('Great Hall', path.join(plans, 'great-hall.json'), ...outdoor),
    planCli('Office Annex', path.join(plans, 'office-annex.json'), ...outdoor),
    planCli('Café Kitchen', path.join(plans, 'cafe-kitchen.json'), ...outdoor),
  ]);
  siteRefs.catch(() => undefined);

  await page.goto(server.url);
  await page.getByTestId('nav-site-plan').click();
  await expect(page.getByTestId('screen-site-plan')).toBeVisible();
  await page.getByTestId('site-outdoor-design').check();
  await page.getByTestId('site-outdoor-db').fill('-18');
  await page.getByTestId('site-outdoor-daily-range').fill('0');

  // The Café Kitchen has no fitted response yet: its row says so and fits it on request.
  const cafeRow = page.getByTestId(`site-row-${ids.cafe}`);
  await expect(cafeRow.getByTestId('site-missing')).toContainText('not been fitted yet');
  await expect(page.getByTestId('site-status')).toHaveText('2 of 3 zones planned');
  await screenshot(page, 'site-timeline-unfitted');
  await cafeRow.getByRole('button', { name: 'Fit now' }).click();
  await expect(page.getByTestId('site-status')).toHaveText('3 of 3 zones planned', { timeout: 60_000 });

  const [hall, annex, cafe] = await siteRefs;
  const C = (c: number) => `${fmt(c, 1)} °C`;
  const lowestOf = (p: CliPlan, days = p.days) => Math.min(...days.map((d) => d.lowestUnoccupiedC ?? Infinity));
  // The Great Hall's schedule is written in °F; the screen works in °C (the same plan within 1e-6 K).
  const near = async (cell: import('@playwright/test').Locator, expected: number, unit: string, tol: number) => {
    const text = (await cell.innerText()).replace('−', '-');
    expect(text.endsWith(unit)).toBe(true);
    expect(Math.abs(Number.parseFloat(text) - expected)).toBeLessThanOrEqual(tol);
  };

  // The week: earliest start, lowest temperature and runtime saved of each zone.
  for (const [id, ref] of [[ids.hall, hall], [ids.annex, annex]] as const) {
    const row = page.getByTestId(`site-row-${id}`);
    const starts = ref.recoveries.filter((r) => r.status === 'met');
    const earliest = starts.reduce((a, b) => (b.leadHours! > a.leadHours! + 1 / 60 ? b : a)); // first of the longest leads
    await expect(row.getByTestId('site-start')).toHaveText(`${earliest.optimalStartLabel} (${lead(earliest.leadHours!)} lead)`);
    await near(row.getByTestId('site-lowest'), lowestOf(ref), '°C', 0.051);
    await near(row.getByTestId('site-saved'), ref.week.savedPercent!, '%', 0.051);
    await expect(row.getByTestId('site-verdict')).toHaveText('Recovers on time');
  }
  // The heat pump cannot reach 20 °C at −18 °C outdoor: flagged in words on its row.
  expect(cafe.recoveries.every((r) => r.cannotRecoverInTime)).toBe(true);
  const worst = Math.max(...cafe.recoveries.map((r) => r.shortfallK));
  await expect(cafeRow.getByTestId('site-verdict')).toHaveText(`⚠ Cannot recover in time: every morning (7), up to ${fmt(worst, 1)} K short`);
  await expect(cafeRow.getByTestId('site-start')).toHaveText('full output from 20:00, too slow');
  await expect(cafeRow).toHaveClass(/flagged/);
  await expect(cafeRow.getByTestId('site-lowest')).toHaveText(C(lowestOf(cafe)));
  await expect(page.getByTestId('site-cautions')).toContainText('Café Kitchen: Cannot recover in time');
  // The seven recovery-by-recovery auxiliary-heat warnings of the heat pump are given once, with all their times.
  const aux = cafe.cautions.filter((c) => c.text.startsWith('Recovery '));
  expect(aux).toHaveLength(7);
  await expect(page.getByTestId('site-cautions').locator('li', { hasText: 'auxiliary heat would likely run' })).toHaveCount(1);
  await expect(page.getByTestId('site-cautions')).toContainText(`Café Kitchen: Recoveries ${aux.map((c) => c.text.slice(9, 18)).join(', ')}: auxiliary heat would likely run`);
  await expect(page.getByTestId('site-notes')).toContainText('not a design load calculation');
  await screenshot(page, 'site-timeline-week');

  // Monday: each zone's start and the order of starts, as the command line has them.
  await page.getByTestId('site-day-0').click();
  const monday = (p: CliPlan) => p.days[0]!.recoveries.filter((r) => r.status === 'met');
  for (const [id, ref] of [[ids.hall, hall], [ids.annex, annex]] as const) {
    const row = page.getByTestId(`site-row-${id}`);
    await expect(row.getByTestId('site-start')).toHaveText(monday(ref).map((r) => hhmmOf(r.optimalStartLabel)).join(', '));
    await expect(row.getByTestId('site-lowest')).toHaveText(C(lowestOf(ref, [ref.days[0]!])));
  }
  const order = [
    ...monday(hall).map((r) => ({ zone: 'Great Hall', r })),
    ...monday(annex).map((r) => ({ zone: 'Office Annex', r })),
  ].sort((a, b) => hhmmOf(a.r.optimalStartLabel).localeCompare(hhmmOf(b.r.optimalStartLabel)));
  const items = page.getByTestId('site-sequence').locator('li');
  await expect(items).toHaveCount(order.length);
  for (let i = 0; i < order.length; i++) {
    await expect(items.nth(i)).toContainText(`${hhmmOf(order[i]!.r.optimalStartLabel)} ${order[i]!.zone}: heating for ${lead(order[i]!.r.leadHours!)} before`);
  }
  await screenshot(page, 'site-timeline-monday');

  // °F: the same timeline in °F.
  await page.getByTestId('unit-switch').getByText('°F').click();
  await expect(page.getByTestId(`site-row-${ids.annex}`).getByTestId('site-lowest')).toHaveText(`${fmt(lowestOf(annex, [annex.days[0]!]) * 1.8 + 32, 1)} °F`);
  await expect(page.getByTestId('site-outdoor-db')).toHaveValue('-0.4');
  await page.getByTestId('unit-switch').getByText('°C').click();

  // The heat pump's figures are in the editor of its zone, and its caution with the plan.
  await page.getByRole('navigation').getByRole('button', { name: 'Café Kitchen' }).click();
  await page.getByTestId('nav-plan').click();
  await expect(page.getByTestId('heat-pump')).toBeChecked();
  await expect(page.getByTestId('hp-0-outdoor')).toHaveValue('7');
  await expect(page.getByTestId('hp-1-percent')).toHaveValue('65');
  await expect(page.getByTestId('hp-aux')).toHaveValue('-3');
  await expect(page.getByTestId('heat-capacity')).toHaveValue('9');
  await expect(page.getByTestId('plan-status')).toHaveText('Up to date');
  await expect(page.getByTestId('plan-cautions').locator('li[data-topic="heat-pump"]').first()).toContainText('auxiliary heat');
  await expect(page.getByTestId('plan-equipment')).toContainText("where the log's heating ran on average");
  await page.getByTestId('nav-site-plan').click();

  // A row's link opens the zone's schedule.
  await page.getByTestId(`site-row-${ids.hall}`).getByRole('button', { name: 'Edit schedule' }).click();
  await expect(page.getByTestId('schedule-name')).toHaveValue('Great Hall, night setback 58 °F');
});
