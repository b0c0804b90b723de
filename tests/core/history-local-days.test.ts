/**
 * Runtime bins of a day follow the zone's own midnights (issue: days were cut at UTC midnight),
 * including the 23- and 25-hour days of a DST change. Europe/Berlin changes on the last Sundays of
 * March and October (EU summer-time rule, Directive 2000/84/EC): 2026-03-29 (02:00 → 03:00) and
 * 2026-10-25 (03:00 → 02:00). The IANA database itself is the runtime's (Intl), an outside source.
 */
import { describe, expect, it } from 'vitest';
import { runtimeBins } from '../../core/history.ts';
import { localDays } from '../../core/localday.ts';

const H = 3_600_000;

/** 15-minute readings over [from, to) with the heating fully on. */
function readings(fromMs: number, toMs: number) {
  const time: number[] = [];
  for (let t = fromMs + 15 * 60_000; t <= toMs; t += 15 * 60_000) time.push(t);
  return { time, frac: time.map(() => 1) };
}

describe('runtime bins in the zone time zone', () => {
  for (const [name, day, hours] of [
    ['spring forward (23 h)', Date.UTC(2026, 2, 28, 23), 23],
    ['fall back (25 h)', Date.UTC(2026, 9, 24, 22), 25],
  ] as const) {
    it(`a 24 h bin is the Berlin day, ${name}`, () => {
      const { time, frac } = readings(day - 24 * H, day + 2 * 24 * H);
      const bins = runtimeBins(time, frac, 24, day, day + hours * H - 1, 'Europe/Berlin');
      // Local midnight in Berlin, and the next one `hours` later.
      expect(bins.x).toContain(day);
      expect(bins.x).toContain(day + hours * H);
      // Independent check of the midnights with Intl (not core/localday.ts): the hour at each is 0.
      for (const x of bins.x) {
        const parts = new Intl.DateTimeFormat('en-GB', { timeZone: 'Europe/Berlin', hour: '2-digit', minute: '2-digit', hourCycle: 'h23' }).format(new Date(x));
        expect(parts).toBe('00:00');
      }
    });
  }

  it('6 h bins count from the local midnight, and UTC bins stay as they were without a zone', () => {
    const day = Date.UTC(2026, 0, 14, 23); // Berlin midnight in winter (UTC+1)
    const { time, frac } = readings(day - 24 * H, day + 24 * H);
    const local = runtimeBins(time, frac, 6, day, day + 24 * H - 1, 'Europe/Berlin');
    expect(local.x).toEqual(expect.arrayContaining([day, day + 6 * H, day + 12 * H, day + 18 * H]));
    const utc = runtimeBins(time, frac, 6, day, day + 24 * H - 1);
    expect(utc.x).toContain(Date.UTC(2026, 0, 15, 0));
    expect(utc.x).not.toContain(day);
    // localDays agrees with Intl on the day length (23/25 h), the rule the fit's days use too.
    const d = localDays('Europe/Berlin', Date.UTC(2026, 2, 28, 12));
    const k = d.dayOf(Date.UTC(2026, 2, 29, 12));
    expect((d.startOf(k + 1) - d.startOf(k)) / H).toBe(23);
  });
});
