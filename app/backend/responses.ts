/**
 * A zone's readings for the history chart (decimated for the window the chart shows, core/history.ts),
 * and its fitted response with the simulated-against-measured overlay on the days the fit did not see.
 *
 * The overlay is an honest out-of-sample check: the zone's response is refitted without the held-out
 * days (core/fit's fitResponse on the log with those days removed), then each held-out day is simulated
 * from its own first reading with the chosen model's exact step (core/dynamics.ts), driven only by that day's measured
 * outdoor temperature and runtime.
 */
import type { FitResult, History, MethodInput, Overlay } from '../api/contract.ts';
import { decimate, lowerBound, runtimeBins } from '../../core/history.ts';
import { fitResponse } from '../../core/fit/index.ts';
import { Plant } from '../../core/dynamics.ts';
import { seriesRows } from '../../core/series.ts';
import type { ZoneModel, ZoneResponse, ZoneSeries } from '../../core/types.ts';
import type { ServiceContext } from './context.ts';
import { ServiceError } from './errors.ts';
import { seriesCache } from './series-cache.ts';
import { fitOptionsFor, timeZoneFor } from './fit-options.ts';

type HistoryRequest = MethodInput<'zoneHistory'>;
const round3 = (v: number) => Math.round(v * 1000) / 1000;

const MS_PER_HOUR = 3_600_000;

function orNull(a: Float64Array): (number | null)[] {
  const out = new Array<number | null>(a.length);
  for (let i = 0; i < a.length; i++) {
    const v = a[i]!;
    out[i] = Number.isFinite(v) ? Math.round(v * 1000) / 1000 : null;
  }
  return out;
}

function subset(series: ZoneSeries, keep: (i: number) => boolean): ZoneSeries {
  const idx: number[] = [];
  for (let i = 0; i < series.time.length; i++) if (keep(i)) idx.push(i);
  return seriesRows(series, idx);
}

/** Response numbers as JSON-safe values (NaN intervals of absent equipment become [0, 0]). */
function jsonSafe(r: ZoneResponse): ZoneResponse {
  const pair = (p: [number, number]): [number, number] => [Number.isFinite(p[0]) ? p[0] : 0, Number.isFinite(p[1]) ? p[1] : 0];
  const n = (v: number) => (Number.isFinite(v) ? v : 0);
  return {
    ...r,
    tauCI: pair(r.tauCI),
    heatRateCI: pair(r.heatRateCI),
    coolRateCI: r.coolRateCI ? pair(r.coolRateCI) : null,
    rmse: n(r.rmse),
    cvrmse: n(r.cvrmse),
    nmbe: n(r.nmbe),
    // Intervals the fit could not bound keep their known side; the unknown one travels as null.
    gainCI: r.gainCI ? loose(r.gainCI) : r.gainCI,
    solarGainCI: r.solarGainCI ? loose(r.solarGainCI) : r.solarGainCI,
    twoNode: r.twoNode
      ? { ...r.twoNode, airMassHoursCI: loose(r.twoNode.airMassHoursCI), massOutdoorHoursCI: loose(r.twoNode.massOutdoorHoursCI), massShareCI: loose(r.twoNode.massShareCI), slowHoursCI: loose(r.twoNode.slowHoursCI) }
      : r.twoNode,
  };
}

/** An interval with non-finite bounds as null (JSON has no NaN or Infinity). */
const loose = (p: [number, number]): [number, number] => p.map((v) => (Number.isFinite(v) ? v : null)) as unknown as [number, number];

/**
 * Simulates each range of `ranges` from its first reading with `model`, using the series' outdoor
 * temperature (held when missing) and runtime (0 when missing). Returns one overlay.
 */
export function simulateDays(series: ZoneSeries, model: ZoneModel, ranges: Array<{ from: number; to: number }>, kind: Overlay['kind']): Overlay {
  const time: number[] = [];
  const measured: number[] = [];
  const simulated: number[] = [];
  const outdoor: number[] = [];
  const starts: number[] = [];
  let se = 0;
  let count = 0;
  const t = series.time;
  const plant = new Plant(model);
  let i = 0;
  for (const range of ranges) {
    while (i < t.length && t[i]! < range.from) i++;
    // Start at the first reading with an indoor temperature.
    while (i < t.length && t[i]! <= range.to && !Number.isFinite(series.indoor[i]!)) i++;
    if (i >= t.length || t[i]! > range.to) continue;
    let T = series.indoor[i]!;
    let a = Number.isFinite(series.outdoor[i]!) ? series.outdoor[i]! : NaN;
    // Two nodes: the mass starts settled for the first reading (its state is not measured).
    const state = plant.settled(T, Number.isFinite(a) ? a : T);
    starts.push(t[i]!);
    if (time.length > 0) {
      // A gap between days: a null point keeps the chart from joining them.
      time.push(t[i]! - 1);
      measured.push(NaN);
      simulated.push(NaN);
      outdoor.push(NaN);
    }
    time.push(t[i]!);
    measured.push(T);
    simulated.push(T);
    outdoor.push(a);
    for (i = i + 1; i < t.length && t[i]! <= range.to; i++) {
      const dt = (t[i]! - t[i - 1]!) / MS_PER_HOUR;
      const a1 = Number.isFinite(series.outdoor[i]!) ? series.outdoor[i]! : a;
      const a0 = Number.isFinite(a) ? a : a1;
      const uh = Number.isFinite(series.heat[i]!) ? series.heat[i]! : 0;
      const uc = Number.isFinite(series.cool[i]!) ? series.cool[i]! : 0;
      const q = model.heatRate * uh - model.coolRate * uc + model.gain;
      if (Number.isFinite(a0) && Number.isFinite(a1)) {
        plant.step(state, dt, a0, a1, q);
        T = state.T;
      }
      a = a1;
      const y = series.indoor[i]!;
      time.push(t[i]!);
      measured.push(y);
      simulated.push(T);
      outdoor.push(a1);
      if (Number.isFinite(y)) {
        se += (y - T) ** 2;
        count++;
      }
    }
  }
  const f = (xs: number[]) => orNull(Float64Array.from(xs));
  return {
    kind,
    time,
    measured: f(measured),
    simulated: f(simulated),
    outdoor: f(outdoor),
    starts,
    rmse: count > 0 ? Math.sqrt(se / count) : null,
  };
}

