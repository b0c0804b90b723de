/**
 * Output-error least squares for the zone model at a fixed τ, by variable projection.
 *
 * Method. For a fixed τ the model  dT/dt = (T_out − T)/τ + h·u_h − c·u_c + g  is linear in its initial
 * state and in (h, c, g), so its exact simulation (core/step.ts) splits into basis responses that are
 * stepped together in one pass:
 *   T_i = x0_s·φ_i + A_i + h·H_i − c·C_i + g·G_i
 * (φ: decay of the segment's initial state; A: response to the outdoor temperature from zero; H, C, G:
 * responses to the heating runtime, the cooling runtime and a unit gain). The simulated-vs-measured
 * mismatch Σ (y_i − T_i)² is then an ordinary linear least-squares problem in (x0_s, h, c, g), with one
 * free initial state per segment (so a quantised first reading does not bias the fit). The remaining
 * non-linear parameter τ is found by a one-dimensional search of the profile RSS(τ) (Golub & Pereyra's
 * variable projection, 1973).
 *
 * The sums are kept per block (one day of one segment), so that a day-block bootstrap or a held-out
 * check re-weights days without simulating again.
 *
 * Cost. A fit makes about 25 passes over the log, so the pass is written for speed without changing a
 * single floating-point operation of the plain method:
 * - a log with heating but no cooling (or the reverse) has a forcing basis that is identically zero
 *   (C = E·0 − wQ·0 = 0 at every reading), so its five sums are exactly zero; such a log is stepped with
 *   one forcing basis instead of two (four basis responses and ten sums a reading instead of five and 15);
 * - φ decays to exactly zero (see below) after a few dozen τ, so each block is stepped in two phases,
 *   with φ and then without it;
 * - readings are stepped in runs of equal interval (found once per log by makeBlocks), so the step
 *   coefficients are looked up once per run rather than tested at every reading.
 * Every sum still adds the same terms in the same order as a single loop over readings would, so the
 * results are bit-for-bit those of accumulateAll (tests/core/fit-profile.test.ts).
 */
import { FixedStep } from '../step.ts';
import type { PreparedLog } from './prepare.ts';

/** Statistics kept per block, in this order. */
const S_HH = 0, S_HC = 1, S_HG = 2, S_CC = 3, S_CG = 4, S_GG = 5, S_HR = 6, S_CR = 7, S_GR = 8, S_RR = 9,
  S_PP = 10, S_PH = 11, S_PC = 12, S_PG = 13, S_PR = 14;
export const STATS = 15;

/** The blocks of a prepared log: block b covers readings blockStart[b] .. blockStart[b+1]-1. */
export interface Blocks {
  blockStart: Int32Array;
  blockDay: Int32Array;
  blockSeg: Int32Array;
  count: number;
  segCount: number;
  /**
   * Runs of equal interval: run r steps readings runStart[r] .. runEnd[r]-1 (each from the reading
   * before it), all runDtMs[r] ms after their predecessor; block b's runs are blockRun[b] .. blockRun[b+1]-1.
   * A segment's first reading is in no run (it is not stepped).
   */
  runStart: Int32Array;
  runEnd: Int32Array;
  runDtMs: Float64Array;
  blockRun: Int32Array;
  /** Whether some stepped reading has non-zero heating (cooling) runtime; if not, H (C) is identically 0. */
  heating: boolean;
  cooling: boolean;
}

