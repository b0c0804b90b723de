/**
 * Exact one-interval solution of the lumped zone model with a linearly moving ambient.
 *
 * Method: the linear first-order ODE  dT/dt = (a(t) − T)/τ + q,  with a(t) = a0 + b·t on [0, Δ] and
 * q constant, has the closed-form solution (integrating factor e^{t/τ}; any ODE text):
 *   T(Δ) = E·T0 + (1 − E)·(a0 + q·τ) + b·(Δ − τ·(1 − E)),   E = e^{−Δ/τ},  b = (a1 − a0)/Δ.
 * (1 − E) is computed with expm1 so that Δ ≪ τ loses no digits. No time-stepping error at all:
 * the only approximation is the model's (ambient linear between samples, runtime constant in an interval).
 *
 * Units: T, a in °C (or any one unit), Δ and τ in hours, q in K/h.
 * Throws nothing; τ must be > 0 and Δ ≥ 0 (Δ = 0 returns T0).
 *
 * @example stepExact(20, 1, 10, 0, 0, 0) // 20·e^{−0.1} = 18.0967…
 */
export function stepExact(T0: number, dtHours: number, tauHours: number, a0: number, a1: number, q: number): number {
  if (dtHours <= 0) return T0;
  const x = dtHours / tauHours;
  const oneMinusE = -Math.expm1(-x);
  const E = 1 - oneMinusE;
  const b = (a1 - a0) / dtHours;
  return E * T0 + oneMinusE * (a0 + q * tauHours) + b * (dtHours - tauHours * oneMinusE);
}

/**
 * The same exact step with its coefficients precomputed for one Δ and τ, for long runs at a fixed
 * interval:  T(Δ) = E·T0 + wA0·a0 + wA1·a1 + wQ·q.
 */
export class FixedStep {
  readonly E: number;
  readonly wA0: number;
  readonly wA1: number;
  readonly wQ: number;

  constructor(dtHours: number, tauHours: number) {
    const oneMinusE = -Math.expm1(-dtHours / tauHours);
    this.E = 1 - oneMinusE;
    // b·(Δ − τ(1−E)) = (a1 − a0)·(1 − τ(1−E)/Δ); collect the a0 and a1 weights.
    const r = dtHours > 0 ? (tauHours * oneMinusE) / dtHours : 1;
    this.wA1 = 1 - r;
    this.wA0 = oneMinusE - (1 - r);
    this.wQ = oneMinusE * tauHours;
  }

  /** One step from T0 with ambient a0 → a1 and forcing q (K/h). */
  step(T0: number, a0: number, a1: number, q: number): number {
    return this.E * T0 + this.wA0 * a0 + this.wA1 * a1 + this.wQ * q;
  }
}

/** The forcing q = h·u_heat − c·u_cool + g of the zone model, K/h. */
export function forcing(heatRate: number, coolRate: number, gain: number, uHeat: number, uCool: number): number {
  return heatRate * uHeat - coolRate * uCool + gain;
}
