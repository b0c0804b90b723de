/**
 * 95 % intervals of a fitted zone model from the HAC sandwich covariance (sandwich.ts).
 *
 * The Jacobian: the linear coefficients' columns are the basis responses (pass.ts, basisColumns); the
 * non-linear parameters' columns (log τ; for two nodes the log time constants and the logit mass share)
 * are central finite differences of the simulated temperature (jacobian.ts). The interval of a
 * parameter is estimate ± t·se with t the Student-t 97.5 % quantile on G − 1 degrees of freedom (G days
 * with data; a small-sample choice for cluster-type covariances, Cameron & Miller 2015, J. Human
 * Resources 50(2) §VI), taken on the transformed scale (so τ's interval is asymmetric and positive).
 */
import tQuantile from '@stdlib/stats-base-dists-t-quantile';
import type { FitContext } from './context.ts';
import type { Modes } from '../modes.ts';
import { basisColumns } from './pass.ts';
import { sandwichCovariance } from './sandwich.ts';
import { simulateModes } from './simulate.ts';
import { dynamicsColumns } from './jacobian.ts';
import type { LinearSolution } from './solve.ts';

export interface Covariance {
  /** (nθ + P)×(nθ + P) covariance of [θ, β], row-major. */
  cov: Float64Array;
  size: number;
  /** Student-t 97.5 % quantile used for the 95 % intervals. */
  t: number;
  days: number;
  lag: number;
  /** Simulated temperature at the optimum and the residual y − ŷ, per reading. */
  predicted: Float64Array;
  residual: Float64Array;
}

/**
 * The covariance of [θ, β] at the optimum `solution` of the dynamics modesAt(theta).
 */
export function covarianceAt(ctx: FitContext, theta: readonly number[], modesAt: (theta: readonly number[]) => Modes, solution: LinearSolution): Covariance {
  const { log, blocks, inputs } = ctx;
  const n = log.y.length;
  const modes = modesAt(theta);
  const basis = basisColumns(log, blocks, modes, inputs);
  ctx.passes++;
  const P = inputs.length;
  const K = modes.count;
  const predicted = simulateModes(log, modes, solution.beta, inputs, solution.init);
  const residual = new Float64Array(n);
  for (let i = 0; i < n; i++) residual[i] = log.y[i] - predicted[i];
  const J = dynamicsColumns(ctx, theta, modesAt, solution);
  for (let j = 0; j < P; j++) J.push(basis.U.subarray(j * n, (j + 1) * n));
  const psi: Float64Array[] = [];
  for (let m = 0; m < K; m++) psi.push(basis.psi.subarray(m * n, (m + 1) * n));
  const s = sandwichCovariance({ J, psi, r: residual, segStart: log.segStart, day: log.day, dayCount: log.dayCount });
  const t = s.days > 1 ? tQuantile(0.975, s.days - 1) : Infinity;
  return { cov: s.cov, size: J.length, t, days: s.days, lag: s.lag, predicted, residual };
}

/** Standard error of parameter i. */
export function standardError(c: Covariance, i: number): number {
  return Math.sqrt(Math.max(c.cov[i * c.size + i], 0));
}

/** estimate ± t·se on the parameter's own scale. */
export function linearInterval(c: Covariance, i: number, estimate: number): [number, number] {
  const h = c.t * standardError(c, i);
  return [estimate - h, estimate + h];
}

/** The interval of a positive parameter whose logarithm is parameter i: estimate·e^(±t·se). */
export function logInterval(c: Covariance, i: number, estimate: number): [number, number] {
  const h = c.t * standardError(c, i);
  return [estimate * Math.exp(-h), estimate * Math.exp(h)];
}

/** Standard error of a derived quantity g(params) with gradient `grad` over [θ, β] (delta method). */
export function derivedError(c: Covariance, grad: readonly number[]): number {
  let v = 0;
  for (let i = 0; i < c.size; i++) for (let j = 0; j < c.size; j++) v += grad[i] * c.cov[i * c.size + j] * grad[j];
  return Math.sqrt(Math.max(v, 0));
}
