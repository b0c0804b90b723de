/**
 * Outdoor temperature as a function of model time: a piecewise-linear profile through samples,
 * held constant before the first sample and after the last. This is the same ambient the exact
 * stepper (step.ts) assumes between two readings.
 *
 * Units: time in hours from the profile's own origin, temperatures in °C.
 */
import { InputError } from './errors.ts';

/** Outdoor samples: `time` strictly increasing, hours; `temp` °C; the same length, at least 1. */
export interface OutdoorProfile {
  time: Float64Array;
  temp: Float64Array;
}

/**
 * Builds a checked profile (copies the inputs).
 * Throws InputError when the lengths differ, the profile is empty, a value is not finite, or the
 * times are not strictly increasing (the message names the first offending index).
 *
 * @example outdoorProfile([0, 6, 12], [-5, -8, 2]) // −5 °C at 0 h, −8 °C at 6 h, 2 °C at 12 h
 */
export function outdoorProfile(time: ArrayLike<number>, temp: ArrayLike<number>): OutdoorProfile {
  const p: OutdoorProfile = { time: Float64Array.from(time), temp: Float64Array.from(temp) };
  checkOutdoorProfile(p);
  return p;
}

/**
 * A profile that is `tempC` (°C) at all times (one sample at 0 h).
 * Throws InputError when tempC is not finite.
 */
export function constantOutdoor(tempC: number): OutdoorProfile {
  if (!Number.isFinite(tempC)) throw new InputError(`The outdoor temperature must be a finite number, got ${tempC}.`);
  return { time: Float64Array.of(0), temp: Float64Array.of(tempC) };
}

/**
 * Checks a profile in place without copying; throws InputError describing the first problem.
 * Cost O(n).
 */
export function checkOutdoorProfile(p: OutdoorProfile): void {
  if (!p || !(p.time instanceof Float64Array) || !(p.temp instanceof Float64Array)) {
    throw new InputError('An outdoor profile needs Float64Array time (hours) and temp (°C) arrays.');
  }
  const n = p.time.length;
  if (n === 0) throw new InputError('The outdoor profile is empty: it needs at least one sample.');
  if (p.temp.length !== n) {
    throw new InputError(`The outdoor profile has ${n} times but ${p.temp.length} temperatures.`);
  }
  for (let i = 0; i < n; i++) {
    if (!Number.isFinite(p.time[i])) throw new InputError(`Outdoor sample ${i}: the time ${p.time[i]} h is not a finite number.`);
    if (!Number.isFinite(p.temp[i])) throw new InputError(`Outdoor sample ${i}: the temperature ${p.temp[i]} °C is not a finite number.`);
    if (i > 0 && !(p.time[i] > p.time[i - 1])) {
      throw new InputError(
        `Outdoor sample ${i}: the time ${p.time[i]} h does not come after the previous one (${p.time[i - 1]} h); times must increase strictly.`,
      );
    }
  }
}

/**
 * The index k of the piece that holds tHours: the largest k with time[k] ≤ tHours, or −1 before the
 * first sample. Binary search, O(log n), no allocation.
 */
export function pieceIndex(profile: OutdoorProfile, tHours: number): number {
  const time = profile.time;
  let lo = 0;
  let hi = time.length - 1;
  if (!(tHours >= time[0])) return -1;
  if (tHours >= time[hi]) return hi;
  // Invariant: time[lo] ≤ t < time[hi].
  while (hi - lo > 1) {
    const mid = (lo + hi) >>> 1;
    if (time[mid] <= tHours) lo = mid;
    else hi = mid;
  }
  return lo;
}

/**
 * Outdoor temperature (°C) at tHours (hours on the profile's time axis): linear between samples,
 * the first value before the first sample and the last value after the last. Throws nothing; the
 * profile is assumed valid (see outdoorProfile / checkOutdoorProfile).
 *
 * @example outdoorAt(outdoorProfile([0, 10], [0, 10]), 2.5) // 2.5
 */
export function outdoorAt(profile: OutdoorProfile, tHours: number): number {
  const k = pieceIndex(profile, tHours);
  const n = profile.time.length;
  if (k < 0) return profile.temp[0];
  if (k >= n - 1) return profile.temp[n - 1];
  const t0 = profile.time[k];
  const t1 = profile.time[k + 1];
  const w = (tHours - t0) / (t1 - t0);
  return profile.temp[k] + w * (profile.temp[k + 1] - profile.temp[k]);
}

/**
 * Samples a function of time into a profile on a regular grid from fromHours to toHours inclusive.
 * Throws InputError for a non-positive step, an empty range, more than 10 million samples, or a
 * non-finite value.
 *
 * @example sampleOutdoor((t) => 5 + 3 * Math.sin((2 * Math.PI * t) / 24), 0, 48, 0.25)
 */
export function sampleOutdoor(fn: (tHours: number) => number, fromHours: number, toHours: number, stepHours: number): OutdoorProfile {
  if (!(stepHours > 0) || !Number.isFinite(stepHours)) throw new InputError(`The sampling step must be a positive number of hours, got ${stepHours}.`);
  if (!(toHours >= fromHours) || !Number.isFinite(fromHours) || !Number.isFinite(toHours)) {
    throw new InputError(`The sampling range ${fromHours} h to ${toHours} h is not a valid range.`);
  }
  const steps = Math.round((toHours - fromHours) / stepHours);
  const count = Math.abs(fromHours + steps * stepHours - toHours) <= 1e-9 * Math.max(1, Math.abs(toHours)) ? steps + 1 : Math.floor((toHours - fromHours) / stepHours) + 2;
  if (count > 1e7) throw new InputError(`Sampling ${toHours - fromHours} h every ${stepHours} h would need ${count} samples; use a coarser step.`);
  const time = new Float64Array(count);
  const temp = new Float64Array(count);
  for (let i = 0; i < count; i++) {
    const t = i === count - 1 ? toHours : fromHours + i * stepHours;
    time[i] = t;
    temp[i] = fn(t);
  }
  const p = { time, temp };
  checkOutdoorProfile(p);
  return p;
}
