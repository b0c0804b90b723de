/**
 * The invented logs of the calibration study (`npm run calibrate`): each a zone simulated by the
 * reference simulator (tests/support/zone-sim.ts: RK4 at a fine fixed step, a deadband thermostat with
 * hysteresis, quantised readings, runtime written as seconds, percent or an on/off state), so the truth
 * is known and shares no code with the fitter's exact step.
 *
 * Three groups:
 * - coverage: one-node truths, τ 10–80 h (log-uniform), heating lift 15–60 K, internal gain, weather,
 *   reading interval (5/10/15 min), quantisation (1 °F or 0.5 °C) and runtime kind all varied;
 * - mass: two-node truths (air–mass 1–5 h, mass–outdoor 30–100 h, mass share 0.6–0.95);
 * - solar: one-node truths with a daily solar gain (the simulator's own sun), fitted with and without
 *   the clear-sky proxy.
 * Everything here is invented data for checking the fitter against a known model.
 */
import type { TempUnit } from '../../core/types.ts';
import { Prng } from '../support/prng.ts';
import { setbackSchedule, type MassTruth, type RuntimeFormat, type SolarTruth, type ZoneSimOptions } from '../support/zone-sim.ts';

export type Group = 'coverage' | 'mass' | 'solar';

export interface Scenario {
  id: string;
  group: Group;
  options: ZoneSimOptions;
  /** Quantisation step in the log's unit. */
  units: TempUnit;
  /** Where the site is (solar group). */
  location?: { latDeg: number; lonDeg: number };
}

const INTERVALS = [5, 10, 15];
const RUNTIMES: RuntimeFormat[] = ['seconds', 'percent', 'onoff'];

function logUniform(rnd: Prng, lo: number, hi: number): number {
  return Math.exp(Math.log(lo) + rnd.next() * (Math.log(hi) - Math.log(lo)));
}

function uniform(rnd: Prng, lo: number, hi: number): number {
  return lo + rnd.next() * (hi - lo);
}

/** A log's format: interval, unit and quantisation, runtime kind, cycling through the combinations. */
function format(i: number) {
  const interval = INTERVALS[i % 3];
  const runtime = RUNTIMES[Math.floor(i / 3) % 3];
  const units: TempUnit = Math.floor(i / 9) % 2 === 0 ? 'F' : 'C';
  return { interval, runtime, units, resolution: units === 'F' ? 1 : 0.5 };
}

function common(rnd: Prng, i: number, seed: number, days: number): Omit<ZoneSimOptions, 'model'> & { units: TempUnit } {
  const f = format(i);
  const occupied = uniform(rnd, 20, 22);
  return {
    days,
    seed,
    stepSeconds: 20,
    start: '2025-01-06T00:00:00Z',
    weather: { seed: seed + 1, meanC: uniform(rnd, -8, 8), dailyRangeK: uniform(rnd, 4, 12), wanderK: uniform(rnd, 1.5, 3.5) },
    thermostat: { deadbandK: uniform(rnd, 0.5, 1.4) },
    schedule: setbackSchedule({ occupiedHeatC: occupied, setbackHeatC: occupied - uniform(rnd, 3, 7), startHour: Math.round(uniform(rnd, 5, 8)), endHour: Math.round(uniform(rnd, 18, 23)) }),
    log: { intervalMinutes: f.interval, units: f.units, indoorResolution: f.resolution, runtime: f.runtime },
    initialC: occupied,
    units: f.units,
  };
}

/** The scenarios of one group, seeded: the same list on every run. */
export function scenarios(group: Group, count: number, days = 28): Scenario[] {
  const rnd = new Prng(group === 'coverage' ? 2026 : group === 'mass' ? 4052 : 6078);
  const list: Scenario[] = [];
  for (let i = 0; i < count; i++) {
    const seed = 1000 * (group === 'coverage' ? 1 : group === 'mass' ? 2 : 3) + i;
    const c = common(rnd, i, seed, days);
    const { units, ...sim } = c;
    if (group === 'mass') {
      const mass: MassTruth = { airMassHours: uniform(rnd, 1, 5), massOutdoorHours: uniform(rnd, 30, 100), massShare: uniform(rnd, 0.6, 0.95) };
      const tauEff = mass.airMassHours + (mass.massOutdoorHours * (1 - mass.massShare)) / mass.massShare;
      const lift = uniform(rnd, 20, 50);
      const heatRate = lift / tauEff;
      list.push({ id: `mass-${i + 1}`, group, units, options: { ...sim, model: { tauHours: tauEff, heatRate, coolRate: 0, gain: uniform(rnd, 0, 0.15) * heatRate }, mass } });
      continue;
    }
    const tauHours = logUniform(rnd, 10, 80);
    const lift = uniform(rnd, 15, 60);
    const heatRate = lift / tauHours;
    const gain = uniform(rnd, 0, 4) / tauHours;
    if (group === 'solar') {
      const latDeg = uniform(rnd, 35, 55);
      const lonDeg = uniform(rnd, -10, 20);
      const solar: SolarTruth = { gainPerKWm2: uniform(rnd, 3, 8) / tauHours, latDeg, lonDeg, minClearness: 0.35 };
      list.push({ id: `solar-${i + 1}`, group, units, location: { latDeg, lonDeg }, options: { ...sim, start: '2025-03-03T00:00:00Z', model: { tauHours, heatRate, coolRate: 0, gain }, solar } });
      continue;
    }
    list.push({ id: `cov-${i + 1}`, group, units, options: { ...sim, model: { tauHours, heatRate, coolRate: 0, gain } } });
  }
  return list;
}

/** Sizes of the study's groups (`npm run calibrate`). */
export const STUDY = { coverage: 40, mass: 12, solar: 8 } as const;

/** Every scenario of the study. */
export function studyScenarios(counts: { coverage: number; mass: number; solar: number } = STUDY): Scenario[] {
  return [...scenarios('coverage', counts.coverage), ...scenarios('mass', counts.mass), ...scenarios('solar', counts.solar)];
}

/** One scenario of the study by its id ("cov-3", "mass-1", "solar-2"), for the workers. */
export function scenarioById(id: string): Scenario {
  const [prefix, n] = id.split('-');
  const group: Group = prefix === 'cov' ? 'coverage' : prefix === 'mass' ? 'mass' : 'solar';
  const s = scenarios(group, Number(n))[Number(n) - 1];
  if (!s || s.id !== id) throw new Error(`no scenario ${id}`);
  return s;
}
