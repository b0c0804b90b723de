/**
 * Fits a zone response to a thermostat log by output error: one node (τ, h, c, g[, s]) and, where the log
 * supports it, two nodes (air and building mass), the model chosen by an information criterion; 95 %
 * intervals from a day-level HAC sandwich; a held-out check; the recovery backtest.
 *
 * Method: output-error least squares (each segment simulated exactly from its own fitted initial state
 * and compared with the readings; pass.ts), not one-step regression, because indoor readings are
 * quantised (1 °F or 0.5 °C steps) and a one-step regression on differences of quantised readings is
 * badly biased toward short time constants. The dynamics are found by search (one node: τ on a grid,
 * then Brent's method; two nodes: Levenberg–Marquardt from several starts, twonode.ts), the forcing
 * coefficients and initial states by linear least squares at each trial (variable projection).
 * Uncertainty: intervals.ts. Model choice: select.ts. Validation: one local day in five is held out, the
 * chosen model refitted without those days, and the held-out days simulated and compared (heldOutRmse).
 *
 * Units: input ZoneSeries in internal units (°C, epoch ms, runtime fractions); output in hours, K/h, K.
 * @throws InputError when the log lacks outdoor temperature or usable readings.
 * @throws UnderdeterminedError when the data cannot determine τ (no free-floating periods and no
 *   variation in heating, or a profile too flat to pin τ down).
 * @example
 *   const response = fitResponse(store.loadSeries(zoneId), { timeZone: 'Europe/Berlin' });
 *   response.tauHours; // e.g. 31.8 (h), response.tauCI // [29.9, 33.6]
 */
import { UnderdeterminedError } from '../errors.ts';
import { fitMetrics } from '../metrics.ts';
import type { ModelSelection, TwoNodeFigures, ZoneModel, ZoneResponse, ZoneSeries } from '../types.ts';
import { evaluate, fitContext, inputIndex, type FitContext } from './context.ts';
import { covarianceAt, derivedError, linearInterval, logInterval, type Covariance } from './intervals.ts';
import { modelError } from './model-error.ts';
import type { FitOptions } from './options.ts';
import { candidateModel, massOfTheta, oneNodeModes, refitCandidate, type Candidate } from './candidate.ts';
import { MIN_GAIN_PERCENT, possibleCutPercent, roundingBoundSelection, selectModel } from './select.ts';
import { fitTwoNode, levenbergMarquardt, twoNodeModes } from './twonode.ts';
import { modesOf, type Modes } from '../modes.ts';
import { fitOneNode, TAU_MAX, TAU_MIN } from './onenode.ts';
import { prepareLog, type PreparedLog } from './prepare.ts';
import { simulateModes } from './simulate.ts';
import { recoveryBacktest } from './backtest.ts';
import { seriesRows } from '../series.ts';

export type { FitOptions };

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

/** The one-node candidate, or an UnderdeterminedError when the log cannot pin τ down. */
function oneNodeCandidate(ctx: FitContext, sample: FitContext | null): Candidate {
  const fit = fitOneNode(ctx, null, undefined, sample);
  if (fit.atEdge) {
    const edge = fit.gridRss[0] <= fit.gridRss[fit.gridRss.length - 1] ? TAU_MIN : TAU_MAX;
    throw new UnderdeterminedError(
      `The log cannot determine the time constant: the best fit lies at the edge of the searched range (${edge.toFixed(2)} h). The readings may not respond to outdoor temperature or to heating at all (check the column mapping).`,
    );
  }
  return { kind: 'one-node', theta: [Math.log(fit.tau)], modesAt: oneNodeModes, solution: fit.solution };
}

