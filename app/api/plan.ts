/**
 * The setback-planning part of the API contract: saved schedules per zone, the outdoor weeks a zone's
 * log can supply, the plan of one zone (core/plan planZone, the same engine and inputs as
 * `heatlag plan`) and the plan of every zone of a site for the site timeline.
 *
 * Schedules travel in the schedule file format of assets/plans/README.md (core/plan ScheduleFileSchema),
 * so what is saved, exported and loaded is the very JSON the command line reads. Results are internal
 * units (°C, K, hours, W, Wh), as planZone returns them; the screens convert where they show them.
 *
 * Imports only zod and pure core modules, like contract.ts.
 */
import { z } from 'zod';
import { ScheduleFileSchema } from '../../core/plan/schedule.ts';
import { FallbackTimeZoneShape } from './time-zone.ts';

const Id = z.number().int().positive();
const Unit = z.enum(['C', 'F']);
const Num = z.number();
const NumOrNull = z.number().nullable();
const IsoDate = z.string().regex(/^\d{4}-\d{2}-\d{2}$/, 'expected a date as YYYY-MM-DD');

/** A schedule in the file format (validated again, fully, by parseSchedule in the service). */
export const ScheduleSchema = ScheduleFileSchema;
export type Schedule = z.infer<typeof ScheduleSchema>;

/** Where the plan's outdoor temperature comes from (°C, K, hours). */
export const OutdoorChoiceSchema = z.discriminatedUnion('kind', [
  /** The zone's own log over 7 local days from weekStart (default: the latest complete week). */
  z.object({ kind: z.literal('history'), weekStart: IsoDate.optional() }).strict(),
  /** A design day: design dry-bulb (the day's maximum) and daily range, ASHRAE hourly fractions. */
  z
    .object({
      kind: z.literal('design'),
      designDbC: Num.min(-80).max(70),
      dailyRangeK: Num.min(0).max(40),
      solarOffsetHours: Num.min(-12).max(12).optional(),
    })
    .strict(),
  /** A daily low and high, the same hourly shape. */
  z
    .object({
      kind: z.literal('range'),
      lowC: Num.min(-80).max(70),
      highC: Num.min(-80).max(70),
      solarOffsetHours: Num.min(-12).max(12).optional(),
    })
    .strict(),
]);
export type OutdoorChoice = z.infer<typeof OutdoorChoiceSchema>;

export const SavedScheduleSchema = z.object({
  zoneId: Id,
  schedule: ScheduleSchema,
  /** Epoch ms of the last save. */
  savedAt: z.number(),
});
export type SavedSchedule = z.infer<typeof SavedScheduleSchema>;

export const PlanWeekSchema = z.object({
  /** Local date of the week's Monday. */
  start: IsoDate,
  /** Whether the log's outdoor readings cover the week well enough to plan on it. */
  usable: z.boolean(),
  /** Why not, in a sentence; null when usable. */
  problem: z.string().nullable(),
});
export type PlanWeek = z.infer<typeof PlanWeekSchema>;

export const PlanWeeksSchema = z.object({
  zoneId: Id,
  /** IANA zone the weeks are laid out in (the log's, else the computer's). */
  timeZone: z.string(),
  /** Mondays from the newest back, at most 60. */
  weeks: z.array(PlanWeekSchema),
  /** The latest usable week, or null when none is. */
  latest: IsoDate.nullable(),
});
export type PlanWeeks = z.infer<typeof PlanWeeksSchema>;

// ---------------------------------------------------------------------------------------------
// The plan (core/plan PlanResult)

const RuntimeSummaryShape = {
  heatHours: Num,
  coolHours: Num,
  baselineHeatHours: Num,
  baselineCoolHours: Num,
  savedHeatHours: Num,
  savedCoolHours: Num,
  savedHours: Num,
  savedHeatPercent: NumOrNull,
  savedCoolPercent: NumOrNull,
  savedPercent: NumOrNull,
  heatEnergyWh: NumOrNull,
  baselineHeatEnergyWh: NumOrNull,
  coolEnergyWh: NumOrNull,
  baselineCoolEnergyWh: NumOrNull,
  savedHeatEnergyWh: NumOrNull,
  savedCoolEnergyWh: NumOrNull,
};
const RuntimeSummarySchema = z.object(RuntimeSummaryShape);

