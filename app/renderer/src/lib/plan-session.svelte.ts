/**
 * What the planning screens remember while the app is open: the schedule being edited for each zone
 * (unsaved edits survive a visit to another screen), the outdoor choice of each zone and of the site
 * timeline, and the zones' saved schedules as the backend last reported them.
 */
import type { OutdoorChoice, SavedSchedule } from '../../../api/plan.ts';
import type { TempUnit } from '../../../../core/types.ts';
import { toCelsius } from '../../../../core/units.ts';
import type { ScheduleDraft } from './plan-draft.ts';

export interface OutdoorDraft {
  kind: 'history' | 'design' | 'range';
  /** Monday of the chosen week (history); null = the latest complete week. */
  weekStart: string | null;
  designDbC: number;
  dailyRangeK: number;
  lowC: number;
  highC: number;
  /** Solar time − clock time, hours (design day and low/high). */
  solarOffsetHours: number;
}

/** Round starting values in the unit the person works in. */
export function defaultOutdoor(unit: TempUnit, kind: OutdoorDraft['kind'] = 'history'): OutdoorDraft {
  return {
    kind,
    weekStart: null,
    designDbC: unit === 'F' ? toCelsius(14, 'F') : -10,
    dailyRangeK: 0,
    lowC: unit === 'F' ? toCelsius(23, 'F') : -5,
    highC: unit === 'F' ? toCelsius(41, 'F') : 5,
    solarOffsetHours: 0,
  };
}

/** The outdoor choice for the API, or a sentence saying what to fix. */
export function outdoorChoice(o: OutdoorDraft): { ok: true; choice: OutdoorChoice } | { ok: false; message: string } {
  const fin = (...v: number[]) => v.every(Number.isFinite);
  if (o.kind === 'history') return { ok: true, choice: o.weekStart ? { kind: 'history', weekStart: o.weekStart } : { kind: 'history' } };
  if (!fin(o.solarOffsetHours) || Math.abs(o.solarOffsetHours) > 12) return { ok: false, message: 'The solar time offset must be a number of hours from −12 to 12.' };
  if (o.kind === 'design') {
    if (!fin(o.designDbC, o.dailyRangeK)) return { ok: false, message: 'Fill in the design dry-bulb and the daily range.' };
    if (o.dailyRangeK < 0) return { ok: false, message: 'The daily range cannot be negative.' };
    if (o.dailyRangeK > 40) return { ok: false, message: 'A daily range over 40 K (72 °F) is beyond any climate’s design data.' };
    if (o.designDbC < -80 || o.designDbC > 70) return { ok: false, message: 'The design dry-bulb must be between −80 °C and 70 °C (−112 °F and 158 °F).' };
    return { ok: true, choice: { kind: 'design', designDbC: o.designDbC, dailyRangeK: o.dailyRangeK, solarOffsetHours: o.solarOffsetHours } };
  }
  if (!fin(o.lowC, o.highC)) return { ok: false, message: 'Fill in the daily low and high.' };
  if (o.highC < o.lowC) return { ok: false, message: 'The daily high is below the daily low.' };
  if (o.lowC < -80 || o.highC > 70) return { ok: false, message: 'The daily low and high must be between −80 °C and 70 °C (−112 °F and 158 °F).' };
  return { ok: true, choice: { kind: 'range', lowC: o.lowC, highC: o.highC, solarOffsetHours: o.solarOffsetHours } };
}

export interface ZoneDraft {
  draft: ScheduleDraft;
  /** JSON of the schedule as last saved (or loaded from the saved list); null = never saved. */
  savedJson: string | null;
}

class PlanSession {
  drafts = $state<Record<number, ZoneDraft>>({});
  outdoor = $state<Record<number, OutdoorDraft>>({});
  saved = $state.raw<SavedSchedule[]>([]);
  site = $state<{ siteId: number | null; outdoor: OutdoorDraft | null; day: number | null }>({ siteId: null, outdoor: null, day: null });

  savedFor(zoneId: number): SavedSchedule | null {
    return this.saved.find((s) => s.zoneId === zoneId) ?? null;
  }
}

/** One session for the app's lifetime. */
export const planSession = new PlanSession();
