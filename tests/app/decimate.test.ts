/** The chart decimation keeps every extreme, marks gaps, and bounds the number of points. */
import { describe, expect, it } from 'vitest';
import { decimate, lowerBound } from '../../app/renderer/src/lib/decimate.ts';

const MIN = 60_000;

describe('decimate', () => {
  it('keeps the minimum and maximum of every bucket, in time order, and stays near 4 points per bucket', () => {
    // A year of 5-minute readings of a daily sine with a few spikes (invented test data).
    const n = 365 * 288;
    const time = Float64Array.from({ length: n }, (_, i) => i * 5 * MIN);
    const value = Float64Array.from({ length: n }, (_, i) => 20 + 3 * Math.sin((2 * Math.PI * i) / 288));
    value[12345] = 40;
    value[99999] = -10;
    const out = decimate(time, value, 0, time[n - 1]!, 1000, 20 * MIN);
    expect(out.length).toBeLessThanOrEqual(4 * 1001);
    const ys = out.map((p) => p.y as number);
    expect(Math.max(...ys)).toBe(40);
    expect(Math.min(...ys)).toBe(-10);
    for (let i = 1; i < out.length; i++) expect(out[i]!.x).toBeGreaterThan(out[i - 1]!.x);
  });

  it('puts a null point in a gap longer than gapMs and skips missing values', () => {
    const time = [0, 5, 10, 15, 100, 105].map((m) => m * MIN);
    const value = [1, 2, NaN, 3, 4, 5];
    const out = decimate(time, value, 0, 105 * MIN, 100, 20 * MIN);
    expect(out.map((p) => p.y)).toEqual([1, 2, 3, null, 4, 5]);
  });

  it('returns only the window with one point of margin on each side', () => {
    const time = Array.from({ length: 100 }, (_, i) => i * MIN);
    const value = time.map((t) => t / MIN);
    const out = decimate(time, value, 10 * MIN, 20 * MIN, 100, 5 * MIN);
    expect(out[0]!.y).toBe(9);
    expect(out[out.length - 1]!.y).toBe(21);
  });

  it('lowerBound finds the first element not below x', () => {
    expect(lowerBound([1, 3, 3, 7], 3)).toBe(1);
    expect(lowerBound([1, 3, 3, 7], 8)).toBe(4);
    expect(lowerBound([], 1)).toBe(0);
  });
});
