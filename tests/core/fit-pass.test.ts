/**
 * The fitter's simulation pass (core/fit/pass.ts) and its least-squares solve (core/fit/solve.ts).
 *
 * - The written-out passes (one and two modes, four input slots; one mode with two or three inputs) must give the sums of the plain
 *   reference pass accumulateGeneric, to rounding.
 * - For one node, the sums must agree with a reading-by-reading computation from core/step.ts's
 *   stepExact (no runs, no blocks bookkeeping); for two nodes, with the per-reading basis columns.
 * - The Schur-complement solve from block sums must match ml-matrix's least-squares solution of the same
 *   problem written out reading by reading (ml-matrix is a general-purpose linear-algebra library from
 *   the npm registry: an outside reference), with and without day weights.
 * Invented logs: deterministic formulas, no real data needed for an identity of two computations.
 */
import { Matrix, solve } from 'ml-matrix';
import { describe, expect, it } from 'vitest';
import { prepareLog, type PreparedLog } from '../../core/fit/prepare.ts';
import { accumulate, accumulateGeneric, basisColumns, gramIndex, layout, makeBlocks } from '../../core/fit/pass.ts';
import { blockCounts, solveLinear } from '../../core/fit/solve.ts';
import { fitContext } from '../../core/fit/context.ts';
import { modesOf, type Modes } from '../../core/modes.ts';
import { stepExact } from '../../core/step.ts';
import type { ZoneSeries } from '../../core/types.ts';

type Runtime = 'heat' | 'cool' | 'both' | 'none';

/**
 * Four days of readings about every 5 minutes (some 4, 6 or 7 minutes apart), with a 3-hour gap that
 * splits the log into two segments; heating runs in the cold hours, cooling in the warm ones.
 */
function series(runtime: Runtime): ZoneSeries {
  const time: number[] = [];
  let t = Date.UTC(2026, 0, 10, 21, 13);
  for (let i = 0; i < 4 * 288; i++) {
    time.push(t);
    t += i % 17 === 0 ? 4 * 60_000 : i % 29 === 0 ? 7 * 60_000 : i % 31 === 0 ? 6 * 60_000 : 5 * 60_000;
    if (i === 500) t += 3 * 3_600_000;
  }
  const n = time.length;
  const hour = (i: number) => (time[i] / 3_600_000) % 24;
  const outdoor = time.map((_, i) => 8 + 7 * Math.sin((2 * Math.PI * (hour(i) - 9)) / 24));
  const indoor = time.map((_, i) => 20 + 1.5 * Math.sin((2 * Math.PI * hour(i)) / 24) + 0.3 * Math.cos(i));
  const heat = time.map((_, i) => (outdoor[i] < 6 ? 0.2 + (0.6 * ((i * 7) % 5)) / 4 : 0));
  const cool = time.map((_, i) => (outdoor[i] > 12 ? ((i * 3) % 4) / 3 : 0));
  const none = new Float64Array(n).fill(NaN);
  return {
    time: Float64Array.from(time),
    indoor: Float64Array.from(indoor),
    outdoor: Float64Array.from(outdoor),
    heatSetpoint: new Float64Array(n).fill(21),
    coolSetpoint: new Float64Array(n).fill(24),
    heat: runtime === 'heat' || runtime === 'both' ? Float64Array.from(heat) : runtime === 'none' ? new Float64Array(n) : none,
    cool: runtime === 'cool' || runtime === 'both' ? Float64Array.from(cool) : none,
  };
}

/** A solar-like fourth input, so the four-slot passes are exercised in full. */
function sunOf(log: PreparedLog): Float64Array {
  return Float64Array.from(log.timeMs, (t) => Math.max(0, Math.sin((2 * Math.PI * ((t / 3_600_000) % 24 - 6)) / 24)));
}

const ONE: Modes[] = [0.3, 6, 40, 1500].map((tauHours) => modesOf({ tauHours }));
const TWO: Modes[] = [
  { airMassHours: 1.5, massOutdoorHours: 40, massShare: 0.9 },
  { airMassHours: 4, massOutdoorHours: 90, massShare: 0.7 },
].map((mass) => modesOf({ tauHours: 1, mass }));

