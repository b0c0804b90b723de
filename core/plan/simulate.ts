/**
 * Simulation of a zone under a schedule: the fitted zone model (one node, or air and building mass), a
 * thermostat with a deadband, and optimal start, stepped exactly (core/dynamics.ts) on a 1-minute
 * control grid.
 *
 * Model (core/types.ts): dT/dt = (T_out(t) − T)/τ + h·u_heat − c·u_cool + g, T_out linear within each
 * minute, u constant between switching instants.
 *
 * Thermostat: with a deadband d > 0 it is on/off with hysteresis: heating comes on when the zone falls
 * to setpoint − d/2 and goes off when it rises to setpoint + d/2 (cooling mirrored). Switching instants
 * are located exactly (bisection on the closed-form solution inside the minute), so the runtime does
 * not depend on the control step. With d = 0 the thermostat is ideal (modulating): within each minute
 * the output is just enough to end the minute at the setpoint, limited to 0–100 %.
 *
 * Optimal start (Park, NBSIR 83-2720, 1983: the start where the cool-down and heat-up curves meet):
 * for each unoccupied → occupied change that raises the heating setpoint (or lowers the cooling one),
 * the zone is first simulated through the unoccupied interval under the setback; then the full-output
 * recovery curve is integrated backward in time (the exact step inverted) from (occupancy, occupied
 * setpoint) and the latest instant where it meets the setback curve is found by bisection. Starting
 * full output there reaches the setpoint exactly at occupancy. Starting earlier is never worse (the
 * setback trajectory heats at most at full output), so the latest such instant is the answer. If the
 * backward curve stays above the setback curve over the whole interval, even starting at the
 * beginning of the setback misses: "cannot recover in time".
 *
 * Two nodes: the backward curve needs the whole state at occupancy, which the air temperature alone
 * does not fix, so the latest start is found forward instead: bisection over start instants of the
 * setback run, each followed by full output to occupancy (monotone: an earlier start is never colder).
 *
 * Warm-up: the horizon (one week) is preceded by whole copies of itself (schedule and outdoor profile
 * repeated), so that the first morning starts from a realistic state.
 */
import { InputError } from '../errors.ts';
import { outdoorAt, type OutdoorProfile } from '../outdoor.ts';
import { Plant } from '../dynamics.ts';
import type { ZoneModel } from '../types.ts';
import type { TimelineInterval } from './timeline.ts';

/** Length of one control step, minutes (schedule times are whole minutes). */
export const CONTROL_STEP_MINUTES = 1;
const DT = CONTROL_STEP_MINUTES / 60;
/** Temperature tolerance for "the setpoint is met", K (numerical: the solution is exact). */
const MET_TOL = 1e-6;

export interface SimulationSetup {
  model: ZoneModel;
  /** Outdoor °C; time axis = simulation hours of the horizon (0 = local midnight of day 0), wrapped for the warm-up. */
  outdoor: OutdoorProfile;
  /** Horizon length, minutes (the timeline must cover [0, horizonMinutes)). */
  horizonMinutes: number;
  /** Thermostat switching band width, K (0 = ideal modulating control). */
  deadbandK: number;
  optimalStart: boolean;
  /** Heating rate at full output as a function of outdoor °C, K/h (default: model.heatRate). */
  heatRateAt?: (outdoorC: number) => number;
  /** Cooling rate at full output as a function of outdoor °C, K/h (default: model.coolRate). */
  coolRateAt?: (outdoorC: number) => number;
  /** Number of warm-up copies of the horizon before it (default: enough for 3 τ, at least 1, at most 4). */
  warmupCopies?: number;
}

