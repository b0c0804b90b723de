/**
 * The recovery table and the "what if" comparison of the zone report and the Recovery screen, checked
 * against closed forms of the lumped first-order model (REFERENCES.md "First-order response"):
 * - with full heat at a steady outdoor temperature the zone relaxes toward T_eq = T_out + (h + g)·τ, so
 *   the time from T0 to T1 is t = τ·ln((T_eq − T0)/(T_eq − T1)) [derived from T(t) = T_eq + (T0 − T_eq)·e^(−t/τ)];
 * - unheated, Newton's law of cooling toward T_free = T_out + g·τ: T(t) = T_free + (T0 − T_free)·e^(−t/τ) [read: any heat-transfer text];
 * - τ = C/UA and h = Q/C (REFERENCES.md "Equipment and envelope"), cross-checked with core/plan's envelopeFromCapacity.
 * The model values are invented.
 */
import { describe, expect, it } from 'vitest';
import { InputError } from '../../core/errors.ts';
import { envelopeFromCapacity } from '../../core/plan/equipment.ts';
import { FREEZE_GUARD_C, RECOVERY_TABLE_AXES, recoveryTable } from '../../core/recovery-table.ts';
import type { ZoneModel } from '../../core/types.ts';
import { deltaToKelvin, toCelsius } from '../../core/units.ts';
import { compareWhatIf, scenarioFigures, whatIfModel } from '../../core/what-if.ts';

const MODEL: ZoneModel = { tauHours: 36, heatRate: 1.2, coolRate: 0, gain: 0.08 };
const closedRecovery = (m: ZoneModel, from: number, to: number, out: number): number | null => {
  const teq = out + (m.heatRate + m.gain) * m.tauHours;
  return teq > to ? m.tauHours * Math.log((teq - from) / (teq - to)) : null;
};

describe('recoveryTable', () => {
  it('fills every cell with the closed-form recovery time (°F axes)', () => {
    const target = toCelsius(70, 'F');
    const t = recoveryTable(MODEL, target, 'F');
    expect(t.depths).toEqual([...RECOVERY_TABLE_AXES.F.depths]);
    expect(t.rows.map((r) => r.outdoorShown)).toEqual([...RECOVERY_TABLE_AXES.F.outdoors]);
    for (const row of t.rows) {
      expect(row.outdoorC).toBeCloseTo(toCelsius(row.outdoorShown, 'F'), 12);
      row.cells.forEach((cell, j) => {
        const from = target - deltaToKelvin(t.depths[j]!, 'F');
        expect(cell.from).toBeCloseTo(from, 12);
        const want = closedRecovery(MODEL, from, target, row.outdoorC);
        // Closed form of the linear ODE (derived); the solver is exact, so 1e-9 h covers rounding only.
        if (want === null) expect(cell.hours).toBeNull();
        else expect(Math.abs(cell.hours! - want)).toBeLessThan(1e-9);
      });
    }
  });

  it('marks cells that are never reached and starts below the 55 °F freeze guard', () => {
    // Small heating: T_eq at −20 °C is −20 + 1.28·36 = 26.1 °C, so 21 °C is reached; with h = 0.5 it is not.
    const weak: ZoneModel = { ...MODEL, heatRate: 0.5 };
    const t = recoveryTable(weak, 21, 'C');
    const coldest = t.rows[0]!; // −20 °C
    expect(coldest.outdoorShown).toBe(-20);
    // T_eq = −20 + (0.5 + 0.08)·36 = 0.88 °C < 21 °C: never reached (closed form).
    expect(coldest.cells.every((c) => c.hours === null)).toBe(true);
    // 55 °F = 12.78 °C (Red Cross guidance in REFERENCES.md): an 8 K setback from 21 °C starts at 13 °C, above it.
    expect(FREEZE_GUARD_C).toBeCloseTo(12.7778, 4);
    const deep = recoveryTable(MODEL, 20, 'C').rows[0]!.cells; // depths 1 … 8 K from 20 °C
    expect(deep.map((c) => c.belowFreezeGuard)).toEqual([false, false, false, false, false, true]); // 20 − 8 = 12 °C only
  });
});

