/**
 * The report's tables as rows of cells — a header row with the unit of every column, then the data —
 * for the CSV exports. Values are plain numbers in the report's unit (rounded only to remove float
 * noise), so a spreadsheet can compute with them; the printed tables round them for reading.
 * CSV text is written by papaparse (quotes, separators and line ends done right).
 */
import Papa from 'papaparse';
import type { LogQuality } from '../../../api/report.ts';
import type { PlanResultInfo } from '../../../api/plan.ts';
import type { PresentedResponse } from '../../../../core/present.ts';
import type { RecoveryTable } from '../../../../core/recovery-table.ts';
import type { TempUnit } from '../../../../core/types.ts';
import { degreeLabel, deltaFromKelvin, fromCelsius } from '../../../../core/units.ts';
import type { Comparison } from '../../../../core/what-if.ts';

export type Cell = string | number | null;
export type Rows = Cell[][];

const round = (v: number | null | undefined, digits = 4): number | null =>
  v === null || v === undefined || !Number.isFinite(v) ? null : Math.round(v * 10 ** digits) / 10 ** digits;
const dl = (u: TempUnit) => (u === 'C' ? 'K' : '°F');
const iso = (ms: number | null) => (ms === null ? null : new Date(ms).toISOString().replace('.000Z', 'Z'));

/** CSV text (comma-separated, CRLF line ends, a final line end) of rows. */
export function toCsv(rows: Rows): string {
  return `${Papa.unparse(rows.map((r) => r.map((c) => (c === null ? '' : c))), { newline: '\r\n' })}\r\n`;
}

/** The fitted response: one row per quantity with its 95 % interval and unit. */
export function responseRows(r: PresentedResponse): Rows {
  const u = dl(r.units);
  const rows: Rows = [['Quantity', 'Estimate', '95 % interval low', '95 % interval high', 'Unit']];
  rows.push(['Time constant τ', round(r.timeConstantHours), round(r.timeConstantHoursCI[0]), round(r.timeConstantHoursCI[1]), 'h']);
  if (r.heatingRatePerHour !== null) rows.push(['Heating rate h', round(r.heatingRatePerHour), round(r.heatingRatePerHourCI?.[0]), round(r.heatingRatePerHourCI?.[1]), `${u}/h`]);
  if (r.coolingRatePerHour !== null) rows.push(['Cooling rate c', round(r.coolingRatePerHour), round(r.coolingRatePerHourCI?.[0]), round(r.coolingRatePerHourCI?.[1]), `${u}/h`]);
  rows.push(['Internal gain g', round(r.gainPerHour), null, null, `${u}/h`]);
  if (r.heatingLift !== null) rows.push(['Heating lift h·τ', round(r.heatingLift), null, null, u]);
  rows.push(['Fit error RMSE', round(r.rmse), null, null, u]);
  if (r.heldOutRmse !== null) rows.push(['Held-out RMSE', round(r.heldOutRmse), null, null, u]);
  rows.push(['CV(RMSE) (ASHRAE Guideline 14)', round(r.cvrmsePercent), null, null, '%']);
  rows.push(['NMBE (ASHRAE Guideline 14)', round(r.nmbePercent), null, null, '%']);
  rows.push(['Readings used', r.samplesUsed, null, null, 'readings']);
  rows.push(['Days used', r.daysUsed, null, null, 'days']);
  rows.push(['Free-floating time', round(r.freeFloatHours, 1), null, null, 'h']);
  return rows;
}

/** The recovery table: outdoor temperature down, setback depth across, hours to the target (blank = not reached). */
export function recoveryTableRows(t: RecoveryTable): Rows {
  const deg = degreeLabel(t.unit);
  const target = round(fromCelsius(t.targetC, t.unit), 2);
  const header: Cell[] = [`Outdoor (${deg})`];
  t.depths.forEach((d, i) => {
    const from = round(fromCelsius(t.targetC - t.depthsK[i]!, t.unit), 2);
    header.push(`${d} ${dl(t.unit)} setback from ${from} ${deg} to ${target} ${deg}: recovery (h)`);
  });
  const rows: Rows = [header];
  for (const row of t.rows) rows.push([row.outdoorShown, ...row.cells.map((c) => round(c.hours))]);
  return rows;
}