/** Splits a prepared log into day-of-segment blocks and runs of equal interval. */
export function makeBlocks(log: PreparedLog): Blocks {
  const { timeMs, day, uh, uc, segStart } = log;
  const starts: number[] = [];
  const days: number[] = [];
  const segs: number[] = [];
  for (let s = 0; s + 1 < segStart.length; s++) {
    for (let k = segStart[s]; k < segStart[s + 1]; k++) {
      if (k === segStart[s] || day[k] !== day[k - 1]) {
        starts.push(k);
        days.push(day[k]);
        segs.push(s);
      }
    }
  }
  starts.push(timeMs.length);
  const count = days.length;

  // Runs of equal interval within each block, over the readings that are stepped.
  const blockRun = new Int32Array(count + 1);
  const runStarts: number[] = [];
  const runEnds: number[] = [];
  const runDts: number[] = [];
  let heating = false;
  let cooling = false;
  for (let b = 0; b < count; b++) {
    blockRun[b] = runStarts.length;
    const end = starts[b + 1];
    let k = starts[b];
    if (b === 0 || segs[b] !== segs[b - 1]) k++;
    let lastDt = NaN;
    for (; k < end; k++) {
      const dtMs = timeMs[k] - timeMs[k - 1];
      if (dtMs !== lastDt) {
        if (runStarts.length > blockRun[b]) runEnds.push(k);
        runStarts.push(k);
        runDts.push(dtMs);
        lastDt = dtMs;
      }
      if (uh[k] !== 0) heating = true;
      if (uc[k] !== 0) cooling = true;
    }
    if (runStarts.length > blockRun[b]) runEnds.push(end);
  }
  blockRun[count] = runStarts.length;
  return {
    blockStart: Int32Array.from(starts),
    blockDay: Int32Array.from(days),
    blockSeg: Int32Array.from(segs),
    count,
    segCount: segStart.length - 1,
    runStart: Int32Array.from(runStarts),
    runEnd: Int32Array.from(runEnds),
    runDtMs: Float64Array.from(runDts),
    blockRun,
    heating,
    cooling,
  };
}

/**
 * One simulation pass at time constant τ (hours): fills out[b*STATS + j] with block b's sums.
 * Cost: one exact step of the basis responses per reading; a log that only heats or only cools steps
 * four of the five (the fifth's sums are exactly zero). Same results as accumulateAll, bit for bit.
 */
export function accumulate(log: PreparedLog, blocks: Blocks, tauHours: number, out: Float64Array): void {
  if (blocks.heating && blocks.cooling) accumulateAll(log, blocks, tauHours, out);
  else accumulateOne(log, blocks, tauHours, out, blocks.cooling);
}

