/**
 * The fitter's simulation pass (core/fit/profile.ts): the specialised pass for logs that only heat or
 * only cool must give bit-for-bit the sums of the general pass, and both must agree with a plain
 * reading-by-reading computation of the same sums from core/step.ts's stepExact (no runs, no blocks
 * bookkeeping, no phases), on logs with irregular intervals, several segments and several days.
 * The least-squares solve from block sums (Schur complement of the per-segment initial states) is checked
 * against ml-matrix's least-squares solution of the same problem written out reading by reading.
 * Invented logs: deterministic formulas, no real data needed for an identity of two computations.
 */
import { Matrix, solve } from 'ml-matrix';
import { describe, expect, it } from 'vitest';
import { prepareLog, type PreparedLog } from '../../core/fit/prepare.ts';
import { STATS, accumulate, accumulateAll, blockCounts, makeBlocks, solveBlocks, solveParameters, workspaceSize } from '../../core/fit/profile.ts';
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
  const heat = time.map((_, i) => (outdoor[i] < 6 ? 0.2 + 0.6 * ((i * 7) % 5) / 4 : 0));
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

/** Basis responses at every reading, stepped one reading at a time with stepExact (C with −u_c). */
function referenceBases(log: PreparedLog, tauHours: number) {
  const n = log.y.length;
  const phi = new Float64Array(n), A = new Float64Array(n), H = new Float64Array(n), C = new Float64Array(n), G = new Float64Array(n);
  const seg = new Int32Array(n);
  for (let s = 0; s + 1 < log.segStart.length; s++) {
    for (let k = log.segStart[s]; k < log.segStart[s + 1]; k++) {
      seg[k] = s;
      if (k === log.segStart[s]) {
        phi[k] = 1;
        continue;
      }
      const dt = (log.timeMs[k] - log.timeMs[k - 1]) / 3_600_000;
      phi[k] = stepExact(phi[k - 1], dt, tauHours, 0, 0, 0);
      A[k] = stepExact(A[k - 1], dt, tauHours, log.a[k - 1], log.a[k], 0);
      H[k] = stepExact(H[k - 1], dt, tauHours, 0, 0, log.uh[k]);
      C[k] = stepExact(C[k - 1], dt, tauHours, 0, 0, -log.uc[k]);
      G[k] = stepExact(G[k - 1], dt, tauHours, 0, 0, 1);
    }
  }
  return { phi, A, H, C, G, seg };
}

/** The block sums computed reading by reading, for comparison. */
function referenceSums(log: PreparedLog, tauHours: number): Float64Array[] {
  const { phi, A, H, C, G } = referenceBases(log, tauHours);
  const blocks: Float64Array[] = [];
  let sums = new Float64Array(STATS);
  for (let s = 0; s + 1 < log.segStart.length; s++) {
    for (let k = log.segStart[s]; k < log.segStart[s + 1]; k++) {
      if (k === log.segStart[s] || log.day[k] !== log.day[k - 1]) blocks.push((sums = new Float64Array(STATS)));
      const h = H[k], c = C[k], g = G[k], p = phi[k], r = log.y[k] - A[k];
      // Order: HH HC HG CC CG GG HR CR GR RR PP PH PC PG PR (profile.ts).
      const terms = [h * h, h * c, h * g, c * c, c * g, g * g, h * r, c * r, g * r, r * r, p * p, p * h, p * c, p * g, p * r];
      terms.forEach((x, j) => (sums[j] += x));
    }
  }
  return blocks;
}

const TAUS = [0.3, 6, 40, 1500];