function inputsOf(runtime: Runtime, withSun: boolean) {
  const log = prepareLog(series(runtime));
  const ctx = fitContext(log, withSun ? sunOf(log) : null);
  return { log, ctx, blocks: ctx.blocks, inputs: ctx.inputs };
}

describe('the simulation pass', () => {
  for (const runtime of ['heat', 'cool', 'both', 'none'] as const) {
    it(`written-out and reference passes agree (${runtime === 'none' ? 'no runtime' : runtime === 'both' ? 'heating and cooling' : `${runtime}ing only`}, with and without sun)`, () => {
      for (const withSun of [false, true]) {
        const { log, blocks, inputs } = inputsOf(runtime, withSun);
        expect(log.segStart.length - 1).toBe(2);
        for (const modes of [...ONE, ...TWO]) {
          const lay = layout(inputs.length, modes.count);
          const fast = new Float64Array(blocks.count * lay.size).fill(NaN);
          const plain = new Float64Array(blocks.count * lay.size).fill(NaN);
          accumulate(log, blocks, modes, inputs, fast);
          accumulateGeneric(log, blocks, modes, inputs, plain);
          for (let i = 0; i < fast.length; i++) {
            // Same sums in a different order of operations: rounding only (1e-12 of the scale).
            const scale = Math.max(1, Math.abs(plain[i]));
            if (!(Math.abs(fast[i] - plain[i]) <= 1e-12 * scale)) {
              expect.fail(`τ ${modes.tau.join('/')} h, block ${Math.floor(i / lay.size)}, sum ${i % lay.size}: ${fast[i]} vs ${plain[i]}`);
            }
          }
        }
      }
    });
  }

  it('one node: the sums agree with a reading-by-reading computation with stepExact', () => {
    for (const runtime of ['heat', 'cool', 'both'] as const) {
      const { log, blocks, inputs } = inputsOf(runtime, false);
      for (const modes of ONE) {
        const tau = modes.tau[0];
        const P = inputs.length;
        const lay = layout(P, 1);
        const got = new Float64Array(blocks.count * lay.size);
        accumulate(log, blocks, modes, inputs, got);
        // Reference: every basis stepped one reading at a time, blocks found afresh.
        const n = log.y.length;
        const cols = Array.from({ length: P + 2 }, () => new Float64Array(n)); // U_0..U_{P-1}, ψ, r
        const want: Float64Array[] = [];
        let sums = new Float64Array(lay.size);
        for (let s = 0; s + 1 < log.segStart.length; s++) {
          let A = 0;
          for (let k = log.segStart[s]; k < log.segStart[s + 1]; k++) {
            if (k === log.segStart[s]) {
              for (let j = 0; j < P; j++) cols[j][k] = 0;
              cols[P][k] = 1;
              A = 0;
            } else {
              const dt = (log.timeMs[k] - log.timeMs[k - 1]) / 3_600_000;
              for (let j = 0; j < P; j++) cols[j][k] = stepExact(cols[j][k - 1], dt, tau, 0, 0, inputs[j][k]);
              cols[P][k] = stepExact(cols[P][k - 1], dt, tau, 0, 0, 0);
              A = stepExact(A, dt, tau, log.a[k - 1], log.a[k], 0);
            }
            cols[P + 1][k] = log.y[k] - A;
            if (k === log.segStart[s] || log.day[k] !== log.day[k - 1]) want.push((sums = new Float64Array(lay.size)));
            for (let i = 0; i < lay.Q; i++) for (let j = i; j < lay.Q; j++) sums[gramIndex(lay.Q, i, j)] += cols[i][k] * cols[j][k];
          }
        }
        expect(want.length).toBe(blocks.count);
        want.forEach((w, b) =>
          w.forEach((v, j) => {
            // Same terms computed another way: agreement to rounding (1e-9 of the scale).
            expect(Math.abs(got[b * lay.size + j] - v), `${runtime}, τ ${tau} h, block ${b}, sum ${j}`).toBeLessThan(1e-9 * Math.max(1, Math.abs(v)));
          }),
        );
      }
    }
  });

  it('runs of equal interval cover every stepped reading once', () => {
    const log = prepareLog(series('both'));
    const blocks = makeBlocks(log);
    const covered = new Uint8Array(log.y.length);
    for (let b = 0; b < blocks.count; b++) {
      for (let r = blocks.blockRun[b]; r < blocks.blockRun[b + 1]; r++) {
        for (let k = blocks.runStart[r]; k < blocks.runEnd[r]; k++) {
          covered[k]++;
          expect(log.timeMs[k] - log.timeMs[k - 1]).toBe(blocks.runDtMs[r]);
          expect(k).toBeGreaterThanOrEqual(blocks.blockStart[b]);
          expect(k).toBeLessThan(blocks.blockStart[b + 1]);
        }
      }
    }
    const firsts = new Set(Array.from(log.segStart.subarray(0, -1)));
    covered.forEach((c, k) => expect(c, `reading ${k}`).toBe(firsts.has(k) ? 0 : 1));
  });
});

