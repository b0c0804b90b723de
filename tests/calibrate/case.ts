/**
 * One scenario of the calibration study, as a user would run it: the simulated log written as CSV,
 * imported into an in-memory database through db/ (the importer's own detection, with the simulator's
 * mapping), read back and fitted by core/. Returns the truth, the estimates and their intervals.
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { fitResponse, type FitOptions } from '../../core/fit/index.ts';
import type { ZoneResponse } from '../../core/types.ts';
import { importLog, openStore } from '../../db/index.ts';
import { simulateZone, type ZoneSimResult } from '../support/zone-sim.ts';
import type { Scenario } from './scenarios.ts';

export interface CaseResult {
  id: string;
  group: Scenario['group'];
  truth: { tauHours: number; heatRate: number; gain: number };
  fit: ZoneResponse | null;
  error: string | null;
  /** Extra fits (the solar group: without the proxy). */
  extra?: Record<string, ZoneResponse | null>;
  format: { interval: number; units: string; runtime: string };
}

/** Simulates, writes, imports and reads back a scenario's log. */
export async function scenarioSeries(s: Scenario): Promise<{ sim: ZoneSimResult; series: ReturnType<ReturnType<typeof openStore>['loadSeries']> }> {
  const sim = simulateZone(s.options);
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'heatlag-calibrate-'));
  try {
    const file = path.join(dir, `${s.id}.csv`);
    fs.writeFileSync(file, sim.csv);
    const store = openStore(':memory:');
    try {
      const zone = store.getOrCreateZone('Calibration (invented)', s.id);
      await importLog(store, file, { zoneId: zone.id, mapping: sim.mapping as never });
      return { sim, series: store.loadSeries(zone.id) };
    } finally {
      store.close();
    }
  } finally {
    fs.rmSync(dir, { recursive: true, force: true });
  }
}

export async function runCase(s: Scenario, fitOptions: (s: Scenario) => Record<string, FitOptions>): Promise<CaseResult> {
  const { sim, series } = await scenarioSeries(s);
  const log = s.options.log ?? {};
  const base: CaseResult = {
    id: s.id,
    group: s.group,
    truth: { tauHours: sim.truth.tauHours, heatRate: sim.truth.heatRate, gain: sim.truth.gain },
    fit: null,
    error: null,
    format: { interval: log.intervalMinutes ?? 5, units: log.units ?? 'C', runtime: log.runtime ?? 'seconds' },
  };
  const fits: Record<string, ZoneResponse | null> = {};
  for (const [name, options] of Object.entries(fitOptions(s))) {
    try {
      fits[name] = fitResponse(series, options);
    } catch (e) {
      fits[name] = null;
      if (name === 'main') base.error = (e as Error).message;
    }
  }
  base.fit = fits.main ?? null;
  delete fits.main;
  if (Object.keys(fits).length) base.extra = fits;
  return base;
}