/** The general pass: all five basis responses stepped at every reading. */
export function accumulateAll(log: PreparedLog, blocks: Blocks, tauHours: number, out: Float64Array): void {
  const { y, a, uh, uc } = log;
  const { blockStart, blockSeg, blockRun, runStart, runEnd, runDtMs } = blocks;
  let cachedDt = -1;
  let E = 0, wA0 = 0, wA1 = 0, wQ = 0;
  let phi = 1, A = 0, H = 0, C = 0, G = 0;
  let seg = -1;
  for (let b = 0; b < blocks.count; b++) {
    let sHH = 0, sHC = 0, sHG = 0, sCC = 0, sCG = 0, sGG = 0, sHR = 0, sCR = 0, sGR = 0, sRR = 0;
    let sPP = 0, sPH = 0, sPC = 0, sPG = 0, sPR = 0;
    if (blockSeg[b] !== seg) {
      // A new segment: its state starts free (x0), every other basis response from zero.
      seg = blockSeg[b];
      phi = 1; A = 0; H = 0; C = 0; G = 0;
      const r = y[blockStart[b]];
      sRR += r * r; sPP += 1; sPR += r;
    }
    for (let run = blockRun[b]; run < blockRun[b + 1]; run++) {
      let k = runStart[run];
      const end = runEnd[run];
      // Interval in whole ms, so equal intervals reuse one set of step coefficients exactly.
      const dtMs = runDtMs[run];
      if (dtMs !== cachedDt) {
        const step = new FixedStep(dtMs / 3_600_000, tauHours);
        E = step.E; wA0 = step.wA0; wA1 = step.wA1; wQ = step.wQ;
        cachedDt = dtMs;
      }
      let aPrev = a[k - 1];
      // The initial state's influence decays as e^{−t/τ}; once below 1e−18 it is exactly dropped.
      for (; k < end && phi !== 0; k++) {
        const aK = a[k];
        A = E * A + wA0 * aPrev + wA1 * aK;
        aPrev = aK;
        H = E * H + wQ * uh[k];
        C = E * C - wQ * uc[k];
        G = E * G + wQ;
        const r = y[k] - A;
        sHH += H * H; sHC += H * C; sHG += H * G; sCC += C * C; sCG += C * G; sGG += G * G;
        sHR += H * r; sCR += C * r; sGR += G * r; sRR += r * r;
        phi = phi * E < 1e-18 ? 0 : phi * E;
        sPP += phi * phi; sPH += phi * H; sPC += phi * C; sPG += phi * G; sPR += phi * r;
      }
      for (; k < end; k++) {
        const aK = a[k];
        A = E * A + wA0 * aPrev + wA1 * aK;
        aPrev = aK;
        H = E * H + wQ * uh[k];
        C = E * C - wQ * uc[k];
        G = E * G + wQ;
        const r = y[k] - A;
        sHH += H * H; sHC += H * C; sHG += H * G; sCC += C * C; sCG += C * G; sGG += G * G;
        sHR += H * r; sCR += C * r; sGR += G * r; sRR += r * r;
      }
    }
    const o = b * STATS;
    out[o + S_HH] = sHH; out[o + S_HC] = sHC; out[o + S_HG] = sHG; out[o + S_CC] = sCC;
    out[o + S_CG] = sCG; out[o + S_GG] = sGG; out[o + S_HR] = sHR; out[o + S_CR] = sCR;
    out[o + S_GR] = sGR; out[o + S_RR] = sRR; out[o + S_PP] = sPP; out[o + S_PH] = sPH;
    out[o + S_PC] = sPC; out[o + S_PG] = sPG; out[o + S_PR] = sPR;
  }
}

/**
 * The pass with one forcing basis U: heating (U = H, stepped with +wQ·u_h) or, with `cooling`, cooling
 * (U = C, stepped with −wQ·u_c; x − wQ·u equals x + (−wQ)·u exactly). The other basis's sums are 0.
 */
