/** Result and option shapes of the recovery solvers (core/recovery.ts). Units: °C, hours. */
import type { EquipmentMode, Outdoor } from './checks.ts';

/** Result of recoveryTime. */
export interface RecoveryResult {
  /** Hours from the start to reach the target, or null when it is never reached. */
  hours: number | null;
  /**
   * Equilibrium with the equipment fully on, °C: at the outdoor temperature at arrival, or, when the
   * target is never reached, at the outdoor temperature the profile ends with (held constant after it).
   */
  equilibriumC: number;
  /** Plain reason when hours is null. */
  reason?: string;
  /** 'heat' when toC > fromC (warm-up), 'cool' when toC < fromC (pull-down). */
  mode: EquipmentMode;
}

/** Options of driftCurve. */
export interface DriftOptions {
  /**
   * Setpoint held while the zone drifts, °C: a heating setback (mode 'heat', the zone is kept at or
   * above it) or a cooling setup (mode 'cool', kept at or below it). Omitted: equipment off.
   */
  setbackC?: number;
  /** Which equipment holds the setpoint (default 'heat'). */
  mode?: EquipmentMode;
  /** Where the curve starts on the profile's time axis, h (default 0). */
  startHours?: number;
}

/** A sampled curve: t hours after the start, temp °C, runtime 0–1 of the interval ending at t[i]. */
export interface Curve {
  t: Float64Array;
  temp: Float64Array;
  /** Average equipment runtime fraction over (t[i−1], t[i]]; runtime[0] = 0. */
  runtime: Float64Array;
}

/** Options of recoveryCurve. */
export interface RecoveryCurveOptions {
  /** Where the recovery starts on the profile's time axis, h (default 0). */
  startHours?: number;
  /** Longest curve drawn, h (default 72): a recovery that never ends is drawn up to this. */
  maxHours?: number;
}

/** A recovery curve for charts, with the recovery time it ends at. */
export interface RecoveryCurve extends RecoveryResult {
  t: Float64Array;
  temp: Float64Array;
}

/** Options of latestStart. */
export interface LatestStartOptions {
  /** Zone temperature when the unoccupied period begins (time 0), °C (usually the occupied setpoint). */
  startC: number;
  /** Temperature the zone must be at when occupancy begins, °C (the occupied setpoint). */
  targetC: number;
  /** Hours from the start of the unoccupied period to occupancy (> 0). */
  occupancyHours: number;
  /** Outdoor temperature, °C, or a profile on its own time axis (hours). */
  outdoor: Outdoor;
  /**
   * Setback (heating) or setup (cooling) setpoint held during the unoccupied period, °C, if the
   * equipment can; omitted: the equipment is off until the start.
   */
  setbackC?: number;
  /** 'heat' (morning warm-up, default) or 'cool' (pull-down). */
  mode?: EquipmentMode;
  /** Where time 0 falls on the profile's time axis, h (default 0). */
  periodStartHours?: number;
}

/** Result of latestStart. All times are hours after the unoccupied period began. */
export interface LatestStartResult {
  /**
   * 'ok': startHours is the latest start; 'no-recovery-needed': the zone is at or past the target at
   * occupancy without recovery (startHours = occupancyHours); 'too-late': even starting at once the
   * target is reached only after occupancy; 'cannot-hold': starting at once the target is reached but
   * the equipment cannot keep it there until occupancy; 'never-reaches': the equipment cannot reach
   * the target at all.
   */
  code: 'ok' | 'no-recovery-needed' | 'too-late' | 'cannot-hold' | 'never-reaches';
  /** Latest start of the recovery, h; null unless code is 'ok' or 'no-recovery-needed'. */
  startHours: number | null;
  /** occupancyHours − startHours: how long before occupancy to start, h. */
  leadHours: number | null;
  /** Zone temperature at the start, °C. */
  startTempC: number | null;
  /** From the start to first reaching the target with the equipment fully on, h. */
  recoveryHours: number | null;
  /** When the target is first reached, h (≤ occupancyHours). */
  arrivalHours: number | null;
  /**
   * Full-load-equivalent equipment hours from 0 to occupancy (∫u dt: setback holding, recovery, then
   * holding the target), h.
   */
  equipmentHours: number | null;
  /** Starting at once with the equipment fully on: when the target would first be reached, h; null if never. */
  earliestArrivalHours: number | null;
  /** Plain sentence for anything but 'ok'. */
  reason?: string;
}
