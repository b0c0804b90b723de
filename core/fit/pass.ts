/**
 * One simulation pass of the zone model over a prepared log, kept as per-block sums for least squares.
 *
 * Method (variable projection, Golub & Pereyra 1973). For fixed dynamics (the modes of modes.ts: one
 * node, or two nodes for air and mass) the simulated air temperature is linear in the forcing
 * coefficients β = (h, c, g, s) and in each segment's initial state, so it splits into basis responses
 * that are stepped together in one pass:
 *   Ti_k = A_k + Σ_j β_j·U_jk + Σ_m c_sm·ψ_mk
 * A: response to the outdoor temperature from zero; U_j: response to forcing input j (heating runtime,
 * minus cooling runtime, a unit gain, the solar proxy) from zero; ψ_m: decay of mode m from 1 at the
 * segment's first reading (the free initial state, one coefficient per mode and segment, so a quantised
 * first reading does not bias the fit). Each basis is stepped exactly, mode by mode (core/step.ts's
 * FixedStep: ambient o_m·T_out, forcing f_m·u), with the row convention of the log: the inputs at
 * reading k act over the interval that ends at reading k, the outdoor temperature is linear between
 * readings.
 *
 * The sums kept per block (one local day of one segment) are the Gram matrix of the columns
 * [U_0 … U_{P−1}, ψ_0 … ψ_{K−1}, r] with r = y − A, upper triangle row by row, so that fits that
 * re-weight days (held-out checks, the recovery backtest) need no new pass.
 *
 * Units: °C, hours, K/h; inputs are runtime fractions (0–1), 1 for the gain, kW/m² for the solar proxy.
 */
import { FixedStep } from '../step.ts';
import type { Modes } from '../modes.ts';
import type { PreparedLog } from './prepare.ts';

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
}

/** Splits a prepared log into day-of-segment blocks and runs of equal interval. */
export function makeBlocks(log: PreparedLog): Blocks {
  const { timeMs, day, segStart } = log;
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
  const blockRun = new Int32Array(count + 1);
  const runStarts: number[] = [];
  const runEnds: number[] = [];
  const runDts: number[] = [];
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
  };
}

/** Layout of the per-block sums for P forcing inputs and K modes. */
export interface Layout {
  /** Forcing inputs. */
  P: number;
  /** Modes (initial-state columns). */
  K: number;
  /** Columns: P + K + 1 (the last is r). */
  Q: number;
  /** Sums per block: Q(Q+1)/2. */
  size: number;
}

export function layout(P: number, K: number): Layout {
  const Q = P + K + 1;
  return { P, K, Q, size: (Q * (Q + 1)) / 2 };
}

/** Index of column pair (i, j), i ≤ j, in the upper triangle of a Q-column Gram matrix. */
export function gramIndex(Q: number, i: number, j: number): number {
  return i * Q - (i * (i - 1)) / 2 + (j - i);
}

/** Per-interval step coefficients of every mode, cached by interval length. */
export class ModeSteps {
  readonly K: number;
  readonly E: Float64Array;
  readonly cA0: Float64Array;
  readonly cA1: Float64Array;
  readonly cQ: Float64Array;
  private dtMs = -1;
  private readonly modes: Modes;

  constructor(modes: Modes) {
    this.modes = modes;
    this.K = modes.count;
    this.E = new Float64Array(this.K);
    this.cA0 = new Float64Array(this.K);
    this.cA1 = new Float64Array(this.K);
    this.cQ = new Float64Array(this.K);
  }

  /** Sets the coefficients for an interval of dtMs milliseconds (no work when it is the last one asked). */
  set(dtMs: number): void {
    if (dtMs === this.dtMs) return;
    this.dtMs = dtMs;
    const { tau, o, f } = this.modes;
    for (let m = 0; m < this.K; m++) {
      const st = new FixedStep(dtMs / 3_600_000, tau[m]);
      this.E[m] = st.E;
      this.cA0[m] = st.wA0 * o[m];
      this.cA1[m] = st.wA1 * o[m];
      this.cQ[m] = st.wQ * f[m];
    }
  }
}

/** Up to this many forcing inputs (heating, cooling, gain, solar). */
export const MAX_INPUTS = 4;