function accumulateOne(log: PreparedLog, blocks: Blocks, tauHours: number, out: Float64Array, cooling: boolean): void {
  const { y, a } = log;
  const u = cooling ? log.uc : log.uh;
  const { blockStart, blockSeg, blockRun, runStart, runEnd, runDtMs } = blocks;
  // Where U's sums go, and the other basis's (zero) sums.
  const iUU = cooling ? S_CC : S_HH, iUG = cooling ? S_CG : S_HG, iUR = cooling ? S_CR : S_HR, iPU = cooling ? S_PC : S_PH;
  const iVV = cooling ? S_HH : S_CC, iVG = cooling ? S_HG : S_CG, iVR = cooling ? S_HR : S_CR, iPV = cooling ? S_PH : S_PC;
  let cachedDt = -1;
  let E = 0, wA0 = 0, wA1 = 0, wQ = 0, wU = 0;
  let phi = 1, A = 0, U = 0, G = 0;
  let seg = -1;
  for (let b = 0; b < blocks.count; b++) {
    let sUU = 0, sUG = 0, sGG = 0, sUR = 0, sGR = 0, sRR = 0;
    let sPP = 0, sPU = 0, sPG = 0, sPR = 0;
    if (blockSeg[b] !== seg) {
      seg = blockSeg[b];
      phi = 1; A = 0; U = 0; G = 0;
      const r = y[blockStart[b]];
      sRR += r * r; sPP += 1; sPR += r;
    }
    for (let run = blockRun[b]; run < blockRun[b + 1]; run++) {
      let k = runStart[run];
      const end = runEnd[run];
      const dtMs = runDtMs[run];
      if (dtMs !== cachedDt) {
        const step = new FixedStep(dtMs / 3_600_000, tauHours);
        E = step.E; wA0 = step.wA0; wA1 = step.wA1; wQ = step.wQ;
        wU = cooling ? -wQ : wQ;
        cachedDt = dtMs;
      }
      let aPrev = a[k - 1];
      for (; k < end && phi !== 0; k++) {
        const aK = a[k];
        A = E * A + wA0 * aPrev + wA1 * aK;
        aPrev = aK;
        U = E * U + wU * u[k];
        G = E * G + wQ;
        const r = y[k] - A;
        sUU += U * U; sUG += U * G; sGG += G * G; sUR += U * r; sGR += G * r; sRR += r * r;
        phi = phi * E < 1e-18 ? 0 : phi * E;
        sPP += phi * phi; sPU += phi * U; sPG += phi * G; sPR += phi * r;
      }
      for (; k < end; k++) {
        const aK = a[k];
        A = E * A + wA0 * aPrev + wA1 * aK;
        aPrev = aK;
        U = E * U + wU * u[k];
        G = E * G + wQ;
        const r = y[k] - A;
        sUU += U * U; sUG += U * G; sGG += G * G; sUR += U * r; sGR += G * r; sRR += r * r;
      }
    }
    const o = b * STATS;
    out[o + iUU] = sUU; out[o + iUG] = sUG; out[o + S_GG] = sGG; out[o + iUR] = sUR;
    out[o + S_GR] = sGR; out[o + S_RR] = sRR; out[o + S_PP] = sPP; out[o + iPU] = sPU;
    out[o + S_PG] = sPG; out[o + S_PR] = sPR;
    out[o + S_HC] = 0; out[o + iVV] = 0; out[o + iVG] = 0; out[o + iVR] = 0; out[o + iPV] = 0;
  }
}

/** Which of h, c, g are free (the others are held at zero). */
export interface Active {
  heat: boolean;
  cool: boolean;
}

/** The least-squares solution at one τ, without the initial states. */
export interface Parameters {
  rss: number;
  /** Weighted number of readings. */
  n: number;
  heatRate: number;
  coolRate: number;
  gain: number;
}

/** The least-squares solution at one τ. */
export interface Solution extends Parameters {
  /** Initial state of each segment, °C (NaN for a segment with zero weight). */
  x0: Float64Array;
}

/** Length of the scratch space solveBlocks and solveParameters need for a log of `segCount` segments. */
export function workspaceSize(segCount: number): number {
  return 5 * segCount;
}

/** Active parameters (order h, c, g) for each combination of heat (1) and cool (2). */
const ACTIVE_INDEX = [[2], [0, 2], [1, 2], [0, 1, 2]];

/**
 * Solves the weighted least-squares problem from block sums.
 * @param weights one weight per day (bootstrap multiplicity, or 0/1 for a held-out split); null = all 1.
 * Eliminates the per-segment initial states by their Schur complement, then solves the ≤3×3 normal
 * equations by Cholesky factorisation (a fixed tiny system solved thousands of times per fit, so it is
 * written out here on a flat scratch array rather than allocated through a matrix library; tests check
 * it against ml-matrix). Sums of an inactive parameter are not read: they are exactly zero (its runtime
 * is zero throughout) and its coefficient is zero.
 */
export function solveBlocks(stats: Float64Array, blocks: Blocks, weights: Float64Array | null, active: Active, counts: Float64Array, workspace?: Float64Array): Solution {
  const segCount = blocks.segCount;
  const ws = workspace && workspace.length >= workspaceSize(segCount) ? workspace : new Float64Array(workspaceSize(segCount));
  const p = solveParameters(stats, blocks, weights, active, counts, ws);
  // Per-segment sums left in the workspace: D, bH, bC, bG, e.
  const x0 = new Float64Array(segCount);
  for (let s = 0; s < segCount; s++) {
    const d = ws[s];
    x0[s] = d > 0 ? (ws[4 * segCount + s] - ws[segCount + s] * p.heatRate - ws[2 * segCount + s] * p.coolRate - ws[3 * segCount + s] * p.gain) / d : NaN;
  }
  return { ...p, x0 };
}