/** The outcome of one recovery (an unoccupied → occupied change that needs heating or cooling). */
export interface RecoveryEvent {
  mode: 'heat' | 'cool';
  /** Simulation hours of the start of the setback (setup) interval; may be negative (warm-up). */
  setbackStartHours: number;
  /** Simulation hours of occupancy. */
  occupancyHours: number;
  /** Occupied setpoint to meet, °C. */
  targetC: number;
  /**
   * - 'not-needed': the zone is at or beyond the occupied setpoint at occupancy without any early start;
   * - 'met': optimal start reaches the setpoint at occupancy;
   * - 'late': the setpoint is reached during occupancy, after it began;
   * - 'not-reached': the setpoint is not reached before the occupied period ends.
   */
  status: 'not-needed' | 'met' | 'late' | 'not-reached';
  /** The latest start that meets the setpoint at occupancy (optimal start), simulation hours; null when impossible. */
  optimalStartHours: number | null;
  /** Occupancy − optimal start, hours; null when impossible. */
  leadHours: number | null;
  /** When full output actually started in the simulation, hours (null when not needed). */
  startedHours: number | null;
  /** Whether even starting at the beginning of the setback misses the setpoint at occupancy. */
  cannotRecoverInTime: boolean;
  /** Whether full output could ever reach the setpoint at the occupancy outdoor temperature (steady state). */
  reachable: boolean;
  /** Indoor temperature at occupancy, °C. */
  atOccupancyC: number;
  /** How far short of the setpoint the zone is at occupancy, K (0 when met). */
  shortfallK: number;
  /** When the setpoint was reached, hours (≥ occupancy; null = not during the occupied period). */
  reachedHours: number | null;
  /** Lowest and highest indoor temperature over the setback interval, °C. */
  lowestC: number;
  highestC: number;
  /** Lowest outdoor temperature while recovering (from the actual start to reaching the setpoint), °C. */
  recoveryOutdoorMinC: number | null;
}

/** One run over the horizon; arrays are per minute of the horizon. */
export interface SimulationRun {
  horizonMinutes: number;
  /** Indoor °C at each minute boundary 0 … horizonMinutes (length horizonMinutes + 1). */
  indoor: Float64Array;
  /** Outdoor °C at each minute boundary (length horizonMinutes + 1). */
  outdoor: Float64Array;
  /** Hours of heating (cooling) in each minute (0 … 1/60), length horizonMinutes. */
  heat: Float64Array;
  cool: Float64Array;
  /** Heating rate at full output used in each minute, K/h (varies for a heat pump). */
  heatRate: Float64Array;
  /** 1 where the minute was forced to full output by optimal start or recovery. */
  recovering: Uint8Array;
  /** Recoveries whose occupancy falls in [0, horizon). */
  recoveries: RecoveryEvent[];
}

interface State {
  T: number;
  /** Mass temperature (two nodes), NaN for one node. */
  m: number;
  heatOn: boolean;
  coolOn: boolean;
}

interface Ctx {
  plant: Plant;
  tau: number;
  g: number;
  band: number; // deadband / 2, K
  ideal: boolean;
}

/** Inverse of stepExact: the start value T0 that reaches T1 after dt. */
function stepBack(T1: number, dt: number, tau: number, a0: number, a1: number, q: number): number {
  const oneMinusE = -Math.expm1(-dt / tau);
  const E = 1 - oneMinusE;
  const b = dt > 0 ? (a1 - a0) / dt : 0;
  return (T1 - oneMinusE * (a0 + q * tau) - b * (dt - tau * oneMinusE)) / E;
}

/**
 * Advances the state over dur hours (ambient a0 → a1 linearly) under the thermostat, or forced full
 * output. Returns the heating and cooling hours run.
 */
