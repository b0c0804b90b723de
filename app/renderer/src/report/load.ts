/**
 * Gathers a zone report from the API — the very methods the screens use — and derives its curves and
 * tables with the same core functions the screens and the command line use: presentResponse
 * (core/present.ts) for the response, recoveryTime / recoveryCurve (core/recovery.ts) for the
 * recovery, recoveryTable (core/recovery-table.ts) for the table, planZone through the API for the
 * plan, compareWhatIf (core/what-if.ts) for the comparison. Nothing is computed a second way here.
 */
import { needsFit } from '../lib/fit-rule.ts';
import type { AppInfo, FitResult, HeatlagApi, LogInfo, SiteInfo, ZoneInfo } from '../../../api/contract.ts';
import type { Schedule, ZonePlan } from '../../../api/plan.ts';
import type { LogQuality } from '../../../api/report.ts';
import { parseSchedule } from '../../../../core/plan/schedule.ts';
import { balancePointC } from '../../../../core/plan/equipment.ts';
import { presentResponse, type PresentedResponse } from '../../../../core/present.ts';
import { driftCurve, recoveryCurve, type Curve, type RecoveryCurve } from '../../../../core/recovery.ts';
import { recoveryTable, type RecoveryTable } from '../../../../core/recovery-table.ts';
import type { TempUnit, ZoneModel, ZoneResponse } from '../../../../core/types.ts';
import { toCelsius } from '../../../../core/units.ts';
import { compareWhatIf, scenarioFigures, whatIfModel, type Comparison, type ScenarioFigures, type WhatIf } from '../../../../core/what-if.ts';
import type { ReportConditions } from './options.svelte.ts';

/** The Recovery screen's starting values, so a report without chosen conditions shows the screen's first figures. */
export function defaultConditions(unit: TempUnit): ReportConditions {
  return unit === 'F'
    ? { fromC: toCelsius(62, 'F'), toC: toCelsius(70, 'F'), outdoorC: toCelsius(20, 'F') }
    : { fromC: 16, toC: 21, outdoorC: -5 };
}

export interface ReportRequest {
  zoneId: number;
  /** Units of the report; default the zone's log units. */
  units?: TempUnit;
  /** Recovery conditions, °C; default the saved schedule's setback and occupied setpoints, else the screen's. */
  conditions?: ReportConditions | null;
  whatIf?: WhatIf | null;
  /** Called when the zone has no current fit and the report fits it (so the screen can say so). */
  onFitting?: () => void;
}

export interface ReportData {
  info: AppInfo;
  site: SiteInfo;
  zone: ZoneInfo;
  units: TempUnit;
  /** When the report was made, epoch ms. */
  madeAt: number;
  fit: FitResult;
  /** True when the stored response was missing or older than the readings, so the report fitted it. */
  refitted: boolean;
  response: PresentedResponse;
  model: ZoneModel;
  logs: LogInfo[];
  quality: LogQuality;
  conditions: ReportConditions & { source: 'chosen' | 'schedule' | 'default' };
  /** The recovery at the conditions (heating fully on); null when the log had no heating runtime. */
  recovery: RecoveryCurve | null;
  /** The same with the what-if model, when one was asked for. */
  whatIfRecovery: RecoveryCurve | null;
  comparison: Comparison | null;
  /** With a comparison: 12 unheated hours from the target at the outdoor temperature, today and changed. */
  drift: { today: Curve; whatIf: Curve } | null;
  /** Today's recovery, full-heat level and overnight drift at the conditions (null without heating). */
  today: ScenarioFigures | null;
  table: RecoveryTable | null;
  schedule: Schedule | null;
  plan: ZonePlan | null;
  /** Why the saved schedule could not be planned; null when it was, or when there is none. */
  planProblem: string | null;
  /** Outdoor °C above which the zone holds the target with no heating (setpoint − g·τ). */
  balancePointC: number;
}

/** Heating setpoints of a schedule file: the highest occupied one and the unoccupied one, °C. */
function scheduleSetpoints(file: Schedule): { occupiedC: number | null; setbackC: number | null } {
  try {
    const s = parseSchedule(file);
    let occupied: number | null = null;
    for (const day of s.days) for (const p of day) if (p.heatC !== null) occupied = Math.max(occupied ?? -Infinity, p.heatC);
    return { occupiedC: occupied, setbackC: s.unoccupied.heatC };
  } catch {
    return { occupiedC: null, setbackC: null };
  }
}