const RecoverySchema = z.object({
  mode: z.enum(['heat', 'cool']),
  setbackStartHours: Num,
  occupancyHours: Num,
  targetC: Num,
  status: z.enum(['not-needed', 'met', 'late', 'not-reached']),
  optimalStartHours: NumOrNull,
  leadHours: NumOrNull,
  startedHours: NumOrNull,
  cannotRecoverInTime: z.boolean(),
  reachable: z.boolean(),
  atOccupancyC: Num,
  shortfallK: Num,
  reachedHours: NumOrNull,
  lowestC: Num,
  highestC: Num,
  recoveryOutdoorMinC: NumOrNull,
  dayIndex: z.number().int(),
  dayLabel: z.string(),
  occupancyLabel: z.string(),
  optimalStartLabel: z.string().nullable(),
  reachedLabel: z.string().nullable(),
  auxLikely: z.boolean(),
  auxReasons: z.array(z.string()),
});
export type PlanRecoveryInfo = z.infer<typeof RecoverySchema>;

const DaySchema = z.object({
  ...RuntimeSummaryShape,
  index: z.number().int(),
  label: z.string(),
  weekday: z.number().int().min(0).max(6),
  startHours: Num,
  endHours: Num,
  lowestUnoccupiedC: NumOrNull,
  highestUnoccupiedC: NumOrNull,
  indoorMinC: Num,
  indoorMaxC: Num,
  outdoorMinC: Num,
  outdoorMaxC: Num,
  recoveries: z.array(RecoverySchema),
});
export type PlanDayInfo = z.infer<typeof DaySchema>;

const CurveSchema = z.object({
  stepMinutes: z.number().int(),
  hours: z.array(Num),
  indoorC: z.array(Num),
  baselineIndoorC: z.array(Num),
  outdoorC: z.array(Num),
  heatSetpointC: z.array(NumOrNull),
  coolSetpointC: z.array(NumOrNull),
  occupied: z.array(z.boolean()),
  heatFraction: z.array(Num),
  coolFraction: z.array(Num),
  baselineHeatFraction: z.array(Num),
  baselineCoolFraction: z.array(Num),
  recovering: z.array(Num),
});
export type PlanCurveInfo = z.infer<typeof CurveSchema>;

const OutdoorSourceSchema = z.union([
  z.object({ kind: z.literal('history'), weekStart: z.string(), timeZone: z.string(), minC: Num, maxC: Num }),
  z.object({ kind: z.literal('design'), designDbC: Num, dailyRangeK: Num, solarOffsetHours: Num, minC: Num, maxC: Num }),
  z.object({ kind: z.literal('range'), lowC: Num, highC: Num, solarOffsetHours: Num, minC: Num, maxC: Num }),
]);

const EquipmentSchema = z.object({
  heatingCapacityW: NumOrNull,
  heatingCapacityAtReferenceW: NumOrNull,
  referenceOutdoorC: NumOrNull,
  heatCapacityJPerK: NumOrNull,
  heatCapacityBtuPerF: NumOrNull,
  heatCapacityKWhPerK: NumOrNull,
  uaWPerK: NumOrNull,
  uaBtuhPerF: NumOrNull,
  internalGainW: NumOrNull,
  coolingCapacityW: NumOrNull,
  heatCapacityFromCoolingJPerK: NumOrNull,
  uaFromCoolingWPerK: NumOrNull,
  heatingLiftK: Num,
});

export const CautionSchema = z.object({
  level: z.enum(['note', 'warning', 'danger']),
  topic: z.string(),
  text: z.string(),
});
export type CautionInfo = z.infer<typeof CautionSchema>;

