/**
 * The linear least-squares step of the variable-projection fit: from a pass's per-block Gram sums
 * (pass.ts) to the forcing coefficients β, each segment's initial-state coefficients and the residual
 * sum of squares, for any weighting of the days.
 *
 * Method: each segment's initial-state columns ψ touch only that segment, so they are eliminated segment
 * by segment by their Schur complement (block Gaussian elimination of the normal equations), leaving a
 * P×P system for β (P ≤ 4), solved by Cholesky (linalg.ts). Weights are per day (0/1 for held-out
 * splits); a segment whose days all have weight 0 drops out.
 */
import { cholesky, choleskySolve, solveSym } from './linalg.ts';
import { gramIndex, type Blocks, type Layout } from './pass.ts';

/** The least-squares solution at one setting of the dynamics. */
export interface LinearSolution {
  /** Weighted residual sum of squares, K². */
  rss: number;
  /** Weighted number of readings. */
  n: number;
  /** Forcing coefficients, in the order of the pass's inputs. */
  beta: Float64Array;
  /** Initial-state coefficient of mode m of segment s at s·K + m (NaN for a segment with no weight). */
  init: Float64Array;
}

/** Scratch of solveLinear, sized for one layout and segment count. */
export class LinearWorkspace {
  readonly seg: Float64Array;
  readonly global: Float64Array;
  readonly psiPsi: Float64Array;
  readonly L: Float64Array;
  readonly t: Float64Array;
  readonly segPsi: Float64Array;
  readonly segHas: Uint8Array;
  readonly rhs: Float64Array;
  readonly x: Float64Array;

  constructor(lay: Layout, segCount: number) {
    this.seg = new Float64Array(segCount * lay.size);
    this.global = new Float64Array((lay.P + 1) * (lay.P + 1));
    this.psiPsi = new Float64Array(lay.K * lay.K);
    this.L = new Float64Array(Math.max(lay.K, lay.P) ** 2);
    this.t = new Float64Array(Math.max(lay.K, lay.P + 1) * (lay.P + 1));
    this.segPsi = new Float64Array(segCount * lay.K * (lay.P + 1));
    this.segHas = new Uint8Array(segCount);
    this.rhs = new Float64Array(lay.K);
    this.x = new Float64Array(lay.K);
  }
}

/** Number of readings in each block. */
export function blockCounts(blocks: Blocks): Float64Array {
  const c = new Float64Array(blocks.count);
  for (let b = 0; b < blocks.count; b++) c[b] = blocks.blockStart[b + 1] - blocks.blockStart[b];
  return c;
}

/**
 * Solves the weighted least-squares problem from block sums.
 * @param weights one weight per day; null = all 1
 */
export function solveLinear(stats: Float64Array, blocks: Blocks, lay: Layout, weights: Float64Array | null, counts: Float64Array, ws: LinearWorkspace = new LinearWorkspace(lay, blocks.segCount)): LinearSolution {
  const { P, K, Q, size } = lay;
  const { count, segCount, blockDay, blockSeg } = blocks;
  const seg = ws.seg;
  seg.fill(0);
  ws.segHas.fill(0);
  let n = 0;
  for (let b = 0; b < count; b++) {
    const w = weights === null ? 1 : weights[blockDay[b]];
    if (w === 0) continue;
    const s = blockSeg[b];
    ws.segHas[s] = 1;
    n += w * counts[b];
    const o = b * size;
    const so = s * size;
    for (let i = 0; i < size; i++) seg[so + i] += w * stats[o + i];
  }
  // Columns: X = 0..P-1, Ψ = P..P+K-1, r = Q-1. Eliminate Ψ segment by segment into the (P+1)² system of [X, r].
  const R = P + 1;
  const G = ws.global;
  G.fill(0);
  const col = (c: number) => (c < P ? c : Q - 1); // index in [X, r] → Gram column
  const psiPsi = ws.psiPsi;
  const L = ws.L;
  const t = ws.t; // K × R: Ψᵀ[X, r] solved by ΨᵀΨ
  const segPsi = ws.segPsi; // per segment: ΨᵀΨ⁻¹·Ψᵀ[X, r] (K × R) for the initial states
  const stride = K * R;
  for (let s = 0; s < segCount; s++) {
    if (!ws.segHas[s]) continue;
    const so = s * size;
    const at = (i: number, j: number) => (i <= j ? seg[so + gramIndex(Q, i, j)] : seg[so + gramIndex(Q, j, i)]);
    for (let i = 0; i < R; i++) for (let j = i; j < R; j++) G[i * R + j] += at(col(i), col(j));
    for (let i = 0; i < K; i++) for (let j = 0; j < K; j++) psiPsi[i * K + j] = at(P + i, P + j);
    if (!cholesky(psiPsi, K, L)) continue;
    const { rhs, x } = ws;
    for (let c = 0; c < R; c++) {
      for (let i = 0; i < K; i++) rhs[i] = at(P + i, col(c));
      choleskySolve(L, K, rhs, x);
      for (let i = 0; i < K; i++) {
        t[i * R + c] = x[i];
        segPsi[s * stride + i * R + c] = x[i];
      }
    }
    // G −= (Ψᵀ[X,r])ᵀ (ΨᵀΨ)⁻¹ (Ψᵀ[X,r])
    for (let i = 0; i < R; i++) {
      for (let j = i; j < R; j++) {
        let v = 0;
        for (let m = 0; m < K; m++) v += at(P + m, col(i)) * t[m * R + j];
        G[i * R + j] -= v;
      }
    }
  }
  for (let i = 0; i < R; i++) for (let j = 0; j < i; j++) G[i * R + j] = G[j * R + i];
  const XX = new Float64Array(P * P);
  const Xr = new Float64Array(P);
  for (let i = 0; i < P; i++) {
    for (let j = 0; j < P; j++) XX[i * P + j] = G[i * R + j];
    Xr[i] = G[i * R + P];
  }
  const beta = P > 0 ? solveSym(XX, P, Xr) : new Float64Array(0);
  let rss = G[P * R + P];
  for (let i = 0; i < P; i++) rss -= beta[i] * Xr[i];
  const init = new Float64Array(segCount * K).fill(NaN);
  for (let s = 0; s < segCount; s++) {
    if (!ws.segHas[s]) continue;
    for (let m = 0; m < K; m++) {
      // c = (ΨᵀΨ)⁻¹Ψᵀr − (ΨᵀΨ)⁻¹ΨᵀX·β
      let c = segPsi[s * stride + m * R + P];
      for (let j = 0; j < P; j++) c -= segPsi[s * stride + m * R + j] * beta[j];
      init[s * K + m] = c;
    }
  }
  return { rss: Math.max(rss, 0), n, beta, init };
}
