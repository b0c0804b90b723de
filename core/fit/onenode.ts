/**
 * The one-node fit: τ by a search of the profile RSS(τ) (the least-squares misfit with h, c, g, s and the
 * initial states solved exactly for each τ, context.ts), on a logarithmic grid and then by Brent's method
 * (search.ts) to a relative precision of about 1e-6 in τ.
 */
import { modesOf } from '../modes.ts';
import { evaluate, type FitContext } from './context.ts';
import { brentMinimum } from './search.ts';
import type { LinearSolution } from './solve.ts';

export const TAU_MIN = 0.25;
export const TAU_MAX = 2000;
/** Coarse grid over the whole range (ratio ≈ 2.25 between points). */
const COARSE_POINTS = 12;

export interface OneNodeFit {
  tau: number;
  solution: LinearSolution;
  /** The coarse grid's best point lay at its edge: τ is not determined by the data. */
  atEdge: boolean;
  /** The coarse grid (τ, RSS), for messages. */
  grid: Float64Array;
  gridRss: Float64Array;
}

/**
 * Fits τ (and, linearly, the rest) to the days with non-zero weight.
 * @param weights per day (null = all 1)
 * @param around a previous τ to search near (a held-out refit): the search starts on a narrow bracket
 * @param coarse a sample of the log's weeks (a long log) to run the coarse grid on; Brent's method then
 *   runs on the whole log in the bracket the sample gives, and the whole log's grid is run after all
 *   when the sample's grid ends on its edge or the optimum runs to the end of that bracket
 */
export function fitOneNode(ctx: FitContext, weights: Float64Array | null, around?: number, coarse?: FitContext | null): OneNodeFit {
  if (coarse && !weights && around === undefined) {
    const rough = coarseGrid(coarse);
    if (!rough.atEdge) {
      const rssAt = (logTau: number) => evaluate(ctx, modesOf({ tauHours: Math.exp(logTau) }), null).rss;
      const m = brentMinimum(rssAt, rough.lo, rough.hi, 1e-6);
      if (m.x - rough.lo > 1e-3 && rough.hi - m.x > 1e-3) {
        const tau = Math.exp(m.x);
        return { tau, solution: evaluate(ctx, modesOf({ tauHours: tau }), null), atEdge: false, grid: rough.grid, gridRss: rough.gridRss };
      }
    }
  }
  const rssAt = (logTau: number) => evaluate(ctx, modesOf({ tauHours: Math.exp(logTau) }), weights).rss;
  let lo: number, hi: number, start: { x: number; fx: number };
  const grid = new Float64Array(COARSE_POINTS);
  const gridRss = new Float64Array(COARSE_POINTS);
  let atEdge = false;
  if (around !== undefined) {
    // A refit on most of the same days: its optimum is near; bracket ±40 % and widen if it runs to an end.
    let x = Math.log(around);
    let fx = rssAt(x);
    let width = Math.log(1.4);
    for (let tries = 0; ; tries++) {
      const m = brentMinimum(rssAt, x - width, x + width, 1e-6, { x, fx });
      const nearEnd = Math.abs(m.x - (x - width)) < 1e-4 || Math.abs(m.x - (x + width)) < 1e-4;
      if (!nearEnd || tries >= 3) {
        const tau = Math.exp(m.x);
        return { tau, solution: evaluate(ctx, modesOf({ tauHours: tau }), weights), atEdge: false, grid, gridRss };
      }
      x = m.x;
      fx = m.fx;
      width *= 2.5;
    }
  }
  const g = coarseGrid(ctx, weights);
  grid.set(g.grid);
  gridRss.set(g.gridRss);
  ({ atEdge, lo, hi, start } = g);
  const m = brentMinimum(rssAt, lo, hi, 1e-6, start);
  const tau = Math.exp(m.x);
  return { tau, solution: evaluate(ctx, modesOf({ tauHours: tau }), weights), atEdge, grid, gridRss };
}

/** The coarse grid of RSS(τ) over [TAU_MIN, TAU_MAX] and the bracket around its best point. */
function coarseGrid(ctx: FitContext, weights: Float64Array | null = null) {
  const grid = new Float64Array(COARSE_POINTS);
  const gridRss = new Float64Array(COARSE_POINTS);
  const a = Math.log(TAU_MIN);
  const step = (Math.log(TAU_MAX) - a) / (COARSE_POINTS - 1);
  let k = 0;
  for (let i = 0; i < COARSE_POINTS; i++) {
    grid[i] = Math.exp(a + i * step);
    gridRss[i] = evaluate(ctx, modesOf({ tauHours: grid[i] }), weights).rss;
    if (gridRss[i] < gridRss[k]) k = i;
  }
  return {
    grid,
    gridRss,
    atEdge: k === 0 || k === COARSE_POINTS - 1,
    lo: a + Math.max(0, k - 1) * step,
    hi: a + Math.min(COARSE_POINTS - 1, k + 1) * step,
    start: { x: a + k * step, fx: gridRss[k] },
  };
}
