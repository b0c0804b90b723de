import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import type { ZoneModel } from '../../core/types.ts';
import { driftCurve, equilibrium, latestStart, recoveryCurve, recoveryTime } from '../../core/recovery.ts';
import { outdoorProfile, type OutdoorProfile } from '../../core/outdoor.ts';
import { timeToReach } from '../../core/newton.ts';
import { InputError } from '../../core/errors.ts';

// ---------------------------------------------------------------------------------------------
// Independent reference integrators, written here without the core's closed forms: the model ODE
//   dT/dt = (T_out(t) − T)/τ + h·u_heat − c·u_cool + g
// integrated with classical fourth-order Runge–Kutta, the outdoor interpolated by the test itself.

/** Piecewise-linear interpolation held constant beyond the ends (the test's own; binary search). */
function interp(time: number[], temp: number[]): (t: number) => number {
  const n = time.length;
  return (t) => {
    if (t <= time[0]) return temp[0];
    if (t >= time[n - 1]) return temp[n - 1];
    let lo = 0;
    let hi = n - 1;
    while (hi - lo > 1) {
      const mid = (lo + hi) >> 1;
      if (time[mid] <= t) lo = mid;
      else hi = mid;
    }
    return temp[lo] + ((temp[hi] - temp[lo]) * (t - time[lo])) / (time[hi] - time[lo]);
  };
}

function rk4Step(f: (t: number, T: number) => number, t: number, T: number, h: number): number {
  const k1 = f(t, T);
  const k2 = f(t + h / 2, T + (h / 2) * k1);
  const k3 = f(t + h / 2, T + (h / 2) * k2);
  const k4 = f(t + h, T + h * k3);
  return T + (h / 6) * (k1 + 2 * k2 + 2 * k3 + k4);
}

/** RK4 with the equipment fully on until T first reaches the target (linear interpolation of the crossing). */
function rk4Arrival(m: ZoneModel, T0: number, target: number, out: (t: number) => number, t0: number, tMax: number, dt = 1e-3): number | null {
  const sgn = target >= T0 ? 1 : -1;
  const q = m.gain + (sgn > 0 ? m.heatRate : -m.coolRate);
  const f = (t: number, T: number) => (out(t) - T) / m.tauHours + q;
  let t = t0;
  let T = T0;
  while (t < tMax) {
    const T1 = rk4Step(f, t, T, dt);
    if (sgn * (T1 - target) >= 0) return t + (dt * (target - T)) / (T1 - T) - t0;
    T = T1;
    t += dt;
  }
  return null;
}

/**
 * RK4 of the zone under a thermostat: a stiff proportional controller u = clamp(K·sgn·(sp − T), 0, 1),
 * which tends to the ideal thermostat as K → ∞ (it sits below a heating setpoint by u/K ≤ 1/K).
 */
function controlled(m: ZoneModel, sgn: number, sp: number, K: number) {
  const e = sgn > 0 ? m.heatRate : -m.coolRate;
  return (out: (t: number) => number) => (t: number, T: number) => {
    const u = Number.isNaN(sp) ? 0 : Math.min(1, Math.max(0, K * sgn * (sp - T)));
    return (out(t) - T) / m.tauHours + m.gain + e * u;
  };
}

const model: ZoneModel = { tauHours: 32, heatRate: 1.2, coolRate: 0.9, gain: 0.12 };

// Invented test weather (not measured): a cold night, hourly samples, falling to a pre-dawn low and
// rising again, with a passing front.
const nightTime = Array.from({ length: 25 }, (_, i) => i);
const nightTemp = nightTime.map((i) => -2 - 5 * Math.sin((Math.PI * i) / 14) + (i >= 15 ? 3 : 0) + 0.4 * ((i * 5) % 3));
const night: OutdoorProfile = outdoorProfile(nightTime, nightTemp);
const nightFn = interp(nightTime, nightTemp);

// ---------------------------------------------------------------------------------------------

