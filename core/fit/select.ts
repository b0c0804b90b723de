/**
 * Chooses between the one-node and the two-node model of a zone.
 *
 * Method: Schwarz's Bayesian information criterion (Schwarz 1978, Annals of Statistics 6(2) 461–464),
 *   BIC = n_eff·ln(RSS/n) + k·ln(n_eff),
 * with k the parameters fitted (dynamics, forcing coefficients, and one initial state per mode and
 * segment) and n_eff an effective number of independent readings: thermostat readings every few minutes
 * are strongly correlated (quantisation, slow drift), and the plain n would let any extra parameter pass.
 * n_eff = n·(1 − ρ)/(1 + ρ) with ρ the lag-one autocorrelation of the one-node residuals within segments
 * (the variance-inflation of the mean of an AR(1) series, e.g. Box, Jenkins & Reinsel, *Time Series
 * Analysis*, §2.1), kept between the number of days and n. A two-node fit that ends on a bound of its
 * search (the mass node not pinned down) or fails is not chosen.
 *
 * Practical significance: two nodes must also cut the squared error by at least MIN_GAIN_PERCENT. On a
 * long log (a year of 5-minute readings) the criterion alone prefers two nodes for a one-node zone whose
 * residuals hold a little systematic error (rounded readings, cycling inside an interval): a 1 % cut
 * wins by hundreds of BIC points while moving τ by 10 %. The threshold is ours, set from the calibration
 * study (npm run calibrate): two-node truths cut the squared error by 70–99 %, one-node truths by at most
 * about 1 %.
 *
 * A bound that saves the search: with rounded readings the rounding error of the one-node trajectory is
 * part of every model's residual (possibleCutPercent). When it leaves less than MIN_GAIN_PERCENT of the
 * one-node squared error to remove, two nodes cannot be chosen and are not searched for.
 */
import type { CandidateScore, ModelSelection } from '../types.ts';
import type { Candidate } from './candidate.ts';
import type { FitContext } from './context.ts';
import { readingResolution, requantise } from './resolution.ts';

/** Least cut in the squared error, %, for two nodes to be chosen (see the module comment). */
export const MIN_GAIN_PERCENT = 10;

/**
 * The most any model could cut the one-node fit's squared error, %, when the readings are rounded: the
 * rounding error of the one-node trajectory itself (requantised on the log's grid, resolution.ts) stays in
 * every model's residual, since a model can only move the trajectory, not the grid. Two models whose
 * trajectories both sit within a fraction of a step of the truth round alike, so the share of the one-node
 * mean square that the rounding accounts for cannot be removed. Returns null when the readings are not
 * rounded (then nothing bounds the cut and the two-node search runs).
 * @example possibleCutPercent(y, predicted) // 2.8 on a one-node zone logged in whole °F
 */
export function possibleCutPercent(y: Float64Array, predicted: Float64Array): number | null {
  const resolution = readingResolution(y);
  if (!resolution) return null;
  const rounded = requantise(predicted, resolution);
  let se = 0, round = 0;
  for (let i = 0; i < y.length; i++) {
    se += (y[i] - predicted[i]) ** 2;
    round += (rounded[i] - predicted[i]) ** 2;
  }
  if (!(se > 0)) return 0;
  return Math.max(0, (1 - round / se) * 100);
}

/** The record of a choice made without a two-node search because the rounding bound rules two nodes out. */
export function roundingBoundSelection(ctx: FitContext, one: Candidate, oneResidual: Float64Array, cutPercent: number): ModelSelection {
  const nEff = effectiveReadings(ctx, oneResidual);
  return {
    criterion: CRITERION,
    candidates: [candidateScore(ctx, one, nEff)],
    effectiveReadings: nEff,
    roundingBoundPercent: cutPercent,
    reason: `One node: it already fits the readings to within their rounding, so a building-mass node could cut the squared error by at most ${cutPercent.toFixed(1)} %, under the ${MIN_GAIN_PERCENT} % a mass that matters for recoveries gives (the two-node search was not needed).`,
  };
}