export function responseService(ctx: ServiceContext) {
  const { store } = ctx;
  const cache = seriesCache(store);
  /** Overlays by zone, for the response they were computed for (a refit takes a moment). */
  const overlays = new Map<number, { key: string; overlay: Overlay | null }>();

  function requireZone(zoneId: number) {
    if (!store.getZone(zoneId)) throw new ServiceError('not-found', 'That zone no longer exists.');
  }

  function overlayFor(series: ZoneSeries, response: ZoneResponse): Overlay | null {
    if (series.time.length < 2) return null;
    if (response.heldOut.length > 0) {
      const held = response.heldOut;
      const inHeld = (ms: number) => held.some((r) => ms >= r.from && ms <= r.to);
      try {
        const train = fitResponse(subset(series, (i) => !inHeld(series.time[i]!)), { heldOutEvery: 0, intervals: false, timeZone: response.timeZone ?? null });
        return simulateDays(series, train, held, 'held-out');
      } catch {
        /* fall through to the fitted days */
      }
    }
    // Too few days to hold any out: show the last three days simulated with the fitted model.
    const last = series.time[series.time.length - 1]!;
    const from = Math.max(series.time[0]!, last - 3 * 24 * MS_PER_HOUR);
    return simulateDays(series, response, [{ from, to: last }], 'fitted');
  }

  return {
    async zoneHistory({ zoneId, fromMs, toMs, buckets, runtimeBinHours }: HistoryRequest): Promise<History> {
      requireZone(zoneId);
      const { series: s, summary } = cache.withSummary(zoneId);
      const from = fromMs ?? summary.firstTime ?? 0;
      const to = toMs ?? summary.lastTime ?? 0;
      if (!(to >= from)) throw new ServiceError('input', 'The chart window ends before it starts.');
      // Readings further apart than three intervals (or 20 minutes) are a gap, drawn as a break.
      const gapMs = Math.max(3 * (summary.stepMs ?? MS_PER_HOUR), 20 * 60_000);
      const readings = lowerBound(s.time, to + 1) - lowerBound(s.time, from);
      // Runtime bins of a day or part of one follow the zone's own midnights (its time zone rule).
      const tz = timeZoneFor(store, zoneId);
      const line = (v: Float64Array) => decimate(s.time, v, from, to, buckets, gapMs, round3);
      const none = { x: [], y: [] };
      return {
        zoneId,
        summary,
        window: { fromMs: from, toMs: to, readings, whole: readings <= 4 * buckets },
        runtimeBinHours,
        indoor: line(s.indoor),
        outdoor: summary.has.outdoor ? line(s.outdoor) : none,
        heatSetpoint: summary.has.heatSetpoint ? line(s.heatSetpoint) : none,
        coolSetpoint: summary.has.coolSetpoint ? line(s.coolSetpoint) : none,
        heatRuntime: summary.has.heat ? runtimeBins(s.time, s.heat, runtimeBinHours, from, to, tz) : none,
        coolRuntime: summary.has.cool ? runtimeBins(s.time, s.cool, runtimeBinHours, from, to, tz) : none,
      };
    },

    async fitZone({ zoneId, fallbackTimeZone }: { zoneId: number; fallbackTimeZone?: string | undefined }): Promise<FitResult> {
      requireZone(zoneId);
      const series = cache.series(zoneId);
      if (series.time.length === 0) {
        throw new ServiceError('input', 'This zone has no readings yet: import a log first.');
      }
      const response = fitResponse(series, fitOptionsFor(store, zoneId, fallbackTimeZone));
      const id = store.saveResponse(zoneId, response);
      const stored = store.listResponses(zoneId).find((r) => r.id === id);
      const overlay = overlayFor(series, response);
      overlays.set(zoneId, { key: `${id}`, overlay });
      return { zoneId, response: jsonSafe(response), overlay, fittedAt: stored?.createdAt ?? Date.now() };
    },

    async latestResponse({ zoneId }: { zoneId: number }): Promise<FitResult | null> {
      requireZone(zoneId);
      const stored = store.listResponses(zoneId)[0];
      if (!stored) return null;
      let cached = overlays.get(zoneId);
      if (!cached || cached.key !== `${stored.id}`) {
        cached = { key: `${stored.id}`, overlay: overlayFor(cache.series(zoneId), stored.response) };
        overlays.set(zoneId, cached);
      }
      return { zoneId, response: jsonSafe(stored.response), overlay: cached.overlay, fittedAt: stored.createdAt };
    },
  };
}
