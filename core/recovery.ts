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
import { InputError } from './errors.ts';
import { outdoorAt, pieceIndex } from './outdoor.ts';
import { Ambient } from './recovery/ambient.ts';
import { checkHours, checkModel, checkOutdoor, checkTemp, fmt, fullForcing, gridCount, neverReason, type EquipmentMode, type Outdoor } from './recovery/checks.ts';
import { FREE, HELD, initialPhase, plantOf, runDrift, runForced, runToTarget, type State } from './recovery/exact.ts';
import { TwoNodeRun, driftCurveTwoNode, latestStartTwoNode, recoveryStart, recoveryTimeTwoNode } from './recovery/two-node.ts';

export type { EquipmentMode, Outdoor };
export type { Curve, DriftOptions, LatestStartOptions, LatestStartResult, RecoveryCurve, RecoveryCurveOptions, RecoveryResult } from './recovery/types.ts';
import type { Curve, DriftOptions, LatestStartOptions, LatestStartResult, RecoveryCurve, RecoveryCurveOptions, RecoveryResult } from './recovery/types.ts';

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
  if (model.mass) {
    const r = recoveryTimeTwoNode(model, fromC, toC, outdoor, startHours);
    return r.hours === null ? { hours: null, equilibriumC: r.equilibriumC, reason: neverReason(mode, model, r.equilibriumC, r.lastOutdoorC, toC), mode } : { hours: r.hours, equilibriumC: r.equilibriumC, mode };
  }
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
  const n = gridCount(hours, stepHours);
  const t = new Float64Array(n);
  for (let i = 1; i < n; i++) t[i] = i === n - 1 ? hours : i * stepHours;
  if (model.mass) {
    const r = driftCurveTwoNode(model, startC, outdoor, t, start, options.setbackC ?? null, options.mode ?? 'heat');
    return { t, temp: r.temp, runtime: r.runtime };
  }
  const plant = plantOf(model, options.mode ?? 'heat');
  const temp = new Float64Array(n);
  const runtime = new Float64Array(n);
  const amb = new Ambient(outdoor);
  const st: State = { t: start, T: startC, phase: initialPhase(plant, startC, sp), equip: 0 };
  temp[0] = startC;
  for (let i = 1; i < n; i++) {
    const ti = t[i];
    const before = st.equip;
    runDrift(plant, amb, st, start + ti, sp);
    temp[i] = st.T;
    runtime[i] = (st.equip - before) / (ti - t[i - 1]);
  }
  return { t, temp, runtime };
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
  const q = fullForcing(model, r.mode);
  temp[0] = fromC;
  for (let i = 1; i < n; i++) t[i] = i === n - 1 ? end : i * stepHours;
  if (model.mass) {
    const { run, state } = recoveryStart(model, fromC, toC, outdoor, start);
    for (let i = 1; i < n; i++) {
      run.runUntil(state, start + t[i - 1], start + t[i], q, null);
      temp[i] = state.T;
    }
  } else {
    const amb = new Ambient(outdoor);
    const st: State = { t: start, T: fromC, phase: FREE, equip: 0 };
    for (let i = 1; i < n; i++) {
      runForced(amb, st, start + t[i], model.tauHours, q, 1);
      temp[i] = st.T;
    }
  }
  if (r.hours !== null && r.hours <= maxHours) temp[n - 1] = toC;
  return { ...r, t, temp };
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
  const sgn = mode === 'heat' ? 1 : -1;
  const tOcc = t0 + occupancyHours;
  const ops = model.mass
    ? twoNodeStartOps(model, { startC, targetC, occupancyHours, outdoor, setbackC: options.setbackC ?? null, mode, periodStartHours: t0 })
    : oneNodeStartOps(model, { startC, targetC, outdoor, sp, mode, t0, tOcc });

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

  const atOcc = ops.atOccupancy;
  const first = ops.arrival(t0, Infinity);
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
  if (!ops.meets(t0)) {
    if (earliestArrival === null) {
      const last = typeof outdoor === 'number' ? outdoor : outdoor.temp[outdoor.temp.length - 1];
      const eq = last + fullForcing(model, mode) * model.tauHours;
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
  while (hi - lo > ops.tolerance) {
    const mid = 0.5 * (lo + hi);
    if (mid <= lo || mid >= hi) break;
    if (ops.meets(mid)) lo = mid;
    else hi = mid;
  }
  const { equipmentHours, startTempC } = ops.at(lo);
  const arrived = ops.arrival(lo, tOcc) ?? tOcc;
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

/** The primitives latestStart needs, for one model kind. Times on the profile's axis, hours. */
interface StartOps {
  /** Drift state at occupancy without any recovery. */
  atOccupancy: { T: number; equip: number };
  /** Starting at s with the equipment fully on: first arrival at the target before `horizon`, or null. */
  arrival(s: number, horizon: number): number | null;
  /** Starting the recovery at s: is the zone at the target at occupancy? */
  meets(s: number): boolean;
  /** Equipment hours to occupancy and the zone temperature at the start, starting at s. */
  at(s: number): { equipmentHours: number; startTempC: number };
  /** Bisection tolerance on the start, hours. */
  tolerance: number;
}

/** One node: exact drift checkpoints at the outdoor breakpoints, crossings on the closed form. */
function oneNodeStartOps(model: ZoneModel, o: { startC: number; targetC: number; outdoor: Outdoor; sp: number; mode: EquipmentMode; t0: number; tOcc: number }): StartOps {
  const { startC, targetC, outdoor, sp, mode, t0, tOcc } = o;
  const plant = plantOf(model, mode);
  const sgn = plant.sgn;
  const tau = model.tauHours;
  const qFull = fullForcing(model, mode);
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

  return {
    atOccupancy: cps[cps.length - 1],
    arrival,
    meets,
    at(s) {
      meets(s);
      const equipmentHours = scratch.equip;
      return { equipmentHours, startTempC: driftTo(s).T };
    },
    tolerance: START_TOL,
  };
}

/** Two nodes: each trial simulated from the period start (core/recovery/two-node.ts). */
function twoNodeStartOps(model: ZoneModel, o: Parameters<typeof latestStartTwoNode>[1]): StartOps {
  const solver = latestStartTwoNode(model, o);
  const sgn = o.mode === 'heat' ? 1 : -1;
  const t0 = o.periodStartHours;
  const noRecovery = solver.trial(solver.occupancy);
  const qFull = fullForcing(model, o.mode);
  return {
    atOccupancy: { T: noRecovery.startTempC, equip: noRecovery.equipment },
    arrival(s, horizon) {
      const trial = solver.trial(s);
      if (trial.arrival !== null && trial.arrival <= horizon) return trial.arrival;
      if (horizon <= solver.occupancy) return null;
      // Beyond occupancy (the earliest arrival asked for with no horizon): keep going at full output.
      const run = new TwoNodeRun(model, o.outdoor);
      const st = run.plant.settled(o.startC, run.outdoorAt(t0));
      if (o.setbackC === null) run.runUntil(st, t0, s, model.gain, null);
      else run.hold(st, t0, s, o.setbackC, o.mode === 'heat' ? model.heatRate : -model.coolRate);
      return run.runUntil(st, s, Math.min(horizon, s + 5000), qFull, (T) => sgn * (T - o.targetC) >= 0);
    },
    meets: (s) => solver.trial(s).meets,
    at(s) {
      const t = solver.trial(s);
      return { equipmentHours: t.equipment, startTempC: t.startTempC };
    },
    tolerance: 1e-7,
  };
}
