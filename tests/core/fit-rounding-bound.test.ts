/**
 * The rounding bound that spares the two-node search (core/fit/select.ts, possibleCutPercent).
 *
 * Reference: rounding a signal that sweeps many steps of a grid of width q leaves an error uniform on
 * [−q/2, q/2], of variance q²/12 (Sheppard's correction, W. F. Sheppard 1898, Proc. London Math. Soc.
 * 29, 353–380; also B. Widrow & I. Kollár, *Quantization Noise*, 2008, ch. 4). Signals and logs here are
 * invented (the reference simulator, tests/support/zone-sim.ts).
 */
import { describe, expect, it } from 'vitest';
import { possibleCutPercent, MIN_GAIN_PERCENT } from '../../core/fit/select.ts';
import { fitResponse } from '../../core/fit/fit.ts';
import { scenarioSeries } from '../calibrate/case.ts';

const q = 1 / 1.8; // 1 °F in K
// An indoor trace drifting steadily between 50 and 80 °F (so its fractions of a step spread evenly), in
// °C, and its readings rounded to whole °F.
const truth = Float64Array.from({ length: 20_000 }, (_, i) => (50 + ((i * 0.00731 * Math.SQRT2) % 30) - 32) / 1.8);
const rounded = Float64Array.from(truth, (c) => (Math.round(c * 1.8 + 32) - 32) / 1.8);

describe('rounding bound', () => {
  it('rounding leaves q²/12 in the residual of the true trace (Sheppard 1898)', () => {
    let se = 0;
    for (let i = 0; i < truth.length; i++) se += (rounded[i] - truth[i]) ** 2;
    expect(Math.abs(se / truth.length / ((q * q) / 12) - 1)).toBeLessThan(0.02);
    // The true trace itself: its whole residual is rounding, so no model can cut it.
    expect(possibleCutPercent(rounded, truth)).toBeCloseTo(0, 6);
  });

  it('a trace that misses by more than the rounding leaves room, in proportion', () => {
    // A model off by a steady 0.3 K sine: mean square 0.045 K² on top of about q²/12 = 0.0257 K².
    const off = Float64Array.from(truth, (c, i) => c + 0.3 * Math.sqrt(2) * Math.sin(i / 400));
    const cut = possibleCutPercent(rounded, off)!;
    // Expected from the two variances (their cross term averages out): 1 − 0.0257/(0.0257 + 0.09·…).
    let se = 0, round = 0;
    for (let i = 0; i < truth.length; i++) {
      se += (rounded[i] - off[i]) ** 2;
      const r = (Math.round(off[i] * 1.8 + 32) - 32) / 1.8;
      round += (r - off[i]) ** 2;
    }
    expect(cut).toBeCloseTo((1 - round / se) * 100, 9);
    expect(cut).toBeGreaterThan(50);
  });

  it('readings that are not rounded give no bound', () => {
    const fine = Float64Array.from(truth, (c, i) => c + 1e-3 * Math.sin(i * 1.7));
    expect(possibleCutPercent(fine, truth)).toBeNull();
  });

  it('a one-node zone logged in whole °F is kept as one node without the search; a mass zone is searched', async () => {
    const log = { intervalMinutes: 5, units: 'F' as const, indoorResolution: 1 };
    const one = await scenarioSeries({ id: 'one', group: 'coverage', units: 'F', options: { model: { tauHours: 30, heatRate: 2.5, coolRate: 0, gain: 0.1 }, days: 21, log } });
    const r1 = fitResponse(one.series, { timeZone: 'UTC' });
    expect(r1.model).toBe('one-node');
    expect(r1.selection.roundingBoundPercent).toBeLessThan(MIN_GAIN_PERCENT);
    expect(r1.selection.reason).toMatch(/within their rounding/);

    const mass = await scenarioSeries({ id: 'mass', group: 'mass', units: 'F', options: {
      model: { tauHours: 60, heatRate: 3, coolRate: 0, gain: 0.1 },
      mass: { airMassHours: 2, massOutdoorHours: 50, massShare: 0.8 },
      days: 21,
      log,
    } });
    const r2 = fitResponse(mass.series, { timeZone: 'UTC' });
    expect(r2.selection.roundingBoundPercent).toBeUndefined();
    expect(r2.model).toBe('two-node');
  });
});
