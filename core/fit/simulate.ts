/**
 * Simulation of a prepared log with a given zone model, by exact steps (core/step.ts), each segment
 * from its own initial state. The step T ← E·T + wA0·a0 + wA1·a1 + wQ·q is FixedStep.step written out
 * (same operations, same order), with its coefficients recomputed only when the interval changes.
 */
import { FixedStep } from '../step.ts';
import type { ZoneModel } from '../types.ts';
import type { PreparedLog } from './prepare.ts';

/**
 * Simulated indoor temperature (°C) at every reading of `log`, driven by the log's outdoor temperature
 * and runtime, starting each segment s from x0[s] (°C).
 * @param out where to write the result (length ≥ readings); a new array by default.
 */
export function simulatePrepared(log: PreparedLog, model: ZoneModel, x0: Float64Array, out: Float64Array = new Float64Array(log.timeMs.length)): Float64Array {
  const { timeMs, a, uh, uc, segStart } = log;
  const { heatRate, coolRate, gain, tauHours } = model;
  let cachedDt = -1;
  let E = 0, wA0 = 0, wA1 = 0, wQ = 0;
  for (let s = 0; s + 1 < segStart.length; s++) {
    const begin = segStart[s];
    const end = segStart[s + 1];
    let T = Number.isFinite(x0[s]) ? x0[s] : log.y[begin];
    out[begin] = T;
    for (let k = begin + 1; k < end; k++) {
      const dtMs = timeMs[k] - timeMs[k - 1];
      if (dtMs !== cachedDt) {
        const step = new FixedStep(dtMs / 3_600_000, tauHours);
        E = step.E; wA0 = step.wA0; wA1 = step.wA1; wQ = step.wQ;
        cachedDt = dtMs;
      }
      const q = heatRate * uh[k] - coolRate * uc[k] + gain;
      T = E * T + wA0 * a[k - 1] + wA1 * a[k] + wQ * q;
      out[k] = T;
    }
  }
  return out;
}
