/**
 * Fits a zone response (τ, h, c, g with 95 % intervals) to a thermostat log by output error.
 *
 * Method: output-error least squares (each segment simulated exactly from its own fitted initial state
 * and compared with the readings; see profile.ts), not one-step regression, because indoor readings
 * are quantised (1 °F or 0.5 °C steps) and a one-step regression on differences of quantised readings
 * is badly biased toward short time constants. τ is found by a search of the profile RSS(τ) on a
 * logarithmic grid with parabolic refinement; h, c, g and the initial states follow linearly.
 * Uncertainty: a day-block bootstrap (Künsch 1989, moving/non-overlapping block bootstrap), which keeps
 * the strong within-day correlation of the residuals; 95 % percentile intervals.
 * Validation: one day in five is held out, the model refitted without those days, and the held-out days
 * simulated and compared (heldOutRmse).
 *
 * Units: input ZoneSeries in internal units (°C, epoch ms, runtime fractions); output in hours, K/h, K.
 * @throws InputError when the log lacks outdoor temperature or usable readings.
 * @throws UnderdeterminedError when the data cannot determine τ (no free-floating periods and no
 *   variation in heating, or a profile too flat to pin τ down).
 * @example
 *   const response = fitResponse(store.loadSeries(zoneId));
 *   response.tauHours; // e.g. 31.8 (h), response.tauCI // [29.9, 33.6]
 */
import { UnderdeterminedError } from '../errors.ts';
import { fitMetrics } from '../metrics.ts';
import { mulberry32 } from '../random.ts';
import type { ZoneResponse, ZoneSeries } from '../types.ts';
import { prepareLog, type PreparedLog } from './prepare.ts';
import { STATS, accumulate, blockCounts, makeBlocks, solveBlocks, solveParameters, workspaceSize, type Active, type Blocks, type Parameters, type Solution } from './profile.ts';
import { simulatePrepared } from './simulate.ts';

export interface FitOptions {
  /** Hold out one day in this many for the check (0 = no held-out check). Default 5. */
  heldOutEvery?: number;
  /** Bootstrap resamples for the intervals. Default 200. */
  bootstrap?: number;
  /** Seed of the bootstrap's random generator (results are reproducible). Default 1. */
  seed?: number;
}

const TAU_MIN = 0.25;
const TAU_MAX = 2000;
/** Coarse grid over the whole range (ratio ≈ 2.25 between points). */
const COARSE_POINTS = 12;
/** Fine grid around the coarse optimum (ratio ≈ 1.18), used by the point estimate and the bootstrap. */
const FINE_POINTS = 11;

interface Context {
  log: PreparedLog;
  blocks: Blocks;
  counts: Float64Array;
  active: Active;
  /** Scratch space of solveBlocks and solveParameters. */
  workspace: Float64Array;
  /** Block sums of the single-τ solves (solveAt). */
  stats: Float64Array;
}

function logGrid(lo: number, hi: number, points: number): Float64Array {
  const g = new Float64Array(points);
  const a = Math.log(lo);
  const step = (Math.log(hi) - a) / (points - 1);
  for (let i = 0; i < points; i++) g[i] = Math.exp(a + i * step);
  return g;
}

/** Minimum of f over an equally spaced (in log τ) grid with parabolic refinement: returns log τ. */
function gridMinimum(grid: Float64Array, f: Float64Array): { index: number; logTau: number; atEdge: boolean } {
  let k = 0;
  for (let i = 1; i < f.length; i++) if (f[i] < f[k]) k = i;
  const atEdge = k === 0 || k === f.length - 1;
  if (atEdge) return { index: k, logTau: Math.log(grid[k]), atEdge };
  const d = Math.log(grid[k + 1]) - Math.log(grid[k]);
  const f0 = f[k - 1], f1 = f[k], f2 = f[k + 1];
  const denom = f0 - 2 * f1 + f2;
  let offset = denom > 0 ? (0.5 * d * (f0 - f2)) / denom : 0;
  offset = Math.max(-d, Math.min(d, offset));
  return { index: k, logTau: Math.log(grid[k]) + offset, atEdge };
}

function solveAt(ctx: Context, tau: number, weights: Float64Array | null): Solution {
  accumulate(ctx.log, ctx.blocks, tau, ctx.stats);
  return solveBlocks(ctx.stats, ctx.blocks, weights, ctx.active, ctx.counts, ctx.workspace);
}

/** Population variance of u. */
function variance(u: Float64Array): number {
  let mean = 0;
  for (let i = 0; i < u.length; i++) mean += u[i];
  mean /= u.length;
  let v = 0;
  for (let i = 0; i < u.length; i++) {
    const d = u[i] - mean;
    v += d * d;
  }
  return v / u.length;
}

