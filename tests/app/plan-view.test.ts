/**
 * The site timeline's rows run on each zone's own local days (app/renderer/src/lib/plan-view.ts): a
 * zone whose time zone or week differs from the axis's (the first planned zone's) says whose days it
 * shows, and its clock labels are its own zone's wall clock.
 */
import { describe, expect, it } from 'vitest';
import type { PlanResultInfo } from '../../app/api/plan.ts';
import { clockLabels, ownDaysNote } from '../../app/renderer/src/lib/plan-view.ts';

type Outdoor = PlanResultInfo['outdoor'];
const history = (weekStart: string, timeZone: string): Outdoor => ({ kind: 'history', weekStart, timeZone, minC: 0, maxC: 5 });
const design: Outdoor = { kind: 'design', designDbC: -10, dailyRangeK: 0, solarOffsetHours: 0, minC: -10, maxC: -10 };

describe('ownDaysNote', () => {
  it('is silent for a zone on the axis’s days, names the zone and week of one that is not', () => {
    const denver = history('2025-03-17', 'America/Denver');
    expect(ownDaysNote(denver, denver)).toBeNull();
    expect(ownDaysNote(design, denver)).toBeNull();
    // 17 March 2025 was a Monday (the calendar; Intl gives the same below).
    expect(new Intl.DateTimeFormat('en-GB', { weekday: 'short', timeZone: 'UTC' }).format(Date.UTC(2025, 2, 17))).toBe('Mon');
    expect(ownDaysNote(history('2025-03-17', 'Europe/Berlin'), denver)).toBe('Days in Europe/Berlin, week from Mon 17 Mar');
    expect(ownDaysNote(history('2025-03-10', 'America/Denver'), denver)).toBe('Days in America/Denver, week from Mon 10 Mar');
    expect(ownDaysNote(denver, design)).toBe('Days in America/Denver, week from Mon 17 Mar');
  });

  it('labels a zone’s hours on its own wall clock', () => {
    // Hour 30 of a week from Monday 00:00 is Tuesday 06:00 local, whatever the zone.
    for (const tz of ['America/Denver', 'Europe/Berlin', 'Asia/Tokyo']) {
      const l = clockLabels(history('2025-03-17', tz));
      expect([l.day(30), l.time(30)]).toEqual(['Tue 18 Mar', '06:00']);
    }
    // Europe/Berlin springs forward on 30 March 2025 at 02:00 (EU rule: last Sunday of March, 01:00 UTC):
    // 150 elapsed hours from Monday 24 March 00:00 CET is Sunday 30 March 07:00 CEST.
    expect(clockLabels(history('2025-03-24', 'Europe/Berlin')).time(150)).toBe('07:00');
  });
});