describe('equilibrium', () => {
  it('is T_out + (h·u + g)·τ, and T_out + (g − c·u)·τ for cooling', () => {
    // dT/dt = 0 in the zone model (INTERFACES.md). Tolerance 1e-12 K.
    expect(equilibrium(model, -5)).toBeCloseTo(-5 + (1.2 + 0.12) * 32, 12);
    expect(equilibrium(model, -5, 0.5)).toBeCloseTo(-5 + (0.6 + 0.12) * 32, 12);
    expect(equilibrium(model, 30, 1, 'cool')).toBeCloseTo(30 + (0.12 - 0.9) * 32, 12);
    expect(equilibrium(model, 30, 1, 'off')).toBeCloseTo(30 + 0.12 * 32, 12);
    expect(() => equilibrium(model, 0, 1.5)).toThrow(InputError);
  });
});

describe('recoveryTime', () => {
  it('constant outdoor: closed form = profile method = independent RK4', () => {
    for (const [fromC, toC, outC] of [
      [15, 21, -5],
      [17.5, 20, 5],
      [12, 22, -15],
    ]) {
      const Teq = outC + (model.heatRate + model.gain) * model.tauHours;
      // Closed form τ·ln((T_eq − T0)/(T_eq − T1)) (Newton cooling toward T_eq; any heat-transfer text).
      const expected = model.tauHours * Math.log((Teq - fromC) / (Teq - toC));
      const closed = recoveryTime(model, fromC, toC, outC);
      expect(closed.hours!).toBeCloseTo(expected, 10); // tolerance 1e-10 h: same formula, rounding
      expect(closed.equilibriumC).toBeCloseTo(Teq, 12);
      // Profile method over a flat profile cut into 20-minute pieces, started mid-piece:
      // exact steps + in-piece root finding. Tolerance 1e-9 h (the crossing is solved to ~1e-11 h).
      const times = Array.from({ length: 200 }, (_, i) => i / 3);
      const flat = outdoorProfile(times, times.map(() => outC));
      expect(Math.abs(recoveryTime(model, fromC, toC, flat, 0.1).hours! - expected)).toBeLessThan(1e-9);
      // Independent RK4 (Δt = 1e-3 h) with linear location of the crossing: tolerance 1e-6 h.
      const rk = rk4Arrival(model, fromC, toC, () => outC, 0, 100);
      expect(Math.abs(closed.hours! - rk!)).toBeLessThan(1e-6);
    }
  });

  it('moving outdoor: profile method = independent RK4', () => {
    for (const start of [0, 2.5, 7, 13.25]) {
      const r = recoveryTime(model, 16, 21, night, start);
      const rk = rk4Arrival(model, 16, 21, nightFn, start, start + 60);
      expect(r.hours).not.toBeNull();
      expect(rk).not.toBeNull();
      // Tolerance 1e-6 h: RK4 truncation and the linear crossing location are far below it.
      expect(Math.abs(r.hours! - rk!)).toBeLessThan(1e-6);
    }
  });

  it('cooling pull-down when toC < fromC: closed form and profile = RK4', () => {
    const Teq = 31 + (model.gain - model.coolRate) * model.tauHours;
    const closed = recoveryTime(model, 27, 24, 31);
    expect(closed.mode).toBe('cool');
    // Closed form toward the cooling equilibrium. Tolerance 1e-10 h.
    expect(closed.hours!).toBeCloseTo(model.tauHours * Math.log((Teq - 27) / (Teq - 24)), 10);
    // Invented hot afternoon.
    const hotT = [0, 2, 4, 6, 8, 10];
    const hotC = [29, 33, 35, 34, 30, 26];
    const r = recoveryTime(model, 28, 23.5, outdoorProfile(hotT, hotC), 1);
    const rk = rk4Arrival(model, 28, 23.5, interp(hotT, hotC), 1, 80);
    expect(Math.abs(r.hours! - rk!)).toBeLessThan(1e-6); // tolerance as above
  });

  it('never reaches: null with the reason and the equilibrium', () => {
    const weak: ZoneModel = { tauHours: 30, heatRate: 0.5, coolRate: 0, gain: 0 };
    const r = recoveryTime(weak, 15, 21, -2);
    expect(r.hours).toBeNull();
    expect(r.equilibriumC).toBeCloseTo(-2 + 0.5 * 30, 12); // 13 °C < 21 °C
    expect(r.reason).toMatch(/never reaches/);
    expect(r.reason).toMatch(/13\.0 °C/);
    // Profile falling from 10 °C (T_eq 25 °C, above the target) to −10 °C (T_eq 5 °C) over 10 h.
    const falling = outdoorProfile([0, 10], [10, -10]);
    const p = recoveryTime(weak, 15, 24, falling);
    expect(p.hours).toBeNull();
    expect(p.equilibriumC).toBeCloseTo(5, 12);
    expect(rk4Arrival(weak, 15, 24, interp([0, 10], [10, -10]), 0, 200)).toBeNull(); // RK4 agrees
    // …but a lower target is reached while the outdoor is still mild, and RK4 agrees (tolerance 1e-6 h).
    const q = recoveryTime(weak, 15, 17, falling);
    expect(Math.abs(q.hours! - rk4Arrival(weak, 15, 17, interp([0, 10], [10, -10]), 0, 200)!)).toBeLessThan(1e-6);
    // A heating-only zone asked to pull down in hot weather says it has no cooling.
    expect(recoveryTime(weak, 26, 24, 35).reason).toMatch(/no cooling/);
  });

  it('is monotone in outdoor temperature and setback depth (property)', () => {
    const inf = (h: number | null) => (h === null ? Infinity : h);
    fc.assert(
      fc.property(
        fc.double({ min: 5, max: 120, noNaN: true }), // τ, h
        fc.double({ min: 0.2, max: 6, noNaN: true }), // h, K/h
        fc.double({ min: 0, max: 0.5, noNaN: true }), // g, K/h
        fc.double({ min: -25, max: 15, noNaN: true }), // outdoor, °C
        fc.double({ min: 0, max: 10, noNaN: true }), // warmer by, K
        fc.double({ min: 8, max: 20.5, noNaN: true }), // setback temperature, °C
        fc.double({ min: 0, max: 5, noNaN: true }), // shallower by, K
        (tau, h, g, out, warmer, fromC, shallower) => {
          const m: ZoneModel = { tauHours: tau, heatRate: h, coolRate: 0, gain: g };
          const toC = 21;
          const slack = 1e-9;
          // Colder outdoor: recovery no faster (constant and profile methods).
          expect(inf(recoveryTime(m, fromC, toC, out).hours)).toBeGreaterThanOrEqual(inf(recoveryTime(m, fromC, toC, out + warmer).hours) - slack);
          const shifted = (d: number) => outdoorProfile(nightTime, nightTemp.map((x) => x + out + d));
          expect(inf(recoveryTime(m, fromC, toC, shifted(0)).hours)).toBeGreaterThanOrEqual(inf(recoveryTime(m, fromC, toC, shifted(warmer)).hours) - slack);
          // Deeper setback: recovery no faster.
          const from2 = Math.min(toC, fromC + shallower);
          expect(inf(recoveryTime(m, fromC, toC, shifted(0)).hours)).toBeGreaterThanOrEqual(inf(recoveryTime(m, from2, toC, shifted(0)).hours) - slack);
        },
      ),
      { numRuns: 150, seed: 7 },
    );
  });

  it('rejects invalid input with InputError', () => {
    expect(() => recoveryTime({ ...model, tauHours: 0 }, 15, 20, 0)).toThrow(InputError);
    expect(() => recoveryTime({ ...model, heatRate: -1 }, 15, 20, 0)).toThrow(/heating rate/);
    expect(() => recoveryTime(model, NaN, 20, 0)).toThrow(InputError);
    expect(() => recoveryTime(model, 15, 20, { time: Float64Array.of(0, 0), temp: Float64Array.of(1, 2) })).toThrow(/increase strictly/);
  });
});

