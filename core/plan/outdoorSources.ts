/**
 * Where a plan's outdoor temperature comes from: the zone's own history (a chosen week), a design day
 * (design dry-bulb and daily range, ASHRAE Table 6 shape), or a user-entered daily low and high. Each
 * builder returns the profile on the simulation's time axis together with the matching clock.
 */
import { DateTime } from 'luxon';
import { InputError } from '../errors.ts';
import { outdoorProfile, type OutdoorProfile } from '../outdoor.ts';
import type { ZoneSeries } from '../types.ts';
import { designClock, zonedClock, type PlanClock } from './clock.ts';
import { designDayProfile, lowHighProfile } from './designDay.ts';

export type PlanOutdoorSource =
  | { kind: 'history'; weekStart: string; timeZone: string }
  | { kind: 'design'; designDbC: number; dailyRangeK: number; solarOffsetHours: number }
  | { kind: 'range'; lowC: number; highC: number; solarOffsetHours: number };

export interface PlanOutdoor {
  source: PlanOutdoorSource;
  /** °C over simulation hours (0 = local midnight of day 0). */
  profile: OutdoorProfile;
  clock: PlanClock;
  /** Plain sentences about the outdoor data (e.g. a gap bridged linearly). */
  notes: string[];
}

/** Longest gap without an outdoor reading that a history week may have, hours. */
export const MAX_OUTDOOR_GAP_HOURS = 6;
/** Gaps longer than this are mentioned in the plan's notes, hours. */
export const NOTED_OUTDOOR_GAP_HOURS = 1;

/**
 * A week of design days (Monday to Sunday, identical days).
 * @param designDbC design dry-bulb (daily maximum), °C; dailyRangeK daily range, K
 * @param solarOffsetHours AST − clock time, hours (default 0)
 * @throws InputError for a non-finite dry-bulb or a bad range (designDay.ts)
 * @example designDayOutdoor(35, 11)
 */
export function designDayOutdoor(designDbC: number, dailyRangeK: number, solarOffsetHours = 0): PlanOutdoor {
  return {
    source: { kind: 'design', designDbC, dailyRangeK, solarOffsetHours },
    profile: designDayProfile(designDbC, dailyRangeK, { days: 7, solarOffsetHours }),
    clock: designClock(7),
    notes: [],
  };
}

/**
 * A week of identical days between a daily low and high (°C), Table 6 shape.
 * @throws InputError when high < low
 * @example lowHighOutdoor(-8, 2)
 */
export function lowHighOutdoor(lowC: number, highC: number, solarOffsetHours = 0): PlanOutdoor {
  return {
    source: { kind: 'range', lowC, highC, solarOffsetHours },
    profile: lowHighProfile(lowC, highC, { days: 7, solarOffsetHours }),
    clock: designClock(7),
    notes: [],
  };
}

/**
 * The outdoor readings of a zone's own log over 7 local days from `weekStart` (YYYY-MM-DD, local
 * midnight in `timeZone`), on the simulation's time axis, linear between readings.
 *
 * @throws InputError when the log has no outdoor readings there, or a gap between readings (or at
 *         either end of the week) is longer than MAX_OUTDOOR_GAP_HOURS; the message names the gap
 * @example historyOutdoor(series, '2026-01-12', 'America/Chicago')
 */
export function historyOutdoor(series: ZoneSeries, weekStart: string, timeZone: string): PlanOutdoor {
  const clock = zonedClock(weekStart, timeZone, 7);
  const startMs = clock.startMs!;
  const endMs = startMs + clock.hoursAt(7, 0) * 3_600_000;
  const fmt = (ms: number) => DateTime.fromMillis(ms, { zone: timeZone }).toFormat('yyyy-LL-dd HH:mm');
  const times: number[] = [];
  const temps: number[] = [];
  const pad = MAX_OUTDOOR_GAP_HOURS * 3_600_000;
  for (let i = 0; i < series.time.length; i++) {
    const t = series.time[i]!;
    const v = series.outdoor[i]!;
    if (t < startMs - pad || t > endMs + pad || !Number.isFinite(v)) continue;
    times.push((t - startMs) / 3_600_000);
    temps.push(v);
  }
  if (times.length === 0) {
    throw new InputError(`The log has no outdoor readings in the week from ${fmt(startMs)} to ${fmt(endMs)}; choose another week or use a design day or a daily low and high.`);
  }
  const horizon = (endMs - startMs) / 3_600_000;
  // Stretches of [0, horizon] without a reading (edges included).
  const gaps: Array<{ gap: number; at: number }> = [{ gap: Math.max(0, times[0]!), at: 0 }];
  for (let i = 1; i < times.length; i++) {
    const a = times[i - 1]!;
    const b = times[i]!;
    if (b > 0 && a < horizon) gaps.push({ gap: b - a, at: a });
  }
  const last = times[times.length - 1]!;
  gaps.push({ gap: Math.max(0, horizon - last), at: last });
  const worst = gaps.reduce((w, g) => (g.gap > w.gap ? g : w));
  if (worst.gap > MAX_OUTDOOR_GAP_HOURS) {
    throw new InputError(
      `The log's outdoor readings have a gap of ${worst.gap.toFixed(1)} h from ${fmt(startMs + worst.at * 3_600_000)} in the week from ${fmt(startMs)}; ` +
        `a week needs a reading at least every ${MAX_OUTDOOR_GAP_HOURS} h. Choose another week or use a design day or a daily low and high.`,
    );
  }
  const notes = gaps
    .filter((g) => g.gap > NOTED_OUTDOOR_GAP_HOURS)
    .map((g) => `The log has no outdoor reading for ${g.gap.toFixed(1)} h from ${fmt(startMs + g.at * 3_600_000)}; the outdoor temperature is taken as a straight line across the gap.`);
  return { source: { kind: 'history', weekStart: clock.dayLabel(0).slice(4), timeZone }, profile: outdoorProfile(times, temps), clock, notes };
}

/**
 * The latest week of the log (7 local days from a Monday) whose outdoor readings are complete enough
 * for historyOutdoor, or null when there is none.
 * @example latestHistoryWeek(series, 'America/Chicago') // "2026-01-12"
 */
export function latestHistoryWeek(series: ZoneSeries, timeZone: string): string | null {
  const n = series.time.length;
  if (n === 0) return null;
  let monday = DateTime.fromMillis(series.time[n - 1]!, { zone: timeZone }).startOf('week');
  const first = series.time[0]!;
  for (let k = 0; k < 60 && monday.toMillis() >= first - 86_400_000; k++) {
    try {
      historyOutdoor(series, monday.toISODate()!, timeZone);
      return monday.toISODate();
    } catch {
      monday = monday.minus({ weeks: 1 });
    }
  }
  return null;
}
