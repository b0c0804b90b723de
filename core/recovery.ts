/**
 * Recovery, drift and optimal start with a fitted zone model (types.ts):
 *   dT/dt = (T_out(t) − T)/τ + h·u_heat − c·u_cool + g
 * with the outdoor temperature constant or piecewise linear (outdoor.ts).
 *
 * Method: no time-stepping error anywhere. Over each linear piece of the outdoor profile the state is
 * advanced with the exact closed-form step (step.ts, stepExact). Within a piece the solution is
 *   T(s) = P + b·s + (T0 − P)·e^(−s/τ),   P = a0 + q·τ − b·τ,  T'(s) = b − (b − T'(0))·e^(−s/τ),
 * so T' is monotone in s: a level is crossed at most twice per piece, the first crossing is bracketed
 * exactly (using the closed-form extremum s* = τ·ln(1 − T'(0)/b) when T' changes sign) and solved by
 * safeguarded Newton iteration on the closed form to about 1e-11 h. With a constant outdoor temperature
 * the recovery time is the closed form τ·ln((T_eq − T0)/(T_eq − T1)).
 *
 * A held setback (heating) or setup (cooling) setpoint is modelled as an ideal thermostat: the
 * equipment keeps the zone exactly at the setpoint with the runtime fraction it needs,
 * u = ((sp − T_out)/τ − g)/h for heating, when that lies in [0, 1]; below the setpoint it runs
 * fully, above it (heating) it is off. The switching instants are solved exactly too.
 *
 * Units: temperatures °C, time hours, rates K/h. Times in results are hours after the given start.
 */
import type { ZoneModel } from './types.ts';
import { stepExact } from './step.ts';
import { InputError } from './errors.ts';
import { type OutdoorProfile, checkOutdoorProfile, outdoorAt, pieceIndex } from './outdoor.ts';

/** Outdoor temperature: a constant °C, or a profile on its own time axis (hours). */
export type Outdoor = number | OutdoorProfile;

/** Which equipment recovers the zone: heating (warm-up) or cooling (pull-down). */
export type EquipmentMode = 'heat' | 'cool';

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

// ---------------------------------------------------------------------------------------------
// Validation

