/**
 * Recovery, drift and optimal start of a two-node zone (air and building mass, core/modes.ts).
 *
 * Method: the state (air, mass) is advanced with the exact step of core/dynamics.ts over sub-steps of at
 * most one minute inside each linear piece of the outdoor profile; a level crossing is located inside
 * its sub-step by bisection on the sub-step's length (each trial an exact step from the sub-step's start,
 * to 1e-9 h). A held setpoint is an ideal modulating thermostat: in each sub-step the equipment runs the
 * fraction that ends the sub-step at the setpoint (0–100 %), which the linearity of the step gives
 * directly (core/dynamics.ts forcingGain).
 *
 * What one node does not need: the mass temperature when a recovery starts. These solvers take the
 * situation they are asked about: a recovery "from T0 to T1" starts from a setback drift, the zone having
 * been held at T1 long enough for the mass to settle and then left to cool (heating) or warm (cooling)
 * with the equipment off until the air reached T0; a drift starts from the air held at its start
 * temperature with the mass settled. Where the drift cannot reach T0 (T0 beyond where the zone settles
 * with the equipment off), the zone is taken as held at T0 with the mass settled there.
 *
 * Units: °C, hours, K/h.
 */
import { Plant, type ZoneState } from '../dynamics.ts';
import { outdoorAt, type OutdoorProfile } from '../outdoor.ts';
import type { ZoneModel } from '../types.ts';
import type { EquipmentMode, Outdoor } from './checks.ts';

/** Longest sub-step, hours. */
const SUB = 1 / 60;
/** Bisection tolerance on time, hours. */
const TOL = 1e-9;

/** Outdoor temperature at t and the next breakpoint after t (∞ past the last). */
function outdoorPieces(outdoor: Outdoor): { at: (t: number) => number; next: (t: number) => number } {
  if (typeof outdoor === 'number') return { at: () => outdoor, next: () => Infinity };
  const p: OutdoorProfile = outdoor;
  return {
    at: (t) => outdoorAt(p, t),
    next: (t) => {
      let lo = 0, hi = p.time.length;
      while (lo < hi) {
        const mid = (lo + hi) >>> 1;
        if (p.time[mid] <= t) lo = mid + 1;
        else hi = mid;
      }
      return lo < p.time.length ? p.time[lo] : Infinity;
    },
  };
}

/** A two-node zone with its outdoor temperature, stepping in sub-steps that end on the profile's breakpoints. */
export class TwoNodeRun {
  readonly plant: Plant;
  readonly model: ZoneModel;
  private readonly out: ReturnType<typeof outdoorPieces>;

  constructor(model: ZoneModel, outdoor: Outdoor) {
    this.model = model;
    this.plant = new Plant(model);
    this.out = outdoorPieces(outdoor);
  }

  outdoorAt(t: number): number {
    return this.out.at(t);
  }

  /** The end of the sub-step starting at t (at most SUB, never across a breakpoint, never past tEnd). */
  private subEnd(t: number, tEnd: number): number {
    return Math.min(t + SUB, this.out.next(t), tEnd);
  }

  /**
   * Runs from (t, st) to tEnd with constant forcing q until `stop(T)` first holds; returns the time it
   * held (st at that time) or null (st at tEnd).
   */
  runUntil(st: ZoneState, t: number, tEnd: number, q: number, stop: ((T: number) => boolean) | null): number | null {
    if (stop && stop(st.T)) return t;
    while (t < tEnd) {
      const e = this.subEnd(t, tEnd);
      const a0 = this.out.at(t);
      const dt = e - t;
      const a1 = this.out.at(e);
      if (stop) {
        const T1 = this.plant.peek(st, dt, a0, a1, q);
        if (stop(T1)) {
          let lo = 0, hi = dt;
          while (hi - lo > TOL) {
            const mid = 0.5 * (lo + hi);
            if (stop(this.plant.peek(st, mid, a0, a0 + ((a1 - a0) * mid) / dt, q))) hi = mid;
            else lo = mid;
          }
          this.plant.step(st, hi, a0, a0 + ((a1 - a0) * hi) / dt, q);
          return t + hi;
        }
      }
      this.plant.step(st, dt, a0, a1, q);
      t = e;
    }
    return null;
  }

