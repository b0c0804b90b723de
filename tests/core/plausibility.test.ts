/**
 * Plausibility sentences (core/plausibility.ts): each bound fires outside its range and stays quiet
 * inside it, in the person's units. Bounds are common practice / from memory, as the module says; the
 * unit conversion (1 K = 1.8 °F difference) is the definition of the Fahrenheit degree.
 */
import { describe, expect, it } from 'vitest';
import { plausibilityNotes } from '../../core/plausibility.ts';
import type { ZoneResponse } from '../../core/types.ts';
import { ONE_NODE_FIELDS } from '../support/response-fields.ts';

const base: ZoneResponse = {
  tauHours: 30, heatRate: 1.5, coolRate: 0, gain: 0.05, tauCI: [28, 32], heatRateCI: [1.4, 1.6], coolRateCI: null,
  hasHeating: true, hasCooling: false, heldOut: [], rmse: 0.25, heldOutRmse: 0.3, cvrmse: 1, nmbe: 0,
  samplesUsed: 8000, daysUsed: 28, segments: 2, freeFloatHours: 200, firstTime: 0, lastTime: 28 * 864e5, warnings: [],
  ...ONE_NODE_FIELDS,
};

describe('plausibility notes', () => {
  it('say nothing for an ordinary zone (τ 30 h, lift 45 K, gain 1.5 K, error 0.25 K)', () => {
    expect(plausibilityNotes(base, 'C')).toEqual([]);
  });

  it('flag a heating lift far above any design temperature difference, in the display unit', () => {
    // The figures of the issue: h·τ = 138 K.
    const r = { ...base, heatRate: 4.6 };
    const c = plausibilityNotes(r, 'C');
    expect(c).toHaveLength(1);
    expect(c[0]).toContain('138.0 K');
    expect(c[0]).toMatch(/wrong unit|wrong column/);
    // 138 K = 248.4 °F difference.
    expect(plausibilityNotes(r, 'F')[0]).toContain('248.4 °F');
  });

  it('flag a tiny lift, a short or long τ, negative or huge gains and a large fit error', () => {
    expect(plausibilityNotes({ ...base, heatRate: 0.05 }, 'C')[0]).toMatch(/only 1\.5 K.*undersized/);
    expect(plausibilityNotes({ ...base, tauHours: 1.2, heatRate: 20, gain: 0.5 }, 'C').some((n) => /1\.2 h is shorter/.test(n))).toBe(true);
    expect(plausibilityNotes({ ...base, tauHours: 400, heatRate: 0.1, gain: 0 }, 'C').some((n) => /400 h is longer/.test(n))).toBe(true);
    expect(plausibilityNotes({ ...base, gain: -0.2 }, 'C')[0]).toMatch(/negative.*6\.0 K below/);
    expect(plausibilityNotes({ ...base, gain: 0.6 }, 'C')[0]).toMatch(/18\.0 K above/);
    // 1.57 K on a °F log reads 2.8 °F (the example of a fit warning in the wrong unit).
    expect(plausibilityNotes({ ...base, rmse: 1.57, heldOutRmse: 1.6 }, 'F')[0]).toContain('2.8 °F');
    expect(plausibilityNotes({ ...base, heldOutRmse: 1.2 }, 'C')[0]).toMatch(/held out/);
  });

  it('use the slow time constant of a two-node zone', () => {
    const two: ZoneResponse = { ...base, model: 'two-node', twoNode: { mass: { airMassHours: 2, massOutdoorHours: 400, massShare: 0.9 }, airMassHoursCI: [1, 3], massOutdoorHoursCI: [300, 500], massShareCI: [0.8, 0.95], slowHours: 450, slowHoursCI: [400, 500], fastHours: 1.8 } };
    expect(plausibilityNotes(two, 'C').some((n) => /450 h is longer/.test(n))).toBe(true);
  });
});
