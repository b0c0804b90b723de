/**
 * The report's charts as chart.js configurations: fixed size (the page's text width), drawn once at
 * print resolution, no animation, no interaction. Data come from the report's data (ReportData): the
 * fitted response's overlay, the recovery curves and the plan's week, converted to the report's unit.
 */
import type { ChartConfiguration } from 'chart.js';
import type { Overlay } from '../../../api/contract.ts';
import type { PlanCurveInfo } from '../../../api/plan.ts';
import type { Curve, RecoveryCurve } from '../../../../core/recovery.ts';
import type { TempUnit } from '../../../../core/types.ts';
import { degreeLabel, fromCelsius } from '../../../../core/units.ts';
import { COLORS, curvePoints } from '../lib/charts.ts';
import { date } from '../lib/format.ts';

export type ReportChartConfig = ChartConfiguration<'line', { x: number; y: number | null }[]>;

const FONT = { size: 10 };
const GRID = { color: '#e3e7eb' };
const AXIS_TITLE = (text: string) => ({ display: true, text, font: { size: 10, weight: 600 as const } });

function base(xTitle: string, yTitle: string, xTicks: (v: number) => string, stepSize?: number, max?: number): ReportChartConfig['options'] {
  return {
    parsing: false,
    responsive: false,
    animation: false,
    events: [],
    plugins: { legend: { display: false }, tooltip: { enabled: false } },
    layout: { padding: { top: 4, right: 8 } },
    scales: {
      x: {
        type: 'linear',
        min: 0,
        ...(max !== undefined ? { max } : {}),
        title: AXIS_TITLE(xTitle),
        ticks: { font: FONT, maxRotation: 0, callback: (v) => xTicks(Number(v)), ...(stepSize ? { stepSize } : {}) },
        grid: GRID,
      },
      y: { title: AXIS_TITLE(yTitle), ticks: { font: FONT }, grid: GRID },
    },
  };
}

/** Held-out days laid end to end: measured and simulated indoor, and outdoor, 24 h per day. */
export function overlayChart(o: Overlay, unit: TempUnit, timeZone: string | undefined): { config: ReportChartConfig; days: number } {
  const measured: { x: number; y: number | null }[] = [];
  const simulated: { x: number; y: number | null }[] = [];
  const outdoor: { x: number; y: number | null }[] = [];
  const labels: string[] = [];
  let day = -1;
  let dayStart = 0;
  const T = (c: number | null | undefined) => (c === null || c === undefined ? null : fromCelsius(c, unit));
  for (let i = 0; i < o.time.length; i++) {
    const t = o.time[i]!;
    const isBreak = o.measured[i] === null && o.simulated[i] === null && o.outdoor[i] === null;
    if (isBreak) continue;
    if (day < 0 || o.starts.includes(t)) {
      if (day >= 0) {
        // a break between days, so no line joins them
        for (const s of [measured, simulated, outdoor]) s.push({ x: day * 24 + 24, y: null });
      }
      day++;
      dayStart = t;
      labels.push(date(t, timeZone).replace(/\u2011/g, '-'));
    }
    const x = day * 24 + Math.min(24, (t - dayStart) / 3_600_000);
    measured.push({ x, y: T(o.measured[i]) });
    simulated.push({ x, y: T(o.simulated[i]) });
    outdoor.push({ x, y: T(o.outdoor[i]) });
  }
  const days = day + 1;
  const tick = (v: number) => {
    const k = Math.floor(v / 24 + 1e-9);
    const h = Math.round(v - k * 24);
    if (h === 0 && labels[k]) return labels[k]!;
    return h === 12 ? '12 h' : '';
  };
  const config: ReportChartConfig = {
    type: 'line',
    data: {
      datasets: [
        { label: 'Measured indoor', data: measured, borderColor: COLORS.indoor, borderWidth: 1.6, pointRadius: 0, spanGaps: false, order: 1 },
        { label: 'Simulated indoor', data: simulated, borderColor: COLORS.simulated, borderWidth: 1.6, borderDash: [6, 3], pointRadius: 0, spanGaps: false, order: 0 },
        { label: 'Outdoor', data: outdoor, borderColor: COLORS.outdoor, borderWidth: 1, pointRadius: 0, spanGaps: false, order: 2 },
      ],
    },
    options: base('Held-out days, each from its first reading (hours of the day)', `Temperature (${degreeLabel(unit)})`, tick, 12, days * 24),
  };
  return { config, days };
}