/**
 * One pass: fills out[b·size .. (b+1)·size) with block b's Gram sums of [U, ψ, r] (see the module comment).
 * @param inputs P ≤ 4 forcing inputs per reading (row convention), each as long as the log
 *
 * The loops are written out for one and two modes with four input slots held in local variables (an
 * absent input reads a shared zero array, its sums are zero and are not stored), and for one mode with
 * two or three inputs (the common logs: heating and gain, with the sun or cooling) with only the columns
 * they need: the pass runs some thirty times per fit over up to a year of 5-minute readings.
 */
export function accumulate(log: PreparedLog, blocks: Blocks, modes: Modes, inputs: readonly Float64Array[], out: Float64Array): void {
  if (inputs.length > MAX_INPUTS) throw new RangeError(`accumulate: at most ${MAX_INPUTS} inputs`);
  if (modes.count === 1 && inputs.length <= 2) accumulateOneNarrow(log, blocks, modes, inputs, out);
  else if (modes.count === 1 && inputs.length === 3) accumulateOneThree(log, blocks, modes, inputs, out);
  else if (modes.count === 1) accumulateOne(log, blocks, modes, inputs, out);
  else accumulateTwo(log, blocks, modes, inputs, out);
}

/** Scatters the sums of the full layout of `slots` inputs (Q = slots + K + 1 columns) into the layout of P inputs. */
function scatter(full: Float64Array, K: number, P: number, out: Float64Array, offset: number, slots = MAX_INPUTS): void {
  const QF = slots + K + 1;
  const Q = P + K + 1;
  // Column c of the P-input layout is column c (an input) or c − P + slots (ψ, r) of the full one.
  let idx = offset;
  for (let i = 0; i < Q; i++) {
    const fi = i < P ? i : i - P + slots;
    for (let j = i; j < Q; j++) out[idx++] = full[gramIndex(QF, fi, j < P ? j : j - P + slots)];
  }
}

/** A shared array of zeros for absent inputs (read only), grown as needed. */
let zeros = new Float64Array(0);

function inputSlots(inputs: readonly Float64Array[], n: number): Float64Array[] {
  if (zeros.length < n) zeros = new Float64Array(n);
  return [0, 1, 2, 3].map((j) => inputs[j] ?? zeros);
}

/**
 * accumulateOne for at most two inputs (heating and the gain, the common log): the same sums over the
 * columns [U0 U1 ψ r] only, half the arithmetic of the four-slot loop.
 */
function accumulateOneNarrow(log: PreparedLog, blocks: Blocks, modes: Modes, inputs: readonly Float64Array[], out: Float64Array): void {
  const { y, a } = log;
  const P = inputs.length;
  const { size } = layout(P, 1);
  const [in0, in1] = inputSlots(inputs, y.length);
  const { blockStart, blockSeg, blockRun, runStart, runEnd, runDtMs } = blocks;
  const steps = new ModeSteps(modes);
  const full = new Float64Array(10);
  let A = 0, U0 = 0, U1 = 0, psi = 1;
  let seg = -1;
  for (let b = 0; b < blocks.count; b++) {
    let s00 = 0, s01 = 0, s02 = 0, s03 = 0, s11 = 0, s12 = 0, s13 = 0, s22 = 0, s23 = 0, s33 = 0;
    if (blockSeg[b] !== seg) {
      seg = blockSeg[b];
      A = 0; U0 = 0; U1 = 0; psi = 1;
      const r = y[blockStart[b]];
      s22 += 1; s23 += r; s33 += r * r;
    }
    for (let run = blockRun[b]; run < blockRun[b + 1]; run++) {
      steps.set(runDtMs[run]);
      const E = steps.E[0], cA0 = steps.cA0[0], cA1 = steps.cA1[0], cQ = steps.cQ[0];
      const end = runEnd[run];
      let aPrev = a[runStart[run] - 1];
      for (let k = runStart[run]; k < end; k++) {
        const aK = a[k];
        A = E * A + cA0 * aPrev + cA1 * aK;
        aPrev = aK;
        U0 = E * U0 + cQ * in0[k];
        U1 = E * U1 + cQ * in1[k];
        const pe = psi * E;
        psi = pe < 1e-18 ? 0 : pe;
        const r = y[k] - A;
        s00 += U0 * U0; s01 += U0 * U1; s02 += U0 * psi; s03 += U0 * r;
        s11 += U1 * U1; s12 += U1 * psi; s13 += U1 * r;
        s22 += psi * psi; s23 += psi * r; s33 += r * r;
      }
    }
    full[0] = s00; full[1] = s01; full[2] = s02; full[3] = s03;
    full[4] = s11; full[5] = s12; full[6] = s13;
    full[7] = s22; full[8] = s23; full[9] = s33;
    scatter(full, 1, P, out, b * size, 2);
  }
}

