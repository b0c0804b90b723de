/**
 * The recovery backtest: each morning recovery the log holds is predicted by a fit that did not see its
 * day, and compared with when the zone really got there.
 *
 * A recovery is a heating setpoint step up of at least 1 K (common practice: smaller steps are
 * thermostat adjustments, not setbacks) with the air at least 1 K below the new setpoint. It starts at
 * the reading before the step (the row convention: a row's setpoint held over the interval ending at it)
 * and ends at the first reading at or above the setpoint less half the reading resolution (a quantised
 * reading shows the setpoint from then on), while the setpoint is held and with no gap in the readings.
 *
 * Prediction: the days are split into up to five folds (day index mod folds, as the held-out check);
 * the chosen model's forcing coefficients (heating rate, gain…) and initial states are refitted without
 * each fold (day weights 0), its dynamics (time constants) held at the whole log's fit, and each
 * recovery of that fold predicted with full heat from the reading at the step, driven by the log's own outdoor
 * temperature (core/recovery.ts recoveryTime: two nodes start from the mass settled at the held
 * setpoint and a drift down to the start). The predicted time is rounded up to the next reading time,
 * as the readings would have shown it, and compared with the actual one.
 */
import { outdoorProfile } from '../outdoor.ts';
import { recoveryTime } from '../recovery.ts';
import type { BacktestMorning, RecoveryBacktest, ZoneSeries } from '../types.ts';
import { candidateModel, type Candidate } from './candidate.ts';
import { evaluate, type FitContext } from './context.ts';
import { readingResolution } from './resolution.ts';

const MS_PER_MIN = 60_000;
const MIN_STEP_K = 1;
const MAX_CASES = 200;

interface Event {
  i0: number;
  i1: number;
  fromC: number;
  toC: number;
  targetC: number;
  day: number;
}

function quantile(sorted: number[], p: number): number {
  if (sorted.length === 0) return NaN;
  const x = p * (sorted.length - 1);
  const lo = Math.floor(x);
  const hi = Math.ceil(x);
  return sorted[lo]! + (sorted[hi]! - sorted[lo]!) * (x - lo);
}

/** Recoveries of the log (see the module comment). */
function findRecoveries(series: ZoneSeries, ctx: FitContext, halfRes: number): Event[] {
  const { time, indoor, heatSetpoint } = series;
  const gapMs = Math.max(3 * ctx.log.medianStepHours * 60, 20) * MS_PER_MIN;
  const events: Event[] = [];
  for (let i = 1; i < time.length && events.length < MAX_CASES; i++) {
    const sp0 = heatSetpoint[i - 1]!, sp1 = heatSetpoint[i]!;
    if (!(sp1 - sp0 >= MIN_STEP_K)) continue;
    const T0 = indoor[i - 1]!;
    if (!Number.isFinite(T0) || !(sp1 - T0 >= MIN_STEP_K)) continue;
    const target = sp1 - halfRes;
    let end = -1;
    for (let j = i; j < time.length; j++) {
      if (time[j]! - time[j - 1]! > gapMs) break;
      if (heatSetpoint[j] !== sp1) break;
      if (Number.isFinite(indoor[j]!) && indoor[j]! >= target) {
        end = j;
        break;
      }
    }
    if (end < 0) continue;
    events.push({ i0: i - 1, i1: end, fromC: T0, toC: sp1, targetC: target, day: ctx.log.days.dayOf(time[i - 1]!) });
    i = end;
  }
  return events;
}

/** The outdoor temperature from the step on (hours after it), up to a day past the recovery. */
function outdoorFrom(series: ZoneSeries, e: Event): ReturnType<typeof outdoorProfile> | null {
  const t0 = series.time[e.i0]!;
  const t: number[] = [];
  const v: number[] = [];
  const stopMs = series.time[e.i1]! + 24 * 3_600_000;
  for (let k = e.i0; k < series.time.length && series.time[k]! <= stopMs; k++) {
    const a = series.outdoor[k]!;
    if (!Number.isFinite(a)) continue;
    const h = (series.time[k]! - t0) / 3_600_000;
    if (t.length && h <= t[t.length - 1]!) continue;
    t.push(h);
    v.push(a);
  }
  if (t.length === 0) return null;
  if (t[0]! > 0) {
    t.unshift(0);
    v.unshift(v[0]!);
  }
  return outdoorProfile(t, v);
}