/** Fits the zone response of a log. See the module comment for the method. */
export function fitResponse(series: ZoneSeries, options: FitOptions = {}): ZoneResponse {
  const heldOutEvery = options.heldOutEvery ?? 5;
  const log = prepareLog(series, { timeZone: options.timeZone });
  const solarRaw = options.solarProxy ? options.solarProxy(log.timeMs) : null;
  const solar = solarRaw && variance(solarRaw) > 0 ? solarRaw : null;
  const ctx = fitContext(log, solar);
  const warnings = [...log.warnings];

  // A zone that never free-floats and whose heating never varies carries no information on τ.
  if (log.freeFloatHours < 1 && variance(log.uh) < 1e-4) {
    throw new UnderdeterminedError(
      'The log cannot determine the time constant: the zone never free-floats and the heating output never varies, so envelope losses and heating cannot be told apart. Import a log that includes a setback or an equipment-off period.',
    );
  }

  const sample = weekSample(series, options, ctx, solar !== null);
  const one = oneNodeCandidate(ctx, sample);
  const { sim: oneSim, residual: oneResidual } = residualOf(ctx, one);
  let two: Candidate | null = null;
  let twoAtBound = false;
  let twoFailure: string | null = null;
  const models = options.models ?? 'auto';
  // Rounded readings may leave too little of the one-node error for any model to remove (select.ts).
  const cut = models === 'auto' ? possibleCutPercent(log.y, oneSim) : null;
  if (cut !== null && cut < MIN_GAIN_PERCENT) {
    return finishResponse(series, options, ctx, one, roundingBoundSelection(ctx, one, oneResidual, cut), warnings, heldOutEvery, options.intervals ?? true);
  }
  if (models !== 'one-node') {
    const f = twoNodeSearch(ctx, sample, Math.exp(one.theta[0]));
    if (f) {
      two = { kind: 'two-node', theta: f.theta, modesAt: twoNodeModes, solution: f.solution };
      twoAtBound = f.atBound;
    } else {
      twoFailure = 'the two-node fit did not converge';
      warnings.push('The two-node model (air and building mass) could not be fitted to this log; the one-node model is used.');
    }
  }
  let { chosen, selection } = selectModel(ctx, one, two, oneResidual, twoAtBound, twoFailure);
  if (models === 'one-node') selection = { ...selection, reason: 'One node, as asked.' };
  if (models === 'two-node' && two) {
    chosen = two;
    selection = { ...selection, reason: 'Two nodes, as asked.' };
  }
  return finishResponse(series, options, ctx, chosen, selection, warnings, heldOutEvery, options.intervals ?? true);
}

/** Logs longer than this many days have their searches run on a sample of weeks first. */
const SEARCH_SAMPLE_DAYS = 70;

/**
 * A sample of whole weeks spread over a long log (about five weeks: every k-th week, so every season is
 * seen), as its own fit context; null for a log of SEARCH_SAMPLE_DAYS or fewer, or when the sample
 * lacks one of the log's inputs. The searches locate their optimum on it, then finish on the whole log.
 */
function weekSample(series: ZoneSeries, options: FitOptions, ctx: FitContext, withSolar: boolean): FitContext | null {
  const days = ctx.log.dayCount;
  if (days <= SEARCH_SAMPLE_DAYS) return null;
  const every = Math.ceil(days / 35);
  const t0 = ctx.log.timeMs[0];
  const keep: number[] = [];
  for (let i = 0; i < series.time.length; i++) {
    const week = Math.floor((series.time[i] - t0) / (7 * 86_400_000));
    if (week % every === 0) keep.push(i);
  }
  try {
    const sampleLog = prepareLog(seriesRows(series, keep), { timeZone: options.timeZone });
    const sampleSolar = withSolar && options.solarProxy ? options.solarProxy(sampleLog.timeMs) : null;
    const sampleCtx = fitContext(sampleLog, sampleSolar && variance(sampleSolar) > 0 ? sampleSolar : null);
    return sampleCtx.names.join() === ctx.names.join() ? sampleCtx : null;
  } catch {
    return null;
  }
}

/**
 * The two-node fit. On a long log the search from several starts runs on the sample of weeks, then a few
 * Levenberg–Marquardt steps on the whole log polish it; the answer is the whole log's optimum either
 * way, only reached with far fewer passes over a year of readings.
 */