function accumulateOne(log: PreparedLog, blocks: Blocks, modes: Modes, inputs: readonly Float64Array[], out: Float64Array): void {
  const { y, a } = log;
  const P = inputs.length;
  const { size } = layout(P, 1);
  const [in0, in1, in2, in3] = inputSlots(inputs, y.length);
  const { blockStart, blockSeg, blockRun, runStart, runEnd, runDtMs } = blocks;
  const steps = new ModeSteps(modes);
  const full = new Float64Array(21);
  let A = 0, U0 = 0, U1 = 0, U2 = 0, U3 = 0, psi = 1;
  let seg = -1;
  for (let b = 0; b < blocks.count; b++) {
    // Sums over columns [U0 U1 U2 U3 ψ r], upper triangle row by row.
    let s00 = 0, s01 = 0, s02 = 0, s03 = 0, s04 = 0, s05 = 0, s11 = 0, s12 = 0, s13 = 0, s14 = 0, s15 = 0;
    let s22 = 0, s23 = 0, s24 = 0, s25 = 0, s33 = 0, s34 = 0, s35 = 0, s44 = 0, s45 = 0, s55 = 0;
    if (blockSeg[b] !== seg) {
      seg = blockSeg[b];
      A = 0; U0 = 0; U1 = 0; U2 = 0; U3 = 0; psi = 1;
      const r = y[blockStart[b]];
      s44 += 1; s45 += r; s55 += r * r;
    }
    for (let run = blockRun[b]; run < blockRun[b + 1]; run++) {
      steps.set(runDtMs[run]);
      const E = steps.E[0], cA0 = steps.cA0[0], cA1 = steps.cA1[0], cQ = steps.cQ[0];
      const end = runEnd[run];
      let aPrev = a[runStart[run] - 1];
      for (let k = runStart[run]; k < end; k++) {
        const aK = a[k];
        A = E * A + cA0 * aPrev + cA1 * aK;
        aPrev = aK;
        U0 = E * U0 + cQ * in0[k];
        U1 = E * U1 + cQ * in1[k];
        U2 = E * U2 + cQ * in2[k];
        U3 = E * U3 + cQ * in3[k];
        const pe = psi * E;
        psi = pe < 1e-18 ? 0 : pe;
        const r = y[k] - A;
        s00 += U0 * U0; s01 += U0 * U1; s02 += U0 * U2; s03 += U0 * U3; s04 += U0 * psi; s05 += U0 * r;
        s11 += U1 * U1; s12 += U1 * U2; s13 += U1 * U3; s14 += U1 * psi; s15 += U1 * r;
        s22 += U2 * U2; s23 += U2 * U3; s24 += U2 * psi; s25 += U2 * r;
        s33 += U3 * U3; s34 += U3 * psi; s35 += U3 * r;
        s44 += psi * psi; s45 += psi * r; s55 += r * r;
      }
    }
    full[0] = s00; full[1] = s01; full[2] = s02; full[3] = s03; full[4] = s04; full[5] = s05;
    full[6] = s11; full[7] = s12; full[8] = s13; full[9] = s14; full[10] = s15;
    full[11] = s22; full[12] = s23; full[13] = s24; full[14] = s25;
    full[15] = s33; full[16] = s34; full[17] = s35; full[18] = s44; full[19] = s45; full[20] = s55;
    scatter(full, 1, P, out, b * size);
  }
}

