/**
 * Covariance of the fitted parameters that allows for errors correlated within a day and across a few
 * days: a heteroscedasticity-and-autocorrelation-consistent (HAC) "sandwich" on day-level scores.
 *
 * Method. Linearise the output-error fit at its optimum: ŷ(θ + δ) ≈ ŷ + J·δ with J the n×p Jacobian of
 * the simulated temperature (finite differences for the non-linear dynamics, the basis responses for
 * the linear coefficients). The segments' initial states are nuisance parameters: they are partialled out
 * segment by segment (Frisch–Waugh–Lovell), J̃ = J − Ψ(ΨᵀΨ)⁻¹ΨᵀJ. With residuals r and the day-level
 * scores g_d = Σ_{i in day d} J̃_iᵀ r_i, the covariance is
 *   V = B⁻¹ S B⁻¹,  B = J̃ᵀJ̃,  S = Σ_{|l|≤L} (1 − |l|/(L+1)) Σ_d g_d g_{d+l}ᵀ,
 * the Newey & West (1987, Econometrica 55(3) 703–708) estimator with Bartlett weights applied to days
 * (within a day the scores are summed, so any correlation inside a day is allowed, as in a cluster-robust
 * covariance; across days up to L lags), L = ⌊4·(G/100)^(2/9)⌋ days (Newey & West 1994's rule), at least 1,
 * and the small-sample factor G/(G − 1) for G days with data. Unlike the textbook σ²(JᵀJ)⁻¹ it does not
 * assume independent errors of equal size, so quantised readings, runtime logged coarsely and model error
 * that follows the weather or the schedule widen the intervals as they should.
 *
 * Units: those of the parameters' columns. Throws nothing; a singular B gives zero rows.
 */
import { partialledGram } from './jacobian.ts';
import { inverseSym } from './linalg.ts';

export interface SandwichInput {
  /** p Jacobian columns, each of n readings. */
  J: readonly Float64Array[];
  /** K nuisance columns (initial states), each of n readings; partialled out per segment. */
  psi: readonly Float64Array[];
  /** Residual y − ŷ at the optimum, n readings. */
  r: Float64Array;
  /** Index of the first reading of each segment, plus a final entry = n. */
  segStart: Int32Array;
  /** Day of each reading (0 … dayCount−1). */
  day: Int32Array;
  dayCount: number;
}

export interface SandwichResult {
  /** p×p covariance, row-major. */
  cov: Float64Array;
  /** Days with data (G). */
  days: number;
  /** Newey–West lag, days. */
  lag: number;
}

/** The HAC covariance of the module comment. */
export function sandwichCovariance(input: SandwichInput): SandwichResult {
  const { J, psi, r, segStart, day, dayCount } = input;
  const p = J.length;
  const { gram: B, scores: sc } = partialledGram(J, psi, r, segStart, { day, dayCount });
  const scores = sc!;
  const hasDay = new Uint8Array(dayCount);
  for (let i = 0; i < day.length; i++) hasDay[day[i]] = 1;
  let G = 0;
  for (let d = 0; d < dayCount; d++) G += hasDay[d];
  const lag = Math.max(1, Math.floor(4 * Math.pow(G / 100, 2 / 9)));
  const S = new Float64Array(p * p);
  for (let l = 0; l <= lag; l++) {
    const w = l === 0 ? 1 : 1 - l / (lag + 1);
    for (let d = 0; d + l < dayCount; d++) {
      const o1 = d * p, o2 = (d + l) * p;
      for (let c = 0; c < p; c++) {
        for (let c2 = 0; c2 < p; c2++) {
          const v = w * scores[o1 + c] * scores[o2 + c2];
          // Lags l and −l together: g_d g_{d+l}ᵀ + g_{d+l} g_dᵀ.
          S[c * p + c2] += v;
          if (l > 0) S[c2 * p + c] += v;
        }
      }
    }
  }
  const Binv = inverseSym(B, p);
  const factor = G > 1 ? G / (G - 1) : 1;
  const cov = new Float64Array(p * p);
  for (let i = 0; i < p; i++) for (let j = 0; j < p; j++) {
    let v = 0;
    for (let k = 0; k < p; k++) for (let l = 0; l < p; l++) v += Binv[i * p + k] * S[k * p + l] * Binv[l * p + j];
    cov[i * p + j] = factor * v;
  }
  return { cov, days: G, lag };
}
