/**
 * Setback planning: saved schedules per zone, the weeks of a zone's log that can supply the outdoor
 * temperature, the plan of one zone and the plans of every zone of a site.
 *
 * A plan is core/plan's planZone on the zone's latest stored response, with the inputs `heatlag plan
 * --db FILE --zone SITE/ZONE` uses: the outdoor week laid out in the zone's time zone (the site's, else
 * the log's, else this computer's: db/timezone.ts), the latest complete week by default, and for a heat pump the fitted heating rate taken
 * to apply at the log's mean outdoor temperature while heating ran. So the figures on screen are the
 * command line's figures for the same zone, schedule and outdoor choice.
 */
import { DateTime } from 'luxon';
import type { OutdoorChoice, PlanWeeks, SavedSchedule, Schedule, SitePlan, SiteZonePlan, ZonePlan } from '../api/plan.ts';
import { scheduleInUnit } from '../api/schedule-units.ts';
import {
  designDayOutdoor,
  historyOutdoor,
  latestHistoryWeek,
  lowHighOutdoor,
  MAX_OUTDOOR_GAP_HOURS,
  parseSchedule,
  planZone,
  scheduleTimeline,
  type PlanClock,
  type PlanOutdoor,
  type WeeklySchedule,
} from '../../core/plan/index.ts';
import { heatingOutdoorMean, heatPumpRatingC } from '../../core/plan/equipment.ts';
import { ScheduleFileSchema } from '../../core/plan/schedule.ts';
import type { TempUnit, ZoneResponse, ZoneSeries } from '../../core/types.ts';
import type { ServiceContext } from './context.ts';
import { ServiceError } from './errors.ts';
import { seriesCache } from './series-cache.ts';
import { importLegacySchedules } from './legacy-schedules.ts';
import { timeZoneFor } from './fit-options.ts';

/** Mondays offered by planWeeks, newest first. */
const MAX_WEEKS = 60;
/** Plans kept for repeated identical requests (switching screens, days or units). */
const CACHE_SIZE = 24;

/** The occupied stretches of the plan's horizon, [from, to) in simulation hours. */
export function occupiedHours(schedule: WeeklySchedule, clock: PlanClock): Array<[number, number]> {
  const out: Array<[number, number]> = [];
  for (const iv of scheduleTimeline(schedule, clock, 'schedule')) {
    if (!iv.occupied) continue;
    const last = out[out.length - 1];
    if (last && Math.abs(last[1] - iv.startMinute / 60) < 1e-9) last[1] = iv.endMinute / 60;
    else out.push([iv.startMinute / 60, iv.endMinute / 60]);
  }
  return out;
}

/** Replaces non-finite numbers by null, deeply (JSON has no NaN or Infinity). */
function finite<T>(value: T): T {
  if (typeof value === 'number') return (Number.isFinite(value) ? value : null) as T;
  if (Array.isArray(value)) return value.map((v) => finite(v)) as T;
  if (value !== null && typeof value === 'object') {
    const out: Record<string, unknown> = {};
    for (const [k, v] of Object.entries(value)) out[k] = finite(v);
    return out as T;
  }
  return value;
}