describe('the simulation pass', () => {
  for (const runtime of ['heat', 'cool', 'both', 'none'] as const) {
    it(`specialised and general passes give identical sums (${runtime === 'none' ? 'no runtime' : runtime === 'both' ? 'heating and cooling' : `${runtime}ing only`})`, () => {
      const log = prepareLog(series(runtime));
      const blocks = makeBlocks(log);
      expect(log.segStart.length - 1).toBe(2);
      expect(blocks.heating).toBe(runtime === 'heat' || runtime === 'both');
      expect(blocks.cooling).toBe(runtime === 'cool' || runtime === 'both');
      for (const tau of TAUS) {
        const fast = new Float64Array(blocks.count * STATS).fill(NaN);
        const general = new Float64Array(blocks.count * STATS).fill(NaN);
        accumulate(log, blocks, tau, fast);
        accumulateAll(log, blocks, tau, general);
        for (let i = 0; i < fast.length; i++) {
          if (!Object.is(fast[i], general[i])) expect.fail(`τ ${tau} h, block ${Math.floor(i / STATS)}, sum ${i % STATS}: ${fast[i]} vs ${general[i]}`);
        }
      }
    });
  }

  it('the sums agree with a reading-by-reading computation', () => {
    for (const runtime of ['heat', 'cool', 'both'] as const) {
      const log = prepareLog(series(runtime));
      const blocks = makeBlocks(log);
      for (const tau of TAUS) {
        const ref = referenceSums(log, tau);
        expect(ref.length).toBe(blocks.count);
        const got = new Float64Array(blocks.count * STATS);
        accumulate(log, blocks, tau, got);
        ref.forEach((sums, b) => {
          sums.forEach((want, j) => {
            // Same terms, computed another way: agreement to rounding (1e-9 relative, or 1e-9 of the scale).
            const scale = Math.max(1, Math.abs(want));
            expect(Math.abs(got[b * STATS + j] - want), `${runtime}, τ ${tau} h, block ${b}, sum ${j}`).toBeLessThan(1e-9 * scale);
          });
        });
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
  it('matches a reading-by-reading least-squares solution (ml-matrix), with and without day weights', () => {
    for (const runtime of ['heat', 'cool', 'both'] as const) {
      const log = prepareLog(series(runtime));
      const blocks = makeBlocks(log);
      const active = { heat: log.hasHeating, cool: log.hasCooling };
      const tau = 9;
      const stats = new Float64Array(blocks.count * STATS);
      accumulate(log, blocks, tau, stats);
      const { phi, A, H, C, G, seg } = referenceBases(log, tau);
      const segCount = blocks.segCount;
      for (const weights of [null, Float64Array.from({ length: log.dayCount }, (_, d) => [2, 0, 1, 3, 1][d % 5])]) {
        const got = solveBlocks(stats, blocks, weights, active, blockCounts(blocks));
        // Rows scaled by √w; columns: one initial state per segment, then h, c (if active), g.
        const rows: number[][] = [];
        const target: number[] = [];
        let wSum = 0;
        for (let k = 0; k < log.y.length; k++) {
          const w = weights ? weights[log.day[k]] : 1;
          wSum += w;
          const q = Math.sqrt(w);
          const row = Array.from({ length: segCount }, (_, s) => (s === seg[k] ? q * phi[k] : 0));
          if (active.heat) row.push(q * H[k]);
          if (active.cool) row.push(q * C[k]);
          row.push(q * G[k]);
          rows.push(row);
          target.push(q * (log.y[k] - A[k]));
        }
        const X = new Matrix(rows);
        const theta = solve(X.transpose().mmul(X), X.transpose().mmul(Matrix.columnVector(target))).to1DArray();
        const fitted = X.mmul(Matrix.columnVector(theta)).to1DArray();
        const rss = target.reduce((acc, t, k) => acc + (t - fitted[k]) ** 2, 0);
        let j = segCount;
        const want = { heatRate: active.heat ? theta[j++] : 0, coolRate: active.cool ? theta[j++] : 0, gain: theta[j] };
        const what = `${runtime}, ${weights ? 'weighted' : 'unweighted'}`;
        // Tolerances: the normal equations are solved two ways (Schur complement vs full system), so they
        // agree to rounding amplified by the system's conditioning; 1e-7 relative is far above that and far
        // below any real error.
        expect(Math.abs(got.heatRate - want.heatRate), what).toBeLessThan(1e-7 * Math.max(1, Math.abs(want.heatRate)));
        expect(Math.abs(got.coolRate - want.coolRate), what).toBeLessThan(1e-7 * Math.max(1, Math.abs(want.coolRate)));
        expect(Math.abs(got.gain - want.gain), what).toBeLessThan(1e-7 * Math.max(1, Math.abs(want.gain)));
        expect(Math.abs(got.rss - rss), what).toBeLessThan(1e-7 * rss);
        expect(got.n, what).toBe(wSum);
        for (let s = 0; s < segCount; s++) expect(Math.abs(got.x0[s] - theta[s]), `${what}, segment ${s}`).toBeLessThan(1e-7 * Math.max(1, Math.abs(theta[s])));
        // solveParameters is the same solve without the initial states.
        const params = solveParameters(stats, blocks, weights, active, blockCounts(blocks), new Float64Array(workspaceSize(segCount)));
        expect(params).toEqual({ rss: got.rss, n: got.n, heatRate: got.heatRate, coolRate: got.coolRate, gain: got.gain });
      }
    }
  });
});
