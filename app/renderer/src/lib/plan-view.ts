/**
 * Presenting a plan (core/plan PlanResult, internal units) to a person: wall-clock labels of the
 * plan's time axis, recoveries in words, energy and power with their units, runtime per hour.
 */
import { DateTime } from 'luxon';
import type { PlanCurveInfo, PlanRecoveryInfo, PlanResultInfo } from '../../../api/plan.ts';
import type { TempUnit } from '../../../../core/types.ts';
import { count, delta, duration, num, temp } from './format.ts';

const WEEKDAYS = ['Mon', 'Tue', 'Wed', 'Thu', 'Fri', 'Sat', 'Sun'];

export interface PlanClockLabels {
  /** "Mon" (design days) or "Mon 31 Mar" (a dated week) of simulation hour t. */
  day(t: number): string;
  /** Local wall-clock "HH:MM" of simulation hour t. */
  time(t: number): string;
}

/** Labels of the plan's time axis (hours from local midnight of its first day, elapsed time). */
export function clockLabels(outdoor: PlanResultInfo['outdoor']): PlanClockLabels {
  if (outdoor.kind === 'history') {
    const start = DateTime.fromISO(outdoor.weekStart, { zone: outdoor.timeZone }).startOf('day');
    const at = (t: number) => start.plus({ minutes: Math.round(t * 60) });
    return {
      day: (t) => at(t + 1e-9).toFormat('ccc d LLL', { locale: 'en-GB' }),
      time: (t) => at(t).toFormat('HH:mm'),
    };
  }
  return {
    day: (t) => WEEKDAYS[((Math.floor(t / 24 + 1e-9) % 7) + 7) % 7]!,
    time: (t) => {
      const m = Math.round((((t % 24) + 24) % 24) * 60) % 1440;
      return `${String(Math.floor(m / 60)).padStart(2, '0')}:${String(m % 60).padStart(2, '0')}`;
    },
  };
}

/**
 * Where a zone's row on the site timeline is not on the axis's days (the axis is labelled with the
 * first planned zone's): each row runs on its own zone's local days, so a zone in another time zone,
 * or whose latest week is another, says whose days it shows. Null when its days are the axis's.
 */
export function ownDaysNote(own: PlanResultInfo['outdoor'], axis: PlanResultInfo['outdoor'] | null): string | null {
  if (own.kind !== 'history' || axis === null) return null;
  if (axis.kind === 'history' && axis.timeZone === own.timeZone && axis.weekStart === own.weekStart) return null;
  return `Days in ${own.timeZone}, week from ${clockLabels(own).day(0)}`;
}

/** Heat or cooling delivered, Wh inside: "48.6 kWh (166 kBtu)". */
export function energy(wh: number | null | undefined): string {
  if (wh === null || wh === undefined || !Number.isFinite(wh)) return '—';
  return `${num(wh / 1000, 1)} kWh (${count(Math.round((wh * 3.412142) / 1000))} kBtu)`;
}

/** A power, W inside: "26.4 kW (90,000 Btu/h)". */
export function power(w: number | null | undefined): string {
  if (w === null || w === undefined || !Number.isFinite(w)) return '—';
  return `${num(w / 1000, 1)} kW (${count(Math.round(w * 3.412142))} Btu/h)`;
}

/** A percentage, "12.3 %", or "—". */
export function percent(p: number | null | undefined, digits = 1): string {
  return p === null || p === undefined || !Number.isFinite(p) ? '—' : `${num(p, digits)} %`;
}

/** Whether a recovery needs flagging: it cannot make the setpoint at occupancy even from the start of the setback. */
export function cannotRecover(r: PlanRecoveryInfo): boolean {
  return r.cannotRecoverInTime;
}

/** The time of a label "Mon 05:10" without its weekday. */
const timeOf = (label: string | null) => (label ? label.slice(label.lastIndexOf(' ') + 1) : '—');

/** One recovery in words, e.g. "start 05:10, 1 h 50 min before 07:00". */
export function recoveryWords(r: PlanRecoveryInfo, unit: TempUnit, optimalStart: boolean): string {
  const what = r.mode === 'heat' ? 'heating' : 'cooling';
  const at = timeOf(r.occupancyLabel);
  switch (r.status) {
    case 'not-needed':
      return `no early ${what} needed for ${at}`;
    case 'met':
      return `${what} starts ${timeOf(r.optimalStartLabel)}, ${duration(r.leadHours)} before ${at}`;
    case 'late':
      if (r.cannotRecoverInTime) return `cannot recover in time: ${delta(r.shortfallK, unit)} short at ${at}, reaches ${temp(r.targetC, unit)} at ${timeOf(r.reachedLabel)}`;
      return optimalStart
        ? `reaches ${temp(r.targetC, unit)} at ${timeOf(r.reachedLabel)}, after ${at}`
        : `setpoint changes at ${at}; reaches ${temp(r.targetC, unit)} at ${timeOf(r.reachedLabel)}${r.optimalStartLabel ? ` (optimal start would be ${timeOf(r.optimalStartLabel)})` : ''}`;
    case 'not-reached':
      return r.cannotRecoverInTime
        ? `cannot recover: ${delta(r.shortfallK, unit)} short at ${at}, ${temp(r.targetC, unit)} not reached while occupied`
        : `${temp(r.targetC, unit)} not reached while occupied${r.optimalStartLabel ? ` (optimal start would be ${timeOf(r.optimalStartLabel)})` : ''}`;
  }
}

/**
 * Runtime per hour from the curve's bins, % of each hour, one point at the start of each hour (drawn
 * as steps). `which` picks the schedule's or the baseline's heating or cooling.
 */
export function hourlyRuntime(curve: PlanCurveInfo, which: 'heatFraction' | 'coolFraction' | 'baselineHeatFraction' | 'baselineCoolFraction'): Array<{ x: number; y: number }> {
  const frac = curve[which];
  const sums = new Map<number, { s: number; w: number }>();
  for (let i = 0; i < frac.length; i++) {
    const a = curve.hours[i]!;
    const b = curve.hours[i + 1]!;
    const h = Math.floor(a + 1e-9);
    const e = sums.get(h) ?? { s: 0, w: 0 };
    e.s += frac[i]! * (b - a);
    e.w += b - a;
    sums.set(h, e);
  }
  const out: Array<{ x: number; y: number }> = [];
  for (const [h, e] of [...sums.entries()].sort((p, q) => p[0] - q[0])) out.push({ x: h, y: e.w > 0 ? (100 * e.s) / e.w : 0 });
  const end = curve.hours[curve.hours.length - 1]!;
  if (out.length) out.push({ x: end, y: out[out.length - 1]!.y });
  return out;
}