describe('driftCurve', () => {
  it('free drift at a constant outdoor follows Newton cooling toward T_out + g·τ', () => {
    const c = driftCurve(model, 21, -4, 10, 0.5);
    const Tfree = -4 + model.gain * model.tauHours;
    expect(c.t.length).toBe(21);
    for (let i = 0; i < c.t.length; i++) {
      // Closed form of Newton's law of cooling. Tolerance 1e-10 K.
      expect(c.temp[i]).toBeCloseTo(Tfree + (21 - Tfree) * Math.exp(-c.t[i] / model.tauHours), 10);
      expect(c.runtime[i]).toBe(0);
    }
  });

  it('holds a setback: reached at the Newton time, then runtime = ((sp − T_out)/τ − g)/h', () => {
    const out = -6, sp = 16;
    const c = driftCurve(model, 21, out, 12, 0.25, { setbackC: sp });
    const Tfree = out + model.gain * model.tauHours;
    const reach = timeToReach(21, Tfree, model.tauHours, sp).hours!; // Newton cooling toward the free equilibrium
    const uHold = ((sp - out) / model.tauHours - model.gain) / model.heatRate; // dT/dt = 0 at sp
    for (let i = 1; i < c.t.length; i++) {
      if (c.t[i] <= reach) {
        expect(c.runtime[i]).toBe(0);
        expect(c.temp[i]).toBeCloseTo(Tfree + (21 - Tfree) * Math.exp(-c.t[i] / model.tauHours), 10);
      } else if (c.t[i - 1] >= reach) {
        expect(c.temp[i]).toBe(sp);
        expect(c.runtime[i]).toBeCloseTo(uHold, 12); // tolerance 1e-12: exact hold
      } else {
        // The interval in which the setpoint is reached: runtime only for the held part of it.
        expect(c.runtime[i]).toBeCloseTo((uHold * (c.t[i] - reach)) / 0.25, 9);
      }
    }
  });

  it('with a moving outdoor and a setback matches RK4 of a stiff proportional thermostat', () => {
    // Weak heating so the hold saturates in the coldest hours and the zone sags below the setback.
    const m: ZoneModel = { tauHours: 20, heatRate: 0.9, coolRate: 0, gain: 0.1 };
    const sp = 15;
    const c = driftCurve(m, 20, night, 24, 1 / 12, { setbackC: sp });
    const K = 5000; // the controller sits at most 1/K = 2e-4 K below the setpoint
    const f = controlled(m, 1, sp, K)(nightFn);
    const dt = 1 / 7200;
    let T = 20;
    let worst = 0;
    let sagged = false;
    for (let i = 1; i < c.t.length; i++) {
      for (let k = 0; k < 600; k++) T = rk4Step(f, (i - 1) / 12 + k * dt, T, dt);
      worst = Math.max(worst, Math.abs(T - c.temp[i]));
      if (c.temp[i] < sp - 0.05) sagged = true;
    }
    expect(sagged).toBe(true); // the case exercises saturation and recovery to the setpoint
    // Tolerance 2e-3 K: the controller's offset (≤ 2e-4 K) carried through the saturated stretches.
    expect(worst).toBeLessThan(2e-3);
  });
});