function twoNodeSearch(ctx: FitContext, sample: FitContext | null, tauOne: number) {
  if (!sample) return fitTwoNode(ctx, tauOne);
  try {
    const rough = fitTwoNode(sample, tauOne);
    if (!rough) return fitTwoNode(ctx, tauOne);
    // At a bound the mass node is not pinned down and cannot be chosen: its whole-log misfit is enough.
    if (rough.atBound) return { ...rough, solution: evaluate(ctx, twoNodeModes(rough.theta), null) };
    return levenbergMarquardt(ctx, rough.theta, null, 2);
  } catch {
    return fitTwoNode(ctx, tauOne);
  }
}

/** The simulated temperature ŷ of a candidate and the residual y − ŷ at every reading. */
function residualOf(ctx: FitContext, c: Candidate): { sim: Float64Array; residual: Float64Array } {
  const sim = simulateModes(ctx.log, c.modesAt(c.theta), c.solution.beta, ctx.inputs, c.solution.init);
  const { y } = ctx.log;
  const residual = new Float64Array(y.length);
  for (let i = 0; i < y.length; i++) residual[i] = y[i] - sim[i];
  return { sim, residual };
}

/** Figures, intervals, the held-out check and warnings of the chosen candidate. */
function finishResponse(series: ZoneSeries, options: FitOptions, ctx: FitContext, fitted: Candidate, selection: ModelSelection, warnings: string[], heldOutEvery: number, withIntervals: boolean): ZoneResponse {
  const { log } = ctx;
  const n = log.y.length;
  const nTheta = fitted.theta.length;
  const P = fitted.solution.beta.length;
  const size = nTheta + P;
  const fittedModes = fitted.modesAt(fitted.theta);

  let cov: Covariance | null = null;
  let predicted: Float64Array;
  let chosen = fitted;
  if (withIntervals) {
    cov = covarianceAt(ctx, fitted.theta, fitted.modesAt, fitted.solution);
    predicted = cov.predicted;
    // Model-error components (model-error.ts): rounding of the readings, runtime logged as an on/off state.
    const parts = modelError(series, options, ctx, fitted, predicted);
    chosen = parts.corrected;
    for (let i = 0; i < size; i++) cov.cov[i * size + i] += parts.variance[i];
    warnings.push(...parts.notes);
  } else {
    predicted = simulateModes(log, fittedModes, fitted.solution.beta, ctx.inputs, fitted.solution.init);
  }
  const model = candidateModel(ctx, chosen);
  const modes = chosen.modesAt(chosen.theta);
  let sse = 0;
  for (let i = 0; i < n; i++) sse += (log.y[i] - predicted[i]) ** 2;
  const rmse = Math.sqrt(sse / n);
  const metrics = fitMetrics(log.y, predicted, size);
  const betaIndex = (name: 'heat' | 'cool' | 'gain' | 'solar') => nTheta + inputIndex(ctx, name);
  const nanPair: [number, number] = [NaN, NaN];
  const interval = (name: 'heat' | 'cool' | 'gain' | 'solar', value: number): [number, number] =>
    cov && inputIndex(ctx, name) >= 0 ? linearInterval(cov, betaIndex(name), value) : nanPair;
  let tauCI: [number, number] = nanPair;
  let twoNode: TwoNodeFigures | null = null;
  if (chosen.kind === 'one-node') {
    if (cov) tauCI = logInterval(cov, 0, model.tauHours);
  } else {
    twoNode = twoNodeFigures(chosen, modes, cov);
    if (cov) tauCI = derivedLogInterval(cov, chosen, (m) => m.tauEff);
  }

  // Held-out check: refit without one day in `heldOutEvery`, simulate, compare on the held-out days.
  let heldOutRmse: number | null = null;
  const heldOut: Array<{ from: number; to: number }> = [];
  const { days } = ctx;
  if (heldOutEvery > 1 && days.length >= heldOutEvery * 2) {
    const w = new Float64Array(log.dayCount).fill(1);
    const isHeld = new Uint8Array(log.dayCount);
    days.forEach((d, i) => {
      if (i % heldOutEvery === heldOutEvery - 1) {
        w[d] = 0;
        isHeld[d] = 1;
      }
    });
    const train = refitCandidate(ctx, fitted, w);
    // A segment with no training day gets its initial state from the full fit.
    const init = Float64Array.from(train.solution.init, (v, i) => (Number.isFinite(v) ? v : fitted.solution.init[i]));
    const sim = simulateModes(log, train.modesAt(train.theta), train.solution.beta, ctx.inputs, init);
    const held = heldOutError(log, sim, isHeld);
    if (held.count > 0) heldOutRmse = Math.sqrt(held.se / held.count);
    heldOut.push(...held.spans);
  }

  // The log's own mornings, each predicted by a fit that did not see its day (backtest.ts).
  const backtest = options.backtest === false || !withIntervals ? { backtest: null, reason: 'The recovery backtest was not run for this fit.' } : recoveryBacktest(series, ctx, fitted);

  const hasSolar = inputIndex(ctx, 'solar') >= 0;
  if (log.freeFloatHours < 6) {
    warnings.push(`Only ${log.freeFloatHours.toFixed(1)} hours of the log are free-floating (equipment off): τ rests mostly on the heating cycles and its interval is wide.`);
  }
  if (tauCI[1] / tauCI[0] > 2) {
    warnings.push(`The time constant is poorly determined: its 95 % interval spans a factor of ${(tauCI[1] / tauCI[0]).toFixed(1)}.`);
  }
  // Figures outside what buildings do are flagged in the person's units by core/plausibility.ts.
  if (log.hasHeating && model.heatRate <= 0) {
    warnings.push('The fitted heating rate is not positive: the heating runtime column may be mapped wrongly or hold something else.');
  }
  if (days.length < 7) {
    warnings.push(`The log covers only ${days.length} days: a week or more of data gives steadier figures.`);
  }

  return {
    ...model,
    model: chosen.kind,
    twoNode,
    heatRate: log.hasHeating ? model.heatRate : 0,
    coolRate: log.hasCooling ? model.coolRate : 0,
    tauCI,
    heatRateCI: log.hasHeating ? interval('heat', model.heatRate) : nanPair,
    coolRateCI: log.hasCooling ? interval('cool', model.coolRate) : null,
    gainCI: interval('gain', model.gain),
    solarGainCI: hasSolar ? interval('solar', model.solarGain ?? 0) : null,
    selection,
    recoveryBacktest: backtest.backtest,
    recoveryBacktestReason: backtest.reason,
    timeZone: log.days.timeZone,
    hasHeating: log.hasHeating,
    hasCooling: log.hasCooling,
    heldOut,
    rmse,
    heldOutRmse,
    cvrmse: metrics.cvrmse,
    nmbe: metrics.nmbe,
    samplesUsed: n,
    daysUsed: days.length,
    segments: ctx.blocks.segCount,
    freeFloatHours: log.freeFloatHours,
    firstTime: log.timeMs[0],
    lastTime: log.timeMs[n - 1],
    warnings,
  };
}