function advance(
  st: State,
  dur: number,
  a0: number,
  a1: number,
  heatC: number | null,
  coolC: number | null,
  h: number,
  c: number,
  force: 'heat' | 'cool' | null,
  ctx: Ctx,
): { heatH: number; coolH: number } {
  if (dur <= 0) return { heatH: 0, coolH: 0 };
  const { plant, g } = ctx;
  if (force) {
    st.heatOn = force === 'heat';
    st.coolOn = force === 'cool';
    plant.step(st, dur, a0, a1, g + (force === 'heat' ? h : -c));
    return force === 'heat' ? { heatH: dur, coolH: 0 } : { heatH: 0, coolH: dur };
  }
  const canHeat = heatC !== null && h > 0;
  const canCool = coolC !== null && c > 0;
  if (ctx.ideal) {
    // Linearity: the air after dur is Tfree + wQ·q_extra, so the output that ends the step at the setpoint follows directly.
    const Tfree = plant.peek(st, dur, a0, a1, g);
    const wQ = plant.forcingGain(dur);
    const settle = (q: number, T: number) => {
      if (plant.twoNode) plant.step(st, dur, a0, a1, q);
      st.T = T;
    };
    if (canHeat && Tfree < heatC!) {
      const u = Math.min(1, (heatC! - Tfree) / (wQ * h));
      settle(g + u * h, u < 1 ? heatC! : Tfree + wQ * h);
      st.heatOn = true;
      st.coolOn = false;
      return { heatH: u * dur, coolH: 0 };
    }
    if (canCool && Tfree > coolC!) {
      const u = Math.min(1, (Tfree - coolC!) / (wQ * c));
      settle(g - u * c, u < 1 ? coolC! : Tfree - wQ * c);
      st.heatOn = false;
      st.coolOn = true;
      return { heatH: 0, coolH: u * dur };
    }
    settle(g, Tfree);
    st.heatOn = false;
    st.coolOn = false;
    return { heatH: 0, coolH: 0 };
  }

  // On/off with hysteresis, switching instants located exactly.
  const band = ctx.band;
  const slope = (a1 - a0) / dur;
  let s = 0;
  let heatH = 0;
  let coolH = 0;
  for (let events = 0; s < dur; events++) {
    if (!canHeat) st.heatOn = false;
    else if (!st.heatOn && st.T <= heatC! - band) st.heatOn = true;
    else if (st.heatOn && st.T >= heatC! + band) st.heatOn = false;
    if (!canCool) st.coolOn = false;
    else if (!st.coolOn && st.T >= coolC! + band) st.coolOn = true;
    else if (st.coolOn && st.T <= coolC! - band) st.coolOn = false;
    if (st.heatOn && st.coolOn) st.coolOn = false; // cannot happen when the bands are apart (checked in the schedule)
    const q = g + (st.heatOn ? h : 0) - (st.coolOn ? c : 0);
    const aS = a0 + slope * s;
    const rem = dur - s;
    const T0 = st.T;
    const m0 = st.m;
    const from0 = { T: T0, m: m0 };
    const T1 = plant.peek(from0, rem, aS, a1, q);
    // Candidate switching levels crossed by the end of this piece.
    let level: number | null = null;
    let rising = false;
    const consider = (lv: number, up: boolean) => {
      if (level === null) {
        level = lv;
        rising = up;
      }
    };
    if (events < 64) {
      if (st.heatOn && T1 >= heatC! + band) consider(heatC! + band, true);
      else if (canHeat && !st.heatOn && T1 <= heatC! - band) consider(heatC! - band, false);
      if (st.coolOn && T1 <= coolC! - band) consider(coolC! - band, false);
      else if (canCool && !st.coolOn && T1 >= coolC! + band) consider(coolC! + band, true);
    }
    if (level === null) {
      if (plant.twoNode) plant.step(st, rem, aS, a1, q);
      st.T = T1;
      if (st.heatOn) heatH += rem;
      if (st.coolOn) coolH += rem;
      break;
    }
    // Bisection for the first instant the level is reached (hi is at or past it).
    const lv: number = level;
    const past = (x: number) => {
      const v = plant.peek(from0, x, aS, aS + slope * x, q);
      return rising ? v >= lv : v <= lv;
    };
    let lo = 0;
    let hi = rem;
    for (let it = 0; it < 44; it++) {
      const mid = 0.5 * (lo + hi);
      if (past(mid)) hi = mid;
      else lo = mid;
    }
    st.T = T0;
    st.m = m0;
    plant.step(st, hi, aS, aS + slope * hi, q);
    if (st.heatOn) heatH += hi;
    if (st.coolOn) coolH += hi;
    s += hi;
    if (hi <= 0) s = Math.min(dur, s + 1e-12); // guard against a zero-length piece
  }
  return { heatH, coolH };
}