function accumulateTwo(log: PreparedLog, blocks: Blocks, modes: Modes, inputs: readonly Float64Array[], out: Float64Array): void {
  const { y, a } = log;
  const P = inputs.length;
  const { size } = layout(P, 2);
  const [in0, in1, in2, in3] = inputSlots(inputs, y.length);
  const { blockStart, blockSeg, blockRun, runStart, runEnd, runDtMs } = blocks;
  const steps = new ModeSteps(modes);
  const full = new Float64Array(28);
  // Mode states: outdoor response A, forcing responses U (slot j, mode m), decays ψ.
  let Aa = 0, Ab = 0, U0a = 0, U0b = 0, U1a = 0, U1b = 0, U2a = 0, U2b = 0, U3a = 0, U3b = 0, pa = 1, pb = 1;
  let seg = -1;
  for (let b = 0; b < blocks.count; b++) {
    // Columns [U0 U1 U2 U3 ψa ψb r].
    let s00 = 0, s01 = 0, s02 = 0, s03 = 0, s04 = 0, s05 = 0, s06 = 0;
    let s11 = 0, s12 = 0, s13 = 0, s14 = 0, s15 = 0, s16 = 0;
    let s22 = 0, s23 = 0, s24 = 0, s25 = 0, s26 = 0;
    let s33 = 0, s34 = 0, s35 = 0, s36 = 0;
    let s44 = 0, s45 = 0, s46 = 0, s55 = 0, s56 = 0, s66 = 0;
    if (blockSeg[b] !== seg) {
      seg = blockSeg[b];
      Aa = 0; Ab = 0; U0a = 0; U0b = 0; U1a = 0; U1b = 0; U2a = 0; U2b = 0; U3a = 0; U3b = 0; pa = 1; pb = 1;
      const r = y[blockStart[b]];
      s44 += 1; s45 += 1; s46 += r; s55 += 1; s56 += r; s66 += r * r;
    }
    for (let run = blockRun[b]; run < blockRun[b + 1]; run++) {
      steps.set(runDtMs[run]);
      const Ea = steps.E[0], Eb = steps.E[1];
      const a0a = steps.cA0[0], a0b = steps.cA0[1], a1a = steps.cA1[0], a1b = steps.cA1[1];
      const qa = steps.cQ[0], qb = steps.cQ[1];
      const end = runEnd[run];
      let aPrev = a[runStart[run] - 1];
      for (let k = runStart[run]; k < end; k++) {
        const aK = a[k];
        Aa = Ea * Aa + a0a * aPrev + a1a * aK;
        Ab = Eb * Ab + a0b * aPrev + a1b * aK;
        aPrev = aK;
        const i0 = in0[k], i1 = in1[k], i2 = in2[k], i3 = in3[k];
        U0a = Ea * U0a + qa * i0; U0b = Eb * U0b + qb * i0;
        U1a = Ea * U1a + qa * i1; U1b = Eb * U1b + qb * i1;
        U2a = Ea * U2a + qa * i2; U2b = Eb * U2b + qb * i2;
        U3a = Ea * U3a + qa * i3; U3b = Eb * U3b + qb * i3;
        const pea = pa * Ea, peb = pb * Eb;
        pa = pea < 1e-18 ? 0 : pea;
        pb = peb < 1e-18 ? 0 : peb;
        const U0 = U0a + U0b, U1 = U1a + U1b, U2 = U2a + U2b, U3 = U3a + U3b;
        const r = y[k] - (Aa + Ab);
        s00 += U0 * U0; s01 += U0 * U1; s02 += U0 * U2; s03 += U0 * U3; s04 += U0 * pa; s05 += U0 * pb; s06 += U0 * r;
        s11 += U1 * U1; s12 += U1 * U2; s13 += U1 * U3; s14 += U1 * pa; s15 += U1 * pb; s16 += U1 * r;
        s22 += U2 * U2; s23 += U2 * U3; s24 += U2 * pa; s25 += U2 * pb; s26 += U2 * r;
        s33 += U3 * U3; s34 += U3 * pa; s35 += U3 * pb; s36 += U3 * r;
        s44 += pa * pa; s45 += pa * pb; s46 += pa * r; s55 += pb * pb; s56 += pb * r; s66 += r * r;
      }
    }
    full[0] = s00; full[1] = s01; full[2] = s02; full[3] = s03; full[4] = s04; full[5] = s05; full[6] = s06;
    full[7] = s11; full[8] = s12; full[9] = s13; full[10] = s14; full[11] = s15; full[12] = s16;
    full[13] = s22; full[14] = s23; full[15] = s24; full[16] = s25; full[17] = s26;
    full[18] = s33; full[19] = s34; full[20] = s35; full[21] = s36;
    full[22] = s44; full[23] = s45; full[24] = s46; full[25] = s55; full[26] = s56; full[27] = s66;
    scatter(full, 2, P, out, b * size);
  }
}