const message = (err: unknown) => (err instanceof Error ? err.message : String(err));

/**
 * Loads everything a zone report shows.
 * @throws ApiError from the backend (zone missing, no readings, a fit the data cannot support)
 */
export async function loadReport(api: HeatlagApi, request: ReportRequest): Promise<ReportData> {
  const [info, sites] = await Promise.all([api.appInfo({}), api.listSites({})]);
  const site = sites.find((s) => s.zones.some((z) => z.id === request.zoneId));
  const zone = site?.zones.find((z) => z.id === request.zoneId);
  if (!site || !zone) throw new Error('That zone no longer exists.');
  if (zone.samples === 0) throw new Error(`${site.name} › ${zone.name} has no readings yet: import a log before making its report.`);
  const units: TempUnit = request.units ?? zone.units ?? 'C';

  // The stored response, as on the Response screen; fitted when the zone has no current fit (the one fit
  // rule of lib/fit-rule.ts: none, or older than the latest import or the last reading).
  let fit = await api.latestResponse({ zoneId: zone.id });
  let refitted = false;
  if (!fit || needsFit(fit, zone)) {
    request.onFitting?.();
    fit = await api.fitZone({ zoneId: zone.id });
    refitted = true;
  }
  const r = fit.response as ZoneResponse;
  const model: ZoneModel = { tauHours: r.tauHours, heatRate: r.heatRate, coolRate: r.coolRate, gain: r.gain };

  const [logs, quality, schedules] = await Promise.all([
    api.listLogs({ zoneId: zone.id }),
    api.zoneLogQuality({ zoneId: zone.id }),
    api.listSchedules({}),
  ]);
  const schedule = schedules.find((s) => s.zoneId === zone.id)?.schedule ?? null;

  let plan: ZonePlan | null = null;
  let planProblem: string | null = null;
  if (schedule) {
    try {
      plan = await api.planZone({ zoneId: zone.id, schedule, outdoor: { kind: 'history' }, units });
    } catch (err) {
      planProblem = message(err);
    }
  }

  let conditions: ReportData['conditions'];
  const fromSchedule = schedule ? scheduleSetpoints(schedule) : null;
  if (request.conditions) conditions = { ...request.conditions, source: 'chosen' };
  else if (fromSchedule && fromSchedule.occupiedC !== null && fromSchedule.setbackC !== null && fromSchedule.setbackC < fromSchedule.occupiedC) {
    conditions = { fromC: fromSchedule.setbackC, toC: fromSchedule.occupiedC, outdoorC: defaultConditions(units).outdoorC, source: 'schedule' };
  } else conditions = { ...defaultConditions(units), source: 'default' };

  const heating = r.hasHeating && conditions.toC >= conditions.fromC;
  const recovery = heating ? recoveryCurve(model, conditions.fromC, conditions.toC, conditions.outdoorC, 0.05, { maxHours: 48 }) : null;
  const whatIf = request.whatIf && (request.whatIf.capacityFactor !== 1 || request.whatIf.heatLossFactor !== 1) ? request.whatIf : null;
  const comparison = heating && whatIf ? compareWhatIf(model, whatIf, conditions) : null;
  const whatIfRecovery =
    heating && whatIf ? recoveryCurve(whatIfModel(model, whatIf), conditions.fromC, conditions.toC, conditions.outdoorC, 0.05, { maxHours: 48 }) : null;

  return {
    info,
    site,
    zone,
    units,
    madeAt: Date.now(),
    fit,
    refitted,
    response: presentResponse(r, units),
    model,
    logs,
    quality,
    conditions,
    recovery,
    whatIfRecovery,
    comparison,
    drift:
      comparison && whatIf
        ? {
            today: driftCurve(model, conditions.toC, conditions.outdoorC, 12, 0.1),
            whatIf: driftCurve(whatIfModel(model, whatIf), conditions.toC, conditions.outdoorC, 12, 0.1),
          }
        : null,
    today: heating ? scenarioFigures(model, conditions) : null,
    table: r.hasHeating ? recoveryTable(model, conditions.toC, units) : null,
    schedule,
    plan,
    planProblem,
    balancePointC: plan?.plan.balancePoint.occupiedC ?? balancePointC(model, conditions.toC),
  };
}
