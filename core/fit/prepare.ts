/**
 * Prepares a zone log for fitting: keeps readings with an indoor temperature, fills short outdoor gaps
 * by linear interpolation, splits the log into segments at gaps and at unknown runtime, and assigns
 * each reading to a day block (for the day-block bootstrap and the held-out check).
 */
import { InputError } from '../errors.ts';
import type { ZoneSeries } from '../types.ts';

const MS_PER_HOUR = 3_600_000;
const MS_PER_DAY = 86_400_000;

/** A log ready for the fitter; all arrays share one index (readings kept). */
export interface PreparedLog {
  /** Hours since the first kept reading. */
  t: Float64Array;
  /** Epoch ms of each kept reading. */
  timeMs: Float64Array;
  /** Indoor temperature, °C. */
  y: Float64Array;
  /** Outdoor temperature, °C (short gaps filled). */
  a: Float64Array;
  /** Heating and cooling runtime fraction of the interval ending at the reading (0 where not logged). */
  uh: Float64Array;
  uc: Float64Array;
  /** Index of the first reading of each segment, plus a final entry = length. */
  segStart: Int32Array;
  /** Day number of each reading (days since the UTC midnight before the first reading). */
  day: Int32Array;
  dayCount: number;
  /** Median reading interval, hours. */
  medianStepHours: number;
  hasHeating: boolean;
  hasCooling: boolean;
  /** Hours in which neither heating nor cooling ran (free-floating), within segments. */
  freeFloatHours: number;
  warnings: string[];
}

export interface PrepareOptions {
  /** A gap longer than this many typical intervals (or 20 min, whichever is longer) splits a segment. */
  gapFactor?: number;
  /** Segments shorter than this many hours are dropped. */
  minSegmentHours?: number;
  /** Outdoor gaps up to this many hours are bridged by linear interpolation. */
  maxOutdoorGapHours?: number;
}

/** Median of whole-millisecond intervals, by counting (logs repeat a handful of interval lengths). */
function medianInterval(time: Float64Array, keep: Int32Array): number {
  const counts = new Map<number, number>();
  for (let k = 1; k < keep.length; k++) {
    const d = time[keep[k]] - time[keep[k - 1]];
    counts.set(d, (counts.get(d) ?? 0) + 1);
  }
  const sorted = [...counts.entries()].sort((x, y) => x[0] - y[0]);
  let seen = 0;
  const half = (keep.length - 1) / 2;
  for (const [d, c] of sorted) {
    seen += c;
    if (seen >= half) return d;
  }
  return NaN;
}

/**
 * Builds a PreparedLog from a ZoneSeries (internal units).
 * @throws InputError when the log has no outdoor temperature or too few usable readings.
 */