/**
 * The plain pass for any number of modes and inputs (the reference the written-out passes are tested
 * against, tests/core/fit-pass.test.ts).
 */
export function accumulateGeneric(log: PreparedLog, blocks: Blocks, modes: Modes, inputs: readonly Float64Array[], out: Float64Array): void {
  const { y, a } = log;
  const P = inputs.length;
  const K = modes.count;
  const { Q, size } = layout(P, K);
  const { blockStart, blockSeg, blockRun, runStart, runEnd, runDtMs } = blocks;
  const steps = new ModeSteps(modes);
  const { E, cA0, cA1, cQ } = steps;
  // Mode states: A[m], U[j·K + m], psi[m]; the current column vector v and the block's sums acc.
  const A = new Float64Array(K);
  const U = new Float64Array(P * K);
  const psi = new Float64Array(K);
  const v = new Float64Array(Q);
  const acc = new Float64Array(size);
  let seg = -1;
  for (let b = 0; b < blocks.count; b++) {
    acc.fill(0);
    if (blockSeg[b] !== seg) {
      seg = blockSeg[b];
      A.fill(0);
      U.fill(0);
      psi.fill(1);
      v.fill(0);
      for (let m = 0; m < K; m++) v[P + m] = 1;
      v[Q - 1] = y[blockStart[b]];
      addOuter(acc, v, Q);
    }
    for (let run = blockRun[b]; run < blockRun[b + 1]; run++) {
      steps.set(runDtMs[run]);
      const end = runEnd[run];
      for (let k = runStart[run]; k < end; k++) {
        const a0 = a[k - 1], a1 = a[k];
        let aSum = 0;
        for (let m = 0; m < K; m++) {
          const e = E[m];
          const am = e * A[m] + cA0[m] * a0 + cA1[m] * a1;
          A[m] = am;
          aSum += am;
          const pm = psi[m] * e;
          psi[m] = pm < 1e-18 ? 0 : pm;
          v[P + m] = psi[m];
        }
        for (let j = 0; j < P; j++) {
          const u = inputs[j][k];
          let s = 0;
          for (let m = 0; m < K; m++) {
            const i = j * K + m;
            const um = E[m] * U[i] + cQ[m] * u;
            U[i] = um;
            s += um;
          }
          v[j] = s;
        }
        v[Q - 1] = y[k] - aSum;
        addOuter(acc, v, Q);
      }
    }
    out.set(acc, b * size);
  }
}

/** acc += upper triangle of v·vᵀ (row by row). */
function addOuter(acc: Float64Array, v: Float64Array, Q: number): void {
  let idx = 0;
  for (let i = 0; i < Q; i++) {
    const vi = v[i];
    for (let j = i; j < Q; j++) acc[idx++] += vi * v[j];
  }
}

/**
 * The basis columns at every reading (for the intervals and the Jacobian of a non-linear search):
 * A (outdoor response), U_j (forcing responses, j·n + k) and ψ_m (mode decays, m·n + k).
 */
export interface BasisColumns {
  A: Float64Array;
  U: Float64Array;
  psi: Float64Array;
}

