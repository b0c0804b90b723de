/**
 * One case of the calibration study: simulate, write, import, fit (core/fit through db/, as a user's
 * log would go), and compare with the truth. The figures run.ts aggregates.
 */
import { fitResponse } from '../../core/fit/index.ts';
import { recoveryTime } from '../../core/recovery.ts';
import { solarGainProxy } from '../../core/solar.ts';
import type { ZoneResponse } from '../../core/types.ts';
import { scenarioSeries } from './case.ts';
import type { Scenario } from './scenarios.ts';
import { trueTwoNodeRecoveryHours } from './truth.ts';

export interface Estimate {
  truth: number;
  est: number;
  lo: number;
  hi: number;
}

export interface CaseSummary {
  id: string;
  group: Scenario['group'];
  format: string;
  model: ZoneResponse['model'] | null;
  /** The two-node search was skipped by the rounding bound (select.ts). */
  searchSkipped?: boolean;
  error: string | null;
  seconds: number;
  tau?: Estimate;
  h?: Estimate;
  /** Mass group: recovery after a night setback, hours: truth, chosen model, one node forced. */
  recovery?: { setbackC: number; occupiedC: number; outdoorC: number; trueHours: number | null; predictedHours: number | null; oneNodeHours: number | null };
  /** Solar group: relative errors of τ and h with and without the clear-sky proxy. */
  solar?: { tauWith: number; tauWithout: number; hWith: number; hWithout: number };
}

const est = (truth: number, v: number, ci: [number, number]): Estimate => ({ truth, est: v, lo: ci[0], hi: ci[1] });

export async function analyse(s: Scenario): Promise<CaseSummary> {
  const t0 = performance.now();
  const { sim, series } = await scenarioSeries(s);
  const log = s.options.log ?? {};
  const out: CaseSummary = {
    id: s.id,
    group: s.group,
    format: `${log.intervalMinutes ?? 5} min, ${log.units ?? 'C'} ${log.indoorResolution ?? ''}, ${log.runtime ?? 'seconds'}`,
    model: null,
    error: null,
    seconds: 0,
  };
  const truth = sim.truth;
  try {
    if (s.group === 'coverage') {
      const r = fitResponse(series, { timeZone: 'UTC' });
      out.model = r.model;
      out.searchSkipped = r.selection.roundingBoundPercent !== undefined;
      out.tau = est(truth.tauHours, r.tauHours, r.tauCI);
      out.h = est(truth.heatRate, r.heatRate, r.heatRateCI);
    } else if (s.group === 'mass') {
      const r = fitResponse(series, { timeZone: 'UTC' });
      const one = r.model === 'one-node' ? r : fitResponse(series, { timeZone: 'UTC', models: 'one-node', intervals: false });
      out.model = r.model;
      out.searchSkipped = r.selection.roundingBoundPercent !== undefined;
      out.tau = est(truth.tauHours, r.tauHours, r.tauCI);
      out.h = est(truth.heatRate, r.heatRate, r.heatRateCI);
      // A night setback of 5 K from 21 °C at the log's mean outdoor temperature.
      const weather = s.options.weather as { meanC: number };
      const T1 = 21, T0 = 16, To = weather.meanC;
      const trueHours = trueTwoNodeRecoveryHours(s.options.mass!, truth.heatRate, truth.gain, T0, T1, To);
      out.recovery = {
        setbackC: T0,
        occupiedC: T1,
        outdoorC: To,
        trueHours,
        predictedHours: recoveryTime(r, T0, T1, To).hours,
        oneNodeHours: recoveryTime(one, T0, T1, To).hours,
      };
    } else {
      const { latDeg, lonDeg } = s.location!;
      const withProxy = fitResponse(series, { timeZone: 'UTC', solarProxy: (t) => solarGainProxy(t, latDeg, lonDeg) });
      const without = fitResponse(series, { timeZone: 'UTC' });
      out.model = withProxy.model;
      out.tau = est(truth.tauHours, withProxy.tauHours, withProxy.tauCI);
      out.h = est(truth.heatRate, withProxy.heatRate, withProxy.heatRateCI);
      const rel = (v: number, t: number) => Math.abs(v / t - 1);
      out.solar = {
        tauWith: rel(withProxy.tauHours, truth.tauHours),
        tauWithout: rel(without.tauHours, truth.tauHours),
        hWith: rel(withProxy.heatRate, truth.heatRate),
        hWithout: rel(without.heatRate, truth.heatRate),
      };
    }
  } catch (e) {
    out.error = e instanceof Error ? e.message : String(e);
  }
  out.seconds = (performance.now() - t0) / 1000;
  return out;
}