export function prepareLog(series: ZoneSeries, options: PrepareOptions = {}): PreparedLog {
  const gapFactor = options.gapFactor ?? 2.5;
  const minSegmentHours = options.minSegmentHours ?? 2;
  const maxOutdoorGapHours = options.maxOutdoorGapHours ?? 3;
  const n = series.time.length;
  const warnings: string[] = [];

  let anyOutdoor = false;
  let heatLogged = false;
  let coolLogged = false;
  for (let i = 0; i < n; i++) {
    if (Number.isFinite(series.outdoor[i])) anyOutdoor = true;
    if (Number.isFinite(series.heat[i])) heatLogged = true;
    if (Number.isFinite(series.cool[i])) coolLogged = true;
  }
  if (!anyOutdoor) {
    throw new InputError('The log has no outdoor temperature: the zone model needs one to separate envelope losses from heating.');
  }

  // Outdoor temperature with gaps up to maxOutdoorGapHours bridged linearly.
  const outdoor = Float64Array.from(series.outdoor);
  let prev = -1;
  for (let i = 0; i < n; i++) {
    if (!Number.isFinite(outdoor[i])) continue;
    if (prev >= 0 && i - prev > 1) {
      const span = (series.time[i] - series.time[prev]) / MS_PER_HOUR;
      if (span <= maxOutdoorGapHours) {
        for (let j = prev + 1; j < i; j++) {
          const f = (series.time[j] - series.time[prev]) / (series.time[i] - series.time[prev]);
          outdoor[j] = outdoor[prev] + f * (outdoor[i] - outdoor[prev]);
        }
      }
    }
    prev = i;
  }

  // Keep readings with indoor, outdoor and (where that column exists) runtime known.
  const keepAll = new Int32Array(n);
  let kept0 = 0;
  for (let i = 0; i < n; i++) {
    if (Number.isFinite(series.indoor[i]) && Number.isFinite(outdoor[i])) keepAll[kept0++] = i;
  }
  const keep = keepAll.subarray(0, kept0);
  if (keep.length < 12) {
    throw new InputError(`The log has only ${keep.length} readings with both indoor and outdoor temperature: too few to fit a zone response.`);
  }

  const medianStep = medianInterval(series.time, keep) / MS_PER_HOUR;
  const maxGap = Math.max(gapFactor * medianStep, 20 / 60);

  // Segment boundaries: a long gap, or a runtime value that is unknown where the column exists.
  const segments: Array<[number, number]> = [];
  let segBegin = 0;
  for (let k = 1; k <= keep.length; k++) {
    let split = k === keep.length;
    if (!split) {
      const i = keep[k];
      const dt = (series.time[i] - series.time[keep[k - 1]]) / MS_PER_HOUR;
      const unknownRuntime = (heatLogged && !Number.isFinite(series.heat[i])) || (coolLogged && !Number.isFinite(series.cool[i]));
      split = dt > maxGap || dt <= 0 || unknownRuntime;
    }
    if (split) {
      segments.push([segBegin, k]);
      segBegin = k;
    }
  }

  const keptAll = new Int32Array(keep.length);
  let m = 0;
  const starts: number[] = [];
  let dropped = 0;
  for (const [b, e] of segments) {
    const hours = (series.time[keep[e - 1]] - series.time[keep[b]]) / MS_PER_HOUR;
    if (e - b < 6 || hours < minSegmentHours) {
      dropped += e - b;
      continue;
    }
    starts.push(m);
    keptAll.set(keep.subarray(b, e), m);
    m += e - b;
  }
  const kept = keptAll.subarray(0, m);
  if (m < 12) {
    throw new InputError('The log has no stretch of at least two hours of regular readings: too little to fit a zone response.');
  }
  if (dropped > 0) {
    warnings.push(`${dropped} readings in short stretches between gaps were left out of the fit.`);
  }

  const t = new Float64Array(m);
  const timeMs = new Float64Array(m);
  const y = new Float64Array(m);
  const a = new Float64Array(m);
  const uh = new Float64Array(m);
  const uc = new Float64Array(m);
  const day = new Int32Array(m);
  const t0 = series.time[kept[0]];
  const dayZero = Math.floor(t0 / MS_PER_DAY) * MS_PER_DAY;
  let hasHeating = false;
  let hasCooling = false;
  for (let k = 0; k < m; k++) {
    const i = kept[k];
    timeMs[k] = series.time[i];
    t[k] = (series.time[i] - t0) / MS_PER_HOUR;
    y[k] = series.indoor[i];
    a[k] = outdoor[i];
    const h = heatLogged ? series.heat[i] : 0;
    const c = coolLogged ? series.cool[i] : 0;
    uh[k] = h > 1 ? 1 : h > 0 ? h : 0;
    uc[k] = c > 1 ? 1 : c > 0 ? c : 0;
    if (h > 0) hasHeating = true;
    if (c > 0) hasCooling = true;
    day[k] = Math.floor((series.time[i] - dayZero) / MS_PER_DAY);
  }
  starts.push(m);
  const segStart = Int32Array.from(starts);

  let freeFloatHours = 0;
  for (let s = 0; s + 1 < segStart.length; s++) {
    for (let k = segStart[s] + 1; k < segStart[s + 1]; k++) {
      if (uh[k] === 0 && uc[k] === 0) freeFloatHours += t[k] - t[k - 1];
    }
  }
  if (!heatLogged) warnings.push('The log has no heating runtime: the heating rate cannot be fitted.');

  return {
    t, timeMs, y, a, uh, uc, segStart, day,
    dayCount: day[m - 1] + 1,
    medianStepHours: medianStep,
    hasHeating, hasCooling, freeFloatHours, warnings,
  };
}