/**
 * solveBlocks without the initial states, for the grid and bootstrap solves (which need only the RSS
 * and the rates). Allocates nothing but its result; `workspace` must hold workspaceSize(segCount).
 */
export function solveParameters(stats: Float64Array, blocks: Blocks, weights: Float64Array | null, active: Active, counts: Float64Array, workspace: Float64Array): Parameters {
  const { count, segCount, blockDay, blockSeg } = blocks;
  const ws = workspace;
  // Per-segment sums: D (φφ) at 0, bH at segCount, bC at 2·segCount, bG at 3·segCount, e (φr) at 4·segCount.
  ws.fill(0, 0, 5 * segCount);
  const oH = segCount, oC = 2 * segCount, oG = 3 * segCount, oE = 4 * segCount;
  const heat = active.heat, cool = active.cool;
  let mHH = 0, mHC = 0, mHG = 0, mCC = 0, mCG = 0, mGG = 0, vH = 0, vC = 0, vG = 0, rr = 0, n = 0;
  // A segment's blocks are consecutive, so its sums are kept in locals and stored when it ends.
  let seg = count > 0 ? blockSeg[0] : 0;
  let sD = 0, sH = 0, sC = 0, sG = 0, sE = 0;
  for (let b = 0; b < count; b++) {
    if (blockSeg[b] !== seg) {
      ws[seg] = sD; ws[oH + seg] = sH; ws[oC + seg] = sC; ws[oG + seg] = sG; ws[oE + seg] = sE;
      seg = blockSeg[b];
      sD = 0; sH = 0; sC = 0; sG = 0; sE = 0;
    }
    const w = weights === null ? 1 : weights[blockDay[b]];
    if (w === 0) continue;
    const o = b * STATS;
    mGG += w * stats[o + S_GG]; vG += w * stats[o + S_GR]; rr += w * stats[o + S_RR];
    sD += w * stats[o + S_PP]; sG += w * stats[o + S_PG]; sE += w * stats[o + S_PR];
    if (heat) {
      mHH += w * stats[o + S_HH]; mHG += w * stats[o + S_HG]; vH += w * stats[o + S_HR];
      sH += w * stats[o + S_PH];
      if (cool) mHC += w * stats[o + S_HC];
    }
    if (cool) {
      mCC += w * stats[o + S_CC]; mCG += w * stats[o + S_CG]; vC += w * stats[o + S_CR];
      sC += w * stats[o + S_PC];
    }
    n += w * counts[b];
  }
  if (count > 0) {
    ws[seg] = sD; ws[oH + seg] = sH; ws[oC + seg] = sC; ws[oG + seg] = sG; ws[oE + seg] = sE;
  }
  for (let s = 0; s < segCount; s++) {
    const d = ws[s];
    if (d <= 0) continue;
    const bH = ws[oH + s], bC = ws[oC + s], bG = ws[oG + s], e = ws[oE + s];
    if (heat) {
      mHH -= (bH * bH) / d; mHG -= (bH * bG) / d; vH -= (bH * e) / d;
      if (cool) mHC -= (bH * bC) / d;
    }
    if (cool) {
      mCC -= (bC * bC) / d; mCG -= (bC * bG) / d; vC -= (bC * e) / d;
    }
    mGG -= (bG * bG) / d; vG -= (bG * e) / d;
    rr -= (e * e) / d;
  }
  // Assemble the active system (order: h, c, g) and solve it.
  const full = SYSTEM_FULL;
  full[0] = mHH; full[1] = mHC; full[2] = mHG;
  full[3] = mHC; full[4] = mCC; full[5] = mCG;
  full[6] = mHG; full[7] = mCG; full[8] = mGG;
  const vFull = SYSTEM_VFULL;
  vFull[0] = vH; vFull[1] = vC; vFull[2] = vG;
  const idx = ACTIVE_INDEX[(heat ? 1 : 0) + (cool ? 2 : 0)];
  const dim = idx.length;
  const M = SYSTEM_M, v = SYSTEM_V, theta = SYSTEM_X;
  for (let i = 0; i < dim; i++) {
    for (let j = 0; j < dim; j++) M[i * dim + j] = full[idx[i] * 3 + idx[j]];
    v[i] = vFull[idx[i]];
  }
  choleskySolve(M, v, dim, theta, SYSTEM_L);
  const params = SYSTEM_PARAMS;
  params.fill(0);
  let rss = rr;
  for (let k = 0; k < dim; k++) {
    params[idx[k]] = theta[k];
    rss -= v[k] * theta[k];
  }
  // Regressor C was stepped with −u_c, so its coefficient is the cooling rate c itself.
  return { rss: Math.max(rss, 0), n, heatRate: params[0], coolRate: params[1], gain: params[2] };
}