/** The same pass as accumulate, keeping every reading's basis values instead of block sums. */
export function basisColumns(log: PreparedLog, blocks: Blocks, modes: Modes, inputs: readonly Float64Array[]): BasisColumns {
  const { a } = log;
  const n = a.length;
  const P = inputs.length;
  const K = modes.count;
  const steps = new ModeSteps(modes);
  const { E, cA0, cA1, cQ } = steps;
  const outA = new Float64Array(n);
  const outU = new Float64Array(P * n);
  const outPsi = new Float64Array(K * n);
  const A = new Float64Array(K);
  const U = new Float64Array(P * K);
  const psi = new Float64Array(K);
  const { blockStart, blockSeg, blockRun, runStart, runEnd, runDtMs } = blocks;
  let seg = -1;
  for (let b = 0; b < blocks.count; b++) {
    if (blockSeg[b] !== seg) {
      seg = blockSeg[b];
      A.fill(0);
      U.fill(0);
      psi.fill(1);
      const k0 = blockStart[b];
      for (let m = 0; m < K; m++) outPsi[m * n + k0] = 1;
    }
    for (let run = blockRun[b]; run < blockRun[b + 1]; run++) {
      steps.set(runDtMs[run]);
      const end = runEnd[run];
      for (let k = runStart[run]; k < end; k++) {
        const a0 = a[k - 1], a1 = a[k];
        let aSum = 0;
        for (let m = 0; m < K; m++) {
          const e = E[m];
          A[m] = e * A[m] + cA0[m] * a0 + cA1[m] * a1;
          aSum += A[m];
          const pm = psi[m] * e;
          psi[m] = pm < 1e-18 ? 0 : pm;
          outPsi[m * n + k] = psi[m];
        }
        outA[k] = aSum;
        for (let j = 0; j < P; j++) {
          const u = inputs[j][k];
          let s = 0;
          for (let m = 0; m < K; m++) {
            const i = j * K + m;
            U[i] = E[m] * U[i] + cQ[m] * u;
            s += U[i];
          }
          outU[j * n + k] = s;
        }
      }
    }
  }
  return { A: outA, U: outU, psi: outPsi };
}

/** accumulateOne for three inputs (heating, gain and the sun; or heating, cooling and gain): columns [U0 U1 U2 ψ r]. */
function accumulateOneThree(log: PreparedLog, blocks: Blocks, modes: Modes, inputs: readonly Float64Array[], out: Float64Array): void {
  const { y, a } = log;
  const { size } = layout(3, 1);
  const [in0, in1, in2] = inputs;
  const { blockStart, blockSeg, blockRun, runStart, runEnd, runDtMs } = blocks;
  const steps = new ModeSteps(modes);
  let A = 0, U0 = 0, U1 = 0, U2 = 0, psi = 1;
  let seg = -1;
  for (let b = 0; b < blocks.count; b++) {
    let s00 = 0, s01 = 0, s02 = 0, s03 = 0, s04 = 0, s11 = 0, s12 = 0, s13 = 0, s14 = 0;
    let s22 = 0, s23 = 0, s24 = 0, s33 = 0, s34 = 0, s44 = 0;
    if (blockSeg[b] !== seg) {
      seg = blockSeg[b];
      A = 0; U0 = 0; U1 = 0; U2 = 0; psi = 1;
      const r = y[blockStart[b]];
      s33 += 1; s34 += r; s44 += r * r;
    }
    for (let run = blockRun[b]; run < blockRun[b + 1]; run++) {
      steps.set(runDtMs[run]);
      const E = steps.E[0], cA0 = steps.cA0[0], cA1 = steps.cA1[0], cQ = steps.cQ[0];
      const end = runEnd[run];
      let aPrev = a[runStart[run] - 1];
      for (let k = runStart[run]; k < end; k++) {
        const aK = a[k];
        A = E * A + cA0 * aPrev + cA1 * aK;
        aPrev = aK;
        U0 = E * U0 + cQ * in0[k];
        U1 = E * U1 + cQ * in1[k];
        U2 = E * U2 + cQ * in2[k];
        const pe = psi * E;
        psi = pe < 1e-18 ? 0 : pe;
        const r = y[k] - A;
        s00 += U0 * U0; s01 += U0 * U1; s02 += U0 * U2; s03 += U0 * psi; s04 += U0 * r;
        s11 += U1 * U1; s12 += U1 * U2; s13 += U1 * psi; s14 += U1 * r;
        s22 += U2 * U2; s23 += U2 * psi; s24 += U2 * r;
        s33 += psi * psi; s34 += psi * r; s44 += r * r;
      }
    }
    // The layout of three inputs is this column order already (upper triangle row by row).
    const o = b * size;
    out[o] = s00; out[o + 1] = s01; out[o + 2] = s02; out[o + 3] = s03; out[o + 4] = s04;
    out[o + 5] = s11; out[o + 6] = s12; out[o + 7] = s13; out[o + 8] = s14;
    out[o + 9] = s22; out[o + 10] = s23; out[o + 11] = s24;
    out[o + 12] = s33; out[o + 13] = s34; out[o + 14] = s44;
  }
}
