/**
 * Input checks and shared phrases of the recovery solvers (core/recovery.ts). Units: °C, hours, K/h.
 */
import { InputError } from '../errors.ts';
import { checkOutdoorProfile, type OutdoorProfile } from '../outdoor.ts';
import type { ZoneModel } from '../types.ts';

/** Outdoor temperature: a constant °C, or a profile on its own time axis (hours). */
export type Outdoor = number | OutdoorProfile;

/** Which equipment recovers the zone: heating (warm-up) or cooling (pull-down). */
export type EquipmentMode = 'heat' | 'cool';


export function checkModel(m: ZoneModel): void {
  if (!m || typeof m !== 'object') throw new InputError('A zone model {tauHours, heatRate, coolRate, gain} is required.');
  if (!(m.tauHours > 0) || !Number.isFinite(m.tauHours)) {
    throw new InputError(`The zone's time constant τ must be a positive number of hours, got ${m.tauHours}.`);
  }
  if (!(m.heatRate >= 0) || !Number.isFinite(m.heatRate)) {
    throw new InputError(`The heating rate must be a number ≥ 0 K/h, got ${m.heatRate}.`);
  }
  if (!(m.coolRate >= 0) || !Number.isFinite(m.coolRate)) {
    throw new InputError(`The cooling rate must be a number ≥ 0 K/h, got ${m.coolRate}.`);
  }
  if (!Number.isFinite(m.gain)) throw new InputError(`The internal gain must be a finite number of K/h, got ${m.gain}.`);
}

export function checkTemp(name: string, v: number): void {
  if (!Number.isFinite(v)) throw new InputError(`${name} must be a finite temperature in °C, got ${v}.`);
}

export function checkOutdoor(o: Outdoor): void {
  if (typeof o === 'number') {
    if (!Number.isFinite(o)) throw new InputError(`The outdoor temperature must be a finite number of °C, got ${o}.`);
  } else checkOutdoorProfile(o);
}

export function checkHours(name: string, v: number, allowZero = false): void {
  if (!Number.isFinite(v) || (allowZero ? v < 0 : !(v > 0))) {
    throw new InputError(`${name} must be a ${allowZero ? 'non-negative' : 'positive'} number of hours, got ${v}.`);
  }
}

export const fmt = (x: number): string => (Number.isFinite(x) ? x.toFixed(1) : String(x));

export const MAX_POINTS = 10_000_000;

export function gridCount(hours: number, stepHours: number): number {
  const k = Math.floor(hours / stepHours + 1e-9);
  const onGrid = Math.abs(k * stepHours - hours) <= 1e-9 * Math.max(1, hours);
  const count = onGrid ? k + 1 : k + 2;
  if (count > MAX_POINTS) {
    throw new InputError(`A curve of ${hours} h every ${stepHours} h would need ${count} points; use a larger step.`);
  }

  return count;
}

export function neverReason(mode: EquipmentMode, model: ZoneModel, eqC: number, outdoorC: number, targetC: number): string {
  if (mode === 'heat') {
    if (model.heatRate === 0) {
      return `The zone has no heating (heating rate 0 K/h); on its own it settles at ${fmt(eqC)} °C (outdoor ${fmt(outdoorC)} °C), below the target ${fmt(targetC)} °C, so it never reaches it.`;
    }
    return `With heating fully on the zone settles at ${fmt(eqC)} °C (outdoor ${fmt(outdoorC)} °C), not above the target ${fmt(targetC)} °C, so it never reaches it: the heating is too small for this weather.`;
  }
  if (model.coolRate === 0) {
    return `The zone has no cooling (cooling rate 0 K/h); on its own it settles at ${fmt(eqC)} °C (outdoor ${fmt(outdoorC)} °C), above the target ${fmt(targetC)} °C, so it never reaches it.`;
  }
  return `With cooling fully on the zone settles at ${fmt(eqC)} °C (outdoor ${fmt(outdoorC)} °C), not below the target ${fmt(targetC)} °C, so it never reaches it: the cooling is too small for this weather.`;
}

export function fullForcing(model: ZoneModel, mode: EquipmentMode): number {
  return mode === 'heat' ? model.gain + model.heatRate : model.gain - model.coolRate;
}

