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

/** The least-squares solution at one τ. */
export interface Solution {
  rss: number;
  /** Weighted number of readings. */
  n: number;
  heatRate: number;
  coolRate: number;
  gain: number;
  /** Initial state of each segment, °C (NaN for a segment with zero weight). */
  x0: Float64Array;
}

/**
 * Solves the weighted least-squares problem from block sums.
 * @param weights one weight per day (bootstrap multiplicity, or 0/1 for a held-out split); null = all 1.
 * Eliminates the per-segment initial states by their Schur complement, then solves the ≤3×3 normal
 * equations by Cholesky factorisation (a fixed tiny system solved thousands of times per fit, so it is
 * written out here rather than allocated through a matrix library; tests check it against ml-matrix).
 */
export function solveBlocks(stats: Float64Array, blocks: Blocks, weights: Float64Array | null, active: Active, counts: Float64Array, workspace?: Float64Array): Solution {
  const segCount = blocks.segCount;
  const ws = workspace && workspace.length >= 5 * segCount ? workspace : new Float64Array(5 * segCount);
  ws.fill(0, 0, 5 * segCount);
  const D = ws.subarray(0, segCount);
  const bH = ws.subarray(segCount, 2 * segCount);
  const bC = ws.subarray(2 * segCount, 3 * segCount);
  const bG = ws.subarray(3 * segCount, 4 * segCount);
  const e = ws.subarray(4 * segCount, 5 * segCount);
  let mHH = 0, mHC = 0, mHG = 0, mCC = 0, mCG = 0, mGG = 0, vH = 0, vC = 0, vG = 0, rr = 0, n = 0;
  for (let b = 0; b < blocks.count; b++) {
    const w = weights ? weights[blocks.blockDay[b]] : 1;
    if (w === 0) continue;
    const o = b * STATS;
    const s = blocks.blockSeg[b];
    mHH += w * stats[o + S_HH]; mHC += w * stats[o + S_HC]; mHG += w * stats[o + S_HG];
    mCC += w * stats[o + S_CC]; mCG += w * stats[o + S_CG]; mGG += w * stats[o + S_GG];
    vH += w * stats[o + S_HR]; vC += w * stats[o + S_CR]; vG += w * stats[o + S_GR];
    rr += w * stats[o + S_RR];
    D[s] += w * stats[o + S_PP]; bH[s] += w * stats[o + S_PH]; bC[s] += w * stats[o + S_PC];
    bG[s] += w * stats[o + S_PG]; e[s] += w * stats[o + S_PR];
    n += w * counts[b];
  }
  for (let s = 0; s < segCount; s++) {
    const d = D[s];
    if (d <= 0) continue;
    mHH -= (bH[s] * bH[s]) / d; mHC -= (bH[s] * bC[s]) / d; mHG -= (bH[s] * bG[s]) / d;
    mCC -= (bC[s] * bC[s]) / d; mCG -= (bC[s] * bG[s]) / d; mGG -= (bG[s] * bG[s]) / d;
    vH -= (bH[s] * e[s]) / d; vC -= (bC[s] * e[s]) / d; vG -= (bG[s] * e[s]) / d;
    rr -= (e[s] * e[s]) / d;
  }
  // Assemble the active system (order: h, c, g) and solve it.
  const idx: number[] = [];
  if (active.heat) idx.push(0);
  if (active.cool) idx.push(1);
  idx.push(2);
  const full = [
    [mHH, mHC, mHG],
    [mHC, mCC, mCG],
    [mHG, mCG, mGG],
  ];
  const vFull = [vH, vC, vG];
  const M = idx.map((i) => idx.map((j) => full[i][j]));
  const v = idx.map((i) => vFull[i]);
  const theta = solveSymmetric(M, v);
  const params = [0, 0, 0];
  idx.forEach((i, k) => (params[i] = theta[k]));
  let rss = rr;
  for (let k = 0; k < idx.length; k++) rss -= v[k] * theta[k];
  const x0 = new Float64Array(segCount);
  for (let s = 0; s < segCount; s++) {
    x0[s] = D[s] > 0 ? (e[s] - bH[s] * params[0] - bC[s] * params[1] - bG[s] * params[2]) / D[s] : NaN;
  }
  // Regressor C was stepped with −u_c, so its coefficient is the cooling rate c itself.
  return { rss: Math.max(rss, 0), n, heatRate: params[0], coolRate: params[1], gain: params[2], x0 };
}

/**
 * Solves the symmetric positive (semi-)definite system M·x = v (n ≤ 3) by Cholesky factorisation with a
 * tiny ridge on a near-singular pivot. Returns zeros for a singular direction rather than throwing.
 */
export function solveSymmetric(M: number[][], v: number[]): number[] {
  const n = v.length;
  const L = M.map((row) => row.slice());
  const scale = Math.max(1e-300, ...M.map((row, i) => Math.abs(row[i])));
  for (let j = 0; j < n; j++) {
    let d = L[j][j];
    for (let k = 0; k < j; k++) d -= L[j][k] * L[j][k];
    if (d <= scale * 1e-13) d = scale * 1e-13;
    L[j][j] = Math.sqrt(d);
    for (let i = j + 1; i < n; i++) {
      let s = L[i][j];
      for (let k = 0; k < j; k++) s -= L[i][k] * L[j][k];
      L[i][j] = s / L[j][j];
    }
  }
  const z = new Array<number>(n);
  for (let i = 0; i < n; i++) {
    let s = v[i];
    for (let k = 0; k < i; k++) s -= L[i][k] * z[k];
    z[i] = s / L[i][i];
  }
  const x = new Array<number>(n);
  for (let i = n - 1; i >= 0; i--) {
    let s = z[i];
    for (let k = i + 1; k < n; k++) s -= L[k][i] * x[k];
    x[i] = s / L[i][i];
  }
  return x;
}

/** Number of readings in each block (for weighted counts). */
export function blockCounts(blocks: Blocks): Float64Array {
  const c = new Float64Array(blocks.count);
  for (let b = 0; b < blocks.count; b++) c[b] = blocks.blockStart[b + 1] - blocks.blockStart[b];
  return c;
}
