/**
 * Self-test of the reference zone simulator (tests/support/zone-sim.ts), which the fitter's and the
 * recovery solver's tests rely on. Checks against closed forms from outside the project, and that the
 * log it writes says what the simulation did.
 */
import { describe, expect, it } from 'vitest';
import Papa from 'papaparse';
import { DateTime } from 'luxon';
import {
  makeWeather,
  quantise,
  rk4Trajectory,
  setbackSchedule,
  simulateZone,
  trueRecoveryTime,
  type ZoneSimOptions,
} from '../support/zone-sim.ts';
import type { ZoneModel } from '../../core/types.ts';
import { parseMapping } from '../../core/mapping.ts';

const HOUR_MS = 3_600_000;

function parse(csv: string, delimiter = ','): string[][] {
  const out = Papa.parse<string[]>(csv.trimEnd(), { delimiter });
  expect(out.errors).toEqual([]);
  return out.data;
}

function num(cell: string): number {
  return Number(cell.replace(',', '.'));
}

describe('RK4 against closed forms', () => {
  it('free-floating zone at constant ambient follows T = Ta + (T0 − Ta)e^(−t/τ)', () => {
    // Newton's law of cooling, lumped capacitance: T(t) = Ta + (T0 − Ta)·e^(−t/τ) [any heat-transfer text,
    // e.g. Incropera et al., Fundamentals of Heat and Mass Transfer, §5.2]. RK4 at a 10 s step on τ = 10 h has a
    // truncation error of order (Δt/τ)^4 ≈ 1e-13 relative; tolerance 1e-9 K leaves room for round-off over 17 280 steps.
    const model: ZoneModel = { tauHours: 10, heatRate: 0, coolRate: 0, gain: 0 };
    const { t, temp } = rk4Trajectory(model, 21, 5, 48, { sampleEveryHours: 0.5 });
    expect(t.length).toBe(97);
    for (let i = 0; i < t.length; i++) {
      expect(Math.abs(temp[i] - (5 + 16 * Math.exp(-t[i] / 10)))).toBeLessThan(1e-9);
    }
  });

  it('zone heated fully on approaches Ta + (h + g)τ exponentially', () => {
    // Same linear ODE with constant forcing q = h + g: T = Teq + (T0 − Teq)e^(−t/τ), Teq = Ta + qτ
    // [derived: integrating factor, any ODE text]. Tolerance 1e-9 K as above.
    const model: ZoneModel = { tauHours: 25, heatRate: 2, coolRate: 0, gain: 0.2 };
    const teq = -3 + 2.2 * 25;
    const { t, temp } = rk4Trajectory(model, 15, -3, 30, { uHeat: 1, sampleEveryHours: 1 });
    for (let i = 0; i < t.length; i++) {
      expect(Math.abs(temp[i] - (teq + (15 - teq) * Math.exp(-t[i] / 25)))).toBeLessThan(1e-9);
    }
  });

  it('sinusoidal ambient: amplitude ratio 1/√(1+ω²τ²) and lag arctan(ωτ)/ω', () => {
    // Mikleš & Fikar, Process Modelling, Identification, and Control (2007), eqs. 4.108–4.113, as tabulated in
    // /work/shared/REFERENCES.md for a 24 h cycle and τ = 10 h: ratio 0.3568, lag 4.61 h (published to 4 and 3
    // figures, hence tolerances 1e-4 and 0.01 h). The transient e^(−t/τ) has decayed to 1e-13 after 300 h.
    const tau = 10;
    const w = (2 * Math.PI) / 24;
    const model: ZoneModel = { tauHours: tau, heatRate: 0, coolRate: 0, gain: 0 };
    const dt = 0.01;
    const { t, temp } = rk4Trajectory(model, 0, (h) => 10 * Math.sin(w * h), 324, { sampleEveryHours: dt });
    // Fourier coefficients of the last full period (rectangle rule, exact for trigonometric polynomials).
    let a = 0;
    let b = 0;
    const first = Math.round(300 / dt);
    for (let i = first; i < first + Math.round(24 / dt); i++) {
      a += temp[i] * Math.sin(w * t[i]);
      b += temp[i] * Math.cos(w * t[i]);
    }
    a *= (2 * dt) / 24;
    b *= (2 * dt) / 24;
    const ratio = Math.hypot(a, b) / 10;
    const lagHours = Math.atan2(-b, a) / w;
    expect(Math.abs(ratio - 0.3568)).toBeLessThan(1e-4);
    expect(Math.abs(lagHours - 4.61)).toBeLessThan(0.01);
    // And against the formula itself, to the accuracy of the integration and quadrature (1e-6).
    expect(Math.abs(ratio - 1 / Math.sqrt(1 + (w * tau) ** 2))).toBeLessThan(1e-6);
    expect(Math.abs(lagHours - Math.atan(w * tau) / w)).toBeLessThan(1e-5);
  });

  it('the simulator loop itself matches the closed form for a free-floating zone', () => {
    // Heating never runs (rate 0), ambient constant at 2 °C: the log's true temperatures must follow
    // Newton's law from the warm-up start [any heat-transfer text]; tolerance 1e-9 K.
    const sim = simulateZone({
      model: { tauHours: 18, heatRate: 0, coolRate: 0, gain: 0 },
      weather: () => 2,
      initialC: 20,
      warmupHours: 2,
      days: 2,
    });
    const t0 = sim.startMs - 2 * HOUR_MS;
    const s = sim.trueSeries;
    for (let i = 0; i < s.time.length; i++) {
      const hours = (s.time[i] - t0) / HOUR_MS;
      expect(Math.abs(s.indoor[i] - (2 + 18 * Math.exp(-hours / 18)))).toBeLessThan(1e-9);
      expect(s.heat[i]).toBe(0);
    }
  });
});

