/**
 * The history chart's data (core/history.ts): decimation keeps every extreme, marks gaps and bounds the
 * number of points; runtime bins are plain averages over clock-aligned bins; the summary's figures
 * agree with a direct computation. All series here are invented test data.
 */
import { describe, expect, it } from 'vitest';
import { decimate, historySummary, lowerBound, medianSpacing, runtimeBinHours, runtimeBins } from '../../core/history.ts';
import type { ZoneSeries } from '../../core/types.ts';

const MIN = 60_000;
const HOUR = 60 * MIN;

describe('decimate', () => {
  it('keeps the minimum and maximum of every bucket, in time order, and stays near 4 points per bucket', () => {
    // A year of 5-minute readings of a daily sine with two spikes.
    const n = 365 * 288;
    const time = Float64Array.from({ length: n }, (_, i) => i * 5 * MIN);
    const value = Float64Array.from({ length: n }, (_, i) => 20 + 3 * Math.sin((2 * Math.PI * i) / 288));
    value[12345] = 40;
    value[99999] = -10;
    const out = decimate(time, value, 0, time[n - 1]!, 1000, 20 * MIN);
    expect(out.x.length).toBe(out.y.length);
    expect(out.x.length).toBeLessThanOrEqual(4 * 1001);
    const ys = out.y as number[];
    expect(Math.max(...ys)).toBe(40);
    expect(Math.min(...ys)).toBe(-10);
    for (let i = 1; i < out.x.length; i++) expect(out.x[i]!).toBeGreaterThan(out.x[i - 1]!);
    // Every bucket's own extremes are there: check the bucket holding the spike and a plain one.
    const width = time[n - 1]! / 1000;
    for (const b of [0, 137, 999]) {
      let lo = Infinity;
      let hi = -Infinity;
      for (let i = 0; i < n; i++) {
        if (Math.floor(time[i]! / width) !== b) continue;
        lo = Math.min(lo, value[i]!);
        hi = Math.max(hi, value[i]!);
      }
      const kept = out.x.map((x, i) => [x, out.y[i]!] as const).filter(([x]) => Math.floor(x / width) === b).map(([, y]) => y);
      expect(Math.min(...kept)).toBe(lo);
      expect(Math.max(...kept)).toBe(hi);
    }
  });

  it('puts a null point in a gap longer than gapMs and skips missing values', () => {
    const time = [0, 5, 10, 15, 100, 105].map((m) => m * MIN);
    const value = [1, 2, NaN, 3, 4, 5];
    const out = decimate(time, value, 0, 105 * MIN, 100, 20 * MIN);
    expect(out.y).toEqual([1, 2, 3, null, 4, 5]);
    expect(out.x[3]).toBe(((15 + 100) / 2) * MIN);
  });

  it('returns only the window with one point of margin on each side, rounded as asked', () => {
    const time = Array.from({ length: 100 }, (_, i) => i * MIN);
    const value = time.map((t) => t / MIN + 0.12345);
    const out = decimate(time, value, 10 * MIN, 20 * MIN, 100, 5 * MIN, (v) => Math.round(v * 100) / 100);
    expect(out.y[0]).toBe(9.12);
    expect(out.y[out.y.length - 1]).toBe(21.12);
    expect(out.y).toHaveLength(13);
  });

  it('lowerBound finds the first element not below x', () => {
    expect(lowerBound([1, 3, 3, 7], 3)).toBe(1);
    expect(lowerBound([1, 3, 3, 7], 8)).toBe(4);
    expect(lowerBound([], 1)).toBe(0);
  });
});

