/**
 * The zone's state and its exact step, for one node (air only) or two nodes (air and building mass):
 * what every prediction (recovery, drift, optimal start, the setback plan) advances.
 *
 * Method: one node: core/step.ts's stepExact on the air temperature. Two nodes: the modal form of
 * core/fit/modes.ts, each mode stepped exactly with the same closed form (outdoor temperature linear over
 * the step, forcing constant), the air the sum of the modes and the mass their weighted sum. No
 * time-stepping error either way; one node gives bit-for-bit the numbers of stepExact.
 *
 * Units: °C, hours, K/h.
 */
import { FixedStep, stepExact } from './step.ts';
import { modalState, modesOf, type Modes } from './modes.ts';
import type { ZoneModel } from './types.ts';

/** The state of a zone: air temperature T and, for two nodes, the mass temperature m (NaN for one node). */
export interface ZoneState {
  T: number;
  m: number;
}

/** A zone's dynamics with its exact step. */
export class Plant {
  readonly twoNode: boolean;
  readonly modes: Modes;
  /** τ for one node; C_air·R_total for two (the steady rise per K/h). */
  readonly tau: number;
  private readonly w = new Float64Array(2);

  constructor(model: ZoneModel) {
    this.modes = modesOf(model);
    this.twoNode = this.modes.count === 2;
    this.tau = this.twoNode ? this.modes.tauEff : model.tauHours;
  }

  /** Where the mass settles with the air held at T and the outdoor at a: T for one node's NaN mass. */
  steadyMass(airC: number, outdoorC: number): number {
    return this.twoNode ? this.modes.mw * airC + (1 - this.modes.mw) * outdoorC : NaN;
  }

  /** A state with the air at T and the mass settled for it at outdoor a (see steadyMass). */
  settled(airC: number, outdoorC: number): ZoneState {
    return { T: airC, m: this.steadyMass(airC, outdoorC) };
  }

  /** Advances st by dt hours, outdoor a0 → a1 linearly, forcing q (K/h on the air). Exact. */
  step(st: ZoneState, dt: number, a0: number, a1: number, q: number): void {
    if (!this.twoNode) {
      st.T = stepExact(st.T, dt, this.tau, a0, a1, q);
      return;
    }
    if (dt <= 0) return;
    const { tau, o, f, r } = this.modes;
    const w = modalState(this.modes, st.T, st.m, this.w);
    let T = 0;
    let m = 0;
    for (let k = 0; k < 2; k++) {
      const s = new FixedStep(dt, tau[k]);
      w[k] = s.E * w[k] + s.wA0 * o[k] * a0 + s.wA1 * o[k] * a1 + s.wQ * f[k] * q;
      T += w[k];
      m += r[k] * w[k];
    }
    st.T = T;
    st.m = m;
  }

  /** The air temperature after dt without changing st. */
  peek(st: ZoneState, dt: number, a0: number, a1: number, q: number): number {
    const c = { T: st.T, m: st.m };
    this.step(c, dt, a0, a1, q);
    return c.T;
  }

  /**
   * The air's rise after dt hours per K/h of constant forcing, from zero (linearity: the air after dt is
   * peek(q = 0) + forcingGain(dt)·q).
   */
  forcingGain(dt: number): number {
    if (!this.twoNode) return this.tau * -Math.expm1(-dt / this.tau);
    let g = 0;
    for (let k = 0; k < 2; k++) g += this.modes.f[k] * this.modes.tau[k] * -Math.expm1(-dt / this.modes.tau[k]);
    return g;
  }
}