describe('trueRecoveryTime', () => {
  const model: ZoneModel = { tauHours: 40, heatRate: 2, coolRate: 1.5, gain: 0.1 };

  it('matches t = τ·ln((Teq − T0)/(Teq − T1)) at constant outdoor', () => {
    // From the closed form above with Teq = Ta + (h + g)τ [derived]; bisection inside the RK4 step, tolerance 1e-6 h.
    const teq = 0 + (2 + 0.1) * 40;
    expect(Math.abs(trueRecoveryTime(model, 16, 21, 0)! - 40 * Math.log((teq - 16) / (teq - 21)))).toBeLessThan(1e-6);
    // Cooling recovery (setup to occupied): Teq = Ta + (g − c)τ.
    const teqCool = 30 + (0.1 - 1.5) * 40;
    expect(Math.abs(trueRecoveryTime(model, 28, 24, 30)! - 40 * Math.log((28 - teqCool) / (24 - teqCool)))).toBeLessThan(1e-6);
  });

  it('returns null when the equilibrium lies short of the target, 0 for no change', () => {
    // Teq = −30 + 2.1·40 = 54 °C is above 21, but with h = 0.5: Teq = −30 + 0.6·40 = −6 °C < 21 → never.
    expect(trueRecoveryTime({ ...model, heatRate: 0.5 }, 16, 21, -30)).toBeNull();
    expect(trueRecoveryTime(model, 18, 18, 0)).toBe(0);
  });

  it('reads sampled outdoor profiles piecewise-linearly', () => {
    // A profile that is constant at 5 °C must give the constant-outdoor answer.
    const flat = trueRecoveryTime(model, 15, 20, { time: [0, 10, 20], temp: [5, 5, 5] })!;
    expect(Math.abs(flat - trueRecoveryTime(model, 15, 20, 5)!)).toBeLessThan(1e-9);
    // A warmer outdoor shortens recovery.
    expect(trueRecoveryTime(model, 15, 20, { time: [0, 24], temp: [5, 15] })!).toBeLessThan(flat);
  });
});

