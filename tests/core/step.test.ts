import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { createRequire } from 'node:module';
import { FixedStep, forcing, stepExact } from '../../core/step.ts';

// odex (npm): E. Hairer & G. Wanner's ODEX, a Gragg–Bulirsch–Stoer extrapolation integrator, ported to
// JavaScript. Loaded with require and typed here: its package ships TypeScript sources that do not
// compile under this project's strict settings.
interface OdexSolver {
  absoluteTolerance: number;
  relativeTolerance: number;
  maxSteps: number;
  solve(f: (x: number, y: number[]) => number[], x0: number, y0: number[], xEnd: number): { y: number[]; outcome: number };
}
const odex = createRequire(import.meta.url)('odex') as { Solver: new (n: number) => OdexSolver };

/** Classical fourth-order Runge–Kutta for dT/dt = (a(t) − T)/τ + q with a linear over [0, Δ]. */
function rk4(T0: number, dt: number, tau: number, a0: number, a1: number, q: number, n: number): number {
  const b = (a1 - a0) / dt;
  const f = (t: number, T: number) => (a0 + b * t - T) / tau + q;
  const h = dt / n;
  let T = T0;
  for (let i = 0; i < n; i++) {
    const t = i * h;
    const k1 = f(t, T);
    const k2 = f(t + h / 2, T + (h / 2) * k1);
    const k3 = f(t + h / 2, T + (h / 2) * k2);
    const k4 = f(t + h, T + h * k3);
    T += (h / 6) * (k1 + 2 * k2 + 2 * k3 + k4);
  }
  return T;
}

describe('stepExact against an independent integrator (odex: Hairer & Wanner GBS extrapolation)', () => {
  it('agrees to 1e-8 K over 72 h of a moving ambient with heating bursts', () => {
    // Invented test weather: hourly outdoor samples with a daily swing, a front and noise-free steps.
    const hours = 72;
    const out: number[] = [];
    for (let i = 0; i <= hours; i++) out.push(-3 + 6 * Math.sin((2 * Math.PI * (i - 9)) / 24) - (i > 40 ? 5 : 0) + 0.3 * ((i * 7) % 5));
    // Heating bursts: runtime fraction of each hour (a thermostat cycling, some hours off, some fully on).
    const u: number[] = [0];
    for (let i = 1; i <= hours; i++) u.push([0, 0.35, 1, 0.6, 0, 0, 0.15, 1][i % 8]);
    const model = { tau: 31.5, h: 2.4, c: 0, g: 0.18 };

    const solver = new odex.Solver(1);
    solver.absoluteTolerance = 1e-13;
    solver.relativeTolerance = 1e-13;
    solver.maxSteps = 100000;

    let exact = 19.5;
    let reference = 19.5;
    let worst = 0;
    for (let i = 1; i <= hours; i++) {
      const q = forcing(model.h, model.c, model.g, u[i], 0);
      const a0 = out[i - 1];
      const a1 = out[i];
      exact = stepExact(exact, 1, model.tau, a0, a1, q);
      // The integrator runs on its own state, one interval at a time (the forcing jumps at each sample).
      const r = solver.solve((t: number, y: number[]) => [(a0 + (a1 - a0) * t - y[0]) / model.tau + q], 0, [reference], 1);
      expect(r.outcome).toBe(0); // Outcome.Converged
      reference = r.y[0];
      worst = Math.max(worst, Math.abs(exact - reference));
    }
    // Tolerance 1e-8 K: odex run at 1e-13 tolerance; the exact step has only rounding error.
    expect(worst).toBeLessThan(1e-8);
  });
});

describe('stepExact against a fine-step RK4 (property)', () => {
  it('matches for random τ, Δ, a0, a1, q and T0 in range', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0.5, max: 200, noNaN: true }), // τ, h
        fc.double({ min: 1e-3, max: 48, noNaN: true }), // Δ, h
        fc.double({ min: -30, max: 40, noNaN: true }), // a0, °C
        fc.double({ min: -30, max: 40, noNaN: true }), // a1, °C
        fc.double({ min: -6, max: 12, noNaN: true }), // q, K/h
        fc.double({ min: -10, max: 35, noNaN: true }), // T0, °C
        (tau, dt, a0, a1, q, T0) => {
          // RK4 with h ≤ τ/200: global error ~ (h/τ)⁴ relative, far below the tolerance.
          const n = Math.ceil((200 * dt) / tau) + 200;
          const ref = rk4(T0, dt, tau, a0, a1, q, n);
          // Tolerance 1e-8 K (RK4 truncation ≲ 1e-10 K here; doubles round at ~1e-14 K).
          expect(Math.abs(stepExact(T0, dt, tau, a0, a1, q) - ref)).toBeLessThan(1e-8);
        },
      ),
      { numRuns: 200, seed: 42 },
    );
  });
});

describe('stepExact special cases and FixedStep', () => {
  it('reduces to Newton cooling for a constant ambient and no forcing', () => {
    // Closed form T_a + (T0 − T_a)e^(−Δ/τ) (any heat-transfer text). Tolerance 1e-12 K.
    expect(stepExact(20, 1, 10, 0, 0, 0)).toBeCloseTo(20 * Math.exp(-0.1), 12);
    expect(stepExact(20, 3, 10, 5, 5, 0)).toBeCloseTo(5 + 15 * Math.exp(-0.3), 12);
  });

  it('keeps its digits for Δ ≪ τ (expm1)', () => {
    // First-order Taylor: T0 + Δ·((a0 − T0)/τ + q). Δ = 1e-9 h, so the second-order term is ~1e-20 K.
    const T0 = 20, a0 = -5, tau = 30, q = 1.5, dt = 1e-9;
    const d = stepExact(T0, dt, tau, a0, a0, q) - T0;
    expect(d / (dt * ((a0 - T0) / tau + q))).toBeCloseTo(1, 6);
    expect(stepExact(T0, 0, tau, a0, a0, q)).toBe(T0);
  });

  it('FixedStep gives the same steps as stepExact', () => {
    // Same closed form with precomputed weights. Tolerance 1e-12 K (rounding).
    for (const [dt, tau] of [
      [1 / 12, 30],
      [1, 5],
      [0.25, 200],
    ]) {
      const fixed = new FixedStep(dt, tau);
      let a = 18.2;
      let b = 18.2;
      for (let i = 0; i < 500; i++) {
        const a0 = -4 + Math.sin(i / 7);
        const a1 = -4 + Math.sin((i + 1) / 7);
        const q = (i % 5) * 0.4;
        a = stepExact(a, dt, tau, a0, a1, q);
        b = fixed.step(b, a0, a1, q);
      }
      expect(b).toBeCloseTo(a, 11);
    }
  });
});