/** The 95 % interval of a positive quantity of the dynamics, f(modes), through log f by the delta method. */
function derivedLogInterval(cov: Covariance, c: Candidate, f: (m: Modes) => number): [number, number] {
  const grad = new Array(cov.size).fill(0);
  for (let k = 0; k < c.theta.length; k++) {
    const up = c.theta.slice(), down = c.theta.slice();
    up[k] += 1e-5;
    down[k] -= 1e-5;
    grad[k] = (Math.log(f(c.modesAt(up))) - Math.log(f(c.modesAt(down)))) / 2e-5;
  }
  const h = cov.t * derivedError(cov, grad);
  const v = f(c.modesAt(c.theta));
  return [v * Math.exp(-h), v * Math.exp(h)];
}

/** The two-node figures and their intervals (delta method through the modes for the slow time constant). */
function twoNodeFigures(c: Candidate, modes: Modes, cov: Covariance | null): TwoNodeFigures {
  const mass = massOfTheta(c.theta);
  const nanPair: [number, number] = [NaN, NaN];
  let shareCI = nanPair;
  if (cov) {
    const [lo, hi] = linearInterval(cov, 2, c.theta[2]);
    shareCI = [1 / (1 + Math.exp(-lo)), 1 / (1 + Math.exp(-hi))];
  }
  return {
    mass,
    airMassHoursCI: cov ? logInterval(cov, 0, mass.airMassHours) : nanPair,
    massOutdoorHoursCI: cov ? logInterval(cov, 1, mass.massOutdoorHours) : nanPair,
    massShareCI: shareCI,
    slowHours: modes.tau[0],
    slowHoursCI: cov ? derivedLogInterval(cov, c, (m) => m.tau[0]) : nanPair,
    fastHours: modes.tau[1],
  };
}