describe('invented weather', () => {
  it('has its daily minimum near 06:00 and maximum near 15:00 (solar time), continuously', () => {
    // Common practice: daily minimum near sunrise, maximum in mid-afternoon.
    const origin = Date.UTC(2025, 0, 6);
    const out = makeWeather({ originMs: origin, meanC: 4, dailyRangeK: 8, wanderK: 0 });
    let minAt = 0;
    let maxAt = 0;
    let prev = out(origin);
    for (let m = 0; m < 24 * 60; m++) {
      const v = out(origin + m * 60_000);
      if (v < out(origin + minAt * 60_000)) minAt = m;
      if (v > out(origin + maxAt * 60_000)) maxAt = m;
      expect(Math.abs(v - prev)).toBeLessThan(0.05); // no jumps: at most ~8 K·π/2/9 h per hour → 0.023 K/min
      prev = v;
    }
    expect(minAt).toBe(6 * 60);
    expect(maxAt).toBe(15 * 60);
    expect(out(origin + 6 * HOUR_MS)).toBeCloseTo(0, 12);
    expect(out(origin + 15 * HOUR_MS)).toBeCloseTo(8, 12);
  });

  it('wanders from day to day, reproducibly for a seed, and cold snaps make it colder', () => {
    const origin = Date.UTC(2025, 0, 6);
    const a = makeWeather({ originMs: origin, seed: 5 });
    const b = makeWeather({ originMs: origin, seed: 5 });
    const snap = makeWeather({ originMs: origin, seed: 5, coldSnaps: [{ startHours: 48, hours: 72, depthK: 8 }] });
    const daily = Array.from({ length: 20 }, (_, d) => a(origin + (d * 24 + 12) * HOUR_MS));
    expect(Math.max(...daily) - Math.min(...daily)).toBeGreaterThan(1);
    for (let h = 0; h < 200; h += 0.7) expect(b(origin + h * HOUR_MS)).toBe(a(origin + h * HOUR_MS));
    expect(a(origin + 84 * HOUR_MS) - snap(origin + 84 * HOUR_MS)).toBeCloseTo(8, 12);
    expect(snap(origin + 30 * HOUR_MS)).toBe(a(origin + 30 * HOUR_MS));
  });
});

