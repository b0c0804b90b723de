/**
 * What every fit of one log shares: the prepared log, its blocks, the forcing inputs and the scratch
 * space of the passes, and the evaluation "dynamics → least-squares solution" (one pass, one solve).
 */
import { accumulate, layout, makeBlocks, type Blocks, type Layout } from './pass.ts';
import type { Modes } from '../modes.ts';
import type { PreparedLog } from './prepare.ts';
import { LinearWorkspace, blockCounts, solveLinear, type LinearSolution } from './solve.ts';

/** The forcing inputs a fit may carry, in the order they appear in β. */
export type InputName = 'heat' | 'cool' | 'gain' | 'solar';

export interface FitContext {
  log: PreparedLog;
  blocks: Blocks;
  counts: Float64Array;
  /** Names of the forcing inputs in β's order. */
  names: InputName[];
  /** Per-reading inputs: heating runtime, minus cooling runtime, 1 (gain), solar proxy (kW/m²). */
  inputs: Float64Array[];
  /** Days with readings, in order. */
  days: number[];
  /** Passes made so far (for the bench and the tests). */
  passes: number;
  scratch: Map<number, { lay: Layout; stats: Float64Array; ws: LinearWorkspace }>;
}

/**
 * The context of a prepared log. `solar` is the solar proxy at each kept reading (kW/m²), or null.
 */
export function fitContext(log: PreparedLog, solar: Float64Array | null): FitContext {
  const blocks = makeBlocks(log);
  const names: InputName[] = [];
  const inputs: Float64Array[] = [];
  if (log.hasHeating) {
    names.push('heat');
    inputs.push(log.uh);
  }
  if (log.hasCooling) {
    names.push('cool');
    inputs.push(Float64Array.from(log.uc, (u) => -u));
  }
  names.push('gain');
  inputs.push(new Float64Array(log.y.length).fill(1));
  if (solar) {
    names.push('solar');
    inputs.push(solar);
  }
  const dayHasData = new Uint8Array(log.dayCount);
  for (let b = 0; b < blocks.count; b++) dayHasData[blocks.blockDay[b]] = 1;
  const days: number[] = [];
  dayHasData.forEach((v, d) => v && days.push(d));
  return { log, blocks, counts: blockCounts(blocks), names, inputs, days, passes: 0, scratch: new Map() };
}

/** The context of the same log with other readings y at the same times (the blocks and inputs are shared). */
export function withReadings(ctx: FitContext, y: Float64Array): FitContext {
  return { ...ctx, log: { ...ctx.log, y }, passes: 0, scratch: new Map() };
}

function scratchFor(ctx: FitContext, K: number) {
  let s = ctx.scratch.get(K);
  if (!s) {
    const lay = layout(ctx.inputs.length, K);
    s = { lay, stats: new Float64Array(ctx.blocks.count * lay.size), ws: new LinearWorkspace(lay, ctx.blocks.segCount) };
    ctx.scratch.set(K, s);
  }
  return s;
}

/** One pass at the given dynamics and the weighted least-squares solution (weights per day; null = all 1). */
export function evaluate(ctx: FitContext, modes: Modes, weights: Float64Array | null): LinearSolution {
  const s = scratchFor(ctx, modes.count);
  accumulate(ctx.log, ctx.blocks, modes, ctx.inputs, s.stats);
  ctx.passes++;
  return solveLinear(s.stats, ctx.blocks, s.lay, weights, ctx.counts, s.ws);
}

/** Index of an input in β, or −1. */
export function inputIndex(ctx: FitContext, name: InputName): number {
  return ctx.names.indexOf(name);
}
