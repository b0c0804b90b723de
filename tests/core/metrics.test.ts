import { describe, expect, it } from 'vitest';
import { cvrmse, fitMetrics, GUIDELINE_14_LIMITS, nmbe, rmse } from '../../core/metrics.ts';
import { InputError } from '../../core/errors.ts';

// ASHRAE Guideline 14-2014 Annex B (as reproduced): CV(RMSE) = 100·√(Σ(y−ŷ)²/(n−p))/ȳ,
// NMBE = 100·Σ(y−ŷ)/((n−p)·ȳ), error taken as y − ŷ. Written out independently here.
function g14(y: number[], yhat: number[], p: number): { cv: number; nmbe: number } {
  const n = y.length;
  const mean = y.reduce((a, b) => a + b, 0) / n;
  let se = 0;
  let e = 0;
  for (let i = 0; i < n; i++) {
    se += (y[i] - yhat[i]) ** 2;
    e += y[i] - yhat[i];
  }
  return { cv: (100 * Math.sqrt(se / (n - p))) / mean, nmbe: (100 * e) / ((n - p) * mean) };
}

describe('ASHRAE Guideline 14 CV(RMSE) and NMBE', () => {
  const y = [10, 12, 11, 13];
  const yhat = [10.5, 11.5, 11, 12];

  it('matches the test vector for p = 0', () => {
    // Source: REFERENCES test vector [derived from Guideline 14 Annex B]: 5.3250 %, 2.1739 %.
    // Tolerance 5e-5 %: the 4 decimals quoted. Also recomputed with the formula above to 1e-12.
    expect(cvrmse(y, yhat, 0)).toBeCloseTo(5.325, 4);
    expect(nmbe(y, yhat, 0)).toBeCloseTo(2.1739, 4);
    expect(cvrmse(y, yhat, 0)).toBeCloseTo(g14(y, yhat, 0).cv, 12);
    expect(nmbe(y, yhat, 0)).toBeCloseTo(g14(y, yhat, 0).nmbe, 12);
  });

  it('matches the test vector for p = 1', () => {
    // Source: REFERENCES test vector [derived]: 6.1488 %, 2.8986 %. Tolerance 5e-5 % (4 decimals quoted).
    expect(cvrmse(y, yhat, 1)).toBeCloseTo(6.1488, 4);
    expect(nmbe(y, yhat, 1)).toBeCloseTo(2.8986, 4);
    expect(cvrmse(y, yhat, 1)).toBeCloseTo(g14(y, yhat, 1).cv, 12);
    expect(nmbe(y, yhat, 1)).toBeCloseTo(g14(y, yhat, 1).nmbe, 12);
  });

  it('takes the error as y − ŷ: swapping the series flips the sign of NMBE only', () => {
    // Sign convention made explicit (REFERENCES: "p and the sign convention differ between sources").
    // Here ȳ changes too, so compare with the formula rather than a plain negation.
    expect(nmbe(yhat, y, 0)).toBeCloseTo(g14(yhat, y, 0).nmbe, 12);
    expect(nmbe(yhat, y, 0)).toBeLessThan(0);
    expect(nmbe(y, yhat, 0)).toBeGreaterThan(0); // the model predicts low here: positive NMBE
  });

  it('gives RMSE √(Σe²/n) in the unit of y', () => {
    // Definition of RMSE; Σe² = 0.25 + 0.25 + 0 + 1 = 1.5 over n = 4. Tolerance 1e-12 (rounding).
    expect(rmse(y, yhat)).toBeCloseTo(Math.sqrt(1.5 / 4), 12);
    const all = fitMetrics(y, yhat, 1);
    expect(all.n).toBe(4);
    expect(all.meanY).toBe(11.5);
    expect(all.rmse).toBeCloseTo(Math.sqrt(1.5 / 4), 12);
  });

  it('skips pairs with a missing value', () => {
    // NaN pairs are dropped before the sums (documented behaviour): same as the clean vector.
    const withGap = fitMetrics([10, NaN, 12, 11, 13], [10.5, 3, 11.5, 11, 12], 0);
    expect(withGap.n).toBe(4);
    expect(withGap.cvrmse).toBeCloseTo(g14(y, yhat, 0).cv, 12);
  });

  it('rejects inputs the formulas cannot take, with plain messages', () => {
    expect(() => cvrmse([1, 2], [1], 0)).toThrow(InputError);
    expect(() => cvrmse([1, 2], [1, 2], 2)).toThrow(/more pairs than parameters/);
    expect(() => nmbe([1, -1], [1, 1], 0)).toThrow(/mean/);
    expect(() => cvrmse(y, yhat, 0.5)).toThrow(/whole number/);
    expect(() => cvrmse(y, yhat, -1)).toThrow(InputError);
    expect(() => rmse([], [])).toThrow(InputError);
  });

  it('exposes the Guideline 14 calibration limits', () => {
    // Source: Guideline 14-2002 §5.3.2.4 f [2nd]: monthly NMBE ±5 %, CV(RMSE) 15 %; hourly ±10 %, 30 %.
    expect(GUIDELINE_14_LIMITS.monthly).toEqual({ nmbe: 5, cvrmse: 15 });
    expect(GUIDELINE_14_LIMITS.hourly).toEqual({ nmbe: 10, cvrmse: 30 });
  });
});
