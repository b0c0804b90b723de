/**
 * Simulation of a prepared log with given dynamics (modes.ts) and forcing coefficients, by exact steps
 * mode by mode (core/step.ts's FixedStep, as in pass.ts), each segment from its own initial state.
 * Row convention: the inputs at reading k act over the interval ending at reading k; the outdoor
 * temperature is linear between readings.
 */
import { massOf, modalState, type Modes } from '../modes.ts';
import { ModeSteps } from './pass.ts';
import type { PreparedLog } from './prepare.ts';

/**
 * Simulated air temperature (°C) at every reading, each segment s starting from the modal states
 * init[s·K + m] (NaN: the segment's first reading, with the mass at the matching steady state).
 * @param beta forcing coefficients in the order of `inputs`
 * @param out where to write (length ≥ readings); a new array by default
 * @param mass where to write the mass temperature at every reading (two nodes), if wanted
 */
export function simulateModes(log: PreparedLog, modes: Modes, beta: ArrayLike<number>, inputs: readonly Float64Array[], init: ArrayLike<number>, out: Float64Array = new Float64Array(log.timeMs.length), mass?: Float64Array): Float64Array {
  const { timeMs, a, segStart } = log;
  const K = modes.count;
  const P = inputs.length;
  const steps = new ModeSteps(modes);
  const { E, cA0, cA1, cQ } = steps;
  const w = new Float64Array(K);
  for (let s = 0; s + 1 < segStart.length; s++) {
    const begin = segStart[s];
    const end = segStart[s + 1];
    let known = true;
    for (let m = 0; m < K; m++) if (!Number.isFinite(init[s * K + m])) known = false;
    if (known) for (let m = 0; m < K; m++) w[m] = init[s * K + m];
    else modalState(modes, log.y[begin], modes.mw * log.y[begin] + (1 - modes.mw) * log.a[begin], w);
    let T = 0;
    for (let m = 0; m < K; m++) T += w[m];
    out[begin] = T;
    if (mass) mass[begin] = massOf(modes, w);
    for (let k = begin + 1; k < end; k++) {
      steps.set(timeMs[k] - timeMs[k - 1]);
      let q = 0;
      for (let j = 0; j < P; j++) q += beta[j] * inputs[j][k];
      T = 0;
      for (let m = 0; m < K; m++) {
        w[m] = E[m] * w[m] + cA0[m] * a[k - 1] + cA1[m] * a[k] + cQ[m] * q;
        T += w[m];
      }
      out[k] = T;
      if (mass) mass[k] = massOf(modes, w);
    }
  }
  return out;
}

/** Physical initial states (air, mass) of each segment from modal initial states: [air₀, mass₀, air₁, …]. */
export function physicalInit(modes: Modes, init: ArrayLike<number>, segCount: number): Float64Array {
  const K = modes.count;
  const out = new Float64Array(2 * segCount);
  for (let s = 0; s < segCount; s++) {
    let air = 0;
    for (let m = 0; m < K; m++) air += init[s * K + m];
    out[2 * s] = air;
    out[2 * s + 1] = K === 1 ? NaN : modes.r[0] * init[s * K] + modes.r[1] * init[s * K + 1];
  }
  return out;
}

/** Modal initial states under other dynamics of the same physical initial states (physicalInit's layout). */
export function modalInit(modes: Modes, phys: Float64Array, segCount: number): Float64Array {
  const K = modes.count;
  const out = new Float64Array(segCount * K);
  const w = new Float64Array(K);
  for (let s = 0; s < segCount; s++) {
    modalState(modes, phys[2 * s], phys[2 * s + 1], w);
    for (let m = 0; m < K; m++) out[s * K + m] = w[m];
  }
  return out;
}
