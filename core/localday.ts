/**
 * Local calendar days of a time zone: which day a moment falls on, counted from the local midnight at or
 * before a first moment. Days follow the wall clock, so a daylight-saving change makes a day 23 or 25
 * hours long (IANA rules through luxon).
 *
 * Used wherever the fit, the history chart or a report groups readings by day, so that a day is the
 * site's day, not a UTC one.
 */
import { DateTime } from 'luxon';
import { InputError } from './errors.ts';

/** Finds the local day of increasing moments quickly (a forward walk over the day boundaries). */
export interface LocalDays {
  /** IANA zone used ('UTC' when none was given). */
  readonly timeZone: string;
  /** Local day of `ms`, 0 = the day holding the first moment; may be negative for earlier moments. */
  dayOf(ms: number): number;
  /** Epoch ms of the local midnight that starts day d. */
  startOf(d: number): number;
}

/**
 * Local days of `timeZone` (null or undefined: UTC) counted from the day holding `firstMs`.
 * @throws InputError for an unknown time zone or a non-finite first moment
 * @example localDays('Europe/Berlin', Date.UTC(2026, 2, 28, 12)).startOf(1) // 2026-03-28T23:00Z (29 March, a 23-hour day)
 */
export function localDays(timeZone: string | null | undefined, firstMs: number): LocalDays {
  const zone = timeZone ?? 'UTC';
  if (!Number.isFinite(firstMs)) throw new InputError(`The first time must be a finite epoch millisecond, got ${firstMs}.`);
  const first = DateTime.fromMillis(firstMs, { zone });
  if (!first.isValid) throw new InputError(`Unknown time zone "${zone}".`);
  const day0 = first.startOf('day');
  // Boundaries[d] = start of day d, for d ≥ 0 grown on demand; negative days likewise.
  const ahead: number[] = [day0.toMillis()];
  const behind: number[] = [];
  const grow = (d: number) => {
    while (ahead.length <= d) ahead.push(day0.plus({ days: ahead.length }).toMillis());
    while (behind.length < -d) behind.push(day0.minus({ days: behind.length + 1 }).toMillis());
  };
  const startOf = (d: number): number => {
    grow(d);
    return d >= 0 ? ahead[d] : behind[-d - 1];
  };
  let cursor = 0;
  return {
    timeZone: zone,
    startOf,
    dayOf(ms: number): number {
      if (!Number.isFinite(ms)) return NaN;
      // Walk from the last answer: moments usually come in order.
      while (ms < startOf(cursor)) cursor--;
      while (ms >= startOf(cursor + 1)) cursor++;
      return cursor;
    },
  };
}
