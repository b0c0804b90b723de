/**
 * A log whose runtime is only the on/off state at each reading carries less information on the
 * heating rate than one with the seconds run per interval: the fit says so in a warning, and only then.
 * Both logs are written by the reference simulator from the same invented zone and weather, and read
 * through the real import.
 */
import { describe, expect, it } from 'vitest';
import { fitResponse } from '../../core/fit/index.ts';
import { simulateZone } from '../support/zone-sim.ts';
import { importText } from './helpers.ts';

const model = { tauHours: 30, heatRate: 3, coolRate: 0, gain: 0.1 };
const onOff = /runtime is only ever 0 or 1 at 5-minute readings/;

describe('the runtime format and the fit', () => {
  it('warns for an on/off state per reading, not for seconds per interval', async () => {
    for (const [runtime, warned] of [['onoff', true], ['seconds', false]] as const) {
      const sim = simulateZone({ model, days: 10, seed: 8, log: { intervalMinutes: 5, units: 'C', runtime } });
      const { store, zoneId, result } = await importText(sim.csv);
      expect(result.rowsAccepted).toBe(sim.rowsWritten);
      const r = fitResponse(store.loadSeries(zoneId));
      expect(r.warnings.some((w) => onOff.test(w)), runtime).toBe(warned);
    }
  });
});