/**
 * Simulates one timeline (schedule or baseline) over the horizon after the warm-up.
 *
 * @param setup model (τ h, rates K/h, gain K/h), outdoor profile (°C over simulation hours), deadband K
 * @param timeline intervals covering [0, horizonMinutes), whole minutes
 * @returns per-minute indoor temperature, runtime and the recoveries (see RecoveryEvent)
 * @throws InputError when τ is not positive, a rate is negative, or the timeline does not cover the horizon
 * @example simulateTimeline({ model, outdoor, horizonMinutes: 10080, deadbandK: 0.5, optimalStart: true }, scheduleTimeline(s, designClock()))
 */
export function simulateTimeline(setup: SimulationSetup, timeline: TimelineInterval[]): SimulationRun {
  const { model } = setup;
  if (!(model.tauHours > 0) || !Number.isFinite(model.tauHours)) throw new InputError(`The time constant must be a positive number of hours, got ${model.tauHours}.`);
  if (!(model.heatRate >= 0) || !(model.coolRate >= 0) || !Number.isFinite(model.heatRate) || !Number.isFinite(model.coolRate)) {
    throw new InputError('The heating and cooling rates must be 0 or more K/h.');
  }
  if (!Number.isFinite(model.gain)) throw new InputError('The internal gain must be a finite number of K/h.');
  if (!(setup.deadbandK >= 0)) throw new InputError('The deadband must be 0 or more K.');
  const Hm = setup.horizonMinutes;
  if (!Number.isInteger(Hm) || Hm <= 0) throw new InputError('The horizon must be a positive whole number of minutes.');
  if (timeline.length === 0 || timeline[0]!.startMinute !== 0 || timeline[timeline.length - 1]!.endMinute !== Hm) {
    throw new InputError('The timeline must cover the whole horizon.');
  }
  const plant = new Plant(model);
  // Warm-up long enough for 3 of the slowest time constant (the building mass's for two nodes).
  const slowest = plant.modes.tau[0]!;
  const copies = setup.warmupCopies ?? Math.min(4, Math.max(1, Math.ceil((3 * slowest * 60) / Hm)));
  const ctx: Ctx = { plant, tau: plant.tau, g: model.gain, band: setup.deadbandK / 2, ideal: setup.deadbandK === 0 };
  const hAt = setup.heatRateAt ?? (() => model.heatRate);
  const cAt = setup.coolRateAt ?? (() => model.coolRate);

  // Full timeline: warm-up copies then the horizon, neighbours merged across the joins.
  const full: TimelineInterval[] = [];
  for (let k = -copies; k <= 0; k++) {
    for (const iv of timeline) {
      const shifted = { ...iv, startMinute: iv.startMinute + k * Hm, endMinute: iv.endMinute + k * Hm };
      const last = full[full.length - 1];
      if (last && last.endMinute === shifted.startMinute && last.occupied === shifted.occupied && last.heatC === shifted.heatC && last.coolC === shifted.coolC) {
        last.endMinute = shifted.endMinute;
      } else full.push(shifted);
    }
  }
  const firstMinute = -copies * Hm;
  const N = (copies + 1) * Hm; // cells
  // Outdoor at each boundary of each cell, wrapped into the horizon copy it belongs to.
  const aStart = new Float64Array(N);
  const aEnd = new Float64Array(N);
  const hCell = new Float64Array(N);
  const cCell = new Float64Array(N);
  for (let k = 0; k < N; k++) {
    const m = firstMinute + k;
    const copy = Math.floor(m / Hm);
    const local = m - copy * Hm;
    aStart[k] = outdoorAt(setup.outdoor, local * DT);
    aEnd[k] = outdoorAt(setup.outdoor, (local + 1) * DT);
    const mid = 0.5 * (aStart[k]! + aEnd[k]!);
    hCell[k] = Math.max(0, hAt(mid));
    cCell[k] = Math.max(0, cAt(mid));
  }

  const Tend = new Float64Array(N);
  const heat = new Float64Array(N);
  const cool = new Float64Array(N);
  const forced = new Uint8Array(N);
  const first = full[0]!;
  const st: State = { T: first.heatC ?? first.coolC ?? 20, m: NaN, heatOn: false, coolOn: false };
  if (first.heatC !== null && first.coolC !== null) st.T = 0.5 * (first.heatC + first.coolC);
  st.m = plant.steadyMass(st.T, aStart[0]!);
  const events: RecoveryEvent[] = [];
  const cellOf = (minute: number) => minute - firstMinute;

  const runCell = (k: number, iv: TimelineInterval, force: 'heat' | 'cool' | null) => {
    const r = advance(st, DT, aStart[k]!, aEnd[k]!, iv.heatC, iv.coolC, hCell[k]!, cCell[k]!, force, ctx);
    Tend[k] = st.T;
    heat[k] = r.heatH;
    cool[k] = r.coolH;
    forced[k] = force ? 1 : 0;
  };

  for (let i = 0; i < full.length; i++) {
    const iv = full[i]!;
    const next = full[i + 1];
    const kS = cellOf(iv.startMinute);
    const kE = cellOf(iv.endMinute);
    const heatRise = !!next && next.occupied && !iv.occupied && next.heatC !== null && (iv.heatC === null || next.heatC > iv.heatC);
    const coolDrop = !!next && next.occupied && !iv.occupied && next.coolC !== null && (iv.coolC === null || next.coolC < iv.coolC);
    if (!heatRise && !coolDrop) {
      for (let k = kS; k < kE; k++) runCell(k, iv, null);
      continue;
    }
    // 1. The setback trajectory through the interval, keeping the state at each cell start.
    const n = kE - kS;
    const sT = new Float64Array(n + 1);
    const sM = new Float64Array(n + 1);
    const sHeat = new Uint8Array(n + 1);
    const sCool = new Uint8Array(n + 1);
    const Tstart = st.T;
    for (let j = 0; j < n; j++) {
      sT[j] = st.T;
      sM[j] = st.m;
      sHeat[j] = st.heatOn ? 1 : 0;
      sCool[j] = st.coolOn ? 1 : 0;
      runCell(kS + j, iv, null);
    }
    sT[n] = st.T;
    sM[n] = st.m;
    const S_E = st.T;
    const mode: 'heat' | 'cool' | null = heatRise && S_E < next!.heatC! - MET_TOL ? 'heat' : coolDrop && S_E > next!.coolC! + MET_TOL ? 'cool' : null;
    let lowest = Tstart;
    let highest = Tstart;
    for (let j = 0; j < n; j++) {
      lowest = Math.min(lowest, Tend[kS + j]!);
      highest = Math.max(highest, Tend[kS + j]!);
    }
    const occupancyHours = iv.endMinute * DT;
    if (mode === null) {
      if (iv.endMinute >= 0 && iv.endMinute < Hm) {
        const m = heatRise ? 'heat' : 'cool';
        events.push({
          mode: m,
          setbackStartHours: iv.startMinute * DT,
          occupancyHours,
          targetC: m === 'heat' ? next!.heatC! : next!.coolC!,
          status: 'not-needed',
          optimalStartHours: occupancyHours,
          leadHours: 0,
          startedHours: null,
          cannotRecoverInTime: false,
          reachable: true,
          atOccupancyC: S_E,
          shortfallK: 0,
          reachedHours: occupancyHours,
          lowestC: lowest,
          highestC: highest,
          recoveryOutdoorMinC: null,
        });
      }
      continue;
    }
    // 2. The full-output curve backward from (occupancy, target); find the latest meeting point.
    const target = mode === 'heat' ? next!.heatC! : next!.coolC!;
    const sign = mode === 'heat' ? 1 : -1; // "B ≤ S" for heating means sign·(B − S) ≤ 0
    const qFull = (k: number) => ctx.g + (mode === 'heat' ? hCell[k]! : -cCell[k]!);
    let startCell = -1;
    let startOffset = 0;
    let jHit = -1;
    if (!plant.twoNode) {
      let B = target;
      let Bnext = target;
      for (let j = n - 1; j >= 0; j--) {
        const k = kS + j;
        Bnext = B;
        B = stepBack(B, DT, ctx.tau, aStart[k]!, aEnd[k]!, qFull(k));
        if (!Number.isFinite(B)) break;
        if (sign * (B - sT[j]!) <= 0) {
          jHit = j;
          break;
        }
      }
      if (jHit >= 0) {
        const k = kS + jHit;
        const slope = (aEnd[k]! - aStart[k]!) / DT;
        const partState = (s: number): number => {
          const ps: State = { T: sT[jHit]!, m: sM[jHit]!, heatOn: sHeat[jHit] === 1, coolOn: sCool[jHit] === 1 };
          advance(ps, s, aStart[k]!, aStart[k]! + slope * s, iv.heatC, iv.coolC, hCell[k]!, cCell[k]!, null, ctx);
          return ps.T;
        };
        const back = (s: number) => stepBack(Bnext, DT - s, ctx.tau, aStart[k]! + slope * s, aEnd[k]!, qFull(k));
        let lo = 0;
        let hi = DT;
        for (let it = 0; it < 44; it++) {
          const mid = 0.5 * (lo + hi);
          if (sign * (back(mid) - partState(mid)) <= 0) lo = mid;
          else hi = mid;
        }
        startCell = jHit;
        startOffset = lo;
      }
    } else {
      // Two nodes: the state at occupancy is not fixed by the air temperature alone, so the latest start
      // is found forward: full output from (cell j, offset x) of the setback run reaches the target at
      // occupancy for every start at or before the latest one (starting earlier is never worse).
      const reaches = (j: number, x: number): boolean => {
        const k = kS + j;
        const slope = (aEnd[k]! - aStart[k]!) / DT;
        const ps: State = { T: sT[j]!, m: sM[j]!, heatOn: sHeat[j] === 1, coolOn: sCool[j] === 1 };
        if (j < n) {
          const aMid = aStart[k]! + slope * x;
          if (x > 0) advance(ps, x, aStart[k]!, aMid, iv.heatC, iv.coolC, hCell[k]!, cCell[k]!, null, ctx);
          plant.step(ps, DT - x, aMid, aEnd[k]!, qFull(k));
          for (let jj = j + 1; jj < n; jj++) plant.step(ps, DT, aStart[kS + jj]!, aEnd[kS + jj]!, qFull(kS + jj));
        }
        return sign * (target - ps.T) <= MET_TOL;
      };
      if (reaches(0, 0)) {
        // Latest whole cell whose start still reaches: reaches(lo) true, reaches(hi) false (hi = n: no start).
        let lo = 0;
        let hi = n;
        while (hi - lo > 1) {
          const mid = (lo + hi) >> 1;
          if (reaches(mid, 0)) lo = mid;
          else hi = mid;
        }
        let xlo = 0;
        let xhi = DT;
        for (let it = 0; it < 44; it++) {
          const mid = 0.5 * (xlo + xhi);
          if (reaches(lo, mid)) xlo = mid;
          else xhi = mid;
        }
        jHit = lo;
        startCell = lo;
        startOffset = xlo;
      }
    }
    const optimalStartHours = jHit >= 0 ? (iv.startMinute + startCell) * DT + startOffset : null;
    const cannot = jHit < 0;
    // 3. Redo the interval's tail with full output from the start (optimal start on), or keep the thermostat's run.
    let startedHours: number | null = null;
    if (setup.optimalStart) {
      const from = cannot ? 0 : startCell;
      st.T = sT[from]!;
      st.m = sM[from]!;
      st.heatOn = sHeat[from] === 1;
      st.coolOn = sCool[from] === 1;
      for (let j = from; j < n; j++) {
        const k = kS + j;
        if (j === from && !cannot && startOffset > 0) {
          const slope = (aEnd[k]! - aStart[k]!) / DT;
          const aMid = aStart[k]! + slope * startOffset;
          const r1 = advance(st, startOffset, aStart[k]!, aMid, iv.heatC, iv.coolC, hCell[k]!, cCell[k]!, null, ctx);
          const r2 = advance(st, DT - startOffset, aMid, aEnd[k]!, iv.heatC, iv.coolC, hCell[k]!, cCell[k]!, mode, ctx);
          Tend[k] = st.T;
          heat[k] = r1.heatH + r2.heatH;
          cool[k] = r1.coolH + r2.coolH;
          forced[k] = 1;
        } else runCell(k, iv, mode);
      }
      startedHours = cannot ? iv.startMinute * DT : optimalStartHours;
      lowest = Tstart;
      highest = Tstart;
      for (let k = kS; k < kE; k++) {
        lowest = Math.min(lowest, Tend[k]!);
        highest = Math.max(highest, Tend[k]!);
      }
    } else {
      startedHours = occupancyHours;
    }
    const atOcc = st.T;
    const aOcc = aEnd[kE - 1]!;
    const eq = aOcc + (qFull(kE - 1)) * ctx.tau; // steady state at full output (K/h·h = K)
    const reachable = mode === 'heat' ? eq >= target - MET_TOL : eq <= target + MET_TOL;
    if (iv.endMinute >= 0 && iv.endMinute < Hm) {
      events.push({
        mode,
        setbackStartHours: iv.startMinute * DT,
        occupancyHours,
        targetC: target,
        status: 'met', // settled below once the occupied interval is simulated
        optimalStartHours,
        leadHours: optimalStartHours === null ? null : occupancyHours - optimalStartHours,
        startedHours,
        cannotRecoverInTime: cannot,
        reachable,
        atOccupancyC: atOcc,
        shortfallK: Math.max(0, mode === 'heat' ? target - atOcc : atOcc - target),
        reachedHours: null,
        lowestC: lowest,
        highestC: highest,
        recoveryOutdoorMinC: null,
      });
      // Settle status and reached time during the next (occupied) interval, simulated next in the loop.
      const ev = events[events.length - 1]!;
      const kOccEnd = cellOf(next!.endMinute);
      // Simulate the occupied interval now (the loop then skips it).
      for (let k = kE; k < kOccEnd; k++) runCell(k, next!, null);
      const met = (T: number) => (mode === 'heat' ? T >= target - MET_TOL : T <= target + MET_TOL);
      if (met(atOcc)) {
        ev.reachedHours = occupancyHours;
        ev.status = 'met';
      } else {
        ev.status = 'not-reached';
        for (let k = kE; k < kOccEnd; k++) {
          if (met(Tend[k]!)) {
            ev.reachedHours = (firstMinute + k + 1) * DT;
            ev.status = 'late';
            break;
          }
        }
      }
      // Outdoor during the recovery: from the actual start to reaching the setpoint (or the end of occupancy).
      const recFrom = startedHours === null ? kE : Math.max(kS, Math.floor(startedHours / DT - firstMinute + 1e-9));
      const recTo = ev.reachedHours === null ? kOccEnd : Math.max(recFrom + 1, Math.round(ev.reachedHours / DT - firstMinute));
      let omin = Infinity;
      for (let k = recFrom; k < recTo; k++) omin = Math.min(omin, aStart[k]!, aEnd[k]!);
      ev.recoveryOutdoorMinC = Number.isFinite(omin) ? omin : null;
      i++; // the occupied interval is done
    }
  }

  // Horizon slice.
  const off = copies * Hm;
  const indoor = new Float64Array(Hm + 1);
  const outdoor = new Float64Array(Hm + 1);
  indoor[0] = Tend[off - 1]!;
  outdoor[0] = aStart[off]!;
  for (let m = 0; m < Hm; m++) {
    indoor[m + 1] = Tend[off + m]!;
    outdoor[m + 1] = aEnd[off + m]!;
  }
  return {
    horizonMinutes: Hm,
    indoor,
    outdoor,
    heat: heat.slice(off),
    cool: cool.slice(off),
    heatRate: hCell.slice(off),
    recovering: forced.slice(off),
    recoveries: events,
  };
}
