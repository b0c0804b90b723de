/**
 * A schedule laid out on the plan's clock: the intervals of constant setpoints over the horizon, in
 * whole minutes of simulation time (elapsed minutes from local midnight of day 0).
 */
import { InputError } from '../errors.ts';
import type { PlanClock } from './clock.ts';
import type { Setpoints, WeeklySchedule } from './schedule.ts';

/** One interval of constant setpoints, [startMinute, endMinute) of simulation time. */
export interface TimelineInterval extends Setpoints {
  startMinute: number;
  endMinute: number;
  occupied: boolean;
}

const same = (a: TimelineInterval, b: TimelineInterval) => a.occupied === b.occupied && a.heatC === b.heatC && a.coolC === b.coolC;

/** Merges neighbours with identical setpoints and occupancy. */
export function mergeIntervals(list: TimelineInterval[]): TimelineInterval[] {
  const out: TimelineInterval[] = [];
  for (const iv of list) {
    if (iv.endMinute <= iv.startMinute) continue;
    const last = out[out.length - 1];
    if (last && last.endMinute === iv.startMinute && same(last, iv)) last.endMinute = iv.endMinute;
    else out.push({ ...iv });
  }
  return out;
}

/**
 * Lays a weekly schedule on the clock's calendar days. `variant` 'baseline' keeps the same interval
 * boundaries but holds the schedule's baseline setpoints in every interval (so that a schedule whose
 * setpoints equal the baseline's produces the very same arithmetic).
 *
 * @returns intervals covering [0, horizon minutes), merged where neighbours are identical
 * @throws InputError if the clock's days are not whole minutes long
 * @example scheduleTimeline(schedule, designClock(7))
 */
export function scheduleTimeline(schedule: WeeklySchedule, clock: PlanClock, variant: 'schedule' | 'baseline' = 'schedule'): TimelineInterval[] {
  const minuteAt = (d: number, m: number) => {
    const x = clock.hoursAt(d, m) * 60;
    const r = Math.round(x);
    if (Math.abs(x - r) > 1e-6) throw new InputError('The plan clock must place schedule times on whole minutes.');
    return r;
  };
  const horizon = minuteAt(clock.days, 0);
  const occupied: TimelineInterval[] = [];
  for (let d = 0; d < clock.days; d++) {
    for (const p of schedule.days[clock.weekday(d)]!) {
      const s = minuteAt(d, p.fromMinute);
      const e = p.toMinute >= 1440 ? minuteAt(d + 1, 0) : minuteAt(d, p.toMinute);
      if (e > s) occupied.push({ startMinute: s, endMinute: e, occupied: true, heatC: p.heatC, coolC: p.coolC });
    }
  }
  occupied.sort((a, b) => a.startMinute - b.startMinute);
  const all: TimelineInterval[] = [];
  let cursor = 0;
  const un = schedule.unoccupied;
  for (const iv of occupied) {
    const s = Math.max(iv.startMinute, cursor);
    if (s > cursor) all.push({ startMinute: cursor, endMinute: s, occupied: false, heatC: un.heatC, coolC: un.coolC });
    if (iv.endMinute > s) all.push({ ...iv, startMinute: s });
    cursor = Math.max(cursor, iv.endMinute);
  }
  if (cursor < horizon) all.push({ startMinute: cursor, endMinute: horizon, occupied: false, heatC: un.heatC, coolC: un.coolC });
  if (variant === 'baseline') {
    for (const iv of all) {
      iv.heatC = schedule.baseline.heatC;
      iv.coolC = schedule.baseline.coolC;
    }
  }
  return mergeIntervals(all);
}