/**
 * The fitted model's simulated indoor temperature next to the readings, for an overlay chart.
 * Each segment starts from the initial state that best fits it under the given model.
 */
export function simulateFit(series: ZoneSeries, model: ZoneModel, options: Pick<FitOptions, 'timeZone' | 'solarProxy'> = {}): {
  time: Float64Array;
  measured: Float64Array;
  simulated: Float64Array;
} {
  const log = prepareLog(series, { timeZone: options.timeZone });
  const solar = options.solarProxy && model.solarGain ? options.solarProxy(log.timeMs) : null;
  const ctx = fitContext(log, solar);
  const modes = modesOf(model);
  const beta = ctx.names.map((name) => (name === 'heat' ? model.heatRate : name === 'cool' ? model.coolRate : name === 'gain' ? model.gain : (model.solarGain ?? 0)));
  // Initial states with the forcing held at the model's values: least squares of the initial states alone.
  const init = initialStatesFor(ctx, modes, beta);
  return { time: log.timeMs, measured: log.y, simulated: simulateModes(log, modes, beta, ctx.inputs, init) };
}

/** Each segment's initial modal states that best fit it with the forcing coefficients held at `beta`. */
function initialStatesFor(ctx: FitContext, modes: Modes, beta: ArrayLike<number>): Float64Array {
  const { log, blocks, inputs } = ctx;
  const K = modes.count;
  // Simulate from zero initial states, then fit each segment's mode decays to what is left (linearity).
  const segCount = blocks.segCount;
  const init = new Float64Array(segCount * K);
  const base = simulateModes(log, modes, beta, inputs, new Float64Array(segCount * K));
  const psi = new Float64Array(K);
  for (let s = 0; s < segCount; s++) {
    const b = log.segStart[s], e = log.segStart[s + 1];
    const M = new Float64Array(K * K);
    const v = new Float64Array(K);
    psi.fill(1);
    for (let i = b; i < e; i++) {
      if (i > b) {
        const dtH = (log.timeMs[i] - log.timeMs[i - 1]) / 3_600_000;
        for (let m = 0; m < K; m++) psi[m] *= Math.exp(-dtH / modes.tau[m]);
      }
      const r = log.y[i] - base[i];
      for (let m = 0; m < K; m++) {
        v[m] += psi[m] * r;
        for (let l = 0; l < K; l++) M[m * K + l] += psi[m] * psi[l];
      }
    }
    const x = solveSmall(M, v, K);
    for (let m = 0; m < K; m++) init[s * K + m] = x[m];
  }
  return init;
}

function solveSmall(M: Float64Array, v: Float64Array, K: number): Float64Array {
  if (K === 1) return Float64Array.of(M[0] > 0 ? v[0] / M[0] : 0);
  const det = M[0] * M[3] - M[1] * M[2];
  if (Math.abs(det) < 1e-300) return Float64Array.of(M[0] > 0 ? v[0] / M[0] : 0, 0);
  return Float64Array.of((M[3] * v[0] - M[1] * v[1]) / det, (M[0] * v[1] - M[2] * v[0]) / det);
}