describe('runtime bins', () => {
  it('averages each bin of the interval-ending readings, held over the bin and broken at gaps', () => {
    // 5-minute readings over 3 h, then a 3 h gap, then 1 h: runtime i % 4 / 4.
    const time: number[] = [];
    for (let m = 5; m <= 180; m += 5) time.push(m * MIN);
    for (let m = 365; m <= 420; m += 5) time.push(m * MIN);
    const frac = time.map((_, i) => (i % 4) / 4);
    const out = runtimeBins(time, frac, 1);
    // Brute force: the reading at t covers (t − 5 min, t], so belongs to bin floor((t − 1) / 1 h).
    const bins = new Map<number, number[]>();
    time.forEach((t, i) => {
      const b = Math.floor((t - 1) / HOUR) * HOUR;
      bins.set(b, [...(bins.get(b) ?? []), frac[i]!]);
    });
    const values = [...bins.entries()].map(([b, v]) => [b, Math.round((1000 * v.reduce((a, c) => a + c, 0)) / v.length) / 10]);
    // Bins 0, 1, 2 h; a closing point at 3 h; a null in the gap; bin 6 h; its closing point at 7 h.
    expect(out.x).toEqual([0, HOUR, 2 * HOUR, 3 * HOUR, 4.5 * HOUR, 6 * HOUR, 7 * HOUR]);
    expect(out.y).toEqual([values[0]![1], values[1]![1], values[2]![1], values[2]![1], null, values[3]![1], values[3]![1]]);
  });

  it('bins of several hours are averages of their readings; the width follows the zoom', () => {
    const time = Array.from({ length: 48 * 12 }, (_, i) => (i + 1) * 5 * MIN);
    const frac = time.map((t) => (Math.floor((t - 1) / HOUR) % 24 < 6 ? 1 : 0));
    const out = runtimeBins(time, frac, 6);
    expect(out.y.slice(0, 8)).toEqual([100, 0, 0, 0, 100, 0, 0, 0]);
    // A year over 1200 px: hourly bins would be a third of a pixel; a day is 3.3 px.
    expect(runtimeBinHours(365 * 24 * HOUR, 1200)).toBe(24);
    expect(runtimeBinHours(7 * 24 * HOUR, 1200)).toBe(1);
    // A month: 0.62 h per pixel, so 2 h bins are 3.2 px wide.
    expect(runtimeBinHours(31 * 24 * HOUR, 1200)).toBe(2);
  });
});

describe('history summary', () => {
  it('matches a direct computation, with gaps counted as neither logged nor running', () => {
    const n = 2000;
    const time = Float64Array.from({ length: n }, (_, i) => i * 10 * MIN + (i >= 1000 ? 24 * HOUR : 0));
    const series: ZoneSeries = {
      time,
      indoor: Float64Array.from({ length: n }, (_, i) => (i === 7 ? NaN : 18 + (i % 50) / 10)),
      outdoor: new Float64Array(n).fill(NaN),
      heatSetpoint: Float64Array.from({ length: n }, () => 20),
      coolSetpoint: new Float64Array(n).fill(NaN),
      heat: Float64Array.from({ length: n }, (_, i) => (i % 3 === 0 ? 0.5 : 0)),
      cool: new Float64Array(n).fill(NaN),
    };
    const s = historySummary(series);
    expect(s.readings).toBe(n);
    expect(s.stepMs).toBe(10 * MIN);
    expect(medianSpacing(time)).toBe(10 * MIN);
    const indoor = [...series.indoor].filter(Number.isFinite);
    expect(s.indoor!.min).toBe(Math.min(...indoor));
    expect(s.indoor!.max).toBe(Math.max(...indoor));
    expect(s.indoor!.mean).toBeCloseTo(indoor.reduce((a, b) => a + b, 0) / indoor.length, 12);
    // 1998 intervals of 10 min, and the one across the 24 h gap capped at 3 × 10 min.
    expect(s.loggedHours).toBeCloseTo((1998 * 10 + 30) / 60, 9);
    let heat = 0;
    for (let i = 1; i < n; i++) heat += series.heat[i]! * Math.min(time[i]! - time[i - 1]!, 30 * MIN);
    expect(s.heatHours).toBeCloseTo(heat / HOUR, 9);
    expect(s.has).toEqual({ outdoor: false, heatSetpoint: true, coolSetpoint: false, heat: true, cool: false });
  });

  it('an empty series has no figures', () => {
    const e = new Float64Array(0);
    const s = historySummary({ time: e, indoor: e, outdoor: e, heatSetpoint: e, coolSetpoint: e, heat: e, cool: e });
    expect(s).toMatchObject({ readings: 0, firstTime: null, lastTime: null, stepMs: null, indoor: null, heatHours: 0 });
  });
});
