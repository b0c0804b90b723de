/**
 * The two-node fit (air node and building-mass node, heat into the air; modes.ts): the dynamics
 * θ = (log τam, log τmo, logit share) by Levenberg–Marquardt on the variable-projection misfit, the forcing
 * coefficients and the segments' initial states by linear least squares at each trial (context.ts).
 *
 * Method: Levenberg (1944) / Marquardt (1963) damped Gauss–Newton steps, with the Jacobian of the
 * projected residual approximated as Kaufman (1975) does for variable projection: the derivative of the
 * simulated temperature at fixed linear coefficients (jacobian.ts), with the directions the linear
 * coefficients and initial states can absorb projected out. Several starts spread over the plausible
 * air–mass time constants (1–6 h) from the one-node fit's τ; the best is kept. θ stays inside
 * τam ∈ [0.05, 60] h, τmo ∈ [1, 5000] h, share ∈ [0.02, 0.995].
 */
import type { FitContext } from './context.ts';
import { evaluate } from './context.ts';
import { dynamicsColumns, partialledGram } from './jacobian.ts';
import { solveSym } from './linalg.ts';
import { modesOf, type Modes } from '../modes.ts';
import { basisColumns } from './pass.ts';
import { simulateModes } from './simulate.ts';
import type { LinearSolution } from './solve.ts';

/** θ → the two-node modes. */
export function twoNodeModes(theta: readonly number[]): Modes {
  return modesOf({ tauHours: 1, mass: { airMassHours: Math.exp(theta[0]), massOutdoorHours: Math.exp(theta[1]), massShare: 1 / (1 + Math.exp(-theta[2])) } });
}

const LOWER = [Math.log(0.05), Math.log(1), Math.log(0.02 / 0.98)];
const UPPER = [Math.log(60), Math.log(5000), Math.log(0.995 / 0.005)];

function clamp(theta: number[]): number[] {
  return theta.map((v, k) => Math.min(UPPER[k], Math.max(LOWER[k], v)));
}

export interface TwoNodeFit {
  theta: number[];
  solution: LinearSolution;
  iterations: number;
  /** Whether the search stopped on a bound (the log does not pin down the mass node). */
  atBound: boolean;
}

/** Starting points from the one-node τ: (air–mass time constant, mass share), with τmo giving a slow mode near τ. */
export function twoNodeStarts(tauOne: number): number[][] {
  const starts: number[][] = [];
  for (const [tam, share] of [[0.8, 0.85], [2.5, 0.8], [6, 0.7]] as const) {
    // Slow time constant ≈ τmo/share for a well-coupled mass: aim it a little above the one-node τ.
    const tmo = Math.max(2, Math.min(4000, 1.1 * tauOne * share));
    starts.push(clamp([Math.log(tam), Math.log(tmo), Math.log(share / (1 - share))]));
  }
  return starts;
}

/**
 * Levenberg–Marquardt from one start. `maxIterations` steps at most; stops when a step changes the RSS by
 * less than 1e-9 relative or θ by less than 1e-6.
 */
