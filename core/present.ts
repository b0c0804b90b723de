/**
 * A fitted response in a person's units: the one shape used by `heatlag fit --json`, the API and the
 * screens, so that every output shows the same numbers (one source of truth).
 */
import type { TempUnit, ZoneResponse } from './types.ts';
import { deltaFromKelvin } from './units.ts';

/**
 * What the 95 % intervals do and do not cover, in one sentence shown wherever they are (command line,
 * Response screen, zone report).
 */
export const INTERVAL_NOTE =
  'The 95 % intervals show how far each figure moves when whole days of the log are resampled; they leave out what the one-mass model cannot see (sun, occupants, heat stored deep in heavy walls), so the real uncertainty is larger.';

export interface PresentedResponse {
  units: TempUnit;
  timeConstantHours: number;
  timeConstantHoursCI: [number, number];
  /** Degrees per hour at full heat (null when the log had no heating runtime). */
  heatingRatePerHour: number | null;
  heatingRatePerHourCI: [number, number] | null;
  /** Degrees per hour at full cooling (null without cooling data). */
  coolingRatePerHour: number | null;
  coolingRatePerHourCI: [number, number] | null;
  /** Degrees per hour of steady internal gain. */
  gainPerHour: number;
  /** h·τ: how far above outdoor full heat can hold the zone, degrees (null without heating). */
  heatingLift: number | null;
  /** Degrees (RMSE of simulated against measured indoor temperature). */
  rmse: number;
  heldOutRmse: number | null;
  /** ASHRAE Guideline 14 statistics of the indoor temperature, %. */
  cvrmsePercent: number;
  nmbePercent: number;
  samplesUsed: number;
  daysUsed: number;
  segments: number;
  freeFloatHours: number;
  firstTime: string;
  lastTime: string;
  heldOutDays: Array<{ from: string; to: string }>;
  warnings: string[];
}

const iso = (ms: number): string => new Date(ms).toISOString().replace('.000Z', 'Z');

/** Converts a response (internal units) into `units`. */
export function presentResponse(r: ZoneResponse, units: TempUnit): PresentedResponse {
  const d = (k: number): number => deltaFromKelvin(k, units);
  const pair = (p: [number, number]): [number, number] => [d(p[0]), d(p[1])];
  return {
    units,
    timeConstantHours: r.tauHours,
    timeConstantHoursCI: [r.tauCI[0], r.tauCI[1]],
    heatingRatePerHour: r.hasHeating ? d(r.heatRate) : null,
    heatingRatePerHourCI: r.hasHeating ? pair(r.heatRateCI) : null,
    coolingRatePerHour: r.hasCooling ? d(r.coolRate) : null,
    coolingRatePerHourCI: r.hasCooling && r.coolRateCI ? pair(r.coolRateCI) : null,
    gainPerHour: d(r.gain),
    heatingLift: r.hasHeating ? d(r.heatRate * r.tauHours) : null,
    rmse: d(r.rmse),
    heldOutRmse: r.heldOutRmse === null ? null : d(r.heldOutRmse),
    cvrmsePercent: r.cvrmse,
    nmbePercent: r.nmbe,
    samplesUsed: r.samplesUsed,
    daysUsed: r.daysUsed,
    segments: r.segments,
    freeFloatHours: r.freeFloatHours,
    firstTime: iso(r.firstTime),
    lastTime: iso(r.lastTime),
    heldOutDays: r.heldOut.map((h) => ({ from: iso(h.from), to: iso(h.to) })),
    warnings: [...r.warnings],
  };
}
