/**
 * The recovery backtest (core/fit/backtest.ts), round trip against a known model: a zone simulated by
 * the reference simulator (tests/support/zone-sim.ts: RK4 at 20 s, a thermostat with hysteresis, so not
 * the fitter's own step) with a nightly setback. Each morning is predicted by a fit without its day; with
 * the truth one-node and the readings unrounded, the predictions must land within a couple of readings
 * of the actual times. Invented zone and weather.
 */
import { describe, expect, it } from 'vitest';
import { fitResponse } from '../../core/fit/index.ts';
import { setbackSchedule, simulateZone } from '../support/zone-sim.ts';

describe('recovery backtest', () => {
  const sim = simulateZone({
    model: { tauHours: 30, heatRate: 1.6, coolRate: 0, gain: 0.05 },
    days: 21,
    schedule: setbackSchedule({ occupiedHeatC: 21, setbackHeatC: 16, startHour: 6, endHour: 22 }),
    weather: { seed: 5, meanC: 0, dailyRangeK: 6, wanderK: 2 },
    thermostat: { deadbandK: 0.6 },
    log: { intervalMinutes: 5, units: 'C', runtime: 'seconds' },
  });

  it('predicts each morning from a fit without its day, within a few readings of the truth', () => {
    const r = fitResponse(sim.trueSeries, { timeZone: 'UTC' });
    const b = r.recoveryBacktest;
    expect(r.recoveryBacktestReason).toBeNull();
    expect(b).not.toBeNull();
    // One recovery per morning of the 21 days (the first may fall before the log starts).
    expect(b!.cases).toBeGreaterThanOrEqual(19);
    // Each morning a real recovery: from the 16 °C setback to 21 °C, taking an hour or more.
    for (const m of b!.mornings) {
      expect(m.toC).toBeCloseTo(21, 6);
      expect(m.actualMinutes).toBeGreaterThan(30);
    }
    // Within three 5-minute readings in the median, and the worst decile within six.
    expect(b!.medianErrorMinutes).toBeLessThanOrEqual(15);
    expect(b!.p90ErrorMinutes).toBeLessThanOrEqual(30);
  });

  it('says why when the log holds no recovery or no setpoint', () => {
    // The same readings with the setpoint column flattened (no step up), then without it.
    const flat = { ...sim.trueSeries, heatSetpoint: new Float64Array(sim.trueSeries.time.length).fill(21) };
    const r = fitResponse(flat, { timeZone: 'UTC' });
    expect(r.recoveryBacktest).toBeNull();
    expect(r.recoveryBacktestReason).toMatch(/no morning recovery/);
    const none = { ...sim.trueSeries, heatSetpoint: new Float64Array(sim.trueSeries.time.length).fill(NaN) };
    expect(fitResponse(none, { timeZone: 'UTC' }).recoveryBacktestReason).toMatch(/no heating setpoint column/);
  });
});
