/**
 * Steady periodic response of the zone to a sinusoidal outdoor temperature.
 *
 * Method: for the first-order lag τ·dy/dt + y = x with x = A·sin ωt, once the transient has died out
 * y = A/√(1 + ω²τ²) · sin(ωt − φ),  φ = arctan(ωτ).
 * Source: Mikleš & Fikar, Process Modelling, Identification, and Control (Springer 2007), §4,
 * eqs. 4.108–4.113; Seborg, Edgar & Mellichamp, Process Dynamics and Control, eq. 13-3a.
 * For the zone model dT/dt = (T_out − T)/τ + g (free-floating) the indoor mean is the outdoor mean + g·τ.
 *
 * Units: τ and the period in hours, temperatures in °C, amplitudes in K.
 */
import { InputError } from './errors.ts';
import type { OutdoorProfile } from './outdoor.ts';
import { sampleOutdoor } from './outdoor.ts';

function checkPositive(name: string, v: number): void {
  if (!(v > 0) || !Number.isFinite(v)) throw new InputError(`${name} must be a positive number of hours, got ${v}.`);
}

/**
 * Steady amplitude ratio (indoor swing / outdoor swing) 1/√(1 + ω²τ²), ω = 2π/period.
 * @param tauHours τ, h (> 0); @param periodHours period of the outdoor cycle, h (default 24)
 * @throws InputError for non-positive arguments
 * @example amplitudeRatio(10) // 0.3568
 */
export function amplitudeRatio(tauHours: number, periodHours = 24): number {
  checkPositive('The time constant τ', tauHours);
  checkPositive('The period', periodHours);
  const wt = ((2 * Math.PI) / periodHours) * tauHours;
  return 1 / Math.hypot(1, wt);
}

/**
 * Steady lag of the indoor swing behind the outdoor swing, hours: arctan(ωτ)/ω.
 * @param tauHours τ, h (> 0); @param periodHours period, h (default 24)
 * @throws InputError for non-positive arguments
 * @example phaseLagHours(10) // 4.61 h
 */
export function phaseLagHours(tauHours: number, periodHours = 24): number {
  checkPositive('The time constant τ', tauHours);
  checkPositive('The period', periodHours);
  const w = (2 * Math.PI) / periodHours;
  return Math.atan(w * tauHours) / w;
}

/** Options of sinusoidalOutdoor. */
export interface SinusoidOptions {
  /** Mean outdoor temperature, °C. */
  meanC: number;
  /** Half the daily swing, K. */
  amplitudeK: number;
  /** Period, hours (default 24). */
  periodHours?: number;
  /** Time of the peak within the cycle, hours (default periodHours / 4, i.e. a pure sine from 0). */
  peakHour?: number;
  /** Length of the profile, hours. */
  hours: number;
  /** Sampling step, hours. */
  stepHours: number;
}

/**
 * A sinusoidal outdoor profile sampled on a regular grid (piecewise linear between samples):
 * T(t) = mean + A·cos(ω(t − peak)).
 * @throws InputError for a non-positive period, length or step, or a non-finite mean or amplitude
 * @example sinusoidalOutdoor({ meanC: 5, amplitudeK: 4, hours: 72, stepHours: 0.25 })
 */
export function sinusoidalOutdoor(o: SinusoidOptions): OutdoorProfile {
  const period = o.periodHours ?? 24;
  checkPositive('The period', period);
  checkPositive('The profile length', o.hours);
  if (!Number.isFinite(o.meanC) || !Number.isFinite(o.amplitudeK)) {
    throw new InputError('The mean (°C) and amplitude (K) of the outdoor cycle must be finite numbers.');
  }
  const peak = o.peakHour ?? period / 4;
  const w = (2 * Math.PI) / period;
  return sampleOutdoor((t) => o.meanC + o.amplitudeK * Math.cos(w * (t - peak)), 0, o.hours, o.stepHours);
}
