/**
 * What the sandwich covariance cannot see: biases of the output-error fit that come from how the log was
 * recorded, estimated and added to the intervals (and, for the rounding, removed from the estimates).
 *
 * 1. Rounded readings. A thermostat that reports whole °F or half °C rounds the temperature; while the
 *    zone is held in a deadband the rounding error is not random but depends on where the setpoint sits
 *    on the rounding grid, and the least-squares fit takes part of it for physics (on the calibration
 *    study's logs: τ off by up to 3 %, far outside the sandwich interval). Method: parametric simulation
 *    (Efron & Tibshirani, *An Introduction to the Bootstrap*, 1993, §10.6 bias estimation): the fitted
 *    model is simulated on the log's own outdoor temperature and runtime, rounded on the log's own grid
 *    (resolution.ts), and fitted again; the shift b of the refit from the fit estimates the bias. The
 *    estimates are corrected by −b, and b² is added to each variance (the correction is taken to be as
 *    uncertain as it is large).
 * 2. Runtime logged as an on/off state per reading. The state at the reading's time says little about how
 *    long the equipment ran in the interval; on short cycles this biases τ (on the study's logs by up to
 *    20 %). It cannot be removed; it is measured instead: τ is also fitted to the free-floating stretches
 *    alone (both readings of an interval with the equipment off), where runtime plays no part, the forcing
 *    coefficients re-solved at that τ, and the squared differences added to the variances.
 */
import { UnderdeterminedError } from '../errors.ts';
import type { ZoneSeries } from '../types.ts';
import { evaluate, fitContext, withReadings, type FitContext } from './context.ts';
import { refitCandidate, type Candidate } from './candidate.ts';
import type { FitOptions } from './options.ts';
import { modesOf } from '../modes.ts';
import { fitOneNode } from './onenode.ts';
import { prepareLog } from './prepare.ts';
import { readingResolution, requantise, resolutionLabel } from './resolution.ts';

export interface ModelErrorParts {
  /** The fitted candidate with the rounding bias removed from θ and β. */
  corrected: Candidate;
  /** Variance to add to each of [θ, β] (transformed scale). */
  variance: Float64Array;
  /** Plain sentences about what was found. */
  notes: string[];
}

/** Whether a runtime column holds only 0 and 1 at readings 5 minutes or more apart (an on/off state). */
export function binaryRuntime(u: Float64Array, medianStepHours: number): boolean {
  if (medianStepHours < 5 / 60) return false;
  let any = false;
  for (let i = 0; i < u.length; i++) {
    if (u[i] !== 0 && u[i] !== 1) return false;
    if (u[i] === 1) any = true;
  }
  return any;
}

/** τ fitted to the free-floating stretches of the log alone, or null when they cannot pin it down. */
export function freeFloatingTau(series: ZoneSeries, options: FitOptions): number | null {
  const { heat, cool } = series;
  const heatLogged = heat.some(Number.isFinite);
  const coolLogged = cool.some(Number.isFinite);
  const off = (i: number) => (!heatLogged || heat[i] === 0) && (!coolLogged || cool[i] === 0);
  const indoor = Float64Array.from(series.indoor, (v, i) => (i > 0 && off(i) && off(i - 1) ? v : NaN));
  try {
    const log = prepareLog({ ...series, indoor }, { timeZone: options.timeZone });
    const solar = options.solarProxy ? options.solarProxy(log.timeMs) : null;
    const ctx = fitContext(log, solar);
    const f = fitOneNode(ctx, null);
    return f.atEdge ? null : f.tau;
  } catch (e) {
    if (e instanceof UnderdeterminedError || (e as Error).name === 'InputError') return null;
    throw e;
  }
}

/** The model-error components of a fitted candidate; `predicted` is its simulated temperature. */
export function modelError(series: ZoneSeries, options: FitOptions, ctx: FitContext, fitted: Candidate, predicted: Float64Array): ModelErrorParts {
  const nTheta = fitted.theta.length;
  const P = fitted.solution.beta.length;
  const variance = new Float64Array(nTheta + P);
  const notes: string[] = [];
  let theta = fitted.theta.slice();
  let beta = Float64Array.from(fitted.solution.beta);

  const resolution = readingResolution(ctx.log.y);
  const stepK = resolution ? resolution.step / (resolution.unit === 'F' ? 1.8 : 1) : 0;
  if (resolution && stepK >= 0.05) {
    const ctxQ = withReadings(ctx, requantise(predicted, resolution));
    try {
      const q = refitCandidate(ctxQ, fitted, null);
      theta = theta.map((v, k) => {
        const b = q.theta[k] - v;
        variance[k] += b * b;
        return v - b;
      });
      beta = beta.map((v, j) => {
        const b = q.solution.beta[j] - v;
        variance[nTheta + j] += b * b;
        return v - b;
      });
      const shift = 100 * (q.theta[0] - fitted.theta[0]);
      if (Math.abs(shift) >= 0.5 && fitted.kind === 'one-node') {
        notes.push(`Readings rounded to ${resolutionLabel(resolution)} shift the fitted time constant by about ${Math.abs(shift).toFixed(1)} %; the figures are corrected for it and the intervals include it.`);
      }
    } catch {
      notes.push(`The effect of readings rounded to ${resolutionLabel(resolution)} could not be estimated; the intervals leave it out.`);
    }
  }

  const binaryHeat = binaryRuntime(ctx.log.uh, ctx.log.medianStepHours);
  const binaryCool = binaryRuntime(ctx.log.uc, ctx.log.medianStepHours);
  if ((binaryHeat || binaryCool) && fitted.kind === 'one-node') {
    const tauFree = freeFloatingTau(series, options);
    if (tauFree !== null) {
      const d = Math.log(tauFree) - theta[0];
      variance[0] += d * d;
      const atFree = evaluate(ctx, modesOf({ tauHours: tauFree }), null);
      for (let j = 0; j < P; j++) {
        const b = atFree.beta[j] - beta[j];
        variance[nTheta + j] += b * b;
      }
      notes.push(
        `Runtime is logged only as an on/off state: the free-floating stretches alone give τ ${tauFree.toFixed(1)} h against ${Math.exp(theta[0]).toFixed(1)} h from the whole log; the intervals include the difference.`,
      );
    } else {
      notes.push('Runtime is logged only as an on/off state and the log has too few free-floating stretches to check τ on: the intervals leave out the error this can cause.');
    }
  }
  return { corrected: { ...fitted, theta, solution: { ...fitted.solution, beta } }, variance, notes };
}
