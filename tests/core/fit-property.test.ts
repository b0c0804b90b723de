/**
 * Property: a fit on data simulated from a known model recovers that model.
 *
 * For random zones (time constant τ, heating rate h, internal gain g), random weather and a random log
 * interval, the independent RK4 reference simulator (tests/support/zone-sim.ts, no code shared with
 * core/step.ts or core/fit) writes two weeks of a thermostat-controlled zone with a night setback; the
 * indoor readings are rounded to 0.1 °C like a real export, and core/fit's fitResponse must return τ, h
 * and g each within 15 % of the truth (the tolerance of the issue for this property; the fixed round
 * trips in fit.test.ts hold 10 % on coarser 1 °F readings). Invented data, as the team's rules allow
 * for round trips of the fitter against a known model.
 *
 * Few runs: each simulation and fit takes about 0.1–0.3 s.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { fitResponse } from '../../core/fit/index.ts';
import type { ZoneModel, ZoneSeries } from '../../core/types.ts';
import { simulateZone } from '../support/zone-sim.ts';

const rel = (got: number, want: number) => Math.abs(got - want) / Math.abs(want);

/** The simulator's series with the indoor reading rounded to 0.1 °C and the outdoor to 0.1 °C. */
function rounded(s: ZoneSeries): ZoneSeries {
  const r = (c: number) => Math.round(c * 10) / 10;
  return { ...s, indoor: Float64Array.from(s.indoor, r), outdoor: Float64Array.from(s.outdoor, r) };
}

describe('fitResponse on simulated logs (property)', () => {
  it('recovers τ, h and g within 15 % for random zones, weather and log intervals', () => {
    fc.assert(
      fc.property(
        fc.double({ min: Math.log(6), max: Math.log(80), noNaN: true }), // ln τ, τ in hours (light to heavy zones)
        fc.double({ min: 0, max: 1, noNaN: true }), // where h lies in its range
        fc.double({ min: 0.05, max: 0.5, noNaN: true }), // g, K/h
        fc.double({ min: -10, max: 8, noNaN: true }), // mean outdoor temperature, °C
        fc.constantFrom(5, 10, 15), // log interval, minutes
        fc.integer({ min: 1, max: 1000 }), // weather seed
        (lnTau, hAt, g, meanC, intervalMinutes, seed) => {
          const tauHours = Math.exp(lnTau);
          // Equipment that can hold the 21 °C setpoint in this weather: heating lift h·τ of at least 30 K.
          const hMin = Math.max(1, 30 / tauHours);
          const heatRate = hMin + hAt * (6 - hMin);
          const truth: ZoneModel = { tauHours, heatRate, coolRate: 0, gain: g };
          const sim = simulateZone({ model: truth, days: 14, seed, weather: { meanC, dailyRangeK: 8 }, log: { intervalMinutes } });
          const fit = fitResponse(rounded(sim.trueSeries));
          const what = `truth τ ${tauHours.toFixed(2)} h, h ${heatRate.toFixed(3)} K/h, g ${g.toFixed(3)} K/h; fitted ${fit.tauHours.toFixed(2)}, ${fit.heatRate.toFixed(3)}, ${fit.gain.toFixed(3)}`;
          expect(rel(fit.tauHours, tauHours), what).toBeLessThan(0.15);
          expect(rel(fit.heatRate, heatRate), what).toBeLessThan(0.15);
          expect(rel(fit.gain, g), what).toBeLessThan(0.15);
        },
      ),
      { numRuns: 10, seed: 20261202 },
    );
  });
});