/** The plan's days: occupancy, optimal start, lowest setback temperature, runtime with and without the setback. */
export function planDayRows(plan: PlanResultInfo, unit: TempUnit): Rows {
  const deg = degreeLabel(unit);
  const energy = plan.week.heatEnergyWh !== null;
  const header: Cell[] = [
    'Day', 'Occupancy', 'Heating starts', 'Lead (h)', `Lowest while set back (${deg})`, `Outdoor low (${deg})`,
    'Heating runtime with setback (h)', 'Heating runtime without (h)', 'Runtime saved (h)', 'Runtime saved (%)',
  ];
  if (energy) header.push('Heat saved (kWh)');
  const rows: Rows = [header];
  for (const d of plan.days) {
    const rec = d.recoveries.find((x) => x.mode === 'heat') ?? null;
    const row: Cell[] = [
      d.label,
      rec?.occupancyLabel ?? null,
      rec?.optimalStartLabel ?? null,
      round(rec?.leadHours, 2),
      round(d.lowestUnoccupiedC === null ? null : fromCelsius(d.lowestUnoccupiedC, unit), 2),
      round(fromCelsius(d.outdoorMinC, unit), 2),
      round(d.heatHours, 2),
      round(d.baselineHeatHours, 2),
      round(d.savedHeatHours, 2),
      round(d.savedHeatPercent, 1),
    ];
    if (energy) row.push(round(d.savedHeatEnergyWh === null ? null : d.savedHeatEnergyWh / 1000, 2));
    rows.push(row);
  }
  const w = plan.week;
  const total: Cell[] = ['Week', null, null, null, null, round(fromCelsius(plan.outdoor.minC, unit), 2), round(w.heatHours, 2), round(w.baselineHeatHours, 2), round(w.savedHeatHours, 2), round(w.savedHeatPercent, 1)];
  if (energy) total.push(round(w.savedHeatEnergyWh === null ? null : w.savedHeatEnergyWh / 1000, 2));
  rows.push(total);
  return rows;
}

/** Rejected rows of the zone's logs (the first ones the store returns). */
export function rejectedRows(q: LogQuality): Rows {
  return [['File', 'Line', 'Column', 'Column name', 'Reason'], ...q.rejected.map((r) => [r.file, r.line, r.column, r.columnName, r.reason])];
}

/** Gaps in the readings, longest first (UTC times). */
export function gapRows(q: LogQuality): Rows {
  return [['Last reading before (UTC)', 'First reading after (UTC)', 'Gap (h)'], ...q.gaps.map((g) => [iso(g.from), iso(g.to), round(g.hours, 2)])];
}

/** The what-if comparison: today's zone and the changed one at the same conditions. */
export function comparisonRows(c: Comparison, unit: TempUnit, driftHours = 8): Rows {
  const deg = degreeLabel(unit);
  const T = (v: number) => round(fromCelsius(v, unit), 2);
  const D = (k: number) => round(deltaFromKelvin(k, unit), 2);
  const row = (label: string, f: (s: Comparison['today']) => Cell): Cell[] => [label, f(c.today), f(c.whatIf)];
  return [
    ['Quantity', 'Today', 'What if'],
    ['Heating output (× today)', 1, round(c.change.capacityFactor, 3)],
    ['Envelope heat loss UA (× today)', 1, round(c.change.heatLossFactor, 3)],
    row('Time constant τ (h)', (s) => round(s.model.tauHours, 2)),
    row(`Heating rate h (${dl(unit)}/h)`, (s) => D(s.model.heatRate)),
    row(`Heating lift h·τ (${dl(unit)})`, (s) => D(s.heatingLiftK)),
    row(`Full-heat level (${deg})`, (s) => T(s.fullHeatLevelC)),
    row('Recovery time (h)', (s) => round(s.recoveryHours, 3)),
    row(`After ${driftHours} h unheated from the target (${deg})`, (s) => T(s.driftEndC)),
    row('Hours unheated from the target down to the setback (h)', (s) => round(s.hoursToSetback, 2)),
  ];
}
