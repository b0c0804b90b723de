import { describe, expect, it } from 'vitest';
import { FixedStep } from '../../core/step.ts';
import { amplitudeRatio, phaseLagHours, sinusoidalOutdoor } from '../../core/sinusoid.ts';
import { outdoorAt } from '../../core/outdoor.ts';
import { InputError } from '../../core/errors.ts';

// Steady response of τ·dy/dt + y = A·sin ωt: amplitude A/√(1+ω²τ²), lag arctan(ωτ)/ω.
// Source: Mikleš & Fikar, Process Modelling, Identification, and Control (2007), §4 eqs. 4.108–4.113;
// Seborg, Edgar & Mellichamp, Process Dynamics and Control, eq. 13-3a. Table values for a 24 h cycle
// from REFERENCES.md [derived from those equations], to 4 and 2 decimals.
const TABLE: Array<{ tau: number; ratio: number; lag: number }> = [
  { tau: 5, ratio: 0.6071, lag: 3.51 },
  { tau: 10, ratio: 0.3568, lag: 4.61 },
  { tau: 24, ratio: 0.1572, lag: 5.4 },
  { tau: 50, ratio: 0.0762, lag: 5.71 },
];
const PERIOD = 24;
const W = (2 * Math.PI) / PERIOD;

/**
 * Simulates the free-floating zone (g = 0) with the exact stepper under x = A·sin ωt sampled every
 * minute (piecewise linear), lets the transient die out (≥ 20 τ, e^(−20) ≈ 2e-9), then measures the
 * amplitude and lag over the last two periods by projecting onto sin and cos (exact for a sinusoid
 * sampled over whole periods).
 */
function simulate(tau: number): { ratio: number; lag: number } {
  const A = 5;
  const perHour = 60;
  const dt = 1 / perHour;
  const settle = Math.ceil((20 * tau) / PERIOD) * PERIOD;
  const total = settle + 2 * PERIOD;
  const n = total * perHour;
  const step = new FixedStep(dt, tau);
  let y = 0;
  let s = 0;
  let c = 0;
  let count = 0;
  let xPrev = 0;
  for (let i = 1; i <= n; i++) {
    const t = i * dt;
    const x = A * Math.sin(W * t);
    y = step.step(y, xPrev, x, 0);
    xPrev = x;
    if (t > settle) {
      s += y * Math.sin(W * t);
      c += y * Math.cos(W * t);
      count++;
    }
  }
  // y ≈ R·A·sin(ωt − φ) = R·A·(sin ωt·cos φ − cos ωt·sin φ): s = R·A·cos φ·N/2, c = −R·A·sin φ·N/2.
  const a = (2 * s) / count;
  const b = (2 * c) / count;
  return { ratio: Math.hypot(a, b) / A, lag: Math.atan2(-b, a) / W };
}

describe('steady sinusoidal response of the zone', () => {
  it.each(TABLE)('τ = $tau h: closed-form ratio and lag match the table', ({ tau, ratio, lag }) => {
    // Tolerances: 5e-5 and 0.005 h, the rounding of the table (4 and 2 decimals).
    expect(Math.abs(amplitudeRatio(tau, PERIOD) - ratio)).toBeLessThanOrEqual(5e-5);
    expect(Math.abs(phaseLagHours(tau, PERIOD) - lag)).toBeLessThanOrEqual(0.005);
    // And the textbook expressions themselves, recomputed here. Tolerance 1e-12 (rounding).
    expect(amplitudeRatio(tau, PERIOD)).toBeCloseTo(1 / Math.sqrt(1 + (W * tau) ** 2), 12);
    expect(phaseLagHours(tau, PERIOD)).toBeCloseTo(Math.atan(W * tau) / W, 12);
  });

  it.each(TABLE)('τ = $tau h: the exact stepper reproduces the amplitude ratio and lag', ({ tau, ratio, lag }) => {
    const sim = simulate(tau);
    // Against the table: its rounding (5e-5, 0.005 h) plus 1e-5 / 1e-3 h for the simulation.
    expect(Math.abs(sim.ratio - ratio)).toBeLessThanOrEqual(6e-5);
    expect(Math.abs(sim.lag - lag)).toBeLessThanOrEqual(0.006);
    // Against the unrounded formulas: sampling the sine piecewise linearly every minute changes the
    // fundamental by ~(ωΔ)²/12 ≈ 2e-6 relative; the transient left is ~e^(−20). Tolerances 1e-5 and 1e-3 h.
    expect(Math.abs(sim.ratio - 1 / Math.sqrt(1 + (W * tau) ** 2))).toBeLessThan(1e-5);
    expect(Math.abs(sim.lag - Math.atan(W * tau) / W)).toBeLessThan(1e-3);
  });

  it('builds a sampled sinusoidal outdoor profile with its peak where asked', () => {
    const p = sinusoidalOutdoor({ meanC: 4, amplitudeK: 6, peakHour: 15, hours: 48, stepHours: 0.5 });
    expect(p.time.length).toBe(97);
    expect(outdoorAt(p, 15)).toBeCloseTo(10, 12);
    expect(outdoorAt(p, 3)).toBeCloseTo(-2, 12);
    expect(outdoorAt(p, 48)).toBeCloseTo(4 + 6 * Math.cos(W * (48 - 15)), 12);
  });

  it('rejects a non-positive τ or period', () => {
    expect(() => amplitudeRatio(0)).toThrow(InputError);
    expect(() => phaseLagHours(10, -24)).toThrow(/period/);
  });
});
