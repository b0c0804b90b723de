/**
 * A fitted response in a person's units: the one shape used by `heatlag fit --json`, the API and the
 * screens, so that every output shows the same numbers (one source of truth).
 *
 * Temperatures differences (rates, lifts, errors) are in K for °C and °F differences for °F; times in
 * hours. The keys of earlier versions are kept (timeConstantHours, heatingRatePerHour, cvrmsePercent…).
 */
import { headlineTauHours, plausibilityNotes } from './plausibility.ts';
import type { ModelKind, RecoveryBacktest, TempUnit, ZoneResponse } from './types.ts';
import { deltaFromKelvin } from './units.ts';

/**
 * What the 95 % intervals include, in one sentence shown wherever they are (command line, Response
 * screen, zone report).
 */
export const INTERVAL_NOTE =
  'The 95 % intervals come from a sandwich covariance over whole days (robust to day-to-day correlation and to errors the model cannot explain) and include the bias of rounded readings and, for on/off runtime, of not knowing when in each interval the equipment ran; they were checked on simulated logs (npm run calibrate) and do not cover a mapping or unit mistake.';

/** The two-node figures in hours with their intervals. */
export interface PresentedTwoNode {
  /** τam = C_air·R_air–mass: how fast the air follows the building mass. */
  airMassHours: number;
  airMassHoursCI: [number, number];
  /** τmo = C_mass·R_mass–outdoor: how fast the mass follows outdoor. */
  massOutdoorHours: number;
  massOutdoorHoursCI: [number, number];
  /** Share of the heat capacity in the mass node (0–1): the mass coupling. */
  massCoupling: number;
  massCouplingCI: [number, number];
  /** The two modes' time constants: slow (the building's) and fast (the air's). */
  slowHours: number;
  slowHoursCI: [number, number];
  fastHours: number;
  /** C_air·R_total: the steady rise per unit of heating rate (the one-node τ's counterpart). */
  steadyHours: number;
  steadyHoursCI: [number, number];
}

export interface PresentedResponse {
  units: TempUnit;
  /** "one-node" or "two-node": the model every prediction uses. */
  model: ModelKind;
  /** One sentence: which model and why. */
  modelReason: string;
  /** The time constant a person reads: τ for one node, the slow (building) time constant for two. */
  timeConstantHours: number;
  timeConstantHoursCI: [number, number];
  twoNode: PresentedTwoNode | null;
  /** Degrees per hour at full heat (null when the log had no heating runtime). */
  heatingRatePerHour: number | null;
  heatingRatePerHourCI: [number, number] | null;
  /** Degrees per hour at full cooling (null without cooling data). */
  coolingRatePerHour: number | null;
  coolingRatePerHourCI: [number, number] | null;
  /** Degrees per hour of steady internal gain. */
  gainPerHour: number;
  gainPerHourCI: [number, number] | null;
  /** Degrees per hour per kW/m² of the clear-sky solar proxy; null without a site location. */
  solarGainPerHour: number | null;
  solarGainPerHourCI: [number, number] | null;
  /** How far above outdoor full heat can hold the zone, degrees (h·τ, two nodes h·C_air·R_total; null without heating). */
  heatingLift: number | null;
  /** Degrees (RMSE of simulated against measured indoor temperature). */
  rmse: number;
  heldOutRmse: number | null;
  /** ASHRAE Guideline 14 statistics of the indoor temperature, % (kept for scripts; not a fit-quality test of this model). */
  cvrmsePercent: number;
  nmbePercent: number;
  samplesUsed: number;
  daysUsed: number;
  segments: number;
  freeFloatHours: number;
  /** Share of the log's hours with the equipment off (0–1): where τ is seen directly. */
  freeFloatShare: number;
  /** The recovery backtest (minutes); null with recoveryBacktestReason when not run. */
  recoveryBacktest: RecoveryBacktest | null;
  recoveryBacktestReason: string | null;
  /** IANA zone of the local days the fit grouped readings by. */
  timeZone: string;
  firstTime: string;
  lastTime: string;
  heldOutDays: Array<{ from: string; to: string }>;
  warnings: string[];
  /** Figures outside what buildings do, each with its likely cause (core/plausibility.ts). */
  plausibility: string[];
}

const iso = (ms: number): string => new Date(ms).toISOString().replace('.000Z', 'Z');
const ciOk = (p: [number, number] | null | undefined): p is [number, number] => !!p && Number.isFinite(p[0]) && Number.isFinite(p[1]);

/** Converts a response (internal units) into `units`. */
export function presentResponse(r: ZoneResponse, units: TempUnit): PresentedResponse {
  const d = (k: number): number => deltaFromKelvin(k, units);
  const pair = (p: [number, number]): [number, number] => [d(p[0]), d(p[1])];
  const two = r.model === 'two-node' && r.twoNode ? r.twoNode : null;
  const hours = Math.max(0, (r.lastTime - r.firstTime) / 3_600_000);
  return {
    units,
    model: r.model ?? 'one-node',
    modelReason: r.selection?.reason ?? 'One node.',
    timeConstantHours: headlineTauHours(r),
    timeConstantHoursCI: two ? [two.slowHoursCI[0], two.slowHoursCI[1]] : [r.tauCI[0], r.tauCI[1]],
    twoNode: two
      ? {
          airMassHours: two.mass.airMassHours,
          airMassHoursCI: two.airMassHoursCI,
          massOutdoorHours: two.mass.massOutdoorHours,
          massOutdoorHoursCI: two.massOutdoorHoursCI,
          massCoupling: two.mass.massShare,
          massCouplingCI: two.massShareCI,
          slowHours: two.slowHours,
          slowHoursCI: two.slowHoursCI,
          fastHours: two.fastHours,
          steadyHours: r.tauHours,
          steadyHoursCI: [r.tauCI[0], r.tauCI[1]],
        }
      : null,
    heatingRatePerHour: r.hasHeating ? d(r.heatRate) : null,
    heatingRatePerHourCI: r.hasHeating ? pair(r.heatRateCI) : null,
    coolingRatePerHour: r.hasCooling ? d(r.coolRate) : null,
    coolingRatePerHourCI: r.hasCooling && r.coolRateCI ? pair(r.coolRateCI) : null,
    gainPerHour: d(r.gain),
    gainPerHourCI: ciOk(r.gainCI) ? pair(r.gainCI) : null,
    solarGainPerHour: r.solarGainCI ? d(r.solarGain ?? 0) : null,
    solarGainPerHourCI: ciOk(r.solarGainCI) ? pair(r.solarGainCI) : null,
    heatingLift: r.hasHeating ? d(r.heatRate * r.tauHours) : null,
    rmse: d(r.rmse),
    heldOutRmse: r.heldOutRmse === null ? null : d(r.heldOutRmse),
    cvrmsePercent: r.cvrmse,
    nmbePercent: r.nmbe,
    samplesUsed: r.samplesUsed,
    daysUsed: r.daysUsed,
    segments: r.segments,
    freeFloatHours: r.freeFloatHours,
    freeFloatShare: hours > 0 ? Math.min(1, r.freeFloatHours / hours) : 0,
    recoveryBacktest: r.recoveryBacktest ?? null,
    recoveryBacktestReason: r.recoveryBacktestReason ?? null,
    timeZone: r.timeZone ?? 'UTC',
    firstTime: iso(r.firstTime),
    lastTime: iso(r.lastTime),
    heldOutDays: r.heldOut.map((h) => ({ from: iso(h.from), to: iso(h.to) })),
    warnings: [...r.warnings],
    plausibility: plausibilityNotes(r, units),
  };
}