/** The first reading time at or after `ms` from index `from` on (or ms itself past the log's end). */
function nextReading(series: ZoneSeries, from: number, ms: number): number {
  for (let k = from; k < series.time.length; k++) if (series.time[k]! >= ms - 1e-6) return series.time[k]!;
  return ms;
}

/**
 * Runs the backtest of a fitted candidate. Returns the backtest, or null with the reason there was none.
 * @param folds at most this many folds of days (default 5)
 */
export function recoveryBacktest(series: ZoneSeries, ctx: FitContext, fitted: Candidate, folds = 5): { backtest: RecoveryBacktest | null; reason: string | null } {
  if (!ctx.log.hasHeating) return { backtest: null, reason: 'The log has no heating runtime, so it holds no heating recoveries to check.' };
  if (!series.heatSetpoint.some(Number.isFinite)) return { backtest: null, reason: 'The log has no heating setpoint column, so its recoveries cannot be found.' };
  const res = readingResolution(ctx.log.y);
  const halfRes = res ? (res.unit === 'F' ? res.step / 1.8 : res.step) / 2 : 0.05;
  const events = findRecoveries(series, ctx, halfRes);
  if (events.length === 0) return { backtest: null, reason: 'The log holds no morning recovery (a heating setpoint step up of 1 K or more, reached while the setpoint was held).' };
  const dayIndex = new Map(ctx.days.map((d, k) => [d, k]));
  const eventDays = [...new Set(events.map((e) => e.day))];
  const K = Math.max(1, Math.min(folds, eventDays.length));
  const foldOf = (day: number) => (dayIndex.get(day) ?? day) % K;
  const mornings: BacktestMorning[] = [];
  let failed = 0;
  for (let f = 0; f < K; f++) {
    const mine = events.filter((e) => foldOf(e.day) === f);
    if (mine.length === 0) continue;
    const w = new Float64Array(ctx.log.dayCount).fill(1);
    for (const d of ctx.days) if (foldOf(d) === f) w[d] = 0;
    let model;
    try {
      // One pass at the fitted dynamics with the fold's days weighted out (a refit of the dynamics too
      // would cost a whole search per fold; one fold of days moves τ far less than it moves h and g).
      const solution = evaluate(ctx, fitted.modesAt(fitted.theta), w);
      if (!solution.beta.every(Number.isFinite)) throw new Error('no solution');
      model = candidateModel(ctx, { ...fitted, solution });
    } catch {
      failed += mine.length;
      continue;
    }
    for (const e of mine) {
      const outdoor = outdoorFrom(series, e);
      if (!outdoor) {
        failed++;
        continue;
      }
      const startMs = series.time[e.i0]!;
      const r = recoveryTime(model, e.fromC, e.targetC, outdoor);
      if (r.hours === null) {
        failed++;
        continue;
      }
      const predictedMs = nextReading(series, e.i0, startMs + r.hours * 3_600_000);
      mornings.push({
        startMs,
        fromC: e.fromC,
        toC: e.toC,
        outdoorC: outdoor.temp[0]!,
        actualMinutes: (series.time[e.i1]! - startMs) / MS_PER_MIN,
        predictedMinutes: (predictedMs - startMs) / MS_PER_MIN,
      });
    }
  }
  if (mornings.length === 0) return { backtest: null, reason: `The log holds ${events.length} recoveries, but none could be predicted (${failed} refits or predictions failed).` };
  mornings.sort((a, b) => a.startMs - b.startMs);
  const errs = mornings.map((m) => m.predictedMinutes - m.actualMinutes);
  const abs = errs.map(Math.abs).sort((a, b) => a - b);
  return {
    backtest: {
      cases: mornings.length,
      medianErrorMinutes: quantile(abs, 0.5),
      p90ErrorMinutes: quantile(abs, 0.9),
      medianBiasMinutes: quantile([...errs].sort((a, b) => a - b), 0.5),
      mornings,
    },
    reason: null,
  };
}