export function planService(ctx: ServiceContext) {
  const { store } = ctx;
  const cache = new Map<string, ZonePlan>();
  try {
    importLegacySchedules(store, ctx.databasePath, ctx.log);
  } catch (err) {
    ctx.log(`Saved schedules of an earlier version could not be moved into the database: ${(err as Error).message}`);
  }

  /** A stored schedule in the current format, or null (a schedule that no longer reads is kept, not shown). */
  function readable(schedule: unknown): Schedule | null {
    const ok = ScheduleFileSchema.safeParse(schedule);
    return ok.success ? (ok.data as Schedule) : null;
  }

  function requireZone(zoneId: number) {
    const zone = store.getZone(zoneId);
    if (!zone) throw new ServiceError('not-found', 'That zone no longer exists.');
    return zone;
  }

  /** The zone's time zone (the site's, else the newest log's: db/timezone.ts), else the caller's, else this computer's. */
  function timeZoneOf(zoneId: number, fallback: string | undefined): string {
    return timeZoneFor(store, zoneId, fallback);
  }

  function savedList(): SavedSchedule[] {
    const out: SavedSchedule[] = [];
    for (const e of store.listSchedules()) {
      const schedule = readable(e.schedule);
      if (schedule) out.push({ zoneId: e.zoneId, schedule, savedAt: e.savedAt });
    }
    return out;
  }

  function outdoorFor(series: ZoneSeries, choice: OutdoorChoice, tz: string): PlanOutdoor {
    if (choice.kind === 'design') return designDayOutdoor(choice.designDbC, choice.dailyRangeK, choice.solarOffsetHours ?? 0);
    if (choice.kind === 'range') return lowHighOutdoor(choice.lowC, choice.highC, choice.solarOffsetHours ?? 0);
    const week = choice.weekStart ?? latestHistoryWeek(series, tz);
    if (week === null) {
      throw new ServiceError(
        'input',
        `No week of this zone's log has outdoor readings at least every ${MAX_OUTDOOR_GAP_HOURS} h; use a design day or a daily low and high instead.`,
      );
    }
    return historyOutdoor(series, week, tz);
  }

  /** Plans one zone; throws ServiceError with a plain message when it cannot. */
  function planOne(zoneId: number, file: Schedule, choice: OutdoorChoice, units: TempUnit | undefined, curveMinutes: number, fallback: string | undefined): ZonePlan {
    requireZone(zoneId);
    const stored = store.listResponses(zoneId)[0];
    const tz = timeZoneOf(zoneId, fallback);
    // The readings' version too: a new import changes the outdoor history and the staleness note; and
    // the time zone, which a person can change on the site without touching the readings.
    const key = JSON.stringify([zoneId, stored?.id ?? 0, store.samplesVersion(), tz, file, choice, units ?? null, curveMinutes]);
    const hit = cache.get(key);
    if (hit) {
      cache.delete(key);
      cache.set(key, hit);
      return hit;
    }
    const series = seriesCache(store).series(zoneId);
    if (series.time.length === 0) throw new ServiceError('no-readings', 'This zone has no readings yet: import a log, then fit its response.');
    if (!stored) throw new ServiceError('no-response', 'This zone has not been fitted yet: fit its response first.');
    const response: ZoneResponse = stored.response;
    const schedule = parseSchedule(units ? scheduleInUnit(file, units) : file);
    const outdoor = outdoorFor(series, choice, tz);
    const hp = schedule.equipment?.heatPump ?? null;
    const heatRateReferenceC = hp ? (heatingOutdoorMean(series) ?? heatPumpRatingC(hp)) : undefined;
    const plan = planZone(response, schedule, outdoor, { heatRateReferenceC, curveMinutes });
    const last = series.time[series.time.length - 1]!;
    const stale = response.lastTime < last;
    const notes: string[] = [];
    if (stale) notes.push('Readings were imported after this response was fitted; fit the zone again on the Response screen to plan on all of them.');
    const result: ZonePlan = finite({
      zoneId,
      plan,
      basis: {
        fittedAt: stored.createdAt,
        stale,
        heatRateReferenceC: heatRateReferenceC ?? null,
        timeZone: choice.kind === 'history' ? tz : null,
        occupiedHours: occupiedHours(schedule, outdoor.clock),
        notes,
      },
    }) as ZonePlan;
    cache.set(key, result);
    while (cache.size > CACHE_SIZE) cache.delete(cache.keys().next().value!);
    return result;
  }

  return {
    async listSchedules(): Promise<SavedSchedule[]> {
      return savedList();
    },

    async saveSchedules({ entries }: { entries: Array<{ zoneId: number; schedule: Schedule }> }): Promise<SavedSchedule[]> {
      for (const e of entries) {
        requireZone(e.zoneId);
        parseSchedule(e.schedule); // the full check (periods, overlaps, deadband), with the key named
      }
      store.saveSchedules(entries); // all in one transaction
      return savedList();
    },

    async deleteSchedule({ zoneId }: { zoneId: number }): Promise<SavedSchedule[]> {
      store.deleteSchedule(zoneId);
      return savedList();
    },

    async planWeeks({ zoneId, fallbackTimeZone }: { zoneId: number; fallbackTimeZone?: string | undefined }): Promise<PlanWeeks> {
      requireZone(zoneId);
      const tz = timeZoneOf(zoneId, fallbackTimeZone);
      const series = seriesCache(store).series(zoneId);
      const weeks: PlanWeeks['weeks'] = [];
      let latest: string | null = null;
      const n = series.time.length;
      if (n > 0) {
        const first = DateTime.fromMillis(series.time[0]!, { zone: tz }).startOf('week');
        let monday = DateTime.fromMillis(series.time[n - 1]!, { zone: tz }).startOf('week');
        while (weeks.length < MAX_WEEKS && monday.toMillis() >= first.toMillis()) {
          const start = monday.toISODate()!;
          try {
            historyOutdoor(series, start, tz);
            weeks.push({ start, usable: true, problem: null });
            latest ??= start;
          } catch (err) {
            weeks.push({ start, usable: false, problem: (err as Error).message });
          }
          monday = monday.minus({ weeks: 1 });
        }
      }
      return { zoneId, timeZone: tz, weeks, latest };
    },

    async planZone(input: {
      zoneId: number; schedule: Schedule; outdoor: OutdoorChoice; units?: TempUnit | undefined; curveMinutes?: number | undefined; fallbackTimeZone?: string | undefined;
    }): Promise<ZonePlan> {
      return planOne(input.zoneId, input.schedule, input.outdoor, input.units, input.curveMinutes ?? 10, input.fallbackTimeZone);
    },

    async planSite({ siteId, outdoor, units, fallbackTimeZone }: {
      siteId: number; outdoor: OutdoorChoice; units?: TempUnit | undefined; fallbackTimeZone?: string | undefined;
    }): Promise<SitePlan> {
      if (!store.getSite(siteId)) throw new ServiceError('not-found', 'That site no longer exists.');
      const zones: SiteZonePlan[] = [];
      for (const z of store.listZones(siteId)) {
        const stored = store.getSchedule(z.id);
        const saved = stored ? readable(stored.schedule) : null;
        const row = { zoneId: z.id, name: z.name, plan: null, basis: null };
        if (!saved) {
          zones.push({ ...row, state: 'no-schedule', message: 'No schedule saved for this zone.' });
          continue;
        }
        try {
          // The curve is not needed for the timeline: the coarsest spacing keeps the answer small.
          const { plan, basis } = planOne(z.id, saved, outdoor, units, 240, fallbackTimeZone);
          const { curve: _curve, ...core } = plan;
          zones.push({ ...row, state: 'ok', message: null, plan: core, basis });
        } catch (err) {
          const code = (err as { code?: string }).code;
          const state = code === 'no-readings' || code === 'no-response' ? code : 'error';
          zones.push({ ...row, state, message: (err as Error).message });
        }
      }
      return { siteId, zones };
    },
  };
}
