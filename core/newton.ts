/**
 * Newton's law of cooling at a constant ambient (lumped capacitance):
 *   dT/dt = (T_a − T)/τ   ⇒   T(t) = T_a + (T0 − T_a)·e^(−t/τ).
 * Source: any heat-transfer text, e.g. Incropera et al., Fundamentals of Heat and Mass Transfer, §5.1–5.2;
 * Çengel, Heat Transfer: A Practical Approach, §4-1.
 *
 * Units: temperatures in °C (any one unit works, differences then in that unit), times in hours.
 * The formulas are unit-free in time: τ and t only need the same unit (the lumped helpers at the end
 * work in SI and return seconds).
 */
import { InputError, UnderdeterminedError } from './errors.ts';

/** A time to reach a temperature: hours, or null with a plain reason when it is never reached. */
export type ReachTime = { hours: number; reason?: undefined } | { hours: null; reason: string };

/** One temperature reading at a known time. */
export interface Reading {
  /** Time of the reading, hours (any origin). */
  hours: number;
  /** Temperature, °C. */
  tempC: number;
}

function finite(name: string, v: number, unit: string): void {
  if (!Number.isFinite(v)) throw new InputError(`${name} must be a finite number${unit ? ` (${unit})` : ''}, got ${v}.`);
}

function positiveTau(tauHours: number): void {
  if (!(tauHours > 0) || !Number.isFinite(tauHours)) {
    throw new InputError(`The time constant τ must be a positive number of hours, got ${tauHours}.`);
  }
}

/**
 * Temperature after tHours at a constant ambient: T_a + (T0 − T_a)·e^(−t/τ).
 * Method: closed-form solution of Newton's law of cooling.
 *
 * @param startC T0, °C at t = 0
 * @param ambientC T_a, °C
 * @param tauHours τ, hours (> 0)
 * @param tHours t, hours (negative t extrapolates backwards)
 * @throws InputError for τ ≤ 0 or a non-finite argument
 * @example coolingTemperature(20, 0, 10, 10) // 20·e^(−1) = 7.357… °C
 */
export function coolingTemperature(startC: number, ambientC: number, tauHours: number, tHours: number): number {
  finite('The start temperature', startC, '°C');
  finite('The ambient temperature', ambientC, '°C');
  finite('The time', tHours, 'h');
  positiveTau(tauHours);
  return ambientC + (startC - ambientC) * Math.exp(-tHours / tauHours);
}

/**
 * Time for the body to go from startC to targetC at a constant ambient:
 *   t = τ·ln((T0 − T_a)/(T1 − T_a)),  computed as τ·log1p((T0 − T1)/(T1 − T_a)) for accuracy.
 * Method: inverse of the closed-form solution.
 *
 * Returns {hours: 0} when target = start, and {hours: null, reason} when the target is never reached:
 * it is not strictly between the start and the ambient (the body only approaches the ambient, and
 * reaches the ambient itself only after infinite time).
 *
 * @param startC T0, °C; @param ambientC T_a, °C; @param tauHours τ, hours (> 0); @param targetC T1, °C
 * @throws InputError for τ ≤ 0 or a non-finite argument
 * @example timeToReach(25, 200, 1, 199) // {hours: ln(175) = 5.16} (τ in seconds gives seconds)
 */
export function timeToReach(startC: number, ambientC: number, tauHours: number, targetC: number): ReachTime {
  finite('The start temperature', startC, '°C');
  finite('The ambient temperature', ambientC, '°C');
  finite('The target temperature', targetC, '°C');
  positiveTau(tauHours);
  if (targetC === startC) return { hours: 0 };
  const d0 = startC - ambientC;
  const d1 = targetC - ambientC;
  if (d1 === 0) {
    return { hours: null, reason: `The target ${targetC} °C equals the ambient; it is approached but never reached.` };
  }
  if (d0 === 0) {
    return { hours: null, reason: `The start ${startC} °C equals the ambient, so the temperature never moves.` };
  }
  if (Math.sign(d0) !== Math.sign(d1) || Math.abs(d1) > Math.abs(d0)) {
    return {
      hours: null,
      reason: `The target ${targetC} °C is not between the start ${startC} °C and the ambient ${ambientC} °C, so it is never reached.`,
    };
  }
  return { hours: tauHours * Math.log1p((startC - targetC) / d1) };
}

