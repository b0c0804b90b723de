/**
 * Min–max decimation with gaps, for long time series on a chart of a few thousand pixels.
 *
 * A year of 5-minute readings is 105 120 points per series; a chart needs at most a few per pixel.
 * For the visible window (plus one window's margin on each side, so panning shows data at once), the
 * readings are split into buckets of equal time; each bucket keeps its first, lowest, highest and
 * last reading in time order, so peaks and troughs survive at every zoom. A gap in the log (readings
 * further apart than `gapMs`) becomes a null point, which the chart draws as a break instead of a
 * line across missing data. Zooming in re-runs it on the narrower window, so detail comes back.
 *
 * Pure and allocation-light: no DOM, no chart.js.
 */
export interface XY {
  x: number;
  y: number | null;
}

/** Index of the first element of the sorted `time` that is ≥ x. */
export function lowerBound(time: ArrayLike<number>, x: number): number {
  let lo = 0;
  let hi = time.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (time[mid]! < x) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

/**
 * @param time sorted times (ms); @param value values (NaN = missing) of the same length
 * @param fromMs, toMs the window to cover; @param buckets how many buckets across the window
 * @param gapMs readings further apart than this are not joined
 * @returns points in time order, with {x, y: null} at gaps
 */
export function decimate(time: ArrayLike<number>, value: ArrayLike<number>, fromMs: number, toMs: number, buckets: number, gapMs: number): XY[] {
  const n = time.length;
  const out: XY[] = [];
  if (n === 0 || !(toMs > fromMs)) return out;
  const start = Math.max(0, lowerBound(time, fromMs) - 1);
  let past = lowerBound(time, toMs);
  while (past < n && time[past]! <= toMs) past++;
  const end = Math.min(n, past + 1);
  const width = (toMs - fromMs) / Math.max(1, buckets);
  // Few enough points: all of them, with the gaps marked.
  const all = end - start <= buckets * 4;
  let bucket = NaN;
  let first = -1;
  let last = -1;
  let lo = -1;
  let hi = -1;
  let prevT = NaN;
  const flush = () => {
    if (first < 0) return;
    const idx = [first, lo, hi, last].sort((a, b) => a - b);
    let prev = -1;
    for (const i of idx) {
      if (i !== prev) out.push({ x: time[i]!, y: value[i]! });
      prev = i;
    }
    first = last = lo = hi = -1;
  };
  for (let i = start; i < end; i++) {
    const v = value[i]!;
    if (!Number.isFinite(v)) continue;
    const t = time[i]!;
    if (prevT === prevT && t - prevT > gapMs) {
      flush();
      out.push({ x: (t + prevT) / 2, y: null });
    }
    prevT = t;
    if (all) {
      out.push({ x: t, y: v });
      continue;
    }
    const b = Math.floor((t - fromMs) / width);
    if (b !== bucket) {
      flush();
      bucket = b;
      first = lo = hi = i;
    } else {
      if (v < value[lo]!) lo = i;
      if (v > value[hi]!) hi = i;
    }
    last = i;
  }
  flush();
  return out;
}
