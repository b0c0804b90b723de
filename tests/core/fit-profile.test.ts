/**
 * The fitter's simulation pass (core/fit/profile.ts): the specialised pass for logs that only heat or
 * only cool must give bit-for-bit the sums of the general pass, and both must agree with a plain
 * reading-by-reading computation of the same sums from core/step.ts's stepExact (no runs, no blocks
 * bookkeeping, no phases), on logs with irregular intervals, several segments and several days.
 * Invented logs: deterministic formulas, no real data needed for an identity of two computations.
 */
import { describe, expect, it } from 'vitest';
import { prepareLog, type PreparedLog } from '../../core/fit/prepare.ts';
import { STATS, accumulate, accumulateAll, makeBlocks } from '../../core/fit/profile.ts';
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

/** The block sums computed reading by reading with stepExact, for comparison. */
function referenceSums(log: PreparedLog, tauHours: number): Float64Array[] {
  const blocks: Float64Array[] = [];
  let sums = new Float64Array(STATS);
  let phi = 1, A = 0, H = 0, C = 0, G = 0;
  for (let s = 0; s + 1 < log.segStart.length; s++) {
    for (let k = log.segStart[s]; k < log.segStart[s + 1]; k++) {
      if (k === log.segStart[s] || log.day[k] !== log.day[k - 1]) blocks.push((sums = new Float64Array(STATS)));
      if (k === log.segStart[s]) {
        phi = 1; A = 0; H = 0; C = 0; G = 0;
      } else {
        const dt = (log.timeMs[k] - log.timeMs[k - 1]) / 3_600_000;
        phi = stepExact(phi, dt, tauHours, 0, 0, 0);
        A = stepExact(A, dt, tauHours, log.a[k - 1], log.a[k], 0);
        H = stepExact(H, dt, tauHours, 0, 0, log.uh[k]);
        C = stepExact(C, dt, tauHours, 0, 0, -log.uc[k]);
        G = stepExact(G, dt, tauHours, 0, 0, 1);
      }
      const r = log.y[k] - A;
      // Order: HH HC HG CC CG GG HR CR GR RR PP PH PC PG PR (profile.ts).
      const terms = [H * H, H * C, H * G, C * C, C * G, G * G, H * r, C * r, G * r, r * r, phi * phi, phi * H, phi * C, phi * G, phi * r];
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
