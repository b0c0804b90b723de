/**
 * The exact machinery of the one-node recovery solvers: crossings, full-output runs and a held setpoint,
 * solved on the closed-form solution inside each outdoor piece (see core/recovery.ts for the method).
 */
import { stepExact } from '../step.ts';
import type { ZoneModel } from '../types.ts';
import { Ambient } from './ambient.ts';
import type { EquipmentMode } from './checks.ts';

/** Thermostat phases of a held setpoint. */
export const FREE = 0; // on the free side of the setpoint (heating: above it), equipment off
export const HELD = 1; // exactly at the setpoint, equipment at the fraction it needs
export const SAT = 2; // on the other side (heating: below it), equipment fully on

/** Mutable simulation state, reused to stay allocation-free in loops. */
export interface State {
  t: number;
  T: number;
  phase: number;
  /** Full-load-equivalent equipment hours so far (∫u dt). */
  equip: number;
}

/** Newton/bisection stopping tolerance on time, hours (well under the 1e-9 h required). */
const TIME_TOL = 1e-11;

/**
 * First s in (0, dt] where sgn·(T(s) − target) ≥ 0, for the exact in-piece solution from T0 with
 * ambient a0 + b·s and forcing q; −1 when there is none. Precondition: sgn·(T0 − target) ≤ 0, and when
 * it is 0 the solution is leaving the level (`departing`), so the crossing sought is a return.
 */
export function firstCrossing(T0: number, dt: number, tau: number, a0: number, b: number, q: number, target: number, sgn: number, departing: boolean): number {
  const d0 = (a0 - T0) / tau + q; // T'(0)
  let hi = dt;
  if (!departing && sgn * d0 > 0) {
    // f = sgn(T − target) rises at first; if it turns over inside the piece, search only up to the top.
    const dEnd = b - (b - d0) * Math.exp(-dt / tau);
    if (sgn * dEnd < 0) hi = Math.min(dt, tau * Math.log1p(-d0 / b));
  }
  const fHi = sgn * (stepExact(T0, hi, tau, a0, a0 + b * hi, q) - target);
  if (fHi < 0) return -1;
  if (fHi === 0) return hi;
  // f < 0 on (0, root), f ≥ 0 on [root, hi]: one sign change. Safeguarded Newton (f' is the ODE itself).
  let lo = 0;
  let up = hi;
  let x = hi;
  let fx = fHi;
  for (let i = 0; i < 200; i++) {
    const Tx = target + sgn * fx;
    const dfx = sgn * ((a0 + b * x - Tx) / tau + q);
    let xn = x - fx / dfx;
    if (!(xn > lo && xn < up)) xn = 0.5 * (lo + up);
    const fn = sgn * (stepExact(T0, xn, tau, a0, a0 + b * xn, q) - target);
    if (fn >= 0) up = xn;
    else lo = xn;
    if (Math.abs(xn - x) <= TIME_TOL || up - lo <= TIME_TOL) return fn >= 0 ? xn : up - lo <= TIME_TOL ? up : xn;
    x = xn;
    fx = fn;
  }
  return up;
}

/** Advances st to tEnd with a constant forcing q (K/h), exact steps over the pieces. */
export function runForced(amb: Ambient, st: State, tEnd: number, tau: number, q: number, uEquip: number): void {
  amb.seek(st.t);
  while (st.t < tEnd) {
    const segEnd = Math.min(amb.end(), tEnd);
    const dt = segEnd - st.t;
    const a0 = amb.at(st.t);
    st.T = stepExact(st.T, dt, tau, a0, a0 + amb.slope() * dt, q);
    st.equip += uEquip * dt;
    st.t = segEnd;
    if (segEnd < tEnd) amb.next();
  }
}

/**
 * Equipment fully on (forcing q) from st until the zone first reaches `target` from the side sgn
 * (+1 rising, −1 falling) or until tEnd (may be +∞). Returns true with st at the arrival (T = target),
 * or false with st at tEnd (or, for tEnd = +∞, at the start of the last, constant piece).
 */
export function runToTarget(amb: Ambient, st: State, tEnd: number, tau: number, q: number, target: number, sgn: number): boolean {
  if (sgn * (st.T - target) >= 0) return true;
  amb.seek(st.t);
  for (;;) {
    const pieceEnd = amb.end();
    const a0 = amb.at(st.t);
    if (pieceEnd === Infinity && tEnd === Infinity) {
      // Constant outdoor from here on: closed form τ·ln((T_eq − T0)/(T_eq − T1)).
      const Teq = a0 + q * tau;
      if (sgn * (Teq - target) <= 0) return false;
      const s = tau * Math.log1p((target - st.T) / (Teq - target));
      st.equip += s;
      st.t += s;
      st.T = target;
      return true;
    }
    const segEnd = Math.min(pieceEnd, tEnd);
    const dt = segEnd - st.t;
    if (dt > 0) {
      const b = amb.slope();
      const s = firstCrossing(st.T, dt, tau, a0, b, q, target, sgn, false);
      if (s >= 0) {
        st.equip += s;
        st.t = s >= dt ? segEnd : st.t + s;
        st.T = target;
        return true;
      }
      st.T = stepExact(st.T, dt, tau, a0, a0 + b * dt, q);
      st.equip += dt;
    }
    st.t = segEnd;
    if (segEnd >= tEnd) return false;
    amb.next();
  }
}

