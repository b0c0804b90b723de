import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { biotNumber, coolingTemperature, lumpedTauSeconds, tauFromTwoReadings, timeToReach } from '../../core/newton.ts';
import { InputError, UnderdeterminedError } from '../../core/errors.ts';

describe('coolingTemperature: closed-form Newton cooling', () => {
  it('follows T_a + (T0 − T_a)·e^(−t/τ)', () => {
    // Source: closed-form solution of Newton's law of cooling, any heat-transfer text
    // (Incropera et al., eq. 5.6). Tolerance 1e-12 K: same formula, rounding only.
    for (const [T0, Ta, tau, t] of [
      [20, 0, 10, 10],
      [21, -5, 35, 8],
      [15, 30, 4, 0.5],
    ]) {
      expect(coolingTemperature(T0, Ta, tau, t)).toBeCloseTo(Ta + (T0 - Ta) * Math.exp(-t / tau), 12);
    }
    // One τ leaves e^(−1) = 36.79 % of the initial difference (common textbook fact). Tolerance 1e-12.
    expect((coolingTemperature(20, 0, 10, 10) - 0) / 20).toBeCloseTo(Math.exp(-1), 12);
    expect(coolingTemperature(20, 0, 10, 0)).toBe(20);
  });

  it('satisfies the ODE dT/dt = (T_a − T)/τ (central difference)', () => {
    // Source: Newton's law of cooling itself. Tolerance 1e-7 K/h: central-difference error ~h²·T'''/6.
    const T0 = 22, Ta = -3, tau = 28, t = 6, h = 1e-4;
    const d = (coolingTemperature(T0, Ta, tau, t + h) - coolingTemperature(T0, Ta, tau, t - h)) / (2 * h);
    expect(d).toBeCloseTo((Ta - coolingTemperature(T0, Ta, tau, t)) / tau, 7);
  });

  it('rejects a non-positive τ with a typed error', () => {
    expect(() => coolingTemperature(20, 0, 0, 1)).toThrow(InputError);
    expect(() => coolingTemperature(20, 0, -1, 1)).toThrow(/time constant/);
    expect(() => coolingTemperature(NaN, 0, 1, 1)).toThrow(InputError);
  });
});

describe('Incropera et al., Example 5.1 (thermocouple junction, as reproduced)', () => {
  // Data of the example: h = 400 W/m²K, k = 20 W/m·K, c = 400 J/kg·K, ρ = 8500 kg/m³, required τ = 1 s.
  const h = 400, k = 20, c = 400, rho = 8500, tauRequired = 1;
  // Sphere: V/A = D/6, so τ = ρ·c·D/(6h) → D = 6·h·τ/(ρ·c).
  const D = (6 * h * tauRequired) / (rho * c);
  const V = (Math.PI * D ** 3) / 6;
  const A = Math.PI * D ** 2;

  it('gives D = 7.06×10⁻⁴ m for τ = 1 s, and the lumped τ back', () => {
    // Source: Incropera Ex. 5.1 [2nd] D = 7.06×10⁻⁴ m. Tolerance 0.005×10⁻⁴ m: the text's 3 significant figures.
    expect(D).toBeCloseTo(7.06e-4, 6);
    // τ = ρcV/(hA) must return the required 1 s (Incropera eq. 5.7). Tolerance 1e-12 s (rounding).
    expect(lumpedTauSeconds(rho, c, V, h, A)).toBeCloseTo(1, 12);
  });

  it('has Bi = 2.35×10⁻³ (lumped method valid, Bi < 0.1)', () => {
    // Source: Incropera Ex. 5.1 [2nd; derived] Bi = h(D/6)/k = 2.35×10⁻³. Tolerance 0.005×10⁻³: 3 figures.
    const bi = biotNumber(h, V / A, k);
    expect(bi).toBeCloseTo(2.35e-3, 5);
    expect(bi).toBeLessThan(0.1); // validity limit of the lumped method (Incropera §5.2, Çengel §4-1)
  });

  it('takes 5.16 s from 25 °C to 199 °C in 200 °C gas', () => {
    const tau = lumpedTauSeconds(rho, c, V, h, A); // seconds: the formulas are unit-free in time
    const r = timeToReach(25, 200, tau, 199);
    // Source: Incropera Ex. 5.1 [2nd]: t = 5.16 s (text rounds to 5.2 s); recomputed here as
    // τ·ln((25 − 200)/(199 − 200)) [derived]. Tolerance 0.005 s: the 3 figures quoted.
    expect(r.hours).not.toBeNull();
    expect(r.hours!).toBeCloseTo(5.16, 2);
    expect(r.hours!).toBeCloseTo(tau * Math.log((25 - 200) / (199 - 200)), 12);
    // And the junction really is at 199 °C then (closed form). Tolerance 1e-9 K.
    expect(coolingTemperature(25, 200, tau, r.hours!)).toBeCloseTo(199, 9);
  });
});