// Scratch of the ≤3×3 solve (module level: the solve is synchronous and never re-entered).
const SYSTEM_FULL = new Float64Array(9);
const SYSTEM_VFULL = new Float64Array(3);
const SYSTEM_M = new Float64Array(9);
const SYSTEM_V = new Float64Array(3);
const SYSTEM_X = new Float64Array(3);
const SYSTEM_L = new Float64Array(9);
const SYSTEM_PARAMS = new Float64Array(3);

/**
 * Solves the symmetric positive (semi-)definite system M·x = v (n ≤ 3) by Cholesky factorisation with a
 * tiny ridge on a near-singular pivot. Returns zeros for a singular direction rather than throwing.
 */
export function solveSymmetric(M: number[][], v: number[]): number[] {
  const n = v.length;
  const flat = new Float64Array(n * n);
  for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) flat[i * n + j] = M[i][j];
  const x = new Float64Array(n);
  choleskySolve(flat, Float64Array.from(v), n, x, new Float64Array(n * n));
  return Array.from(x);
}

/**
 * solveSymmetric on flat row-major arrays: M (n×n) and v are read, x receives the solution and L
 * (n×n) is scratch for the factor.
 */
function choleskySolve(M: Float64Array, v: Float64Array, n: number, x: Float64Array, L: Float64Array): void {
  let scale = 1e-300;
  for (let i = 0; i < n; i++) scale = Math.max(scale, Math.abs(M[i * n + i]));
  for (let i = 0; i < n * n; i++) L[i] = M[i];
  for (let j = 0; j < n; j++) {
    let d = L[j * n + j];
    for (let k = 0; k < j; k++) d -= L[j * n + k] * L[j * n + k];
    if (d <= scale * 1e-13) d = scale * 1e-13;
    L[j * n + j] = Math.sqrt(d);
    for (let i = j + 1; i < n; i++) {
      let s = L[i * n + j];
      for (let k = 0; k < j; k++) s -= L[i * n + k] * L[j * n + k];
      L[i * n + j] = s / L[j * n + j];
    }
  }
  // Forward substitution into x (as z), then back substitution in place.
  for (let i = 0; i < n; i++) {
    let s = v[i];
    for (let k = 0; k < i; k++) s -= L[i * n + k] * x[k];
    x[i] = s / L[i * n + i];
  }
  for (let i = n - 1; i >= 0; i--) {
    let s = x[i];
    for (let k = i + 1; k < n; k++) s -= L[k * n + i] * x[k];
    x[i] = s / L[i * n + i];
  }
}

/** Number of readings in each block (for weighted counts). */
export function blockCounts(blocks: Blocks): Float64Array {
  const c = new Float64Array(blocks.count);
  for (let b = 0; b < blocks.count; b++) c[b] = blocks.blockStart[b + 1] - blocks.blockStart[b];
  return c;
}