/** Σ (y_i − ŷ_i)² over all readings. */
function sumSquaredError(y: Float64Array, yhat: Float64Array): number {
  let sse = 0;
  for (let i = 0; i < y.length; i++) {
    const e = y[i] - yhat[i];
    sse += e * e;
  }
  return sse;
}

/** The held-out days' squared error and reading count, and their time spans (one per held-out day). */
function heldOutError(log: PreparedLog, sim: Float64Array, isHeld: Uint8Array): { se: number; count: number; spans: Array<{ from: number; to: number }> } {
  const { y, day, timeMs } = log;
  let se = 0;
  let count = 0;
  const spans: Array<{ from: number; to: number }> = [];
  let current: { from: number; to: number } | null = null;
  let currentDay = -1;
  for (let i = 0; i < y.length; i++) {
    if (!isHeld[day[i]]) continue;
    const e = y[i] - sim[i];
    se += e * e;
    count++;
    if (day[i] !== currentDay) {
      current = { from: timeMs[i], to: timeMs[i] };
      spans.push(current);
      currentDay = day[i];
    } else if (current) current.to = timeMs[i];
  }
  return { se, count, spans };
}

/** Stats for every point of a grid, for re-weighted solves without new passes. */
function gridStats(ctx: Context, grid: Float64Array): Float64Array[] {
  return Array.from(grid, (tau) => {
    const stats = new Float64Array(ctx.blocks.count * STATS);
    accumulate(ctx.log, ctx.blocks, tau, stats);
    return stats;
  });
}

interface GridFit {
  tau: number;
  heatRate: number;
  coolRate: number;
  atEdge: boolean;
}

/**
 * The weighted fit on a grid of precomputed stats. With `startIndex`, only the points a downhill walk
 * from there needs are solved (the bootstrap's replicates sit near the full-data optimum).
 */
function fitOnGrid(ctx: Context, grid: Float64Array, stats: Float64Array[], weights: Float64Array | null, startIndex?: number): GridFit {
  const rss = new Float64Array(grid.length).fill(Infinity);
  const sols: Parameters[] = new Array(grid.length);
  const solve = (i: number): number => {
    if (sols[i] === undefined) {
      sols[i] = solveParameters(stats[i], ctx.blocks, weights, ctx.active, ctx.counts, ctx.workspace);
      rss[i] = sols[i].rss;
    }
    return rss[i];
  };
  if (startIndex === undefined) {
    for (let i = 0; i < grid.length; i++) solve(i);
  } else {
    let k = Math.max(1, Math.min(grid.length - 2, startIndex));
    for (;;) {
      const here = solve(k);
      if (k > 0 && solve(k - 1) < here) k--;
      else if (k < grid.length - 1 && solve(k + 1) < here) k++;
      else break;
      if (k === 0 || k === grid.length - 1) break;
    }
    if (k > 0) solve(k - 1);
    if (k < grid.length - 1) solve(k + 1);
  }
  const m = gridMinimum(grid, rss);
  const tau = Math.exp(m.logTau);
  // h and c between the two bracketing grid points, linear in log τ.
  const k = m.index;
  const j = m.logTau >= Math.log(grid[k]) ? Math.min(k + 1, grid.length - 1) : Math.max(k - 1, 0);
  const span = Math.log(grid[j]) - Math.log(grid[k]);
  const f = span !== 0 ? (m.logTau - Math.log(grid[k])) / span : 0;
  return {
    tau,
    heatRate: sols[k].heatRate + f * (sols[j].heatRate - sols[k].heatRate),
    coolRate: sols[k].coolRate + f * (sols[j].coolRate - sols[k].coolRate),
    atEdge: m.atEdge,
  };
}

function percentile(sorted: number[], p: number): number {
  if (sorted.length === 0) return NaN;
  const x = p * (sorted.length - 1);
  const lo = Math.floor(x);
  const hi = Math.min(sorted.length - 1, lo + 1);
  return sorted[lo] + (x - lo) * (sorted[hi] - sorted[lo]);
}