describe('Çengel, Example 4-1 (temperature measurement by thermocouple, as reproduced)', () => {
  // Data: D = 1 mm, k = 35 W/m·K, ρ = 8500 kg/m³, cp = 320 J/kg·K, h = 210 W/m²K.
  const Dm = 1e-3, k = 35, rho = 8500, cp = 320, h = 210;
  const V = (Math.PI * Dm ** 3) / 6;
  const A = Math.PI * Dm ** 2;
  const Lc = V / A;

  it('has Lc = 1.67×10⁻⁴ m and Bi ≈ 0.001', () => {
    // Source: Çengel Ex. 4-1 [2nd]. Tolerances: 0.005×10⁻⁴ m (3 figures); Bi to 0.0005 (1 figure quoted).
    expect(Lc).toBeCloseTo(1.67e-4, 6);
    expect(biotNumber(h, Lc, k)).toBeCloseTo(0.001, 3);
  });

  it('has b = hA/(ρcV) ≈ 0.462 s⁻¹ and reaches 99 % of the difference in ≈ 10 s (9.94 s unrounded)', () => {
    const tau = lumpedTauSeconds(rho, cp, V, h, A);
    const b = 1 / tau;
    // Source: Çengel Ex. 4-1 [2nd] b ≈ 0.462 s⁻¹ (the text uses Lc rounded to 1.67×10⁻⁴ m, giving 0.4623;
    // the unrounded Lc gives 0.4632). Tolerance 0.002 s⁻¹ covers that rounding.
    expect(Math.abs(b - 0.462)).toBeLessThan(0.002);
    // 99 % of the initial difference: from 0 °C in a 100 °C gas to 99 °C.
    const r = timeToReach(0, 100, tau, 99);
    expect(r.hours).not.toBeNull();
    // Source: Çengel Ex. 4-1 [2nd] t ≈ 10 s; REFERENCES [derived] 9.94 s = ln(100)/b recomputed here.
    // Tolerance 0.1 s against the text's rounded 10 s; 1e-12 s against the recomputed value.
    expect(Math.abs(r.hours! - 10)).toBeLessThan(0.1);
    expect(r.hours!).toBeCloseTo(Math.log(100) / b, 12);
    expect(r.hours!).toBeCloseTo(9.94, 2);
  });
});

describe('timeToReach: never-reached cases', () => {
  it('returns null with a reason when the target is not between start and ambient', () => {
    // Newton cooling approaches the ambient monotonically and never passes it (closed form).
    const beyond = timeToReach(20, 0, 10, -1);
    expect(beyond.hours).toBeNull();
    expect(beyond.reason).toMatch(/not between/);
    const away = timeToReach(20, 0, 10, 25);
    expect(away.hours).toBeNull();
    const atAmbient = timeToReach(20, 0, 10, 0);
    expect(atAmbient.hours).toBeNull();
    expect(atAmbient.reason).toMatch(/never reached/);
    const stuck = timeToReach(0, 0, 10, 5);
    expect(stuck.hours).toBeNull();
    expect(timeToReach(20, 0, 10, 20)).toEqual({ hours: 0 });
  });
});

describe('tauFromTwoReadings', () => {
  it('matches the derived formula τ = Δt / ln((T0 − Ta)/(T1 − Ta))', () => {
    // Source: REFERENCES [derived] from the closed form. Tolerance 1e-10 h (rounding).
    const T0 = 21, T1 = 17.4, Ta = -2, dt = 6.5;
    expect(tauFromTwoReadings({ hours: 1, tempC: T0 }, { hours: 1 + dt, tempC: T1 }, Ta)).toBeCloseTo(dt / Math.log((T0 - Ta) / (T1 - Ta)), 10);
  });

  it('round-trips the closed form for random τ, times and temperatures (property)', () => {
    // Forward with coolingTemperature, back with tauFromTwoReadings: relative tolerance 1e-8
    // (a temperature change of ≥ 0.5 % of the difference keeps the logarithm well conditioned).
    fc.assert(
      fc.property(
        fc.double({ min: 0.5, max: 200, noNaN: true }),
        fc.double({ min: -20, max: 40, noNaN: true }),
        fc.double({ min: 1, max: 30, noNaN: true }),
        fc.double({ min: 0, max: 24, noNaN: true }),
        fc.boolean(),
        (tau, Ta, diff, t0, above) => {
          const T0 = Ta + (above ? diff : -diff);
          const dt = Math.max(0.005 * tau, 0.1); // the readings move at least 0.5 % of the difference
          const T1 = coolingTemperature(T0, Ta, tau, dt);
          const back = tauFromTwoReadings({ hours: t0, tempC: T0 }, { hours: t0 + dt, tempC: T1 }, Ta);
          expect(Math.abs(back - tau) / tau).toBeLessThan(1e-8);
          // Order of the readings does not matter.
          const swapped = tauFromTwoReadings({ hours: t0 + dt, tempC: T1 }, { hours: t0, tempC: T0 }, Ta);
          expect(swapped).toBe(back);
        },
      ),
      { numRuns: 300, seed: 1 },
    );
  });

  it('throws typed errors for readings that cannot give τ', () => {
    const r = (hours: number, tempC: number) => ({ hours, tempC });
    // Equal to the ambient: τ not determined.
    expect(() => tauFromTwoReadings(r(0, 0), r(1, 0), 0)).toThrow(UnderdeterminedError);
    expect(() => tauFromTwoReadings(r(0, 10), r(1, 0), 0)).toThrow(UnderdeterminedError);
    // Not moving: τ infinite.
    expect(() => tauFromTwoReadings(r(0, 10), r(1, 10), 0)).toThrow(UnderdeterminedError);
    // Crossing the ambient.
    expect(() => tauFromTwoReadings(r(0, 10), r(1, -1), 0)).toThrow(InputError);
    expect(() => tauFromTwoReadings(r(0, 10), r(1, -1), 0)).toThrow(/opposite sides/);
    // Moving away from the ambient.
    expect(() => tauFromTwoReadings(r(0, 10), r(1, 12), 0)).toThrow(/moved away/);
    // Same time.
    expect(() => tauFromTwoReadings(r(2, 10), r(2, 9), 0)).toThrow(InputError);
    // Codes are stable for programs.
    try {
      tauFromTwoReadings(r(0, 10), r(1, 10), 0);
    } catch (e) {
      expect((e as UnderdeterminedError).code).toBe('underdetermined');
    }
  });
});