/** Recovery with full heat: today's curve, the what-if curve, and the target. */
export function recoveryChart(today: RecoveryCurve, whatIf: RecoveryCurve | null, targetC: number, unit: TempUnit): ReportChartConfig {
  const end = Math.max(today.t[today.t.length - 1] ?? 1, whatIf ? (whatIf.t[whatIf.t.length - 1] ?? 1) : 0);
  const max = Math.max(1, Math.ceil(end * 1.08));
  const y = fromCelsius(targetC, unit);
  const datasets: ReportChartConfig['data']['datasets'] = [
    { label: 'Today', data: curvePoints(today, unit), borderColor: COLORS.indoor, borderWidth: 2.4, pointRadius: 0 },
  ];
  if (whatIf) datasets.push({ label: 'What if', data: curvePoints(whatIf, unit), borderColor: COLORS.simulated, borderWidth: 2.4, borderDash: [7, 4], pointRadius: 0 });
  datasets.push({ label: 'Target', data: [{ x: 0, y }, { x: max, y }], borderColor: COLORS.target, borderWidth: 1.2, borderDash: [3, 3], pointRadius: 0 });
  const step = max <= 6 ? 1 : max <= 12 ? 2 : max <= 24 ? 4 : 8;
  const options = base('Hours after the heating starts at full output', `Zone temperature (${degreeLabel(unit)})`, (v) => (Number.isInteger(v) ? `${v} h` : ''), step, max)!;
  // Room above the target and below the start, so neither line sits on the frame.
  const from = fromCelsius(today.temp[0]!, unit);
  const pad = Math.max(1, 0.12 * Math.abs(y - from));
  options.scales!.y = { ...options.scales!.y, suggestedMin: Math.min(from, y) - pad, suggestedMax: Math.max(from, y) + pad };
  return { type: 'line', data: { datasets }, options };
}

/** Unheated drift from the target: today's and the what-if's, with the setback for reference. */
export function driftChart(today: Curve, whatIf: Curve, setbackC: number, unit: TempUnit): ReportChartConfig {
  const max = today.t[today.t.length - 1] ?? 12;
  const y = fromCelsius(setbackC, unit);
  const options = base('Hours with the heating off', `Zone temperature (${degreeLabel(unit)})`, (v) => (Number.isInteger(v) ? `${v} h` : ''), 2, max)!;
  const first = fromCelsius(today.temp[0]!, unit);
  const pad = Math.max(1, 0.1 * Math.abs(first - y));
  options.scales!.y = { ...options.scales!.y, suggestedMin: Math.min(y, first) - pad, suggestedMax: first + pad };
  return {
    type: 'line',
    data: {
      datasets: [
        { label: 'Today', data: curvePoints(today, unit), borderColor: COLORS.indoor, borderWidth: 2.2, pointRadius: 0 },
        { label: 'What if', data: curvePoints(whatIf, unit), borderColor: COLORS.simulated, borderWidth: 2.2, borderDash: [7, 4], pointRadius: 0 },
        { label: 'Setback', data: [{ x: 0, y }, { x: max, y }], borderColor: COLORS.target, borderWidth: 1.2, borderDash: [3, 3], pointRadius: 0 },
      ],
    },
    options,
  };
}

const DAY_NAMES = ['Mon', 'Tue', 'Wed', 'Thu', 'Fri', 'Sat', 'Sun'];

/** The plan's week: indoor with the setback, indoor held at the baseline, the heating setpoint, outdoor. */
export function planChart(c: PlanCurveInfo, unit: TempUnit, dayLabels: string[]): ReportChartConfig {
  const T = (v: number | null) => (v === null ? null : fromCelsius(v, unit));
  const series = (a: Array<number | null>) => c.hours.map((h, i) => ({ x: h, y: T(a[i] ?? null) }));
  const max = c.hours[c.hours.length - 1] ?? 168;
  // Day names centred on each day (ticks every 12 h; the midnight ones carry the grid line only).
  const tick = (v: number) => {
    const d = Math.floor(v / 24 + 1e-9);
    if (Math.abs(v - d * 24 - 12) > 1e-6) return '';
    const label = dayLabels[d];
    // "Mon 2025-03-31" → "Mon 31"
    return label ? label.replace(/^(\S+)\s+\d{4}-\d{2}-(\d{2})$/, (_m, w: string, day: string) => `${w} ${Number(day)}`) : DAY_NAMES[d % 7]!;
  };
  return {
    type: 'line',
    data: {
      datasets: [
        { label: 'With the setback', data: series(c.indoorC), borderColor: COLORS.indoor, borderWidth: 1.8, pointRadius: 0 },
        { label: 'Held all week', data: series(c.baselineIndoorC), borderColor: '#8a96a3', borderWidth: 1.2, borderDash: [5, 3], pointRadius: 0 },
        { label: 'Heating setpoint', data: series(c.heatSetpointC), borderColor: COLORS.heatSetpoint, borderWidth: 1.1, stepped: 'before', pointRadius: 0, spanGaps: false },
        { label: 'Outdoor', data: series(c.outdoorC), borderColor: COLORS.outdoor, borderWidth: 1, pointRadius: 0 },
      ],
    },
    options: (() => {
      const o = base('Day of the week', `Temperature (${degreeLabel(unit)})`, tick, 12, max)!;
      (o.scales!.x as { ticks: Record<string, unknown> }).ticks.autoSkip = false;
      (o.scales!.x as { grid: unknown }).grid = { color: (ctx: { tick?: { value: number } }) => ((ctx.tick?.value ?? 1) % 24 === 0 ? '#c9d0d7' : 'rgba(0,0,0,0)') };
      return o;
    })(),
  };
}