function checkModel(m: ZoneModel): void {
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

function checkTemp(name: string, v: number): void {
  if (!Number.isFinite(v)) throw new InputError(`${name} must be a finite temperature in °C, got ${v}.`);
}

function checkOutdoor(o: Outdoor): void {
  if (typeof o === 'number') {
    if (!Number.isFinite(o)) throw new InputError(`The outdoor temperature must be a finite number of °C, got ${o}.`);
  } else checkOutdoorProfile(o);
}

function checkHours(name: string, v: number, allowZero = false): void {
  if (!Number.isFinite(v) || (allowZero ? v < 0 : !(v > 0))) {
    throw new InputError(`${name} must be a ${allowZero ? 'non-negative' : 'positive'} number of hours, got ${v}.`);
  }
}

const fmt = (x: number): string => (Number.isFinite(x) ? x.toFixed(1) : String(x));

// ---------------------------------------------------------------------------------------------
// Equilibrium

/**
 * Steady zone temperature at a constant outdoor temperature with the equipment at runtime u:
 *   heating: T_out + (h·u + g)·τ;  cooling: T_out + (g − c·u)·τ;  off: T_out + g·τ.
 * Method: dT/dt = 0 in the zone model.
 * @param model zone model; @param outdoorC °C; @param u runtime fraction 0–1 (default 1, fully on);
 * @param mode 'heat' (default), 'cool' or 'off'
 * @returns °C
 * @throws InputError for an invalid model, a non-finite outdoor temperature or u outside [0, 1]
 * @example equilibrium({tauHours: 30, heatRate: 1, coolRate: 0, gain: 0.1}, -5) // -5 + 1.1·30 = 28 °C
 */
export function equilibrium(model: ZoneModel, outdoorC: number, u = 1, mode: EquipmentMode | 'off' = 'heat'): number {
  checkModel(model);
  checkTemp('The outdoor temperature', outdoorC);
  if (!(u >= 0 && u <= 1)) throw new InputError(`The runtime fraction u must be between 0 and 1, got ${u}.`);
  const e = mode === 'heat' ? model.heatRate * u : mode === 'cool' ? -model.coolRate * u : 0;
  return outdoorC + (e + model.gain) * model.tauHours;
}

// ---------------------------------------------------------------------------------------------
// Internal machinery: an ambient cursor over the profile's pieces, and the exact in-piece solvers.

/** Walks the pieces of a profile; a constant outdoor temperature is one piece from −∞ to +∞. */
class Ambient {
  private readonly profile: OutdoorProfile;
  private readonly time: Float64Array;
  private readonly temp: Float64Array;
  private readonly n: number;
  k = 0;

  constructor(outdoor: Outdoor) {
    // A constant is one sample at −∞: pieceIndex then always finds piece 0, the last, constant one.
    this.profile = typeof outdoor === 'number' ? { time: Float64Array.of(-Infinity), temp: Float64Array.of(outdoor) } : outdoor;
    this.time = this.profile.time;
    this.temp = this.profile.temp;
    this.n = this.time.length;
  }

  seek(t: number): void {
    this.k = pieceIndex(this.profile, t);
  }

  /** End of the current piece (+∞ on the last). */
  end(): number {
    return this.k + 1 < this.n ? this.time[this.k + 1] : Infinity;
  }

  /** Slope of the current piece, K/h. */
  slope(): number {
    const k = this.k;
    if (k < 0 || k >= this.n - 1) return 0;
    return (this.temp[k + 1] - this.temp[k]) / (this.time[k + 1] - this.time[k]);
  }

  /** Outdoor temperature at t, which must lie in the current piece. */
  at(t: number): number {
    const k = this.k;
    if (k < 0) return this.temp[0];
    if (k >= this.n - 1) return this.temp[this.n - 1];
    return this.temp[k] + this.slope() * (t - this.time[k]);
  }

  /** Outdoor temperature after the last sample. */
  last(): number {
    return this.temp[this.n - 1];
  }

  next(): void {
    this.k++;
  }
}

/** Thermostat phases of a held setpoint. */
const FREE = 0; // on the free side of the setpoint (heating: above it), equipment off
const HELD = 1; // exactly at the setpoint, equipment at the fraction it needs
const SAT = 2; // on the other side (heating: below it), equipment fully on

/** Mutable simulation state, reused to stay allocation-free in loops. */
interface State {
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
function firstCrossing(T0: number, dt: number, tau: number, a0: number, b: number, q: number, target: number, sgn: number, departing: boolean): number {
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
function runForced(amb: Ambient, st: State, tEnd: number, tau: number, q: number, uEquip: number): void {
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
function runToTarget(amb: Ambient, st: State, tEnd: number, tau: number, q: number, target: number, sgn: number): boolean {
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
interface Plant {
  tau: number;
  g: number;
  /** Signed full equipment effect, K/h: +h for heating, −c for cooling. */
  e: number;
  /** +1 heating, −1 cooling. */
  sgn: number;
}

function plantOf(model: ZoneModel, mode: EquipmentMode): Plant {
  return mode === 'heat'
    ? { tau: model.tauHours, g: model.gain, e: model.heatRate, sgn: 1 }
    : { tau: model.tauHours, g: model.gain, e: -model.coolRate, sgn: -1 };
}

/** Initial thermostat phase for temperature T and setpoint sp (NaN = no setpoint). */
function initialPhase(p: Plant, T: number, sp: number): number {
  if (Number.isNaN(sp) || p.e === 0) return FREE;
  const side = p.sgn * (T - sp); // > 0: free side
  return side > 0 ? FREE : side < 0 ? SAT : HELD;
}

/**
 * Free-floating drift, or drift holding setpoint sp (NaN = equipment off), from st to tEnd.
 * Exact: the thermostat switching instants are solved within each piece (see the module comment).
 */
function runDrift(p: Plant, amb: Ambient, st: State, tEnd: number, sp: number): void {
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

function neverReason(mode: EquipmentMode, model: ZoneModel, eqC: number, outdoorC: number, targetC: number): string {
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

function fullForcing(model: ZoneModel, mode: EquipmentMode): number {
  return mode === 'heat' ? model.gain + model.heatRate : model.gain - model.coolRate;
}

// ---------------------------------------------------------------------------------------------
// Public solvers

/**
 * Recovery time: hours for the zone to go from fromC to toC with the equipment fully on (u = 1):
 * heating (warm-up) when toC > fromC, cooling (pull-down) when toC < fromC.
 *
 * Method: constant outdoor: the closed form τ·ln((T_eq − T0)/(T_eq − T1)), T_eq = T_out + (h + g)·τ
 * (or T_out + (g − c)·τ); profile: exact steps over its pieces (step.ts) with the crossing located
 * inside a piece by safeguarded Newton iteration on the exact in-piece solution (to about 1e-11 h),
 * and the closed form after the profile ends (outdoor held at its last value).
 *
 * @param model zone model (τ h, rates K/h)
 * @param fromC start temperature, °C; @param toC target temperature, °C
 * @param outdoor °C, or a profile on its own time axis (hours)
 * @param startHours where the recovery starts on the profile's time axis, h (default 0)
 * @returns {hours, equilibriumC, reason?, mode}; hours null when the equilibrium never passes the target
 * @throws InputError for an invalid model, temperature, profile or start time
 * @example recoveryTime({tauHours: 30, heatRate: 1, coolRate: 0, gain: 0}, 15, 20, 0)
 *   // T_eq = 30 °C, hours = 30·ln(15/10) = 12.16 h
 */
export function recoveryTime(model: ZoneModel, fromC: number, toC: number, outdoor: Outdoor, startHours = 0): RecoveryResult {
  checkModel(model);
  checkTemp('The start temperature', fromC);
  checkTemp('The target temperature', toC);
  checkOutdoor(outdoor);
  if (!Number.isFinite(startHours)) throw new InputError(`The start time must be a finite number of hours, got ${startHours}.`);
  const mode: EquipmentMode = toC >= fromC ? 'heat' : 'cool';
  const sgn = mode === 'heat' ? 1 : -1;
  const q = fullForcing(model, mode);
  const tau = model.tauHours;
  if (typeof outdoor === 'number') {
    const Teq = outdoor + q * tau;
    if (toC === fromC) return { hours: 0, equilibriumC: Teq, mode };
    if (sgn * (Teq - toC) <= 0) return { hours: null, equilibriumC: Teq, reason: neverReason(mode, model, Teq, outdoor, toC), mode };
    return { hours: tau * Math.log1p((toC - fromC) / (Teq - toC)), equilibriumC: Teq, mode };
  }
  const amb = new Ambient(outdoor);
  const st: State = { t: startHours, T: fromC, phase: FREE, equip: 0 };
  if (runToTarget(amb, st, Infinity, tau, q, toC, sgn)) {
    return { hours: st.t - startHours, equilibriumC: outdoorAt(outdoor, st.t) + q * tau, mode };
  }
  const last = amb.last();
  const Teq = last + q * tau;
  return { hours: null, equilibriumC: Teq, reason: neverReason(mode, model, Teq, last, toC), mode };
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

const MAX_POINTS = 10_000_000;

function gridCount(hours: number, stepHours: number): number {
  const k = Math.floor(hours / stepHours + 1e-9);
  const onGrid = Math.abs(k * stepHours - hours) <= 1e-9 * Math.max(1, hours);
  const count = onGrid ? k + 1 : k + 2;
  if (count > MAX_POINTS) {
    throw new InputError(`A curve of ${hours} h every ${stepHours} h would need ${count} points; use a larger step.`);
  }
  return count;
}

/**
 * The free-floating (drift) curve of a zone from startC: equipment off, or holding a setback
 * (setup) setpoint once it is reached, if it can. Sampled every stepHours from 0 to `hours`
 * (the last point at exactly `hours`).
 *
 * Method: exact steps over the outdoor pieces and the output grid (step.ts); an ideal thermostat's
 * switching instants are solved exactly (see the module comment).
 *
 * @param model zone model; @param startC °C at t = 0; @param outdoor °C or profile
 * @param hours length, h (> 0); @param stepHours sampling step, h (> 0)
 * @param options setbackC, mode, startHours
 * @returns {t, temp, runtime}
 * @throws InputError for invalid inputs or more than 10 million points
 * @example driftCurve(model, 21, -5, 12, 0.25, { setbackC: 16 }) // night setback drift, 49 points
 */
export function driftCurve(model: ZoneModel, startC: number, outdoor: Outdoor, hours: number, stepHours: number, options: DriftOptions = {}): Curve {
  checkModel(model);
  checkTemp('The start temperature', startC);
  checkOutdoor(outdoor);
  checkHours('The curve length', hours);
  checkHours('The curve step', stepHours);
  const sp = options.setbackC ?? NaN;
  if (options.setbackC !== undefined) checkTemp('The setback setpoint', options.setbackC);
  const start = options.startHours ?? 0;
  if (!Number.isFinite(start)) throw new InputError(`The start time must be a finite number of hours, got ${start}.`);
  const plant = plantOf(model, options.mode ?? 'heat');
  const n = gridCount(hours, stepHours);
  const t = new Float64Array(n);
  const temp = new Float64Array(n);
  const runtime = new Float64Array(n);
  const amb = new Ambient(outdoor);
  const st: State = { t: start, T: startC, phase: initialPhase(plant, startC, sp), equip: 0 };
  temp[0] = startC;
  for (let i = 1; i < n; i++) {
    const ti = i === n - 1 ? hours : i * stepHours;
    const before = st.equip;
    runDrift(plant, amb, st, start + ti, sp);
    t[i] = ti;
    temp[i] = st.T;
    runtime[i] = (st.equip - before) / (ti - t[i - 1]);
  }
  return { t, temp, runtime };
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

/**
 * The recovery curve from fromC toward toC with the equipment fully on, sampled every stepHours and
 * ending exactly at the arrival (last point = toC), or at maxHours when it arrives later or never.
 * Method: recoveryTime for the end, then exact steps (step.ts) over the grid and the outdoor pieces.
 *
 * @param model zone model; @param fromC °C; @param toC °C; @param outdoor °C or profile;
 * @param stepHours sampling step, h (> 0); @param options startHours, maxHours
 * @throws InputError for invalid inputs or more than 10 million points
 * @example recoveryCurve(model, 15, 20, -5, 0.1).hours // the recovery time, h
 */
export function recoveryCurve(model: ZoneModel, fromC: number, toC: number, outdoor: Outdoor, stepHours: number, options: RecoveryCurveOptions = {}): RecoveryCurve {
  checkHours('The curve step', stepHours);
  const maxHours = options.maxHours ?? 72;
  checkHours('The longest curve', maxHours);
  const start = options.startHours ?? 0;
  const r = recoveryTime(model, fromC, toC, outdoor, start);
  const end = r.hours === null ? maxHours : Math.min(r.hours, maxHours);
  if (end === 0) return { ...r, t: Float64Array.of(0), temp: Float64Array.of(fromC) };
  const n = gridCount(end, stepHours);
  const t = new Float64Array(n);
  const temp = new Float64Array(n);
  const amb = new Ambient(outdoor);
  const q = fullForcing(model, r.mode);
  const st: State = { t: start, T: fromC, phase: FREE, equip: 0 };
  temp[0] = fromC;
  for (let i = 1; i < n; i++) {
    const ti = i === n - 1 ? end : i * stepHours;
    runForced(amb, st, start + ti, model.tauHours, q, 1);
    t[i] = ti;
    temp[i] = st.T;
  }
  if (r.hours !== null && r.hours <= maxHours) temp[n - 1] = toC;
  return { ...r, t, temp };
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

/** Start-time bisection tolerance, hours. */
const START_TOL = 1e-9;

/**
 * Optimal start: the latest time to start the recovery so that the zone, having drifted from startC
 * since time 0 (equipment off, or holding setbackC once reached, if it can), is at targetC when
 * occupancy begins. From the start the equipment runs fully until the zone reaches targetC and then
 * holds it there (an ideal thermostat at targetC), so a target reached early but not held counts as missed.
 *
 * Method: the closed-loop zone is a scalar ODE whose right side is no smaller (heating) during the
 * recovery than during the drift, so by the comparison principle a later start never gives a warmer
 * zone at occupancy: "meets the target at occupancy" is monotone in the start time. The latest start
 * is found by bisection on the start time (to 1e-9 h), each trial simulated exactly (exact steps over
 * the outdoor pieces, thermostat switching and target crossings solved on the closed form). The drift
 * states at the profile's breakpoints are computed once and reused.
 * Compare the optimum-start idea in Park, NBSIR 83-2720 (1983): start where the cool-down and heat-up
 * curves meet.
 *
 * @param model zone model
 * @param options startC °C, targetC °C, occupancyHours h, outdoor, setbackC °C?, mode?, periodStartHours h?
 * @returns LatestStartResult (code, startHours, leadHours, startTempC, recoveryHours, arrivalHours, …)
 * @throws InputError for an invalid model, temperature, profile or time
 * @example latestStart(model, { startC: 21, targetC: 21, setbackC: 16, occupancyHours: 10, outdoor: -5 })
 */
export function latestStart(model: ZoneModel, options: LatestStartOptions): LatestStartResult {
  checkModel(model);
  const { startC, targetC, occupancyHours, outdoor } = options;
  checkTemp('The start temperature', startC);
  checkTemp('The target temperature', targetC);
  checkOutdoor(outdoor);
  checkHours('The time to occupancy', occupancyHours);
  const sp = options.setbackC ?? NaN;
  if (options.setbackC !== undefined) checkTemp('The setback setpoint', options.setbackC);
  const t0 = options.periodStartHours ?? 0;
  if (!Number.isFinite(t0)) throw new InputError(`The period start must be a finite number of hours, got ${t0}.`);
  const mode = options.mode ?? 'heat';
  const plant = plantOf(model, mode);
  const sgn = plant.sgn;
  const tau = model.tauHours;
  const qFull = fullForcing(model, mode);
  const tOcc = t0 + occupancyHours;
  const amb = new Ambient(outdoor);

  // Drift checkpoints at the outdoor breakpoints inside (t0, tOcc), plus both ends.
  const cps: State[] = [];
  {
    const st: State = { t: t0, T: startC, phase: initialPhase(plant, startC, sp), equip: 0 };
    cps.push({ ...st });
    if (typeof outdoor !== 'number') {
      const time = outdoor.time;
      for (let i = Math.max(0, pieceIndex(outdoor, t0) + 1); i < time.length && time[i] < tOcc; i++) {
        runDrift(plant, amb, st, time[i], sp);
        cps.push({ ...st });
      }
    }
    runDrift(plant, amb, st, tOcc, sp);
    cps.push({ ...st });
  }
  const scratch: State = { t: 0, T: 0, phase: FREE, equip: 0 };
  const driftTo = (s: number): State => {
    let lo = 0;
    let hi = cps.length - 1;
    while (hi - lo > 1) {
      const mid = (lo + hi) >>> 1;
      if (cps[mid].t <= s) lo = mid;
      else hi = mid;
    }
    const c = cps[cps[hi].t <= s ? hi : lo];
    scratch.t = c.t;
    scratch.T = c.T;
    scratch.phase = c.phase;
    scratch.equip = c.equip;
    runDrift(plant, amb, scratch, s, sp);
    return scratch;
  };
  /** Starting the recovery at s: is the zone at the target at occupancy? Leaves scratch at tOcc. */
  const meets = (s: number): boolean => {
    const st = driftTo(s);
    st.phase = initialPhase(plant, st.T, targetC);
    runDrift(plant, amb, st, tOcc, targetC);
    return st.phase === HELD || sgn * (st.T - targetC) >= 0;
  };
  /** Starting at s with the equipment fully on: first arrival at the target before `horizon`, or null. */
  const arrival = (s: number, horizon: number): number | null =>
    runToTarget(amb, driftTo(s), horizon, tau, qFull, targetC, sgn) ? scratch.t : null;

  const fail = (code: 'too-late' | 'cannot-hold' | 'never-reaches', earliest: number | null, reason: string): LatestStartResult => ({
    code,
    startHours: null,
    leadHours: null,
    startTempC: null,
    recoveryHours: null,
    arrivalHours: null,
    equipmentHours: null,
    earliestArrivalHours: earliest,
    reason,
  });
  const side = mode === 'heat' ? 'at or above' : 'at or below';

  const atOcc = cps[cps.length - 1];
  const first = arrival(t0, Infinity);
  const earliestArrival = first === null ? null : first - t0;
  if (sgn * (atOcc.T - targetC) >= 0) {
    return {
      code: 'no-recovery-needed',
      startHours: occupancyHours,
      leadHours: 0,
      startTempC: atOcc.T,
      recoveryHours: 0,
      arrivalHours: occupancyHours,
      equipmentHours: atOcc.equip,
      earliestArrivalHours: earliestArrival,
      reason: `The zone is at ${fmt(atOcc.T)} °C at occupancy, already ${side} the target ${fmt(targetC)} °C: no recovery is needed.`,
    };
  }
  if (!meets(t0)) {
    if (earliestArrival === null) {
      const last = typeof outdoor === 'number' ? outdoor : amb.last();
      const eq = last + qFull * tau;
      return fail('never-reaches', null, neverReason(mode, model, eq, last, targetC));
    }
    if (earliestArrival > occupancyHours) {
      return fail(
        'too-late',
        earliestArrival,
        `Even starting at once, the zone reaches the target ${fmt(targetC)} °C only ${fmt(earliestArrival)} h after the period begins, ${fmt(earliestArrival - occupancyHours)} h after occupancy.`,
      );
    }
    const what = mode === 'heat' ? 'heating' : 'cooling';
    return fail(
      'cannot-hold',
      earliestArrival,
      earliestArrival === 0
        ? `The zone starts at the target ${fmt(targetC)} °C, but even fully on the ${what} cannot keep it there until occupancy in this weather.`
        : `Starting at once, the zone reaches the target ${fmt(targetC)} °C after ${fmt(earliestArrival)} h, but the ${what} cannot keep it there until occupancy in this weather.`,
    );
  }
  // Bisection on the start: meets(lo) is true, meets(hi) is false.
  let lo = t0;
  let hi = tOcc;
  while (hi - lo > START_TOL) {
    const mid = 0.5 * (lo + hi);
    if (mid <= lo || mid >= hi) break;
    if (meets(mid)) lo = mid;
    else hi = mid;
  }
  meets(lo);
  const equipmentHours = scratch.equip;
  const startTempC = driftTo(lo).T;
  const arrived = arrival(lo, tOcc) ?? tOcc;
  const startHours = lo - t0;
  return {
    code: 'ok',
    startHours,
    leadHours: occupancyHours - startHours,
    startTempC,
    recoveryHours: arrived - lo,
    arrivalHours: arrived - t0,
    equipmentHours,
    earliestArrivalHours: earliestArrival,
  };
}