describe('recoveryCurve', () => {
  it('ends exactly at the target at the recovery time, and follows the closed form', () => {
    const c = recoveryCurve(model, 15, 21, -5, 0.5);
    const Teq = -5 + (model.heatRate + model.gain) * model.tauHours;
    expect(c.hours!).toBeCloseTo(recoveryTime(model, 15, 21, -5).hours!, 12);
    expect(c.t[c.t.length - 1]).toBe(c.hours);
    expect(c.temp[c.temp.length - 1]).toBe(21);
    for (let i = 0; i < c.t.length - 1; i++) {
      // Closed form toward T_eq. Tolerance 1e-10 K.
      expect(c.temp[i]).toBeCloseTo(Teq + (15 - Teq) * Math.exp(-c.t[i] / model.tauHours), 10);
    }
    const never = recoveryCurve({ ...model, heatRate: 0.2 }, 15, 21, -10, 1, { maxHours: 24 });
    expect(never.hours).toBeNull();
    expect(never.t[never.t.length - 1]).toBe(24);
  });
});

// ---------------------------------------------------------------------------------------------

/**
 * Brute-force optimal start: every start minute on a 1-minute grid, each simulated with RK4 (2 s
 * steps) of the drift (proportional thermostat at the setback, or equipment off) and then of the
 * recovery (proportional thermostat at the target: full output below it). Success = at the target at
 * occupancy within the controller's offset (1.5/K). Returns the latest successful start, h, or null,
 * and the drift temperature at every minute.
 */