describe('simulateZone log', () => {
  const base: ZoneSimOptions = {
    model: { tauHours: 30, heatRate: 3, coolRate: 0, gain: 0.1 },
    days: 7,
    weather: { meanC: 0, seed: 3 },
  };

  it('runtime seconds in the log add up to the simulated on-time', () => {
    const sim = simulateZone({ ...base, log: { runtime: 'seconds' } });
    const rows = parse(sim.csv);
    expect(rows[0]).toEqual(sim.header);
    expect(rows.length - 1).toBe(7 * 24 * 12);
    const col = sim.header.indexOf('heat_runtime_s');
    const total = rows.slice(1).reduce((acc, r) => acc + Number(r[col]), 0);
    expect(sim.onSeconds.heat).toBeGreaterThan(0);
    expect(sim.starts.heat).toBeGreaterThan(7); // cycles at least once a day
    expect(total).toBe(sim.onSeconds.heat);
    // No interval holds more than its own length.
    for (const r of rows.slice(1)) expect(Number(r[col])).toBeLessThanOrEqual(300);
  });

  it('the recorded on-time closes the zone energy balance', () => {
    // Integrating the model over the log: h·t_on = T(end) − T(start) − ∫(Ta − T)/τ dt − g·Δt [derived from the
    // model equation]. With constant Ta and 1-minute true temperatures the trapezoid rule errs only at the
    // switching kinks (measured ≈ 5e-7 relative); tolerance 1e-5 relative. Ties the runtime bookkeeping to the physics.
    const model: ZoneModel = { tauHours: 20, heatRate: 4, coolRate: 0, gain: 0.3 };
    const sim = simulateZone({ model, days: 3, weather: () => -5, log: { intervalMinutes: 1 }, stepSeconds: 10 });
    const s = sim.trueSeries;
    const n = s.time.length;
    let integral = 0;
    for (let i = 1; i < n; i++) {
      const dt = (s.time[i] - s.time[i - 1]) / HOUR_MS;
      integral += (dt * ((-5 - s.indoor[i]) + (-5 - s.indoor[i - 1]))) / 2 / model.tauHours;
    }
    const spanH = (s.time[n - 1] - s.time[0]) / HOUR_MS;
    const onH = (s.indoor[n - 1] - s.indoor[0] - integral - model.gain * spanH) / model.heatRate;
    // On-time over the same span: intervals 1…n−1 (row 0's interval lies before time[0]).
    let onFromSeries = 0;
    for (let i = 1; i < n; i++) onFromSeries += s.heat[i] / 60;
    expect(Math.abs(onH - onFromSeries) / onFromSeries).toBeLessThan(1e-5);
  });

  it('minutes, fraction, percent and on/off runtimes agree with the true runtime', () => {
    const mins = simulateZone({ ...base, log: { runtime: 'minutes' } });
    const frac = simulateZone({ ...base, log: { runtime: 'fraction' } });
    const pct = simulateZone({ ...base, log: { runtime: 'percent' } });
    const onoff = simulateZone({ ...base, log: { runtime: 'onoff', onOffLabels: ['on', 'off'] } });
    const s = frac.trueSeries;
    const mr = parse(mins.csv).slice(1);
    const mCol = mins.header.indexOf('heat_runtime_min');
    const fr = parse(frac.csv).slice(1);
    const pr = parse(pct.csv).slice(1);
    const or = parse(onoff.csv).slice(1);
    const fCol = frac.header.indexOf('heat_runtime_fraction');
    const pCol = pct.header.indexOf('heat_runtime_pct');
    const oCol = onoff.header.indexOf('heat_state');
    for (let i = 0; i < s.time.length; i++) {
      expect(Math.abs(Number(mr[i][mCol]) - 5 * s.heat[i])).toBeLessThanOrEqual(0.05 + 1e-9); // 1 decimal
      expect(Math.abs(Number(fr[i][fCol]) - s.heat[i])).toBeLessThanOrEqual(0.0005 + 1e-12); // 3 decimals
      expect(Math.abs(Number(pr[i][pCol]) - 100 * s.heat[i])).toBeLessThanOrEqual(0.5 + 1e-9); // whole percent
      // The state at the end of an interval: certainly on if it ran all interval, off if not at all.
      if (s.heat[i] === 1) expect(or[i][oCol]).toBe('on');
      if (s.heat[i] === 0) expect(or[i][oCol]).toBe('off');
      expect(['on', 'off']).toContain(or[i][oCol]);
    }
  });

  it('quantises the indoor reading in the log unit', () => {
    const cases = [
      { units: 'F' as const, res: 1 },
      { units: 'C' as const, res: 0.5 },
      { units: 'C' as const, res: 0.1 },
      { units: 'C' as const, res: 0 },
    ];
    for (const c of cases) {
      const sim = simulateZone({ ...base, days: 2, log: { units: c.units, indoorResolution: c.res, delimiter: ';', decimal: ',' } });
      const rows = parse(sim.csv, ';').slice(1);
      const s = sim.trueSeries;
      const tol = c.res > 0 ? c.res / 2 : 0.0005; // unrounded values are written with 3 decimals
      for (let i = 0; i < rows.length; i++) {
        const v = num(rows[i][1]);
        const trueInUnit = c.units === 'F' ? s.indoor[i] * 1.8 + 32 : s.indoor[i];
        expect(Math.abs(v - trueInUnit)).toBeLessThanOrEqual(tol + 1e-9);
        if (c.res > 0) expect(Math.abs(v / c.res - Math.round(v / c.res))).toBeLessThan(1e-6);
      }
      if (c.res > 0) expect(new Set(rows.map((r) => r[1])).size).toBeGreaterThan(2);
    }
    expect(quantise(20.26, 0.5)).toBe(20.5);
    expect(quantise(68.4, 1)).toBe(68);
    expect(quantise(1.234, 0)).toBe(1.234);
  });

  it('writes local wall-clock dates in split columns across a DST change, and epoch seconds', () => {
    // Europe/Berlin springs forward on 2025-03-30 at 02:00 local (EU rule: last Sunday of March, 01:00 UTC).
    const opts: ZoneSimOptions = { ...base, days: 2, start: '2025-03-29T00:00', timezone: 'Europe/Berlin' };
    const split = simulateZone({ ...opts, log: { timestamps: 'split', datePattern: 'dd.MM.yyyy', timePattern: 'HH:mm', delimiter: ';', decimal: ',', intervalMinutes: 10 } });
    expect(split.mapping.time).toEqual(['date', 'clock']);
    expect(split.mapping.dateFormat).toBe('dd.MM.yyyy HH:mm');
    const rows = parse(split.csv, ';').slice(1);
    expect(rows[0].slice(0, 2)).toEqual(['29.03.2025', '00:00']);
    expect(rows.some((r) => r[0] === '30.03.2025' && r[1].startsWith('02:'))).toBe(false);
    rows.forEach((r, i) => {
      const ms = DateTime.fromFormat(`${r[0]} ${r[1]}`, 'dd.MM.yyyy HH:mm', { zone: 'Europe/Berlin' }).toMillis();
      expect(ms).toBe(split.trueSeries.time[i]);
    });
    // Time steps stay 10 minutes in UTC over the change.
    const t = split.trueSeries.time;
    for (let i = 1; i < t.length; i++) expect(t[i] - t[i - 1]).toBe(600_000);

    const epoch = simulateZone({ ...opts, log: { timestamps: 'epoch', delimiter: '\t' } });
    const er = parse(epoch.csv, '\t').slice(1);
    er.forEach((r, i) => expect(Number(r[0]) * 1000).toBe(epoch.trueSeries.time[i]));

    // The mappings it hands out are valid under the project's mapping schema (core/mapping.ts).
    expect(parseMapping(split.mapping)).toEqual(split.mapping);
    expect(parseMapping(epoch.mapping).delimiter).toBe('\t');

    const iso = simulateZone({ ...opts });
    expect(parseMapping(iso.mapping).time).toBe('time');
    const ir = parse(iso.csv).slice(1);
    expect(ir[0][0]).toBe('2025-03-29T00:00:00+01:00');
    expect(ir.at(-1)![0]).toBe('2025-03-31T00:55:00+02:00'); // 48 h of UTC time; the DST day has 23 local hours
    ir.forEach((r, i) => expect(Date.parse(r[0])).toBe(iso.trueSeries.time[i]));
  });

  it('applies gaps, duplicates, swapped rows and blank outdoor cells', () => {
    const sim = simulateZone({
      ...base,
      days: 3,
      log: { timestamps: 'epoch', gaps: [{ atHours: 10, hours: 4 }], duplicates: 3, outOfOrder: 2, missingOutdoor: 4 },
    });
    const rows = parse(sim.csv).slice(1);
    const full = 3 * 24 * 12;
    expect(rows.length).toBe(full - 4 * 12 + 3);
    expect(sim.rowsWritten).toBe(rows.length);
    const times = rows.map((r) => Number(r[0]) * 1000);
    const start = sim.startMs;
    expect(times.some((ms) => ms >= start + 10 * HOUR_MS && ms < start + 14 * HOUR_MS)).toBe(false);
    expect(times.length - new Set(times).size).toBe(3);
    let backwards = 0;
    for (let i = 1; i < times.length; i++) if (times[i] < times[i - 1]) backwards++;
    expect(backwards).toBe(2);
    expect(new Set(rows.filter((r) => r[2] === '').map((r) => r[0])).size).toBe(4); // a blank row may also be duplicated
  });

  it('the thermostat holds the schedule within its deadband, with a night setback', () => {
    // Occupied 06–22 at 21 °C, setback 16 °C; deadband 1 K. With 20 s steps and h = 3 K/h the overshoot past a
    // switching point is at most 3 K/h · 20 s ≈ 0.017 K.
    const sim = simulateZone({ ...base, schedule: setbackSchedule({ occupiedHeatC: 21, setbackHeatC: 16 }) });
    const s = sim.trueSeries;
    let checked = 0;
    for (let i = 0; i < s.time.length; i++) {
      const hour = new Date(s.time[i]).getUTCHours() + new Date(s.time[i]).getUTCMinutes() / 60;
      if (hour >= 9 && hour < 22) {
        // three hours after the morning start the zone has recovered
        expect(s.heatSetpoint[i]).toBe(21);
        expect(s.indoor[i]).toBeGreaterThan(20.5 - 0.02);
        expect(s.indoor[i]).toBeLessThan(21.5 + 0.02);
        checked++;
      }
      if (hour < 6 || hour >= 22) {
        expect(s.heatSetpoint[i]).toBe(16);
        expect(s.indoor[i]).toBeGreaterThan(15.5 - 0.02);
      }
    }
    expect(checked).toBeGreaterThan(1000);
    // The night drift really happens: the zone falls below 20 °C at night.
    expect(Math.min(...s.indoor)).toBeLessThan(20);
  });

  it('honours minimum on and off times', () => {
    // A light zone with a narrow deadband would short-cycle; 10 min minimum on/off stops it.
    const model: ZoneModel = { tauHours: 8, heatRate: 6, coolRate: 0, gain: 0 };
    const sim = simulateZone({ model, days: 1, weather: () => 0, thermostat: { deadbandK: 0.2, minOnMinutes: 10, minOffMinutes: 10 }, log: { intervalMinutes: 1 }, stepSeconds: 20 });
    const u = sim.trueSeries.heat;
    let run = 0;
    let state = u[0] > 0;
    const runs: { on: boolean; len: number }[] = [];
    for (let i = 1; i < u.length; i++) {
      const on = u[i] > 0.5;
      if (on === state) run++;
      else {
        runs.push({ on: state, len: run });
        state = on;
        run = 1;
      }
    }
    // Interior runs (not the first) last at least 10 minutes (to within one logged minute of rounding).
    expect(runs.length).toBeGreaterThan(4);
    for (const r of runs.slice(1)) expect(r.len).toBeGreaterThanOrEqual(9);
  });

  it('cooling with a setup setpoint runs in warm weather and is logged', () => {
    const sim = simulateZone({
      model: { tauHours: 20, heatRate: 3, coolRate: 2.5, gain: 0.4 },
      days: 4,
      weather: { meanC: 24, dailyRangeK: 10, wanderK: 0 },
      schedule: setbackSchedule({ occupiedHeatC: 20, setbackHeatC: 16, occupiedCoolC: 24, setupCoolC: 28 }),
      log: { runtime: 'seconds' },
    });
    expect(sim.onSeconds.cool).toBeGreaterThan(3600);
    expect(sim.onSeconds.heat).toBe(0);
    expect(sim.header).toContain('cool_runtime_s');
    expect(sim.header).toContain('cool_setpoint_c');
    expect(sim.mapping.cooling).toEqual({ column: 'cool_runtime_s', as: 'seconds' });
    const rows = parse(sim.csv).slice(1);
    const col = sim.header.indexOf('cool_runtime_s');
    expect(rows.reduce((a, r) => a + Number(r[col]), 0)).toBe(sim.onSeconds.cool);
  });

  it('is deterministic for a seed and rejects bad options', () => {
    const opts: ZoneSimOptions = { ...base, days: 2, sensorNoiseK: 0.1, log: { duplicates: 2, outOfOrder: 1 } };
    expect(simulateZone(opts).csv).toBe(simulateZone(opts).csv);
    expect(simulateZone({ ...opts, seed: 2 }).csv).not.toBe(simulateZone(opts).csv);
    expect(() => simulateZone({ ...base, model: { ...base.model, tauHours: 0 } })).toThrow(/tauHours/);
    expect(() => simulateZone({ ...base, timezone: 'Mars/Olympus' })).toThrow(/time zone/);
    expect(() => simulateZone({ ...base, stepSeconds: 7 })).toThrow(/whole multiple/);
  });
});
