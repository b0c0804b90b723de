/**
 * The plan's clock: maps the simulation's time axis (hours from local midnight of day 0, elapsed
 * time, so a daylight-saving change makes a day 23 or 25 h long) to local calendar days and wall-clock
 * times, which is where schedules live.
 */
import { DateTime } from 'luxon';
import { InputError } from '../errors.ts';
import { WEEKDAY_NAMES, type Weekday } from './schedule.ts';

export interface PlanClock {
  /** Number of local calendar days in the horizon. */
  readonly days: number;
  /** Epoch ms (UTC) of local midnight starting day 0, or null for a clock of design days. */
  readonly startMs: number | null;
  /** IANA zone, or null for design days. */
  readonly timeZone: string | null;
  /** Weekday of calendar day d (0 = Monday). */
  weekday(d: number): Weekday;
  /** Simulation hours of local wall-clock `minuteOfDay` on calendar day d (0 ≤ d ≤ days). */
  hoursAt(d: number, minuteOfDay: number): number;
  /** A label for day d: "Mon" for design days, "Mon 2026-01-12" for a dated week. */
  dayLabel(d: number): string;
  /** Local wall-clock "HH:MM" of simulation time t (hours), rounded to the minute. */
  timeLabel(tHours: number): string;
  /** Calendar day index holding simulation time t (floor; may be < 0 or ≥ days). */
  dayOf(tHours: number): number;
}

const pad = (n: number) => String(n).padStart(2, '0');

/**
 * A clock of identical 24-hour days (design days, a low/high day): day d starts at 24·d hours.
 * @param startWeekday weekday of day 0 (default Monday)
 * @example designClock(7).hoursAt(1, 420) // 31 (Tuesday 07:00)
 */
export function designClock(days = 7, startWeekday: Weekday = 0): PlanClock {
  return {
    days,
    startMs: null,
    timeZone: null,
    weekday: (d) => ((((startWeekday + d) % 7) + 7) % 7) as Weekday,
    hoursAt: (d, m) => d * 24 + m / 60,
    dayLabel(d) {
      return WEEKDAY_NAMES[this.weekday(d)]!;
    },
    timeLabel(t) {
      const m = Math.round((((t % 24) + 24) % 24) * 60) % 1440;
      return `${pad(Math.floor(m / 60))}:${pad(m % 60)}`;
    },
    dayOf: (t) => Math.floor(t / 24 + 1e-12),
  };
}

/**
 * A clock of real local days in an IANA time zone, starting at local midnight of `startDate`
 * (YYYY-MM-DD). Daylight-saving changes are honoured (luxon): a wall-clock time that does not exist
 * on a spring-forward day is moved forward by the gap.
 *
 * @throws InputError for an unknown zone or a malformed date
 * @example zonedClock('2026-01-12', 'America/Chicago', 7).dayLabel(0) // "Mon 2026-01-12"
 */
export function zonedClock(startDate: string, timeZone: string, days = 7): PlanClock {
  const start = DateTime.fromISO(startDate, { zone: timeZone });
  if (!DateTime.local().setZone(timeZone).isValid) throw new InputError(`Unknown time zone "${timeZone}" (expected an IANA name such as America/Chicago).`);
  if (!/^\d{4}-\d{2}-\d{2}$/.test(startDate) || !start.isValid) throw new InputError(`"${startDate}" is not a date as YYYY-MM-DD.`);
  const day0 = start.startOf('day');
  const startMs = day0.toMillis();
  const midnights: number[] = [];
  for (let d = 0; d <= days; d++) midnights.push(day0.plus({ days: d }).toMillis());
  const hoursAt = (d: number, m: number) => {
    const base = day0.plus({ days: d });
    const dt = DateTime.fromObject({ year: base.year, month: base.month, day: base.day, hour: Math.floor(m / 60) % 24, minute: m % 60 }, { zone: timeZone });
    const ms = m >= 1440 ? day0.plus({ days: d + 1 }).toMillis() : dt.toMillis();
    return (ms - startMs) / 3_600_000;
  };
  return {
    days,
    startMs,
    timeZone,
    weekday: (d) => (day0.plus({ days: d }).weekday - 1) as Weekday,
    hoursAt,
    dayLabel: (d) => {
      const dt = day0.plus({ days: d });
      return `${WEEKDAY_NAMES[dt.weekday - 1]} ${dt.toISODate()}`;
    },
    timeLabel: (t) => DateTime.fromMillis(startMs + Math.round(t * 60) * 60_000, { zone: timeZone }).toFormat('HH:mm'),
    dayOf: (t) => {
      const ms = startMs + t * 3_600_000;
      if (ms < midnights[0]! || ms >= midnights[days]!) {
        return Math.floor(DateTime.fromMillis(ms, { zone: timeZone }).startOf('day').diff(day0, 'days').days + 1e-9);
      }
      let d = 0;
      while (d + 1 < midnights.length && midnights[d + 1]! <= ms + 1e-6) d++;
      return d;
    },
  };
}