describe('what if', () => {
  it('scales h with the heating output and τ inversely with the heat loss, g unchanged', () => {
    const m = whatIfModel(MODEL, { capacityFactor: 1.5, heatLossFactor: 0.8 });
    expect(m.heatRate).toBeCloseTo(1.8, 12);
    expect(m.tauHours).toBeCloseTo(45, 12);
    expect(m.gain).toBe(MODEL.gain);
    // The same stated output (here 20 kW) gives the same heat capacity C and a UA scaled by 0.8
    // (τ = C/UA, h = Q/C; core/plan envelopeFromCapacity as an independent route through the same identities).
    const q = 20_000;
    const today = envelopeFromCapacity(MODEL, { heatingCapacityW: q, coolingCapacityW: null, heatPump: null });
    const changed = envelopeFromCapacity(m, { heatingCapacityW: q * 1.5, coolingCapacityW: null, heatPump: null });
    expect(changed.heatCapacityJPerK! / today.heatCapacityJPerK!).toBeCloseTo(1, 12);
    expect(changed.uaWPerK! / today.uaWPerK!).toBeCloseTo(0.8, 12);
  });

  it('compares recovery, full-heat level and overnight drift with the closed forms', () => {
    const conditions = { fromC: 15, toC: 21, outdoorC: -6 };
    const change = { capacityFactor: 1.25, heatLossFactor: 0.75 };
    const c = compareWhatIf(MODEL, change, conditions);
    for (const [s, m] of [[c.today, MODEL], [c.whatIf, whatIfModel(MODEL, change)]] as const) {
      const want = closedRecovery(m, 15, 21, -6)!;
      expect(Math.abs(s.recoveryHours! - want)).toBeLessThan(1e-9); // derived closed form
      expect(s.fullHeatLevelC).toBeCloseTo(-6 + (m.heatRate + m.gain) * m.tauHours, 10);
      expect(s.heatingLiftK).toBeCloseTo(m.heatRate * m.tauHours, 12);
      const free = -6 + m.gain * m.tauHours;
      // Newton's law of cooling after 8 h from 21 °C; the exact stepper agrees to 1e-9 K.
      expect(Math.abs(s.driftEndC - (free + (21 - free) * Math.exp(-8 / m.tauHours)))).toBeLessThan(1e-9);
      expect(s.hoursToSetback!).toBeCloseTo(m.tauHours * Math.log((21 - free) / (15 - free)), 10);
    }
    // Better envelope and more output: faster recovery, slower drift.
    expect(c.whatIf.recoveryHours!).toBeLessThan(c.today.recoveryHours!);
    expect(c.whatIf.driftEndC).toBeGreaterThan(c.today.driftEndC);
  });

  it('says never when the heating cannot reach the target or the zone never drifts to the setback', () => {
    const f = scenarioFigures({ tauHours: 20, heatRate: 0.4, coolRate: 0, gain: 0.5 }, { fromC: 16, toC: 21, outdoorC: 0 });
    expect(f.recoveryHours).toBeNull(); // T_eq = 0 + 0.9·20 = 18 °C < 21 °C
    expect(f.hoursToSetback!).toBeCloseTo(20 * Math.log((21 - 10) / (16 - 10)), 10); // T_free = 10 °C: reached
    const g = scenarioFigures({ tauHours: 20, heatRate: 2, coolRate: 0, gain: 0.9 }, { fromC: 16, toC: 21, outdoorC: 0 });
    expect(g.hoursToSetback).toBeNull(); // T_free = 18 °C > 16 °C: the gain alone holds it above the setback
  });

  it('refuses factors that are not positive numbers up to 20', () => {
    for (const bad of [0, -1, Number.NaN, 21]) {
      expect(() => whatIfModel(MODEL, { capacityFactor: bad, heatLossFactor: 1 })).toThrow(InputError);
      expect(() => whatIfModel(MODEL, { capacityFactor: 1, heatLossFactor: bad })).toThrow(InputError);
    }
  });
});