/** The zone constants the drift solver needs. */
export interface Plant {
  tau: number;
  g: number;
  /** Signed full equipment effect, K/h: +h for heating, −c for cooling. */
  e: number;
  /** +1 heating, −1 cooling. */
  sgn: number;
}

export function plantOf(model: ZoneModel, mode: EquipmentMode): Plant {
  return mode === 'heat'
    ? { tau: model.tauHours, g: model.gain, e: model.heatRate, sgn: 1 }
    : { tau: model.tauHours, g: model.gain, e: -model.coolRate, sgn: -1 };
}

/** Initial thermostat phase for temperature T and setpoint sp (NaN = no setpoint). */
export function initialPhase(p: Plant, T: number, sp: number): number {
  if (Number.isNaN(sp) || p.e === 0) return FREE;
  const side = p.sgn * (T - sp); // > 0: free side
  return side > 0 ? FREE : side < 0 ? SAT : HELD;
}

/**
 * Free-floating drift, or drift holding setpoint sp (NaN = equipment off), from st to tEnd.
 * Exact: the thermostat switching instants are solved within each piece (see the module comment).
 */
export function runDrift(p: Plant, amb: Ambient, st: State, tEnd: number, sp: number): void {
  if (Number.isNaN(sp) || p.e === 0) {
    runForced(amb, st, tEnd, p.tau, p.g, 0);
    return;
  }
  const { tau, g, e, sgn } = p;
  amb.seek(st.t);
  while (st.t < tEnd) {
    const segEnd = Math.min(amb.end(), tEnd);
    const b = amb.slope();
    let a0 = amb.at(st.t);
    let departing = false;
    // A linear piece holds at most a few switches; the guard only protects against rounding chatter.
    for (let guard = 0; st.t < segEnd; guard++) {
      const dt = segEnd - st.t;
      if (st.phase === HELD) {
        // Runtime needed to hold sp, linear in time over the piece: u(s) = u0 + du·s.
        const u0 = ((sp - a0) / tau - g) / e;
        const du = -b / (tau * e);
        if (guard < 16 && (u0 > 1 || (u0 >= 1 && du > 0))) {
          st.phase = SAT;
          departing = true;
          continue;
        }
        if (guard < 16 && (u0 < 0 || (u0 <= 0 && du < 0))) {
          st.phase = FREE;
          departing = true;
          continue;
        }
        const sx = du > 0 ? (1 - u0) / du : du < 0 ? -u0 / du : Infinity;
        if (sx >= dt || guard >= 16) {
          const uAvg = Math.min(1, Math.max(0, u0 + 0.5 * du * dt));
          st.equip += uAvg * dt;
          st.T = sp;
          st.t = segEnd;
          break;
        }
        st.equip += (u0 + 0.5 * du * sx) * sx;
        st.t += sx;
        a0 += b * sx;
        // Tangential exit inside the piece: the zone leaves the setpoint and, the outdoor slope
        // keeping its sign, cannot come back before the piece ends.
        st.phase = du > 0 ? SAT : FREE;
        const rest = segEnd - st.t;
        const sat = st.phase === SAT;
        st.T = stepExact(sp, rest, tau, a0, a0 + b * rest, sat ? g + e : g);
        if (sat) st.equip += rest;
        st.t = segEnd;
        break;
      }
      const sat = st.phase === SAT;
      const q = sat ? g + e : g;
      // Approaching sp: from the saturated side in the equipment's direction, from the free side against it.
      const fs = sat ? sgn : -sgn;
      if (!departing && guard < 16) {
        const f0 = fs * (st.T - sp);
        const d0 = (a0 - st.T) / tau + q;
        if (f0 > 0 || (f0 === 0 && fs * d0 >= 0)) {
          st.phase = HELD;
          st.T = sp;
          continue;
        }
      }
      const s = guard < 16 ? firstCrossing(st.T, dt, tau, a0, b, q, sp, fs, departing) : -1;
      departing = false;
      if (s >= 0) {
        if (sat) st.equip += s;
        st.t = s >= dt ? segEnd : st.t + s;
        a0 += b * s;
        st.T = sp;
        st.phase = HELD;
        continue;
      }
      st.T = stepExact(st.T, dt, tau, a0, a0 + b * dt, q);
      if (sat) st.equip += dt;
      st.t = segEnd;
    }
    if (st.t < tEnd) amb.next();
  }
}

