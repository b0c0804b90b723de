/**
 * A fitted candidate model of a zone (one or two nodes): its dynamics θ (transformed: log time constants,
 * logit mass share), the least-squares solution at θ, and how to refit it on other days or other readings.
 */
import { UnderdeterminedError } from '../errors.ts';
import type { ModelKind, ZoneModel } from '../types.ts';
import { inputIndex, type FitContext } from './context.ts';
import { modesOf, type Modes } from '../modes.ts';
import { fitOneNode } from './onenode.ts';
import type { LinearSolution } from './solve.ts';
import { fitTwoNode, twoNodeModes } from './twonode.ts';

/** A fitted candidate: its dynamics, the least-squares solution and the transformed non-linear parameters. */
export interface Candidate {
  kind: ModelKind;
  theta: number[];
  modesAt: (theta: readonly number[]) => Modes;
  solution: LinearSolution;
}

/** The one-node model's non-linear parameter: θ = (log τ). */
export const oneNodeModes = (theta: readonly number[]): Modes => modesOf({ tauHours: Math.exp(theta[0]) });

/** The model of a candidate in internal units. */
export function candidateModel(ctx: FitContext, c: Candidate): ZoneModel {
  const beta = c.solution.beta;
  const coef = (name: 'heat' | 'cool' | 'gain' | 'solar') => {
    const i = inputIndex(ctx, name);
    return i < 0 ? 0 : beta[i];
  };
  const modes = c.modesAt(c.theta);
  const model: ZoneModel = { tauHours: modes.tauEff, heatRate: coef('heat'), coolRate: coef('cool'), gain: coef('gain') };
  if (inputIndex(ctx, 'solar') >= 0) model.solarGain = coef('solar');
  if (c.kind === 'two-node') model.mass = massOfTheta(c.theta);
  return model;
}

/** The two-node parameters θ = (log τam, log τmo, logit share) as a mass node. */
export function massOfTheta(theta: readonly number[]) {
  return { airMassHours: Math.exp(theta[0]), massOutdoorHours: Math.exp(theta[1]), massShare: 1 / (1 + Math.exp(-theta[2])) };
}

/** Refits a candidate's kind on the days with non-zero weight of `ctx` (warm start from `c`). */
export function refitCandidate(ctx: FitContext, c: Candidate, weights: Float64Array | null): Candidate {
  if (c.kind === 'one-node') {
    const f = fitOneNode(ctx, weights, Math.exp(c.theta[0]));
    return { kind: 'one-node', theta: [Math.log(f.tau)], modesAt: oneNodeModes, solution: f.solution };
  }
  const f = fitTwoNode(ctx, 0, weights, c.theta);
  if (!f) throw new UnderdeterminedError('The two-node refit did not converge.');
  return { kind: 'two-node', theta: f.theta, modesAt: twoNodeModes, solution: f.solution };
}

