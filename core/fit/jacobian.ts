/**
 * The Jacobian pieces shared by the non-linear search (twonode.ts) and the intervals (intervals.ts):
 * finite-difference columns of the simulated temperature with respect to the dynamics' parameters, and
 * the Gram matrix of the Jacobian after the segments' initial states are partialled out.
 *
 * Method: with the forcing coefficients β and each segment's physical initial state (air and mass
 * temperatures) held, the simulated temperature is a smooth function of the dynamics' parameters θ; its
 * derivative is taken by central differences (step 1e-4 in the transformed parameter: log time
 * constants, logit mass share). Partialling out (Frisch–Waugh–Lovell): within each segment the
 * columns are projected off that segment's mode decays ψ, which touch only that segment.
 */
import type { FitContext } from './context.ts';
import type { Modes } from '../modes.ts';
import { modalInit, physicalInit, simulateModes } from './simulate.ts';
import type { LinearSolution } from './solve.ts';
import { solveSym } from './linalg.ts';

const STEP = 1e-4;

/** ∂ŷ/∂θ_k for every k, at fixed β and physical initial states. */
export function dynamicsColumns(ctx: FitContext, theta: readonly number[], modesAt: (theta: readonly number[]) => Modes, solution: LinearSolution): Float64Array[] {
  const { log, blocks, inputs } = ctx;
  const n = log.y.length;
  const phys = physicalInit(modesAt(theta), solution.init, blocks.segCount);
  const cols: Float64Array[] = [];
  const up = new Float64Array(n);
  const down = new Float64Array(n);
  for (let k = 0; k < theta.length; k++) {
    const tu = theta.slice(), td = theta.slice();
    tu[k] += STEP;
    td[k] -= STEP;
    const mu = modesAt(tu), md = modesAt(td);
    simulateModes(log, mu, solution.beta, inputs, modalInit(mu, phys, blocks.segCount), up);
    simulateModes(log, md, solution.beta, inputs, modalInit(md, phys, blocks.segCount), down);
    const d = new Float64Array(n);
    for (let i = 0; i < n; i++) d[i] = (up[i] - down[i]) / (2 * STEP);
    cols.push(d);
  }
  return cols;
}

/**
 * Gram matrix J̃ᵀJ̃ (p×p, row-major) of the columns J after each segment's nuisance columns ψ are
 * projected out, J̃ᵀr for a residual r, and with `days` the per-day scores Σ_{i in day d} J̃_iᵀ r_i
 * (d·p + c).
 */
export function partialledGram(J: readonly Float64Array[], psi: readonly Float64Array[], r: Float64Array | null, segStart: Int32Array, days?: { day: Int32Array; dayCount: number }): { gram: Float64Array; jr: Float64Array; scores: Float64Array | null } {
  const p = J.length;
  const scores = days ? new Float64Array(days.dayCount * p) : null;
  const K = psi.length;
  const gram = new Float64Array(p * p);
  const jr = new Float64Array(p);
  const PP = new Float64Array(K * K);
  const PJ = new Float64Array(K * p);
  const M = new Float64Array(K * p);
  const col = new Float64Array(K);
  const sol = new Float64Array(K);
  const jt = new Float64Array(p);
  for (let s = 0; s + 1 < segStart.length; s++) {
    const b = segStart[s], e = segStart[s + 1];
    PP.fill(0);
    PJ.fill(0);
    for (let i = b; i < e; i++) {
      for (let m = 0; m < K; m++) {
        const pm = psi[m][i];
        for (let l = 0; l < K; l++) PP[m * K + l] += pm * psi[l][i];
        for (let c = 0; c < p; c++) PJ[m * p + c] += pm * J[c][i];
      }
    }
    for (let c = 0; c < p; c++) {
      for (let m = 0; m < K; m++) col[m] = PJ[m * p + c];
      solveSym(PP, K, col, sol);
      for (let m = 0; m < K; m++) M[m * p + c] = sol[m];
    }
    for (let i = b; i < e; i++) {
      for (let c = 0; c < p; c++) {
        let v = J[c][i];
        for (let m = 0; m < K; m++) v -= psi[m][i] * M[m * p + c];
        jt[c] = v;
      }
      for (let c = 0; c < p; c++) for (let c2 = c; c2 < p; c2++) gram[c * p + c2] += jt[c] * jt[c2];
      if (r) {
        const ri = r[i];
        for (let c = 0; c < p; c++) jr[c] += jt[c] * ri;
        if (scores && days) {
          const o = days.day[i] * p;
          for (let c = 0; c < p; c++) scores[o + c] += jt[c] * ri;
        }
      }
    }
  }
  for (let c = 0; c < p; c++) for (let c2 = 0; c2 < c; c2++) gram[c * p + c2] = gram[c2 * p + c];
  return { gram, jr, scores };
}
