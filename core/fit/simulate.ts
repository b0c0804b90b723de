/**
 * Simulation of a prepared log with a given zone model, by exact steps (core/step.ts), each segment
 * from its own initial state.
 */
import { FixedStep } from '../step.ts';
import type { ZoneModel } from '../types.ts';
import type { PreparedLog } from './prepare.ts';

/**
 * Simulated indoor temperature (°C) at every reading of `log`, driven by the log's outdoor temperature
 * and runtime, starting each segment s from x0[s] (°C).
 */
export function simulatePrepared(log: PreparedLog, model: ZoneModel, x0: Float64Array): Float64Array {
  const { timeMs, a, uh, uc, segStart } = log;
  const out = new Float64Array(timeMs.length);
  let cachedDt = -1;
  let step = new FixedStep(1, model.tauHours);
  for (let s = 0; s + 1 < segStart.length; s++) {
    const begin = segStart[s];
    const end = segStart[s + 1];
    let T = Number.isFinite(x0[s]) ? x0[s] : log.y[begin];
    out[begin] = T;
    for (let k = begin + 1; k < end; k++) {
      const dtMs = timeMs[k] - timeMs[k - 1];
      if (dtMs !== cachedDt) {
        step = new FixedStep(dtMs / 3_600_000, model.tauHours);
        cachedDt = dtMs;
      }
      const q = model.heatRate * uh[k] - model.coolRate * uc[k] + model.gain;
      T = step.step(T, a[k - 1], a[k], q);
      out[k] = T;
    }
  }
  return out;
}