/** Fits the zone response of a log. See the module comment for the method. */
export function fitResponse(series: ZoneSeries, options: FitOptions = {}): ZoneResponse {
  const heldOutEvery = options.heldOutEvery ?? 5;
  const reps = options.bootstrap ?? 200;
  const log = prepareLog(series);
  const blocks = makeBlocks(log);
  const ctx: Context = {
    log, blocks, counts: blockCounts(blocks), active: { heat: log.hasHeating, cool: log.hasCooling },
    workspace: new Float64Array(workspaceSize(blocks.segCount)),
    stats: new Float64Array(blocks.count * STATS),
  };
  const warnings = [...log.warnings];

  // A zone that never free-floats and whose heating never varies carries no information on τ.
  if (log.freeFloatHours < 1 && variance(log.uh) < 1e-4) {
    throw new UnderdeterminedError(
      'The log cannot determine the time constant: the zone never free-floats and the heating output never varies, so envelope losses and heating cannot be told apart. Import a log that includes a setback or an equipment-off period.',
    );
  }

  // Coarse search of the profile over the whole plausible range.
  const coarse = logGrid(TAU_MIN, TAU_MAX, COARSE_POINTS);
  const coarseRss = new Float64Array(coarse.length);
  coarse.forEach((tau, i) => (coarseRss[i] = solveAt(ctx, tau, null).rss));
  const cm = gridMinimum(coarse, coarseRss);
  if (cm.atEdge) {
    throw new UnderdeterminedError(
      `The log cannot determine the time constant: the best fit lies at the edge of the searched range (${coarse[cm.index].toFixed(2)} h). The readings may not respond to outdoor temperature or to heating at all (check the column mapping).`,
    );
  }
  const tau0 = Math.exp(cm.logTau);

  // Fine grid around the coarse optimum, one coarse step either side; widened if the bootstrap needs it.
  const coarseRatio = coarse[1] / coarse[0];
  let widen = coarseRatio;
  let grid = logGrid(tau0 / widen, tau0 * widen, FINE_POINTS);
  let stats = gridStats(ctx, grid);
  let point = fitOnGrid(ctx, grid, stats, null);

  // Day-block bootstrap.
  const dayHasData = new Uint8Array(log.dayCount);
  for (let b = 0; b < blocks.count; b++) dayHasData[blocks.blockDay[b]] = 1;
  const days: number[] = [];
  dayHasData.forEach((v, d) => v && days.push(d));
  const runBootstrap = () => {
    const random = mulberry32(options.seed ?? 1);
    let start = 0;
    for (let i = 1; i < grid.length; i++) if (Math.abs(Math.log(grid[i] / point.tau)) < Math.abs(Math.log(grid[start] / point.tau))) start = i;
    const taus: number[] = [];
    const hs: number[] = [];
    const cs: number[] = [];
    let edgeHits = 0;
    const w = new Float64Array(log.dayCount);
    for (let r = 0; r < reps; r++) {
      w.fill(0);
      for (let i = 0; i < days.length; i++) w[days[Math.floor(random() * days.length)]] += 1;
      const f = fitOnGrid(ctx, grid, stats, w, start);
      if (f.atEdge) edgeHits++;
      taus.push(f.tau);
      hs.push(f.heatRate);
      cs.push(f.coolRate);
    }
    return { taus, hs, cs, edgeHits };
  };
  let boot = runBootstrap();
  if (point.atEdge || boot.edgeHits > 0.025 * reps) {
    widen = coarseRatio ** 3;
    grid = logGrid(Math.max(TAU_MIN, tau0 / widen), Math.min(TAU_MAX, tau0 * widen), 3 * FINE_POINTS);
    stats = gridStats(ctx, grid);
    point = fitOnGrid(ctx, grid, stats, null);
    boot = runBootstrap();
    if (boot.edgeHits > 0.025 * reps) {
      throw new UnderdeterminedError(
        `The log cannot determine the time constant: time constants from ${grid[0].toFixed(1)} h to ${grid[grid.length - 1].toFixed(0)} h fit about equally well. Import a longer log, or one with setback or equipment-off periods.`,
      );
    }
  }
  const sortedTau = boot.taus.slice().sort((x, y) => x - y);
  const sortedH = boot.hs.slice().sort((x, y) => x - y);
  const sortedC = boot.cs.slice().sort((x, y) => x - y);

  // Point estimate: the exact solve at the refined τ.
  const tauHat = point.tau;
  const final = solveAt(ctx, tauHat, null);
  const model = { tauHours: tauHat, heatRate: final.heatRate, coolRate: final.coolRate, gain: final.gain };
  const predicted = simulatePrepared(log, model, final.x0);
  const n = log.y.length;
  const rmse = Math.sqrt(sumSquaredError(log.y, predicted) / n);
  const p = 2 + (ctx.active.heat ? 1 : 0) + (ctx.active.cool ? 1 : 0);
  // ASHRAE Guideline 14 figures now, so that the held-out simulation can reuse `predicted`.
  const metrics = fitMetrics(log.y, predicted, p);

  // Held-out check: refit without one day in `heldOutEvery`, simulate, compare on the held-out days.
  let heldOutRmse: number | null = null;
  const heldOut: Array<{ from: number; to: number }> = [];
  if (heldOutEvery > 1 && days.length >= heldOutEvery * 2) {
    const w = new Float64Array(log.dayCount).fill(1);
    const isHeld = new Uint8Array(log.dayCount);
    days.forEach((d, i) => {
      if (i % heldOutEvery === heldOutEvery - 1) {
        w[d] = 0;
        isHeld[d] = 1;
      }
    });
    const train = fitOnGrid(ctx, grid, stats, w);
    const trainSol = solveAt(ctx, train.tau, w);
    // A segment with no training day gets its initial state from the full-data fit's initial states.
    const x0 = Float64Array.from(trainSol.x0, (v, s) => (Number.isFinite(v) ? v : final.x0[s]));
    const sim = simulatePrepared(log, { tauHours: train.tau, heatRate: trainSol.heatRate, coolRate: trainSol.coolRate, gain: trainSol.gain }, x0, predicted);
    const held = heldOutError(log, sim, isHeld);
    if (held.count > 0) heldOutRmse = Math.sqrt(held.se / held.count);
    heldOut.push(...held.spans);
  }

  const tauCI: [number, number] = [percentile(sortedTau, 0.025), percentile(sortedTau, 0.975)];
  const heatRateCI: [number, number] = [percentile(sortedH, 0.025), percentile(sortedH, 0.975)];
  const coolRateCI: [number, number] | null = ctx.active.cool ? [percentile(sortedC, 0.025), percentile(sortedC, 0.975)] : null;

  // Plain-sentence warnings.
  if (log.freeFloatHours < 6) {
    warnings.push(`Only ${log.freeFloatHours.toFixed(1)} hours of the log are free-floating (equipment off): τ rests mostly on the heating cycles and its interval is wide.`);
  }
  if (tauCI[1] / tauCI[0] > 2) {
    warnings.push(`The time constant is poorly determined: its 95 % interval spans a factor of ${(tauCI[1] / tauCI[0]).toFixed(1)}.`);
  }
  if (rmse > 1) {
    warnings.push(`The model misses the readings by ${rmse.toFixed(2)} K on average: sun, occupants, open windows or a neighbouring zone may drive this zone more than the model can see.`);
  }
  if (heldOutRmse !== null && heldOutRmse > 2 * rmse + 0.2) {
    warnings.push('The held-out days fit much worse than the days used for fitting: the response may change over the log (season, use or equipment).');
  }
  if (tauHat < 2 || tauHat > 300) {
    warnings.push(`A time constant of ${tauHat.toFixed(1)} h is outside the usual range for buildings (a few hours to a few hundred): check the column mapping and units.`);
  }
  if (ctx.active.heat && model.heatRate <= 0) {
    warnings.push('The fitted heating rate is not positive: the heating runtime column may be mapped wrongly or hold something else.');
  }
  if (days.length < 7) {
    warnings.push(`The log covers only ${days.length} days: a week or more of data gives steadier figures.`);
  }

  return {
    tauHours: tauHat,
    heatRate: ctx.active.heat ? model.heatRate : 0,
    coolRate: ctx.active.cool ? model.coolRate : 0,
    gain: model.gain,
    tauCI,
    heatRateCI: ctx.active.heat ? heatRateCI : [NaN, NaN],
    coolRateCI,
    hasHeating: ctx.active.heat,
    hasCooling: ctx.active.cool,
    heldOut,
    rmse,
    heldOutRmse,
    cvrmse: metrics.cvrmse,
    nmbe: metrics.nmbe,
    samplesUsed: n,
    daysUsed: days.length,
    segments: blocks.segCount,
    freeFloatHours: log.freeFloatHours,
    firstTime: log.timeMs[0],
    lastTime: log.timeMs[n - 1],
    warnings,
  };
}

/**
 * The fitted model's simulated indoor temperature next to the readings, for an overlay chart.
 * Each segment starts from the initial state that best fits it under the given model.
 */
export function simulateFit(series: ZoneSeries, model: { tauHours: number; heatRate: number; coolRate: number; gain: number }): {
  time: Float64Array;
  measured: Float64Array;
  simulated: Float64Array;
} {
  const log = prepareLog(series);
  const blocks = makeBlocks(log);
  const stats = new Float64Array(blocks.count * STATS);
  accumulate(log, blocks, model.tauHours, stats);
  // Initial state of each segment with h, c, g held at the model's values.
  const D = new Float64Array(blocks.segCount);
  const e = new Float64Array(blocks.segCount);
  for (let b = 0; b < blocks.count; b++) {
    const o = b * STATS;
    const s = blocks.blockSeg[b];
    D[s] += stats[o + 10];
    e[s] += stats[o + 14] - model.heatRate * stats[o + 11] - model.coolRate * stats[o + 12] - model.gain * stats[o + 13];
  }
  const x0 = Float64Array.from(D, (d, s) => e[s] / d);
  return { time: log.timeMs, measured: log.y, simulated: simulatePrepared(log, model, x0) };
}