describe('the least-squares solve from block sums', () => {
  it('matches a reading-by-reading least-squares solution (ml-matrix), one and two nodes, with and without day weights', () => {
    for (const runtime of ['heat', 'cool', 'both'] as const) {
      const { log, blocks, inputs } = inputsOf(runtime, true);
      for (const modes of [ONE[1], TWO[0]]) {
        const P = inputs.length;
        const K = modes.count;
        const lay = layout(P, K);
        const stats = new Float64Array(blocks.count * lay.size);
        accumulate(log, blocks, modes, inputs, stats);
        const { A, U, psi } = basisColumns(log, blocks, modes, inputs);
        const n = log.y.length;
        const segOf = new Int32Array(n);
        for (let s = 0; s + 1 < log.segStart.length; s++) segOf.fill(s, log.segStart[s], log.segStart[s + 1]);
        const segCount = blocks.segCount;
        for (const weights of [null, Float64Array.from({ length: log.dayCount }, (_, d) => [2, 0, 1, 3, 1][d % 5])]) {
          const got = solveLinear(stats, blocks, lay, weights, blockCounts(blocks));
          // Rows scaled by √w; columns: β (P inputs), then K initial-state columns per segment.
          const rows: number[][] = [];
          const target: number[] = [];
          let wSum = 0;
          for (let k = 0; k < n; k++) {
            const w = weights ? weights[log.day[k]] : 1;
            wSum += w;
            const q = Math.sqrt(w);
            const row = Array.from({ length: P }, (_, j) => q * U[j * n + k]);
            for (let s = 0; s < segCount; s++) for (let m = 0; m < K; m++) row.push(s === segOf[k] ? q * psi[m * n + k] : 0);
            rows.push(row);
            target.push(q * (log.y[k] - A[k]));
          }
          const X = new Matrix(rows);
          const theta = solve(X.transpose().mmul(X), X.transpose().mmul(Matrix.columnVector(target))).to1DArray();
          const fitted = X.mmul(Matrix.columnVector(theta)).to1DArray();
          const rss = target.reduce((acc, t, k) => acc + (t - fitted[k]) ** 2, 0);
          const what = `${runtime}, ${K} mode(s), ${weights ? 'weighted' : 'unweighted'}`;
          // Tolerance: the normal equations solved two ways (Schur complement vs full system) agree to
          // rounding amplified by the conditioning; 1e-6 relative is far above that and far below any real error.
          for (let j = 0; j < P; j++) expect(Math.abs(got.beta[j] - theta[j]), `${what}, β${j}`).toBeLessThan(1e-6 * Math.max(1, Math.abs(theta[j])));
          for (let i = 0; i < segCount * K; i++) expect(Math.abs(got.init[i] - theta[P + i]), `${what}, init ${i}`).toBeLessThan(1e-6 * Math.max(1, Math.abs(theta[P + i])));
          expect(Math.abs(got.rss - rss), what).toBeLessThan(1e-6 * rss);
          expect(got.n, what).toBe(wSum);
        }
      }
    }
  });
});