function bruteLatestStart(m: ZoneModel, o: { startC: number; targetC: number; occ: number; out: (t: number) => number; setbackC?: number; sgn?: number }): { start: number | null; driftMinute: Float64Array } {
  const sgn = o.sgn ?? 1;
  const e = sgn > 0 ? m.heatRate : -m.coolRate;
  const sub = 30;
  const dt = 1 / 60 / sub;
  // Gain K with |e|·K·Δt = 2 (inside RK4's real stability limit 2.78); offset ≤ 1/K, e.g. 1.1e-3 K at 4 K/h.
  const K = 2 / (Math.abs(e) * dt);
  const minutes = Math.round(o.occ * 60);
  const steps = minutes * sub;
  // Outdoor at every half step, precomputed once (the integration then costs a few flops a step).
  const outHalf = new Float64Array(2 * steps + 1);
  for (let i = 0; i <= 2 * steps; i++) outHalf[i] = o.out((i * dt) / 2);
  const tau = m.tauHours;
  const g = m.gain;
  const rhs = (i2: number, T: number, sp: number) => {
    const u = Number.isNaN(sp) ? 0 : Math.min(1, Math.max(0, K * sgn * (sp - T)));
    return (outHalf[i2] - T) / tau + g + e * u;
  };
  const step = (i: number, T: number, sp: number) => {
    const k1 = rhs(2 * i, T, sp);
    const k2 = rhs(2 * i + 1, T + (dt / 2) * k1, sp);
    const k3 = rhs(2 * i + 1, T + (dt / 2) * k2, sp);
    const k4 = rhs(2 * i + 2, T + dt * k3, sp);
    return T + (dt / 6) * (k1 + 2 * k2 + 2 * k3 + k4);
  };
  const setback = o.setbackC ?? NaN;
  const driftMinute = new Float64Array(minutes + 1);
  let T = o.startC;
  driftMinute[0] = T;
  for (let i = 0; i < steps; i++) {
    T = step(i, T, setback);
    if ((i + 1) % sub === 0) driftMinute[(i + 1) / sub] = T;
  }
  let best: number | null = null;
  for (let s = 0; s <= minutes; s++) {
    let R = driftMinute[s];
    for (let i = s * sub; i < steps; i++) R = step(i, R, o.targetC);
    if (sgn * (R - o.targetC) >= -1.5 / K) best = s / 60;
  }
  return { start: best, driftMinute };
}