const PlanCoreShape = {
  scheduleName: z.string(),
  scheduleUnits: Unit,
  outdoor: OutdoorSourceSchema,
  model: z.object({ tauHours: Num, heatRate: Num, coolRate: Num, gain: Num }),
  deadbandK: Num,
  optimalStart: z.boolean(),
  horizonHours: Num,
  days: z.array(DaySchema),
  week: RuntimeSummarySchema,
  recoveries: z.array(RecoverySchema),
  equipment: EquipmentSchema.nullable(),
  balancePoint: z.object({ occupiedC: NumOrNull, unoccupiedC: NumOrNull }),
  cautions: z.array(CautionSchema),
};

export const PlanResultSchema = z.object({ ...PlanCoreShape, curve: CurveSchema });
export type PlanResultInfo = z.infer<typeof PlanResultSchema>;

/** How the plan was made: which fitted response, where the outdoor data came from. */
const PlanBasisSchema = z.object({
  /** When the response used was fitted (epoch ms). */
  fittedAt: z.number(),
  /** True when readings were imported after that fit (fit again on the Response screen). */
  stale: z.boolean(),
  /** Heat pump: outdoor °C where the fitted heating rate applies (the log's heating-weighted mean); null otherwise. */
  heatRateReferenceC: NumOrNull,
  /** IANA zone of a history week; null for design days. */
  timeZone: z.string().nullable(),
  /** Occupied stretches of the week, [from, to) in simulation hours (0 = local midnight of the first day). */
  occupiedHours: z.array(z.tuple([Num, Num])),
  /** Plain sentences about the data the plan rests on. */
  notes: z.array(z.string()),
});

export const ZonePlanSchema = z.object({
  zoneId: Id,
  plan: PlanResultSchema,
  basis: PlanBasisSchema,
});
export type ZonePlan = z.infer<typeof ZonePlanSchema>;

/** One zone of the site timeline: its plan without the curve, or why there is none. */
export const SiteZonePlanSchema = z.object({
  zoneId: Id,
  name: z.string(),
  state: z.enum(['ok', 'no-schedule', 'no-readings', 'no-response', 'error']),
  /** Why there is no plan, in a sentence; null when state is 'ok'. */
  message: z.string().nullable(),
  plan: z.object(PlanCoreShape).nullable(),
  basis: PlanBasisSchema.nullable(),
});
export type SiteZonePlan = z.infer<typeof SiteZonePlanSchema>;

export const SitePlanSchema = z.object({
  siteId: Id,
  zones: z.array(SiteZonePlanSchema),
});
export type SitePlan = z.infer<typeof SitePlanSchema>;

function method<I extends z.ZodType, O extends z.ZodType>(input: I, output: O) {
  return { input, output };
}

/** The planning methods (merged into the contract). */
export const planMethods = {
  /** Every zone's saved schedule. */
  listSchedules: method(z.object({}).strict(), z.array(SavedScheduleSchema)),
  /** Saves schedules, one per zone (the same schedule may go to several zones); answers the full list. */
  saveSchedules: method(
    z.object({ entries: z.array(z.object({ zoneId: Id, schedule: ScheduleSchema }).strict()).min(1).max(500) }).strict(),
    z.array(SavedScheduleSchema),
  ),
  deleteSchedule: method(z.object({ zoneId: Id }).strict(), z.array(SavedScheduleSchema)),
  /** The weeks of the zone's log that can supply the outdoor temperature. */
  planWeeks: method(z.object({ zoneId: Id, ...FallbackTimeZoneShape }).strict(), PlanWeeksSchema),
  /**
   * The plan of one zone with a schedule, on its latest fitted response. `units` is the unit the
   * cautions' sentences are written in (the schedule is rewritten in it first; the numbers do not change).
   */
  planZone: method(
    z
      .object({
        zoneId: Id,
        schedule: ScheduleSchema,
        outdoor: OutdoorChoiceSchema,
        units: Unit.optional(),
        curveMinutes: z.number().int().min(1).max(240).optional(),
        ...FallbackTimeZoneShape,
      })
      .strict(),
    ZonePlanSchema,
  ),
  /** Every zone of a site with its saved schedule, on one outdoor choice. */
  planSite: method(z.object({ siteId: Id, outdoor: OutdoorChoiceSchema, units: Unit.optional(), ...FallbackTimeZoneShape }).strict(), SitePlanSchema),
} as const;
