/**
 * Goodness of fit of a simulated series ŷ against a measured series y, as in ASHRAE Guideline 14
 * (Measurement of Energy, Demand, and Water Savings), Annex B:
 *   CV(RMSE) = 100 · √( Σ(yᵢ − ŷᵢ)² / (n − p) ) / ȳ          (%)
 *   NMBE     = 100 · Σ(yᵢ − ŷᵢ) / ((n − p) · ȳ)               (%)
 * with y measured, ŷ predicted, ȳ the mean of y, n the number of pairs and p the number of model
 * parameters. Sources differ on p (some use p = 0 for NMBE, or n − 1) and on the sign of the error;
 * here both are explicit: the error is y − ŷ (a positive NMBE means the model predicts low), and p is
 * a required argument.
 *
 * Pairs where either value is NaN are skipped (n counts the pairs used), so a log with gaps can be
 * passed as is. Units: y and ŷ in one unit (°C for temperatures); RMSE is in that unit (K).
 */
import { InputError } from './errors.ts';

/** Calibration limits of ASHRAE Guideline 14 (2002 §5.3.2.4 f, same limits quoted for 2014), %. */
export const GUIDELINE_14_LIMITS = {
  monthly: { nmbe: 5, cvrmse: 15 },
  hourly: { nmbe: 10, cvrmse: 30 },
} as const;

/** All three figures from one pass. */
export interface FitMetrics {
  /** Number of pairs used (NaN pairs skipped). */
  n: number;
  /** Root-mean-square error √(Σe²/n), in the unit of y (K for temperatures). Uses n, not n − p. */
  rmse: number;
  /** CV(RMSE), %. */
  cvrmse: number;
  /** NMBE, %, error taken as y − ŷ. */
  nmbe: number;
  /** Mean of the measured values used, unit of y. */
  meanY: number;
}

/**
 * RMSE, CV(RMSE) and NMBE of ŷ against y in one pass.
 * Method: ASHRAE Guideline 14 Annex B formulas above.
 *
 * @param y measured values; @param yhat predicted values (same length); @param p number of model parameters (integer ≥ 0)
 * @throws InputError when the lengths differ, p is not a non-negative integer, n − p ≤ 0 after
 *   skipping NaN pairs, or ȳ = 0 (CV and NMBE are undefined; use RMSE).
 * @example fitMetrics([10, 12, 11, 13], [10.5, 11.5, 11, 12], 1) // cvrmse 6.1488 %, nmbe 2.8986 %
 */
export function fitMetrics(y: ArrayLike<number>, yhat: ArrayLike<number>, p: number): FitMetrics {
  const { n, sum, sumE, sumE2 } = sums(y, yhat);
  if (!Number.isInteger(p) || p < 0) throw new InputError(`The number of model parameters p must be a whole number ≥ 0, got ${p}.`);
  if (n - p <= 0) {
    throw new InputError(`Only ${n} usable pairs for ${p} model parameters: the fit metrics need more pairs than parameters.`);
  }
  const meanY = sum / n;
  if (meanY === 0) throw new InputError('The mean of the measured values is 0, so CV(RMSE) and NMBE are undefined.');
  return {
    n,
    rmse: Math.sqrt(sumE2 / n),
    cvrmse: (100 * Math.sqrt(sumE2 / (n - p))) / meanY,
    nmbe: (100 * sumE) / ((n - p) * meanY),
    meanY,
  };
}

/** ASHRAE Guideline 14 CV(RMSE), %, with p parameters. See fitMetrics for method and throws. */
export function cvrmse(y: ArrayLike<number>, yhat: ArrayLike<number>, p: number): number {
  return fitMetrics(y, yhat, p).cvrmse;
}

/** ASHRAE Guideline 14 NMBE, %, error y − ŷ, with p parameters. See fitMetrics for method and throws. */
export function nmbe(y: ArrayLike<number>, yhat: ArrayLike<number>, p: number): number {
  return fitMetrics(y, yhat, p).nmbe;
}

/**
 * Root-mean-square error √(Σ(yᵢ − ŷᵢ)²/n), in the unit of y (K for temperatures). NaN pairs skipped.
 * @throws InputError when the lengths differ or no pair is usable
 * @example rmse([1, 2], [1, 4]) // √2
 */
export function rmse(y: ArrayLike<number>, yhat: ArrayLike<number>): number {
  const { n, sumE2 } = sums(y, yhat);
  if (n === 0) throw new InputError('No usable pairs: RMSE needs at least one measured and predicted value.');
  return Math.sqrt(sumE2 / n);
}

function sums(y: ArrayLike<number>, yhat: ArrayLike<number>): { n: number; sum: number; sumE: number; sumE2: number } {
  if (y.length !== yhat.length) {
    throw new InputError(`The measured series has ${y.length} values but the predicted series has ${yhat.length}.`);
  }
  let n = 0;
  let sum = 0;
  let sumE = 0;
  let sumE2 = 0;
  for (let i = 0; i < y.length; i++) {
    const a = y[i];
    const b = yhat[i];
    if (Number.isNaN(a) || Number.isNaN(b)) continue;
    if (!Number.isFinite(a) || !Number.isFinite(b)) throw new InputError(`Value ${i} is infinite (measured ${a}, predicted ${b}).`);
    const e = a - b;
    n++;
    sum += a;
    sumE += e;
    sumE2 += e * e;
  }
  return { n, sum, sumE, sumE2 };
}