describe('latestStart (optimal start)', () => {
  const cases: Array<{ name: string; m: ZoneModel; startC: number; targetC: number; occ: number; outdoor: number | OutdoorProfile; out: (t: number) => number; setbackC?: number; mode?: 'heat' | 'cool' }> = [
    { name: 'equipment off, constant outdoor', m: model, startC: 21, targetC: 21, occ: 6, outdoor: -8, out: () => -8 },
    // The setback is reached after about 1.8 h and held until the start.
    { name: 'setback reached and held, then warm-up', m: { tauHours: 8, heatRate: 4, coolRate: 0, gain: 0.1 }, startC: 21, targetC: 21, occ: 8, outdoor: -5, out: () => -5, setbackC: 16 },
    // Invented cold snap: even full heat cannot stop the fall, so the recovery dips before it gains.
    {
      name: 'cold snap: full heat cannot stop the fall, recovery dips first',
      m: { tauHours: 15, heatRate: 1.6, coolRate: 0, gain: 0.1 },
      startC: 20,
      targetC: 19,
      occ: 10,
      outdoor: outdoorProfile([0, 2, 5, 8, 10], [-4, -14, -10, 8, 10]),
      out: interp([0, 2, 5, 8, 10], [-4, -14, -10, 8, 10]),
      setbackC: 15,
    },
    // Invented hot day: the setup is reached after about 4 h and held, then the pull-down.
    {
      name: 'setup held, cooling pull-down on a hot day',
      m: { tauHours: 12, heatRate: 0, coolRate: 2.2, gain: 0.2 },
      startC: 24,
      targetC: 24,
      occ: 8,
      outdoor: outdoorProfile([0, 3, 6, 9], [27, 32, 36, 35]),
      out: interp([0, 3, 6, 9], [27, 32, 36, 35]),
      setbackC: 26.5,
      mode: 'cool',
    },
  ];

  it.each(cases)('$name: matches a brute-force search on a 1-minute grid', (c) => {
    const r = latestStart(c.m, { startC: c.startC, targetC: c.targetC, occupancyHours: c.occ, outdoor: c.outdoor, setbackC: c.setbackC, mode: c.mode });
    const brute = bruteLatestStart(c.m, { startC: c.startC, targetC: c.targetC, occ: c.occ, out: c.out, setbackC: c.setbackC, sgn: c.mode === 'cool' ? -1 : 1 });
    expect(r.code).toBe('ok');
    expect(brute.start).not.toBeNull();
    // The exact latest start lies in [brute, brute + 1 min): the grid. Allow 0.003 h below for the
    // controller's offset (≤ 1/K ≈ 1.1e-3 K, over recovery slopes ≳ 0.8 K/h) and RK4 error.
    const d = r.startHours! - brute.start!;
    expect(d).toBeGreaterThanOrEqual(-0.003);
    expect(d).toBeLessThan(1 / 60 + 1e-9);
    // Bookkeeping: start + recovery = arrival ≤ occupancy; the start temperature matches the drift.
    expect(r.startHours! + r.recoveryHours!).toBeCloseTo(r.arrivalHours!, 9);
    expect(r.arrivalHours!).toBeLessThanOrEqual(c.occ + 1e-9);
    expect(r.leadHours!).toBeCloseTo(c.occ - r.startHours!, 12);
    const minute = Math.floor(r.startHours! * 60);
    const frac = r.startHours! * 60 - minute;
    const driftThere = brute.driftMinute[minute] * (1 - frac) + brute.driftMinute[Math.min(minute + 1, brute.driftMinute.length - 1)] * frac;
    expect(Math.abs(r.startTempC! - driftThere)).toBeLessThan(5e-3); // linear interpolation of a smooth drift
    // The recovery from that start takes exactly the time to occupancy (it ends on the target).
    expect(r.arrivalHours!).toBeCloseTo(c.occ, 6);
  });

  it('reports too-late, never-reaches and no-recovery-needed with reasons', () => {
    const weak: ZoneModel = { tauHours: 30, heatRate: 0.5, coolRate: 0, gain: 0 };
    // Too late: from 12 °C the zone needs longer than 1 h to reach 21 °C even with heat on at once.
    const late = latestStart(model, { startC: 12, targetC: 21, occupancyHours: 1, outdoor: -5 });
    expect(late.code).toBe('too-late');
    expect(late.startHours).toBeNull();
    expect(late.earliestArrivalHours!).toBeCloseTo(recoveryTime(model, 12, 21, -5).hours!, 9);
    expect(late.reason).toMatch(/after occupancy/);
    // Never: T_eq = −2 + 15 = 13 °C < 21 °C.
    const never = latestStart(weak, { startC: 18, targetC: 21, occupancyHours: 8, outdoor: -2 });
    expect(never.code).toBe('never-reaches');
    expect(never.reason).toMatch(/never reaches/);
    // Starts at the target but cannot hold it.
    expect(latestStart(weak, { startC: 21, targetC: 21, occupancyHours: 8, outdoor: -2 }).code).toBe('cannot-hold');
    // Mild night: the free-floating zone stays above the target.
    const mild = latestStart(model, { startC: 22, targetC: 19, occupancyHours: 8, outdoor: 18 });
    expect(mild.code).toBe('no-recovery-needed');
    expect(mild.startHours).toBe(8);
    expect(mild.recoveryHours).toBe(0);
  });

  it('starts no later in colder weather (property)', () => {
    fc.assert(
      fc.property(fc.double({ min: -20, max: 10, noNaN: true }), fc.double({ min: 0.5, max: 8, noNaN: true }), fc.double({ min: 12, max: 19, noNaN: true }), (out, warmer, setback) => {
        const base = { startC: 21, targetC: 21, occupancyHours: 10, setbackC: setback };
        const cold = latestStart(model, { ...base, outdoor: out });
        const warm = latestStart(model, { ...base, outdoor: out + warmer });
        const s = (r: typeof cold) => (r.startHours === null ? -Infinity : r.startHours);
        expect(s(cold)).toBeLessThanOrEqual(s(warm) + 1e-8);
      }),
      { numRuns: 60, seed: 3 },
    );
  });
});
