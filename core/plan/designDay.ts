/**
 * Design-day outdoor profiles from a design dry-bulb and a daily range.
 *
 * Method: 2021 ASHRAE Handbook—Fundamentals, ch. 14, Table 6 "Fraction of daily temperature range":
 *   T(hour) = design dry-bulb − fraction(hour) · daily range,
 * hours 1–24 in apparent solar time (AST). The design dry-bulb is the day's maximum and
 * design dry-bulb − range its minimum. Clock time and AST differ by the time-zone meridian, the
 * equation of time and daylight saving time; the handbook's Example 9 uses AST = clock − 1.73 h for a
 * daylight-time clock and takes the nearest whole hour. Here `solarOffsetHours` = AST − clock time
 * (default 0: clock time taken as solar time).
 *
 * For heating, ASHRAE practice holds the 99.6 % heating dry-bulb constant all day [memory]: give a
 * daily range of 0 for that.
 */
import { InputError } from '../errors.ts';
import { outdoorProfile, type OutdoorProfile } from '../outdoor.ts';

/**
 * Fraction of the daily range below the maximum, hours 1–24 AST (index 0 = hour 1).
 * Source: 2021 ASHRAE Handbook—Fundamentals, ch. 14, Table 6.
 */
export const ASHRAE_DAILY_RANGE_FRACTIONS: readonly number[] = Object.freeze([
  0.88, 0.92, 0.95, 0.98, 1.0, 0.98, 0.91, 0.74, 0.55, 0.38, 0.23, 0.13, 0.05, 0.0, 0.0, 0.06, 0.14, 0.24, 0.39, 0.5, 0.59, 0.68, 0.75,
  0.82,
]);

/** The Table 6 fraction at a whole AST hour, any integer (periodic: hour 0 = hour 24). */
function fractionAtHour(hour: number): number {
  const h = ((Math.round(hour) % 24) + 24) % 24; // 0 … 23, where 0 means hour 24
  return ASHRAE_DAILY_RANGE_FRACTIONS[h === 0 ? 23 : h - 1]!;
}

/**
 * The fraction of the daily range at a solar time (hours, any real value), linear between the
 * table's whole hours (periodic over 24 h).
 * @example rangeFractionAt(14.5) // 0.00 (between hours 14 and 15)
 */
export function rangeFractionAt(solarHours: number): number {
  const h0 = Math.floor(solarHours);
  const w = solarHours - h0;
  return (1 - w) * fractionAtHour(h0) + w * fractionAtHour(h0 + 1);
}

function checkDesign(designDbC: number, dailyRangeK: number): void {
  if (!Number.isFinite(designDbC)) throw new InputError(`The design dry-bulb must be a finite temperature, got ${designDbC}.`);
  if (!Number.isFinite(dailyRangeK) || dailyRangeK < 0) throw new InputError(`The daily range must be 0 or more degrees, got ${dailyRangeK}.`);
  if (dailyRangeK > 40) throw new InputError(`A daily range of ${dailyRangeK} K is beyond any climate's design data (expected under 40 K).`);
}

/**
 * Hourly design-day temperatures at clock hours 1–24, the way the handbook tabulates them
 * (Example 9 / Table 8): for each clock hour the AST is clock + solarOffsetHours, rounded to the
 * nearest whole hour ('nearest', as in the handbook) or interpolated ('linear').
 *
 * @param designDbC design dry-bulb (the day's maximum), °C
 * @param dailyRangeK mean daily range, K
 * @param options solarOffsetHours = AST − clock time, h (default 0); rounding 'nearest' (default) or 'linear'
 * @returns 24 temperatures, °C, index 0 = clock hour 1
 * @throws InputError for a non-finite dry-bulb or a negative / implausible range
 * @example designDayHourly(33.1, 11.2, { solarOffsetHours: -1.73 })[0] // 24.7 (Table 8, hour 1)
 */
export function designDayHourly(
  designDbC: number,
  dailyRangeK: number,
  options: { solarOffsetHours?: number; rounding?: 'nearest' | 'linear' } = {},
): number[] {
  checkDesign(designDbC, dailyRangeK);
  const off = options.solarOffsetHours ?? 0;
  const out: number[] = [];
  for (let clock = 1; clock <= 24; clock++) {
    const ast = clock + off;
    const f = options.rounding === 'linear' ? rangeFractionAt(ast) : fractionAtHour(Math.round(ast));
    out.push(designDbC - f * dailyRangeK);
  }
  return out;
}

/**
 * A design-day outdoor profile repeated over `days` days, knots every clock hour from 0 h, linear in
 * between (Table 6 fractions interpolated linearly in AST).
 *
 * @param designDbC design dry-bulb (daily maximum), °C
 * @param dailyRangeK daily range, K
 * @param options days (default 7), solarOffsetHours = AST − clock, h (default 0)
 * @returns OutdoorProfile with time in hours from local midnight of day 0
 * @throws InputError as designDayHourly
 * @example designDayProfile(-10, 8) // minimum −18 °C at 05:00, maximum −10 °C at 14:00–15:00 each day
 */
export function designDayProfile(designDbC: number, dailyRangeK: number, options: { days?: number; solarOffsetHours?: number } = {}): OutdoorProfile {
  checkDesign(designDbC, dailyRangeK);
  const days = options.days ?? 7;
  if (!Number.isInteger(days) || days < 1 || days > 366) throw new InputError(`A design-day profile needs 1 to 366 days, got ${days}.`);
  const off = options.solarOffsetHours ?? 0;
  const n = days * 24 + 1;
  const time = new Float64Array(n);
  const temp = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    time[i] = i;
    temp[i] = designDbC - rangeFractionAt(i + off) * dailyRangeK;
  }
  return outdoorProfile(time, temp);
}

/**
 * A profile from a user-entered daily low and high: the same Table 6 shape with design dry-bulb = high
 * and range = high − low (the low falls at 05:00 solar time, the high at 14:00–15:00).
 *
 * @param lowC daily low, °C; highC daily high, °C (high ≥ low)
 * @throws InputError when high < low or either is not finite
 * @example lowHighProfile(-5, 5).temp[5] // −5 (05:00)
 */
export function lowHighProfile(lowC: number, highC: number, options: { days?: number; solarOffsetHours?: number } = {}): OutdoorProfile {
  if (!Number.isFinite(lowC) || !Number.isFinite(highC)) throw new InputError('The daily low and high must be finite temperatures.');
  if (highC < lowC) throw new InputError(`The daily high (${highC} °C) is below the daily low (${lowC} °C).`);
  return designDayProfile(highC, highC - lowC, options);
}