function effectiveReadings(ctx: FitContext, oneResidual: Float64Array): number {
  const n = ctx.log.y.length;
  const rho = Math.max(0, lagOneAutocorrelation(oneResidual, ctx.log.segStart));
  return Math.min(n, Math.max(ctx.days.length, (n * (1 - rho)) / (1 + rho)));
}

/** Lag-one autocorrelation of residuals r within segments. */
export function lagOneAutocorrelation(r: Float64Array, segStart: Int32Array): number {
  let mean = 0;
  for (let i = 0; i < r.length; i++) mean += r[i];
  mean /= Math.max(r.length, 1);
  let num = 0, den = 0;
  for (let s = 0; s + 1 < segStart.length; s++) {
    for (let i = segStart[s]; i < segStart[s + 1]; i++) {
      const d = r[i] - mean;
      den += d * d;
      if (i > segStart[s]) num += d * (r[i - 1] - mean);
    }
  }
  return den > 0 ? num / den : 0;
}

function parameters(ctx: FitContext, c: Candidate): number {
  const K = c.kind === 'one-node' ? 1 : 2;
  return c.theta.length + c.solution.beta.length + K * ctx.blocks.segCount;
}

const CRITERION = 'Bayesian information criterion with an effective number of readings (Schwarz 1978)';

/** A candidate's BIC, n_eff·ln(RSS/n) + k·ln(n_eff), with its parameter count. */
function candidateScore(ctx: FitContext, c: Candidate, nEff: number): CandidateScore {
  const k = parameters(ctx, c);
  const n = ctx.log.y.length;
  return { kind: c.kind, rss: c.solution.rss, parameters: k, score: nEff * Math.log(Math.max(c.solution.rss, 1e-300) / n) + k * Math.log(nEff) };
}

/**
 * The chosen candidate and the record of the choice. `oneResidual` is the one-node fit's residual at
 * every reading; `twoFailure` says why there is no two-node candidate, if there is none.
 */
export function selectModel(ctx: FitContext, one: Candidate, two: Candidate | null, oneResidual: Float64Array, twoAtBound: boolean, twoFailure: string | null): { chosen: Candidate; selection: ModelSelection } {
  const nEff = effectiveReadings(ctx, oneResidual);
  const score = (c: Candidate): CandidateScore => candidateScore(ctx, c, nEff);
  const s1 = score(one);
  const candidates = [s1];
  const criterion = CRITERION;
  if (!two) {
    return {
      chosen: one,
      selection: { criterion, candidates, effectiveReadings: nEff, reason: `One node: ${twoFailure ?? 'the two-node fit did not succeed'}.` },
    };
  }
  const s2 = score(two);
  candidates.push(s2);
  const better = ((s1.rss - s2.rss) / Math.max(s1.rss, 1e-300)) * 100;
  if (twoAtBound) {
    return {
      chosen: one,
      selection: { criterion, candidates, effectiveReadings: nEff, reason: `One node: a building-mass node does not improve the fit (the two-node search ran to the edge of its range; ${better.toFixed(1)} % less squared error).` },
    };
  }
  if (s2.score < s1.score && better < MIN_GAIN_PERCENT) {
    return {
      chosen: one,
      selection: {
        criterion, candidates, effectiveReadings: nEff,
        reason: `One node: a building-mass node cuts the squared error by only ${better.toFixed(1)} % (BIC ${s2.score.toFixed(0)} against ${s1.score.toFixed(0)}), under the ${MIN_GAIN_PERCENT} % a mass that matters for recoveries gives.`,
      },
    };
  }
  if (s2.score < s1.score) {
    return {
      chosen: two,
      selection: {
        criterion, candidates, effectiveReadings: nEff,
        reason: `Two nodes (air and building mass): ${better.toFixed(0)} % less squared error than one node, well beyond what its ${s2.parameters - s1.parameters} extra parameters buy (BIC ${s2.score.toFixed(0)} against ${s1.score.toFixed(0)}).`,
      },
    };
  }
  return {
    chosen: one,
    selection: {
      criterion, candidates, effectiveReadings: nEff,
      reason: `One node: a building-mass node cuts the squared error by only ${better.toFixed(1)} %, not enough for its ${s2.parameters - s1.parameters} extra parameters (BIC ${s2.score.toFixed(0)} against ${s1.score.toFixed(0)}).`,
    },
  };
}
