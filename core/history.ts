/**
 * A zone's readings made ready for a history chart: the whole log's summary figures, min–max
 * decimation with gaps for a time window, and runtime averaged over clock-hour bins.
 *
 * A year of 5-minute readings is 105,120 points per series; a chart needs at most a few per pixel.
 * The backend keeps the readings and sends the chart only what the visible window needs (plus a
 * window's margin either side so panning shows data at once): for each equal-time bucket of the
 * window, its first, lowest, highest and last reading in time order, so every peak and trough
 * survives at every zoom. A gap in the log (readings further apart than `gapMs`) becomes a null
 * point, which the chart draws as a break rather than a line across missing data. Zooming in asks
 * again for the narrower window, so the detail comes back; a window of few enough readings is sent
 * whole.
 *
 * Pure and allocation-light: no I/O, no DOM, no chart library. Units are those of the input (the
 * backend works in °C and runtime fractions; the chart converts at its edge).
 */
import { medianInterval } from './interval.ts';
import { localDays } from './localday.ts';
import type { ZoneSeries } from './types.ts';

const HOUR_MS = 3_600_000;

/** Points of one chart line: x (epoch ms) and y (null at a gap). */
export interface Points {
  x: number[];
  y: (number | null)[];
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

/** Median spacing of sorted times, ms (NaN with fewer than two readings): core/interval.ts. */
export function medianSpacing(time: ArrayLike<number>): number {
  return medianInterval(time);
}

/**
 * Min–max decimation of one series over a window.
 * @param time sorted times (ms); @param value values (NaN = missing) of the same length
 * @param fromMs, toMs the window to cover (one reading of margin is kept on each side, so the line
 *   runs to the window's edges); @param buckets how many equal-time buckets across the window
 * @param gapMs readings further apart than this are not joined
 * @param round optional rounding of the values sent (e.g. to 0.001 K)
 * @returns points in time order, with y = null at gaps; every reading when the window holds no
 *   more than 4 per bucket
 */
export function decimate(
  time: ArrayLike<number>,
  value: ArrayLike<number>,
  fromMs: number,
  toMs: number,
  buckets: number,
  gapMs: number,
  round: (v: number) => number = (v) => v,
): Points {
  const n = time.length;
  const out: Points = { x: [], y: [] };
  if (n === 0 || !(toMs > fromMs)) return out;
  const start = Math.max(0, lowerBound(time, fromMs) - 1);
  let past = lowerBound(time, toMs);
  while (past < n && time[past]! <= toMs) past++;
  const end = Math.min(n, past + 1);
  const width = (toMs - fromMs) / Math.max(1, buckets);
  const all = end - start <= buckets * 4;
  let bucket = NaN;
  let first = -1;
  let last = -1;
  let lo = -1;
  let hi = -1;
  let prevT = NaN;
  const push = (i: number) => {
    out.x.push(time[i]!);
    out.y.push(round(value[i]!));
  };
  const flush = () => {
    if (first < 0) return;
    // The four kept readings in time order, each once.
    const a = Math.min(lo, hi);
    const b = Math.max(lo, hi);
    push(first);
    if (a > first) push(a);
    if (b > a && b > first) push(b);
    if (last > b && last > first) push(last);
    first = last = lo = hi = -1;
  };
  for (let i = start; i < end; i++) {
    const v = value[i]!;
    if (!Number.isFinite(v)) continue;
    const t = time[i]!;
    if (prevT === prevT && t - prevT > gapMs) {
      flush();
      out.x.push((t + prevT) / 2);
      out.y.push(null);
    }
    prevT = t;
    if (all) {
      push(i);
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

/** Bin widths offered for runtime, hours: whole divisors of a day, then a day. */
export const RUNTIME_BIN_HOURS = [1, 2, 3, 4, 6, 12, 24] as const;

/**
 * The runtime bin width (hours) for a visible span drawn over `pixels`: the narrowest of
 * RUNTIME_BIN_HOURS whose bins are at least `minPixels` wide, so a year on one screen shows daily
 * shares instead of a solid block of hourly bars.
 */
export function runtimeBinHours(visibleMs: number, pixels: number, minPixels = 3): number {
  const hoursPerPixel = visibleMs / HOUR_MS / Math.max(1, pixels);
  for (const h of RUNTIME_BIN_HOURS) if (h / hoursPerPixel >= minPixels) return h;
  return 24;
}

/**
 * Runtime (fraction of each reading's interval) averaged over clock-aligned bins of `binHours`
 * (aligned to the local midnights of `timeZone`, so a 24 h bin is the zone's own day, 23 or 25 hours
 * long on DST days, and shorter bins count from its midnight; UTC when no zone is given), as % of the
 * bin, one point at the start of each bin (drawn as steps that hold a point's value until the next
 * point), for the bins that overlap the window. Bins without runtime data are left out: the bin
 * before such a gap, and the last bin, get a closing point at their end, and a gap a null point, so
 * every bin is drawn over its own width and the steps do not run across gaps.
 */
export function runtimeBins(time: ArrayLike<number>, frac: ArrayLike<number>, binHours: number, fromMs = -Infinity, toMs = Infinity, timeZone: string | null = null): Points {
  const out: Points = { x: [], y: [] };
  const binMs = binHours * HOUR_MS;
  const days = timeZone && timeZone !== 'UTC' && time.length > 0 ? localDays(timeZone, time[0]!) : null;
  // The bin an instant lies in: its local day's midnight plus whole bins; the last bin of a day runs to
  // the next midnight (so a 24 h bin is the whole 23- or 25-hour day; 1 h bins keep the repeated hour).
  const perDay = binHours >= 1.5 ? Math.max(1, Math.round(24 / binHours)) : Infinity;
  const binOf = (t: number): number => {
    if (!days) return Math.floor(t / binMs) * binMs;
    const s0 = days.startOf(days.dayOf(t));
    return s0 + Math.min(Math.floor((t - s0) / binMs), perDay - 1) * binMs;
  };
  const binEnd = (b: number): number => {
    if (!days) return b + binMs;
    const d = days.dayOf(b);
    const next = days.startOf(d + 1);
    return Math.round((b - days.startOf(d)) / binMs) >= perDay - 1 ? next : Math.min(b + binMs, next);
  };

  // The runtime covers the interval ending at time[i]: attribute it to the bin that interval lies in.
  const startMs = !Number.isFinite(fromMs) ? -Infinity : days ? binOf(binOf(fromMs) - 1) : Math.floor((fromMs - binMs) / binMs) * binMs;
  let i = Number.isFinite(startMs) ? lowerBound(time, startMs) : 0;
  let bin = NaN;
  let sum = 0;
  let count = 0;
  // Each bin is drawn from its start to its end: a bin followed by a gap (or the last bin) gets a
  // closing point at its end with its own value, and a gap a null point after that.
  const close = () => {
    const k = out.x.length - 1;
    out.x.push(binEnd(out.x[k]!));
    out.y.push(out.y[k]!);
  };
  const flush = () => {
    if (count === 0) return;
    const k = out.x.length - 1;
    if (k >= 0 && bin > binEnd(out.x[k]!)) {
      const end = binEnd(out.x[k]!);
      close();
      out.x.push((end + bin) / 2);
      out.y.push(null);
    }
    out.x.push(bin);
    out.y.push(Math.round((1000 * sum) / count) / 10);
  };
  for (; i < time.length; i++) {
    const t = time[i]!;
    if (t > toMs + binMs) break;
    const v = frac[i]!;
    if (!Number.isFinite(v)) continue;
    const b = binOf(t - 1);
    if (b !== bin) {
      flush();
      bin = b;
      sum = 0;
      count = 0;
    }
    sum += v;
    count++;
  }
  flush();
  if (out.x.length > 0) close();
  return out;
}

/** Whole-log figures shown above the history chart (units of the input). */
export interface HistorySummary {
  readings: number;
  firstTime: number | null;
  lastTime: number | null;
  /** Median reading interval, ms (null with fewer than two readings). */
  stepMs: number | null;
  indoor: { min: number; max: number; mean: number } | null;
  /**
   * Hours the equipment ran (Σ runtime fraction × interval) and hours logged (Σ interval), each
   * interval capped at three median intervals so that a gap in the log counts as neither.
   */
  heatHours: number;
  coolHours: number;
  loggedHours: number;
  has: { outdoor: boolean; heatSetpoint: boolean; coolSetpoint: boolean; heat: boolean; cool: boolean };
}

/** The summary of a whole series in one pass (after the median interval). */
export function historySummary(s: ZoneSeries): HistorySummary {
  const n = s.time.length;
  const step = medianSpacing(s.time);
  const cap = Number.isFinite(step) ? 3 * step : 0;
  let lo = Infinity;
  let hi = -Infinity;
  let sum = 0;
  let count = 0;
  let heatMs = 0;
  let coolMs = 0;
  let loggedMs = 0;
  const has = { outdoor: false, heatSetpoint: false, coolSetpoint: false, heat: false, cool: false };
  for (let i = 0; i < n; i++) {
    const v = s.indoor[i]!;
    if (v === v) {
      if (v < lo) lo = v;
      if (v > hi) hi = v;
      sum += v;
      count++;
    }
    if (!has.outdoor && s.outdoor[i] === s.outdoor[i]) has.outdoor = true;
    if (!has.heatSetpoint && s.heatSetpoint[i] === s.heatSetpoint[i]) has.heatSetpoint = true;
    if (!has.coolSetpoint && s.coolSetpoint[i] === s.coolSetpoint[i]) has.coolSetpoint = true;
    const h = s.heat[i]!;
    const c = s.cool[i]!;
    if (h > 0) has.heat = true;
    if (c > 0) has.cool = true;
    if (i > 0) {
      const dt = Math.min(s.time[i]! - s.time[i - 1]!, cap);
      loggedMs += dt;
      if (h > 0) heatMs += h * dt;
      if (c > 0) coolMs += c * dt;
    }
  }
  return {
    readings: n,
    firstTime: n ? s.time[0]! : null,
    lastTime: n ? s.time[n - 1]! : null,
    stepMs: Number.isFinite(step) ? step : null,
    indoor: count ? { min: lo, max: hi, mean: sum / count } : null,
    heatHours: heatMs / HOUR_MS,
    coolHours: coolMs / HOUR_MS,
    loggedHours: loggedMs / HOUR_MS,
    has,
  };
}
