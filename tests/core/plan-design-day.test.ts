/**
 * The design-day profile against the handbook: 2021 ASHRAE Handbook—Fundamentals, ch. 14, Table 6
 * (fraction of daily range) and Example 9 / Table 8 (hourly dry-bulb for DB 33.1 °C, range 11.2 °C).
 */
import { describe, expect, it } from 'vitest';
import { InputError } from '../../core/errors.ts';
import { outdoorAt } from '../../core/outdoor.ts';
import { designDayHourly, designDayOutdoor, designDayProfile, lowHighProfile, rangeFractionAt } from '../../core/plan/index.ts';

// Table 6, hours 1–24 apparent solar time [read, REFERENCES.md], typed here independently of the engine.
const TABLE6 = [0.88, 0.92, 0.95, 0.98, 1.0, 0.98, 0.91, 0.74, 0.55, 0.38, 0.23, 0.13, 0.05, 0.0, 0.0, 0.06, 0.14, 0.24, 0.39, 0.5, 0.59, 0.68, 0.75, 0.82];
// Example 9 / Table 8, hourly results in daylight time, hours 1–24 [read, REFERENCES.md].
const TABLE8 = [24.7, 23.9, 23.2, 22.8, 22.5, 22.1, 21.9, 22.1, 22.9, 24.8, 26.9, 28.8, 30.5, 31.6, 32.5, 33.1, 33.1, 32.4, 31.5, 30.4, 28.7, 27.5, 26.5, 25.5];

describe('design day (ASHRAE Fundamentals 2021 ch. 14)', () => {
  it('reproduces Example 9 / Table 8 hour by hour', () => {
    // Example 9: hour 1 daylight time = AST −0.73, i.e. AST = clock − 1.73 h, nearest whole hour.
    const temps = designDayHourly(33.1, 11.2, { solarOffsetHours: -1.73 });
    expect(temps).toHaveLength(24);
    temps.forEach((t, i) => {
      // Tolerance 0.05 °C: Table 8 is printed to 0.1 °C.
      expect(Math.abs(t - TABLE8[i]!), `clock hour ${i + 1}`).toBeLessThanOrEqual(0.05 + 1e-9);
    });
  });

  it('uses the Table 6 fractions at whole solar hours', () => {
    for (let h = 1; h <= 24; h++) expect(rangeFractionAt(h)).toBeCloseTo(TABLE6[h - 1]!, 12);
    expect(rangeFractionAt(0)).toBeCloseTo(TABLE6[23]!, 12); // hour 0 is hour 24 of the day before
    // Between whole hours: linear (the engine's choice for a continuous profile).
    expect(rangeFractionAt(7.5)).toBeCloseTo((TABLE6[6]! + TABLE6[7]!) / 2, 12);
    const p = designDayProfile(33.1, 11.2, { days: 2 });
    for (let h = 0; h <= 48; h++) {
      const f = TABLE6[(((h - 1) % 24) + 24) % 24]!;
      expect(outdoorAt(p, h)).toBeCloseTo(33.1 - f * 11.2, 12); // T = DB − fraction·range (Table 6 note)
    }
  });

  it('the maximum is the design dry-bulb and the minimum DB − range, at the handbook hours', () => {
    const p = designDayProfile(-6, 9, { days: 1 });
    expect(outdoorAt(p, 5)).toBeCloseTo(-15, 12); // fraction 1.00 at hour 5
    expect(outdoorAt(p, 14)).toBeCloseTo(-6, 12); // fraction 0.00 at hours 14 and 15
    expect(outdoorAt(p, 15)).toBeCloseTo(-6, 12);
    const week = designDayOutdoor(-6, 9);
    expect(week.profile.time[week.profile.time.length - 1]).toBe(168);
    expect(outdoorAt(week.profile, 24 * 3 + 5)).toBeCloseTo(-15, 12); // every day alike
  });

  it('a daily low and high use the same shape', () => {
    const p = lowHighProfile(-3, 7, { days: 1 });
    expect(outdoorAt(p, 5)).toBeCloseTo(-3, 12);
    expect(outdoorAt(p, 14.5)).toBeCloseTo(7, 12);
  });

  it('a solar offset shifts the curve', () => {
    const p = designDayProfile(30, 10, { days: 1, solarOffsetHours: -2 });
    expect(outdoorAt(p, 7)).toBeCloseTo(20, 12); // clock 07:00 = solar 05:00, the minimum
  });

  it('rejects bad input with an InputError', () => {
    expect(() => designDayHourly(30, -1)).toThrow(InputError);
    expect(() => designDayHourly(Number.NaN, 10)).toThrow(/dry-bulb/);
    expect(() => lowHighProfile(10, 5)).toThrow(/below the daily low/);
  });
});