export function levenbergMarquardt(ctx: FitContext, start: number[], weights: Float64Array | null, maxIterations: number): TwoNodeFit {
  let theta = clamp(start);
  let sol = evaluate(ctx, twoNodeModes(theta), weights);
  let lambda = 1e-3;
  let it = 0;
  const { log, blocks, inputs } = ctx;
  const n = log.y.length;
  const P = inputs.length;
  const w = weights;
  for (; it < maxIterations; it++) {
    const modes = twoNodeModes(theta);
    const basis = basisColumns(log, blocks, modes, inputs);
    const yhat = simulateModes(log, modes, sol.beta, inputs, sol.init);
    const r = new Float64Array(n);
    for (let i = 0; i < n; i++) r[i] = w === null || w[log.day[i]] !== 0 ? log.y[i] - yhat[i] : 0;
    const D = dynamicsColumns(ctx, theta, twoNodeModes, sol);
    if (w) for (const d of D) for (let i = 0; i < n; i++) if (w[log.day[i]] === 0) d[i] = 0;
    const X: Float64Array[] = [];
    for (let j = 0; j < P; j++) {
      const col = Float64Array.from(basis.U.subarray(j * n, (j + 1) * n));
      if (w) for (let i = 0; i < n; i++) if (w[log.day[i]] === 0) col[i] = 0;
      X.push(col);
    }
    const psi: Float64Array[] = [];
    for (let m = 0; m < 2; m++) {
      const col = Float64Array.from(basis.psi.subarray(m * n, (m + 1) * n));
      if (w) for (let i = 0; i < n; i++) if (w[log.day[i]] === 0) col[i] = 0;
      psi.push(col);
    }
    const { gram, jr } = partialledGram([...D, ...X], psi, r, log.segStart);
    // Schur out the linear coefficients: A = G_DD − G_DX G_XX⁻¹ G_XD, g = Dᵀr (r is orthogonal to X and ψ).
    const p = 3 + P;
    const GXX = new Float64Array(P * P);
    for (let i = 0; i < P; i++) for (let j = 0; j < P; j++) GXX[i * P + j] = gram[(3 + i) * p + 3 + j];
    const A = new Float64Array(9);
    const colBuf = new Float64Array(P);
    const Y: Float64Array[] = [];
    for (let k = 0; k < 3; k++) {
      for (let j = 0; j < P; j++) colBuf[j] = gram[(3 + j) * p + k];
      Y.push(solveSym(GXX, P, colBuf));
    }
    for (let k = 0; k < 3; k++) for (let l = 0; l < 3; l++) {
      let v = gram[k * p + l];
      for (let j = 0; j < P; j++) v -= gram[k * p + 3 + j] * Y[l][j];
      A[k * 3 + l] = v;
    }
    const g = [jr[0], jr[1], jr[2]];
    let improved = false;
    for (let tries = 0; tries < 8; tries++) {
      const M = Float64Array.from(A);
      for (let k = 0; k < 3; k++) M[k * 3 + k] += lambda * Math.max(A[k * 3 + k], 1e-12);
      const step = solveSym(M, 3, g);
      const next = clamp(theta.map((v, k) => v + step[k]));
      const nextSol = evaluate(ctx, twoNodeModes(next), weights);
      if (nextSol.rss < sol.rss) {
        const relDrop = (sol.rss - nextSol.rss) / Math.max(sol.rss, 1e-300);
        const moved = Math.max(...next.map((v, k) => Math.abs(v - theta[k])));
        theta = next;
        sol = nextSol;
        lambda = Math.max(lambda / 4, 1e-7);
        improved = true;
        if (relDrop < 1e-9 || moved < 1e-6) return finish(theta, sol, it + 1);
        break;
      }
      lambda *= 8;
    }
    if (!improved) break;
  }
  return finish(theta, sol, it);
}

function finish(theta: number[], solution: LinearSolution, iterations: number): TwoNodeFit {
  const atBound = theta.some((v, k) => v <= LOWER[k] + 1e-9 || v >= UPPER[k] - 1e-9);
  return { theta, solution, iterations, atBound };
}

/**
 * The two-node fit from several starts around the one-node τ: a few iterations from each, then the
 * best polished. Throws nothing: a failed search returns null.
 */
export function fitTwoNode(ctx: FitContext, tauOne: number, weights: Float64Array | null = null, around?: number[]): TwoNodeFit | null {
  try {
    // A refit from a fitted θ (held-out days, backtest folds) starts next to its optimum.
    if (around) return levenbergMarquardt(ctx, around, weights, 2);
    let best: TwoNodeFit | null = null;
    for (const start of twoNodeStarts(tauOne)) {
      const f = levenbergMarquardt(ctx, start, weights, 3);
      if (!best || f.solution.rss < best.solution.rss) best = f;
    }
    if (!best) return null;
    // A best start already on a bound (no mass node in the log) needs only a short polish.
    const polished = levenbergMarquardt(ctx, best.theta, weights, best.atBound ? 5 : 16);
    return polished.solution.rss <= best.solution.rss ? polished : best;
  } catch {
    return null;
  }
}