  /**
   * Holds the setpoint sp (ideal thermostat) from (t, st) to tEnd with equipment effect e K/h at full
   * output (+h heating, −c cooling; the side it holds follows its sign). Returns full-output-equivalent
   * equipment hours.
   */
  hold(st: ZoneState, t: number, tEnd: number, sp: number, e: number): number {
    const g = this.model.gain;
    let equip = 0;
    while (t < tEnd) {
      const end = this.subEnd(t, tEnd);
      const dt = end - t;
      const a0 = this.out.at(t), a1 = this.out.at(end);
      const free = this.plant.peek(st, dt, a0, a1, g);
      // Heating holds the air at or above sp, cooling at or below: u = (sp − free)/(gain·e), clipped to 0–1.
      let u = 0;
      if (e !== 0 && (e > 0 ? free < sp : free > sp)) u = Math.min(1, (sp - free) / (this.plant.forcingGain(dt) * e));
      this.plant.step(st, dt, a0, a1, g + u * e);
      if (u > 0 && u < 1) st.T = sp;
      equip += u * dt;
      t = end;
    }
    return equip;
  }

  /**
   * The state after a setback drift: the zone held at `heldC` until the mass settled (outdoor at t), then
   * left with the equipment off until the air reached `toC` (or, if it cannot, held at `toC` settled).
   */
  afterSetback(heldC: number, toC: number, t: number): ZoneState {
    const a = this.out.at(t);
    const st = this.plant.settled(heldC, a);
    if (heldC === toC) return st;
    const down = toC < heldC;
    const freeEq = a + this.model.gain * this.plant.tau;
    const reachable = down ? toC > freeEq : toC < freeEq;
    if (!reachable) return this.plant.settled(toC, a);
    // Drift at the constant outdoor temperature of the moment (the prelude has no clock of its own).
    const prelude = new TwoNodeRun(this.model, a);
    const hit = prelude.runUntil(st, 0, 2000, this.model.gain, (T) => (down ? T <= toC : T >= toC));
    return hit === null ? this.plant.settled(toC, a) : { T: toC, m: st.m };
  }
}

/** Full-output forcing of a mode: g + h (heat) or g − c (cool). */
export function fullForcingOf(model: ZoneModel, mode: EquipmentMode): number {
  return mode === 'heat' ? model.gain + model.heatRate : model.gain - model.coolRate;
}

/** Longest a two-node recovery is followed, hours (a recovery slower than this is reported as never). */
const MAX_RECOVERY_HOURS = 5000;

/** recoveryTime (core/recovery.ts) for a two-node model; inputs are checked by the caller. */
export function recoveryTimeTwoNode(model: ZoneModel, fromC: number, toC: number, outdoor: Outdoor, startHours: number): { hours: number | null; equilibriumC: number; mode: EquipmentMode; lastOutdoorC: number } {
  const mode: EquipmentMode = toC >= fromC ? 'heat' : 'cool';
  const sgn = mode === 'heat' ? 1 : -1;
  const q = fullForcingOf(model, mode);
  const run = new TwoNodeRun(model, outdoor);
  const tau = run.plant.tau;
  const last = typeof outdoor === 'number' ? outdoor : outdoor.temp[outdoor.temp.length - 1];
  const st = run.afterSetback(toC, fromC, startHours);
  st.T = fromC;
  if (toC === fromC) return { hours: 0, equilibriumC: run.outdoorAt(startHours) + q * tau, mode, lastOutdoorC: last };
  const endOfProfile = typeof outdoor === 'number' ? startHours : Math.max(startHours, outdoor.time[outdoor.time.length - 1]);
  // Past the profile's end the outdoor is constant: if full output settles short of the target, never.
  let hit = run.runUntil(st, startHours, endOfProfile, q, (T) => sgn * (T - toC) >= 0);
  if (hit === null) {
    if (sgn * (last + q * tau - toC) <= 0) return { hours: null, equilibriumC: last + q * tau, mode, lastOutdoorC: last };
    hit = run.runUntil(st, endOfProfile, endOfProfile + MAX_RECOVERY_HOURS, q, (T) => sgn * (T - toC) >= 0);
  }
  if (hit === null) return { hours: null, equilibriumC: last + q * tau, mode, lastOutdoorC: last };
  return { hours: hit - startHours, equilibriumC: run.outdoorAt(hit) + q * tau, mode, lastOutdoorC: last };
}

