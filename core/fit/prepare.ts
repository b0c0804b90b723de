/**
 * Prepares a zone log for fitting: keeps readings with an indoor temperature, fills short outdoor gaps
 * by linear interpolation, splits the log into segments at gaps and at unknown runtime, and assigns
 * each reading to a day block (for the day-block bootstrap and the held-out check).
 */
import { medianInterval } from '../interval.ts';
import { InputError } from '../errors.ts';
import { localDays, type LocalDays } from '../localday.ts';
import type { ZoneSeries } from '../types.ts';

const MS_PER_HOUR = 3_600_000;

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
  /** Local day of each reading (days since the local midnight before the first reading, in `days.timeZone`). */
  day: Int32Array;
  dayCount: number;
  /** The local days the readings were grouped by (the site's time zone, else UTC). */
  days: LocalDays;
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
  /** IANA time zone whose local days group the readings (days of the fit, held-out days); default UTC. */
  timeZone?: string | null;
}

/** Whether x[0 .. n-1] holds a finite value (stops at the first). */
function anyFinite(x: Float64Array, n: number): boolean {
  for (let i = 0; i < n; i++) if (Number.isFinite(x[i])) return true;
  return false;
}

/**
 * The outdoor temperature with gaps up to maxGapHours bridged linearly. Returns the series' own array
 * when there is nothing to bridge (it is only read), else a copy.
 */
function bridgeOutdoorGaps(time: Float64Array, source: Float64Array, maxGapHours: number): Float64Array {
  let outdoor: Float64Array | null = null;
  let prev = -1;
  for (let i = 0; i < time.length; i++) {
    if (!Number.isFinite(source[i])) continue;
    if (prev >= 0 && i - prev > 1) {
      const span = (time[i] - time[prev]) / MS_PER_HOUR;
      if (span <= maxGapHours) {
        outdoor ??= Float64Array.from(source);
        for (let j = prev + 1; j < i; j++) {
          const f = (time[j] - time[prev]) / (time[i] - time[prev]);
          outdoor[j] = source[prev] + f * (source[i] - source[prev]);
        }
      }
    }
    prev = i;
  }
  return outdoor ?? source;
}

/** Indices of the readings with a time and both indoor and outdoor temperature. */
function readingsWithTemperatures(time: Float64Array, indoor: Float64Array, outdoor: Float64Array, n: number): Int32Array {
  const keep = new Int32Array(n);
  let count = 0;
  for (let i = 0; i < n; i++) {
    // A reading without a valid time (never stored by db/, but possible through the API) is left out.
    if (Number.isFinite(time[i]) && Number.isFinite(indoor[i]) && Number.isFinite(outdoor[i])) keep[count++] = i;
  }
  return keep.subarray(0, count);
}

/**
 * Segment boundaries over `keep`: a gap longer than maxGap hours, a non-increasing time, or a runtime
 * value that is unknown where the column exists. Returns [begin, end) pairs, flattened.
 */
function segmentBounds(series: ZoneSeries, keep: Int32Array, maxGap: number, heatLogged: boolean, coolLogged: boolean): number[] {
  const { time, heat, cool } = series;
  const bounds: number[] = [];
  let segBegin = 0;
  // The gap test depends on the interval only, so a repeated interval reuses the last answer.
  let lastMs = NaN;
  let lastGap = false;
  for (let k = 1; k <= keep.length; k++) {
    let split = k === keep.length;
    if (!split) {
      const i = keep[k];
      const ms = time[i] - time[keep[k - 1]];
      if (ms !== lastMs) {
        const dt = ms / MS_PER_HOUR;
        lastGap = dt > maxGap || dt <= 0;
        lastMs = ms;
      }
      const unknownRuntime = (heatLogged && !Number.isFinite(heat[i])) || (coolLogged && !Number.isFinite(cool[i]));
      split = lastGap || unknownRuntime;
    }
    if (split) {
      bounds.push(segBegin, k);
      segBegin = k;
    }
  }
  return bounds;
}

/**
 * Builds a PreparedLog from a ZoneSeries (internal units).
 * @throws InputError when the log has no outdoor temperature or too few usable readings.
 */
