/**
 * The model choice (core/fit/select.ts): Schwarz's BIC (Schwarz 1978) with an effective sample size,
 * plus the practical-significance rule (two nodes must cut the squared error by at least 10 %, the
 * threshold set from `npm run calibrate`). Candidates with invented residual sums on a real prepared
 * log (a simulated week; invented data), so the criterion's arithmetic is checked directly:
 * with uncorrelated residuals n_eff = n, and BIC = n·ln(RSS/n) + k·ln(n).
 */
import { describe, expect, it } from 'vitest';
import { fitContext } from '../../core/fit/context.ts';
import { prepareLog } from '../../core/fit/prepare.ts';
import { MIN_GAIN_PERCENT, selectModel } from '../../core/fit/select.ts';
import type { Candidate } from '../../core/fit/candidate.ts';
import { modesOf } from '../../core/modes.ts';
import { simulateZone } from '../support/zone-sim.ts';

const sim = simulateZone({ model: { tauHours: 30, heatRate: 2, coolRate: 0, gain: 0.1 }, days: 7, log: { intervalMinutes: 5 } });
const ctx = fitContext(prepareLog(sim.trueSeries, { timeZone: 'UTC' }), null);
const n = ctx.log.y.length;
const cand = (kind: Candidate['kind'], rss: number): Candidate => ({
  kind,
  theta: kind === 'one-node' ? [Math.log(30)] : [0, Math.log(40), 2],
  modesAt: () => modesOf({ tauHours: 30 }),
  solution: { rss, n, beta: new Float64Array(ctx.inputs.length), init: new Float64Array(ctx.blocks.segCount * (kind === 'one-node' ? 1 : 2)) },
});
// Alternating residuals: lag-one autocorrelation −1 → clipped at 0, so n_eff = n.
const residual = Float64Array.from({ length: n }, (_, i) => (i % 2 ? 0.1 : -0.1));

describe('model selection', () => {
  it('keeps one node when two nodes win the BIC by a cut under the threshold', () => {
    const two = cand('two-node', 0.95 * 100);
    const { chosen, selection } = selectModel(ctx, cand('one-node', 100), two, residual, false, null);
    // BIC difference: n·ln(0.95) + 3·ln(n) < 0 for n of a week of 5-minute readings (≈ 2000): two nodes win the criterion …
    expect(selection.candidates[1]!.score).toBeLessThan(selection.candidates[0]!.score);
    // … but a 5 % cut is under the threshold, so one node stays.
    expect(MIN_GAIN_PERCENT).toBe(10);
    expect(chosen.kind).toBe('one-node');
    expect(selection.reason).toMatch(/only 5\.0 %/);
  });

  it('chooses two nodes for a large cut, and never at a bound or after a failure', () => {
    expect(selectModel(ctx, cand('one-node', 100), cand('two-node', 30), residual, false, null).chosen.kind).toBe('two-node');
    expect(selectModel(ctx, cand('one-node', 100), cand('two-node', 30), residual, true, null).chosen.kind).toBe('one-node');
    expect(selectModel(ctx, cand('one-node', 100), null, residual, false, 'the two-node fit did not converge').selection.reason).toMatch(/did not converge/);
  });

  it('scores by BIC = n_eff·ln(RSS/n) + k·ln(n_eff)', () => {
    const { selection } = selectModel(ctx, cand('one-node', 100), cand('two-node', 30), residual, false, null);
    const k1 = 1 + ctx.inputs.length + ctx.blocks.segCount;
    expect(selection.effectiveReadings).toBe(n);
    expect(selection.candidates[0]!.score).toBeCloseTo(n * Math.log(100 / n) + k1 * Math.log(n), 9);
  });
});