/** The state a two-node recovery from fromC to toC starts from (see the module comment). */
export function recoveryStart(model: ZoneModel, fromC: number, toC: number, outdoor: Outdoor, startHours: number): { run: TwoNodeRun; state: ZoneState } {
  const run = new TwoNodeRun(model, outdoor);
  const state = run.afterSetback(toC, fromC, startHours);
  state.T = fromC;
  return { run, state };
}

/**
 * driftCurve for a two-node model: the air starts held at startC with the mass settled; then the
 * equipment is off, or holds setbackC (heating) / setupC (cooling) as an ideal thermostat.
 */
export function driftCurveTwoNode(model: ZoneModel, startC: number, outdoor: Outdoor, times: Float64Array, start: number, setbackC: number | null, mode: EquipmentMode): { temp: Float64Array; runtime: Float64Array } {
  const run = new TwoNodeRun(model, outdoor);
  const st = run.plant.settled(startC, run.outdoorAt(start));
  const temp = new Float64Array(times.length);
  const runtime = new Float64Array(times.length);
  temp[0] = startC;
  const e = mode === 'heat' ? model.heatRate : -model.coolRate;
  for (let i = 1; i < times.length; i++) {
    const t0 = start + times[i - 1], t1 = start + times[i];
    if (setbackC === null) run.runUntil(st, t0, t1, model.gain, null);
    else runtime[i] = run.hold(st, t0, t1, setbackC, e) / (t1 - t0);
    temp[i] = st.T;
  }
  return { temp, runtime };
}

/** One trial of the optimal start: drift from period start to s, full output to the target, then hold it. */
interface StartTrial {
  meets: boolean;
  startTempC: number;
  arrival: number | null;
  equipment: number;
}

/**
 * latestStart (core/recovery.ts) for a two-node model: the air starts at startC with the mass settled,
 * drifts (equipment off, or holding the setback), and from the start runs full output until the target,
 * then holds it. "Meets the target at occupancy" is monotone in the start (the air and mass equations
 * form a cooperative system, so the comparison principle holds as for one node), so bisection applies.
 */
export function latestStartTwoNode(model: ZoneModel, o: { startC: number; targetC: number; occupancyHours: number; outdoor: Outdoor; setbackC: number | null; mode: EquipmentMode; periodStartHours: number }): {
  trial: (s: number) => StartTrial;
  bisect: () => number;
  occupancy: number;
} {
  const sgn = o.mode === 'heat' ? 1 : -1;
  const e = o.mode === 'heat' ? model.heatRate : -model.coolRate;
  const qFull = model.gain + e;
  const t0 = o.periodStartHours;
  const tOcc = t0 + o.occupancyHours;
  const run = new TwoNodeRun(model, o.outdoor);
  const trial = (s: number): StartTrial => {
    const st = run.plant.settled(o.startC, run.outdoorAt(t0));
    let equipment = 0;
    if (o.setbackC === null) run.runUntil(st, t0, s, model.gain, null);
    else equipment += run.hold(st, t0, s, o.setbackC, e);
    const startTempC = st.T;
    const arrival = run.runUntil(st, s, tOcc, qFull, (T) => sgn * (T - o.targetC) >= 0);
    equipment += (arrival ?? tOcc) - s;
    if (arrival !== null) equipment += run.hold(st, arrival, tOcc, o.targetC, e);
    return { meets: sgn * (st.T - o.targetC) >= -1e-6, startTempC, arrival, equipment };
  };
  const bisect = () => {
    let lo = t0, hi = tOcc;
    while (hi - lo > 1e-7) {
      const mid = 0.5 * (lo + hi);
      if (trial(mid).meets) lo = mid;
      else hi = mid;
    }
    return lo;
  };
  return { trial, bisect, occupancy: tOcc };
}