export function prepareLog(series: ZoneSeries, options: PrepareOptions = {}): PreparedLog {
  const gapFactor = options.gapFactor ?? 2.5;
  const minSegmentHours = options.minSegmentHours ?? 2;
  const maxOutdoorGapHours = options.maxOutdoorGapHours ?? 3;
  const warnings: string[] = [];

  const n = series.time.length;
  const heatLogged = anyFinite(series.heat, n);
  const coolLogged = anyFinite(series.cool, n);
  if (!anyFinite(series.outdoor, n)) {
    throw new InputError('The log has no outdoor temperature: the zone model needs one to separate envelope losses from heating.');
  }

  // Outdoor temperature with gaps up to maxOutdoorGapHours bridged linearly.
  const outdoor = bridgeOutdoorGaps(series.time, series.outdoor, maxOutdoorGapHours);

  // Keep readings with indoor, outdoor and (where that column exists) runtime known.
  const keep = readingsWithTemperatures(series.time, series.indoor, outdoor, series.time.length);
  if (keep.length < 12) {
    throw new InputError(`The log has only ${keep.length} readings with both indoor and outdoor temperature: too few to fit a zone response.`);
  }

  const medianStep = medianInterval(series.time, keep) / MS_PER_HOUR;
  const maxGap = Math.max(gapFactor * medianStep, 20 / 60);

  // Segment boundaries: a long gap, or a runtime value that is unknown where the column exists.
  const bounds = segmentBounds(series, keep, maxGap, heatLogged, coolLogged);

  // Segments long enough to fit; `kept` is `keep` itself when none is dropped.
  const starts: number[] = [];
  const keptBounds: number[] = [];
  let m = 0;
  let dropped = 0;
  for (let j = 0; j < bounds.length; j += 2) {
    const b = bounds[j], e = bounds[j + 1];
    const hours = (series.time[keep[e - 1]] - series.time[keep[b]]) / MS_PER_HOUR;
    if (e - b < 6 || hours < minSegmentHours) {
      dropped += e - b;
      continue;
    }
    starts.push(m);
    keptBounds.push(b, e);
    m += e - b;
  }
  let kept = keep;
  if (dropped > 0) {
    kept = new Int32Array(m);
    for (let j = 0, at = 0; j < keptBounds.length; j += 2) {
      kept.set(keep.subarray(keptBounds[j], keptBounds[j + 1]), at);
      at += keptBounds[j + 1] - keptBounds[j];
    }
  }
  if (m < 12) {
    throw new InputError('The log has no stretch of at least two hours of regular readings: too little to fit a zone response.');
  }
  if (dropped > 0) {
    warnings.push(`${dropped} readings in short stretches between gaps were left out of the fit.`);
  }
  starts.push(m);
  const segStart = Int32Array.from(starts);

  const days = localDays(options.timeZone, series.time[kept[0]]);
  const r = readingArrays(series, outdoor, kept, segStart, heatLogged, coolLogged, days);
  if (!heatLogged) warnings.push('The log has no heating runtime: the heating rate cannot be fitted.');
  const binary = [r.hasHeating && onlyWhole(r.uh) ? 'heating' : '', r.hasCooling && onlyWhole(r.uc) ? 'cooling' : ''].filter(Boolean);
  if (binary.length > 0 && medianStep >= 5 / 60) {
    warnings.push(
      `The ${binary.join(' and ')} runtime is only ever 0 or 1 at ${Math.round(medianStep * 60)}-minute readings (an on/off state per reading): equipment cycles shorter than the interval are seen only in part, so the fitted ${binary.length > 1 ? 'rates' : 'rate'} can be off by several percent beyond ${binary.length > 1 ? 'their intervals' : 'its interval'}. A log with runtime in seconds or percent per interval pins ${binary.length > 1 ? 'them' : 'it'} down better.`,
    );
  }

  return {
    t: r.t, timeMs: r.timeMs, y: r.y, a: r.a, uh: r.uh, uc: r.uc, segStart, day: r.day,
    dayCount: r.day[m - 1] + 1,
    days,
    medianStepHours: medianStep,
    hasHeating: r.hasHeating, hasCooling: r.hasCooling, freeFloatHours: r.freeFloatHours, warnings,
  };
}

/** Whether every runtime fraction is exactly 0 or 1 (an on/off state rather than a share of the interval). */
function onlyWhole(u: Float64Array): boolean {
  for (let k = 0; k < u.length; k++) if (u[k] !== 0 && u[k] !== 1) return false;
  return true;
}

/** The per-reading arrays of the PreparedLog for the kept readings, and the figures taken along the way. */
function readingArrays(series: ZoneSeries, outdoor: Float64Array, kept: Int32Array, segStart: Int32Array, heatLogged: boolean, coolLogged: boolean, days: LocalDays) {
  const { time, indoor, heat, cool } = series;
  const m = kept.length;
  const t = new Float64Array(m);
  const timeMs = new Float64Array(m);
  const y = new Float64Array(m);
  const a = new Float64Array(m);
  const uh = new Float64Array(m);
  const uc = new Float64Array(m);
  const day = new Int32Array(m);
  const t0 = time[kept[0]];
  let hasHeating = false;
  let hasCooling = false;
  // Hours in which neither heating nor cooling ran, within segments (so from each segment's second reading).
  let freeFloatHours = 0;
  for (let s = 0; s + 1 < segStart.length; s++) {
    for (let k = segStart[s]; k < segStart[s + 1]; k++) {
      const i = kept[k];
      const ti = time[i];
      timeMs[k] = ti;
      t[k] = (ti - t0) / MS_PER_HOUR;
      y[k] = indoor[i];
      a[k] = outdoor[i];
      const h = heatLogged ? heat[i] : 0;
      const c = coolLogged ? cool[i] : 0;
      const uhk = h > 1 ? 1 : h > 0 ? h : 0;
      const uck = c > 1 ? 1 : c > 0 ? c : 0;
      uh[k] = uhk;
      uc[k] = uck;
      if (h > 0) hasHeating = true;
      if (c > 0) hasCooling = true;
      day[k] = days.dayOf(ti);
      if (k > segStart[s] && uhk === 0 && uck === 0) freeFloatHours += t[k] - t[k - 1];
    }
  }
  return { t, timeMs, y, a, uh, uc, day, hasHeating, hasCooling, freeFloatHours };
}