/**
 * τ from two readings at a constant, known ambient:  τ = (t1 − t0) / ln((T0 − T_a)/(T1 − T_a)).
 * Method: the closed-form solution solved for τ (two points on one exponential). The readings may be
 * given in either order of time.
 *
 * @param first, second readings (hours, °C) at different times
 * @param ambientC T_a, °C, constant between the readings
 * @returns τ in hours (> 0)
 * @throws InputError for a non-finite value, equal times, readings on opposite sides of the ambient
 *   (crossing it) or moving away from it (inconsistent with cooling toward that ambient);
 *   UnderdeterminedError when a reading equals the ambient or both temperatures are equal (τ is then
 *   not determined by the data: zero or infinite).
 * @example tauFromTwoReadings({hours: 0, tempC: 20}, {hours: 10, tempC: 7.357588823}, 0) // ≈ 10 h
 */
export function tauFromTwoReadings(first: Reading, second: Reading, ambientC: number): number {
  finite('The first reading time', first.hours, 'h');
  finite('The first reading', first.tempC, '°C');
  finite('The second reading time', second.hours, 'h');
  finite('The second reading', second.tempC, '°C');
  finite('The ambient temperature', ambientC, '°C');
  let a = first;
  let b = second;
  if (b.hours < a.hours) [a, b] = [b, a];
  const dt = b.hours - a.hours;
  if (!(dt > 0)) throw new InputError('The two readings are at the same time, so they cannot give a time constant.');
  const d0 = a.tempC - ambientC;
  const d1 = b.tempC - ambientC;
  if (d0 === 0 || d1 === 0) {
    throw new UnderdeterminedError(
      `A reading equals the ambient ${ambientC} °C, so the time constant is not determined (the law of cooling reaches the ambient only after infinite time).`,
    );
  }
  if (Math.sign(d0) !== Math.sign(d1)) {
    throw new InputError(
      `The readings ${a.tempC} °C and ${b.tempC} °C lie on opposite sides of the ambient ${ambientC} °C; cooling toward a constant ambient never crosses it.`,
    );
  }
  if (d0 === d1) {
    throw new UnderdeterminedError(`Both readings are ${a.tempC} °C: the temperature did not move, so the time constant is not determined.`);
  }
  if (Math.abs(d1) > Math.abs(d0)) {
    throw new InputError(
      `The temperature moved away from the ambient ${ambientC} °C (from ${a.tempC} °C to ${b.tempC} °C); cooling toward it cannot do that.`,
    );
  }
  // ln(d0/d1) = log1p((d0 − d1)/d1), exact for nearby readings.
  return dt / Math.log1p((a.tempC - b.tempC) / d1);
}

/**
 * Lumped-capacitance time constant τ = ρ·c·V / (h·A), seconds (SI inputs).
 * Source: Incropera et al., eq. 5.7; Çengel, eq. 4-4 (b = 1/τ).
 * @param densityKgM3 ρ, kg/m³; @param specificHeatJKgK c, J/(kg·K); @param volumeM3 V, m³;
 * @param hWm2K convection coefficient h, W/(m²·K); @param areaM2 surface area A, m²
 * @throws InputError for a non-positive or non-finite argument
 * @example lumpedTauSeconds(8500, 400, V, 400, A) // sphere of D = 0.706 mm: ≈ 1 s
 */
export function lumpedTauSeconds(densityKgM3: number, specificHeatJKgK: number, volumeM3: number, hWm2K: number, areaM2: number): number {
  const args: Array<[string, number]> = [
    ['The density', densityKgM3],
    ['The specific heat', specificHeatJKgK],
    ['The volume', volumeM3],
    ['The convection coefficient', hWm2K],
    ['The surface area', areaM2],
  ];
  for (const [name, v] of args) {
    if (!(v > 0) || !Number.isFinite(v)) throw new InputError(`${name} must be a positive number, got ${v}.`);
  }
  return (densityKgM3 * specificHeatJKgK * volumeM3) / (hWm2K * areaM2);
}

/**
 * Biot number Bi = h·Lc/k (dimensionless); the lumped model is valid for Bi < 0.1.
 * Source: Incropera et al., eq. 5.10; Çengel, eq. 4-6.
 * @param hWm2K h, W/(m²·K); @param lengthM characteristic length Lc = V/A, m; @param conductivityWmK k, W/(m·K)
 * @throws InputError for a non-positive or non-finite argument
 */
export function biotNumber(hWm2K: number, lengthM: number, conductivityWmK: number): number {
  for (const v of [hWm2K, lengthM, conductivityWmK]) {
    if (!(v > 0) || !Number.isFinite(v)) throw new InputError(`The Biot number needs positive h, Lc and k, got ${v}.`);
  }
  return (hWm2K * lengthM) / conductivityWmK;
}
