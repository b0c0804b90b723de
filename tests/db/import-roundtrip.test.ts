/**
 * Round trips through the reference zone simulator (tests/support/zone-sim.ts, RK4, invented weather):
 * its logs, written in several export styles, are imported and compared with the simulator's own
 * unrounded series. Tolerances are half the rounding step of each written value (converted to K for °F
 * logs: 1 °F = 1/1.8 K by definition of the Fahrenheit scale).
 */
import { describe, expect, it } from 'vitest';
import type { ZoneSeries } from '../../core/types.ts';
import { simulateZone, type ZoneSimOptions, type ZoneSimResult } from '../support/zone-sim.ts';
import { importText } from './helpers.ts';

const model = { tauHours: 30, heatRate: 3, coolRate: 0, gain: 0.1 };

function maxAbs(a: Float64Array, b: Float64Array): number {
  let m = 0;
  for (let i = 0; i < a.length; i++) {
    if (Number.isNaN(a[i]) !== Number.isNaN(b[i])) return Infinity;
    if (!Number.isNaN(a[i])) m = Math.max(m, Math.abs(a[i] - b[i]));
  }
  return m;
}

/** Imports the simulated log (with the simulator's mapping, or detecting everything) and compares. */
async function roundTrip(sim: ZoneSimResult, withMapping: boolean, tolerance: { indoorK: number; outdoorK: number; runtime: number }) {
  const mapping = withMapping ? (sim.mapping as never) : undefined;
  const { store, zoneId, result } = await importText(sim.csv, { mapping, timezone: withMapping ? undefined : sim.timezone });
  const got: ZoneSeries = store.loadSeries(zoneId);
  const want = sim.trueSeries;
  expect(result.rowsRejected).toBe(0);
  expect(Array.from(got.time)).toEqual(Array.from(want.time));
  expect(maxAbs(got.indoor, want.indoor)).toBeLessThanOrEqual(tolerance.indoorK);
  expect(maxAbs(got.outdoor, want.outdoor)).toBeLessThanOrEqual(tolerance.outdoorK);
  expect(maxAbs(got.heatSetpoint, want.heatSetpoint)).toBeLessThanOrEqual(tolerance.outdoorK);
  expect(maxAbs(got.heat, want.heat)).toBeLessThanOrEqual(tolerance.runtime);
  expect(result.units).toBe(sim.units);
  return { result, got };
}

const eps = 1e-9;

describe('simulated logs imported back', () => {
  it('ISO with offset, °C, runtime in seconds (detected from the header)', async () => {
    const sim = simulateZone({ model, days: 3, log: { units: 'C', runtime: 'seconds' } });
    for (const withMapping of [false, true]) {
      // Runtime seconds are exact multiples of the 20 s step, so the fractions come back exactly.
      await roundTrip(sim, withMapping, { indoorK: 0.05 + eps, outdoorK: 0.05 + eps, runtime: eps });
    }
  });

  it('local times in America/Chicago across the fall-back night, °F rounded to 1 °F, runtime in percent', async () => {
    const opts: ZoneSimOptions = {
      model,
      start: '2026-10-31T00:00',
      days: 3,
      timezone: 'America/Chicago',
      log: { units: 'F', indoorResolution: 1, outdoorResolution: 1, setpointResolution: 1, runtime: 'percent', timestamps: 'local' },
    };
    const sim = simulateZone(opts);
    for (const withMapping of [false, true]) {
      const { result } = await roundTrip(sim, withMapping, { indoorK: 0.5 / 1.8 + eps, outdoorK: 0.5 / 1.8 + eps, runtime: 0.005 + eps });
      // 5-minute readings: the repeated hour holds 24 readings (12 per pass).
      expect(result.warnings.join(' ')).toContain('24 readings fell in the repeated hour of 2026-11-01 01:00–02:00 America/Chicago');
    }
  });

  it('date and time columns, semicolons and decimal commas in Europe/Berlin across spring forward, runtime as a fraction', async () => {
    const sim = simulateZone({
      model,
      start: '2026-03-28T00:00',
      days: 3,
      timezone: 'Europe/Berlin',
      log: { runtime: 'fraction', timestamps: 'split', delimiter: ';', decimal: ',', indoorResolution: 0.5, lineEnding: '\r\n' },
    });
    for (const withMapping of [false, true]) {
      const { result } = await roundTrip(sim, withMapping, { indoorK: 0.25 + eps, outdoorK: 0.05 + eps, runtime: 0.0005 + eps });
      expect(result.mapping).toMatchObject({ time: ['date', 'clock'], delimiter: ';', decimal: ',' });
    }
  });

  it('epoch seconds with gaps, duplicate rows, swapped rows and blank outdoor cells', async () => {
    const sim = simulateZone({
      model,
      days: 4,
      seed: 7,
      log: { timestamps: 'epoch', gaps: [{ atHours: 30, hours: 5 }], duplicates: 6, outOfOrder: 5, missingOutdoor: 9 },
    });
    const { store, zoneId, result } = await importText(sim.csv, {});
    const got = store.loadSeries(zoneId);
    const want = sim.trueSeries;
    const gapStart = want.time[0] + 30 * 3_600_000;
    const gapEnd = gapStart + 5 * 3_600_000;
    const kept = Array.from(want.time).filter((t) => t < gapStart || t >= gapEnd);
    expect(Array.from(got.time)).toEqual(kept);
    expect(result.duplicates).toBe(6);
    expect(result.rowsAccepted).toBe(kept.length);
    expect(Array.from(got.outdoor).filter(Number.isNaN).length).toBeGreaterThan(0);
    expect(result.warnings.join(' ')).toMatch(/out of time order/);
    expect(result.warnings.join(' ')).toMatch(/gap/);
  });

  it('heating and cooling with both setpoints, runtime as the on/off state at each row', async () => {
    const sim = simulateZone({
      model: { tauHours: 8, heatRate: 4, coolRate: 5, gain: 0.1 },
      days: 3,
      weather: { meanC: 20, dailyRangeK: 26, wanderK: 0 },
      schedule: () => ({ heatC: 20, coolC: 24 }),
      log: { runtime: 'onoff', onOffLabels: ['on', 'off'] },
    });
    const { store, zoneId, result } = await importText(sim.csv, { mapping: sim.mapping as never });
    const got = store.loadSeries(zoneId);
    expect(result.rowsRejected).toBe(0);
    expect(Array.from(got.coolSetpoint).every((v) => Math.abs(v - 24) < 1e-9)).toBe(true);
    expect(Array.from(got.time)).toEqual(Array.from(sim.trueSeries.time));
    // The state is 0 or 1; where the log says "on" at the end of an interval, the equipment ran in it.
    const pairs: [Float64Array, Float64Array][] = [
      [got.heat, sim.trueSeries.heat],
      [got.cool, sim.trueSeries.cool],
    ];
    for (const [u, truth] of pairs) {
      expect(Array.from(u).every((v) => v === 0 || v === 1)).toBe(true);
      expect(Array.from(u).filter((v) => v === 1).length).toBeGreaterThan(0);
      for (let i = 0; i < u.length; i++) if (u[i] === 1) expect(truth[i]).toBeGreaterThan(0);
    }
  });
});
