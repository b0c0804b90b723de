/**
 * Recoveries the equipment cannot make, heat-pump derate and auxiliary heat, equipment figures and the
 * cautions shown with them.
 */
import { describe, expect, it } from 'vitest';
import { outdoorProfile } from '../../core/outdoor.ts';
import {
  balancePointC,
  designClock,
  designDayOutdoor,
  envelopeFromCapacity,
  heatPumpFraction,
  historyOutdoor,
  latestHistoryWeek,
  lowHighOutdoor,
  parseSchedule,
  planZone,
} from '../../core/plan/index.ts';
import type { ZoneModel, ZoneSeries } from '../../core/types.ts';
import { BTUH_PER_F_PER_W_PER_K } from '../../core/units.ts';

const office = (unoccupiedHeat: number | 'off', extra: Record<string, unknown> = {}) =>
  parseSchedule({
    name: 'office',
    units: 'C',
    days: { weekdays: [{ from: '07:00', to: '18:00', heat: 21 }], weekend: [] },
    unoccupied: { heat: unoccupiedHeat },
    deadband: 0,
    ...extra,
  });

describe('a schedule the equipment cannot recover from', () => {
  it('is reported as such when full output cannot reach the setpoint at occupancy', () => {
    // Derived: full-output equilibrium = T_out + (h + g)·τ. At 07:00 the design day is DB − 0.91·range
    // (Table 6, hour 7) = −10.9 °C, so the equilibrium is −10.9 + 0.9·30 = 16.1 °C < 21 °C.
    const model: ZoneModel = { tauHours: 30, heatRate: 0.9, coolRate: 0, gain: 0 };
    const plan = planZone(model, office(12), designDayOutdoor(0, 12));
    const weekday = plan.recoveries.filter((r) => r.dayIndex >= 1 && r.dayIndex <= 4);
    expect(weekday.length).toBe(4);
    for (const r of weekday) {
      expect(r.cannotRecoverInTime).toBe(true);
      expect(r.reachable).toBe(false);
      expect(r.status === 'late' || r.status === 'not-reached').toBe(true);
      expect(r.shortfallK).toBeGreaterThan(0);
      expect(r.optimalStartHours).toBeNull();
      // Recovery then starts at the beginning of the setback (18:00 the day before).
      expect(r.startedHours).toBeCloseTo(r.setbackStartHours, 9);
    }
    const caution = plan.cautions.find((c) => c.topic === 'capacity');
    expect(caution?.text).toMatch(/Cannot recover in time/);
    expect(caution?.text).toMatch(/cannot reach the setpoint at all/);
  });

  it('without optimal start, heat-up after the weekend is late, and the advised optimal start is earlier', () => {
    const model: ZoneModel = { tauHours: 20, heatRate: 3, coolRate: 0, gain: 0 };
    const plan = planZone(model, office('off', { optimalStart: false }), lowHighOutdoor(4, 10));
    const monday = plan.recoveries.find((r) => r.dayIndex === 0)!;
    expect(monday.status).toBe('late');
    expect(monday.startedHours).toBeCloseTo(7, 9); // the thermostat starts at occupancy
    expect(monday.reachedHours!).toBeGreaterThan(7);
    expect(monday.optimalStartHours!).toBeLessThan(7); // advice: when it should have started
    expect(monday.cannotRecoverInTime).toBe(false);
  });
});

describe('heat pump', () => {
  const hp = { capacityAt: [{ outdoorC: 8.3333, fraction: 1 }, { outdoorC: -8.3333, fraction: 0.6 }] as const, auxBelowC: -1.1 };

  it('capacity is linear between the two points and never negative', () => {
    const spec = { capacityAt: [hp.capacityAt[0], hp.capacityAt[1]] as [{ outdoorC: number; fraction: number }, { outdoorC: number; fraction: number }], auxBelowC: null };
    expect(heatPumpFraction(spec, 0)).toBeCloseTo(0.8, 9); // halfway: (1 + 0.6) / 2 [derived]
    expect(heatPumpFraction(spec, -8.3333)).toBeCloseTo(0.6, 9);
    expect(heatPumpFraction(spec, -100)).toBe(0);
  });

  it('derating lengthens the recovery and outdoor below the threshold warns of auxiliary heat', () => {
    const model: ZoneModel = { tauHours: 25, heatRate: 3, coolRate: 0, gain: 0.1 };
    const schedule = (withHp: boolean) =>
      parseSchedule({
        name: 'hp',
        units: 'F',
        days: { weekdays: [{ from: '07:00', to: '18:00', heat: 70 }], weekend: [] },
        unoccupied: { heat: 62 },
        deadband: 0,
        equipment: {
          heatingCapacity: { value: 36000, unit: 'Btu/h' },
          ...(withHp ? { heatPump: { capacityAt: [{ outdoor: 47, percent: 100 }, { outdoor: 17, percent: 60 }], auxBelow: 30 } } : {}),
        },
      });
    const cold = lowHighOutdoor(-9, -1); // about 16 … 30 °F
    // The fitted h applies at the rating point (47 °F) here: derated h is lower at every colder hour.
    const withHp = planZone(model, schedule(true), cold, { heatRateReferenceC: (47 - 32) / 1.8 });
    const plain = planZone(model, schedule(false), cold);
    const a = withHp.recoveries.find((r) => r.dayIndex === 2)!;
    const b = plain.recoveries.find((r) => r.dayIndex === 2)!;
    expect(a.leadHours!).toBeGreaterThan(b.leadHours!);
    expect(a.auxLikely).toBe(true);
    expect(a.auxReasons).toContain('outdoor-below-threshold');
    expect(b.auxLikely).toBe(false);
    expect(withHp.cautions.some((c) => c.topic === 'heat-pump' && /auxiliary heat would likely run/.test(c.text))).toBe(true);
    // Mild weather: no auxiliary heat expected.
    const mild = planZone(model, schedule(true), lowHighOutdoor(4, 12), { heatRateReferenceC: (47 - 32) / 1.8 });
    expect(mild.recoveries.every((r) => !r.auxLikely)).toBe(true);
  });
});

describe('equipment and envelope', () => {
  it('C = Q/h and UA = C/τ recover a known envelope (Open University worked example, UA 87.7 W/K)', () => {
    // Fabric UA of the worked example (Open University, "Energy in buildings" §2.4.1) [read]: 87.7 W/K.
    // A zone with that UA, τ = 40 h (so C = UA·τ) and a 5 kW output heats at h = Q/C [derived].
    const UA = 87.7;
    const tau = 40;
    const C = UA * tau * 3600; // J/K
    const Q = 5000;
    const model: ZoneModel = { tauHours: tau, heatRate: (Q * 3600) / C, coolRate: 0, gain: 0.05 };
    const e = envelopeFromCapacity(model, { heatingCapacityW: Q, coolingCapacityW: null, heatPump: null });
    expect(e.uaWPerK!).toBeCloseTo(UA, 9);
    expect(e.heatCapacityJPerK!).toBeCloseTo(C, 3);
    // Steady rise with heat fully on = Q/UA = h·τ (REFERENCES.md, lumped model) [derived].
    expect(e.heatingLiftK).toBeCloseTo(Q / UA, 9);
    // 1 W/K = 1.8956 Btu/(h·°F) [memory; verified from 1 W = 3.41214 Btu/h and 1 K = 1.8 °F].
    expect(e.uaBtuhPerF! / e.uaWPerK!).toBeCloseTo(1.8956, 4);
    expect(BTUH_PER_F_PER_W_PER_K).toBeCloseTo(3.41214 / 1.8, 5);
    // 1 Btu/°F = 1055.06 J per 1/1.8 K = 1899.1 J/K [derived from the same factors].
    expect(e.heatCapacityJPerK! / e.heatCapacityBtuPerF!).toBeCloseTo(1899.1, 0);
    expect(e.internalGainW!).toBeCloseTo((0.05 * C) / 3600, 6);
  });

  it('balance point = setpoint − g·τ', () => {
    expect(balancePointC({ tauHours: 30, heatRate: 3, coolRate: 0, gain: 0.1 }, 21)).toBeCloseTo(18, 12);
  });

  it('energy = runtime × output; the figures and the balance point appear in a plan', () => {
    const model: ZoneModel = { tauHours: 30, heatRate: 2.5, coolRate: 0, gain: 0.1 };
    const plan = planZone(model, office(16, { equipment: { heatingCapacity: { value: 10, unit: 'kW' } } }), lowHighOutdoor(-5, 3));
    expect(plan.week.heatEnergyWh!).toBeCloseTo(plan.week.heatHours * 10000, 6);
    expect(plan.week.savedHeatEnergyWh!).toBeCloseTo(plan.week.savedHeatHours * 10000, 6);
    expect(plan.balancePoint.occupiedC).toBeCloseTo(21 - 3, 12);
    expect(plan.equipment!.uaWPerK!).toBeCloseTo(10000 / 2.5 / 30, 9);
  });
});

describe('cautions', () => {
  const model: ZoneModel = { tauHours: 30, heatRate: 3, coolRate: 2, gain: 0.1 };
  it('always label the figures as estimates and show the ventilation note', () => {
    const plan = planZone(model, office(18), lowHighOutdoor(2, 10));
    expect(plan.cautions.find((c) => c.topic === 'estimate')!.text).toMatch(/not a design load calculation/);
    expect(plan.cautions.find((c) => c.topic === 'estimate')!.text).toMatch(/local codes/);
    expect(plan.cautions.some((c) => c.topic === 'ventilation')).toBe(true);
    expect(plan.cautions.some((c) => c.topic === 'occupants')).toBe(true);
    expect(plan.cautions.some((c) => c.topic === 'freeze')).toBe(false);
  });

  it('warn below the freeze floor and more strongly in freezing weather', () => {
    const mild = planZone(model, office(10), lowHighOutdoor(3, 12));
    expect(mild.cautions.find((c) => c.topic === 'freeze')!.level).toBe('warning');
    const freezing = planZone(model, office(10), lowHighOutdoor(-12, -4));
    expect(freezing.cautions.some((c) => c.topic === 'freeze' && c.level === 'danger')).toBe(true);
    // The floor is adjustable.
    const lowered = planZone(model, office(10, { setbackFloor: 8 }), lowHighOutdoor(3, 12));
    expect(lowered.cautions.some((c) => c.topic === 'freeze')).toBe(false);
    const off = planZone(model, office('off'), lowHighOutdoor(-12, -4));
    expect(off.cautions.find((c) => c.topic === 'freeze')!.text).toMatch(/Heating is off when unoccupied/);
  });

  it('warn of humidity with a deep cooling setup', () => {
    const s = parseSchedule({
      name: 'summer',
      units: 'F',
      days: { weekdays: [{ from: '07:00', to: '18:00', cool: 75 }], weekend: [] },
      unoccupied: { cool: 85 },
      deadband: 1,
    });
    const plan = planZone(model, s, lowHighOutdoor(24, 35));
    const h = plan.cautions.find((c) => c.topic === 'humidity')!;
    expect(h.level).toBe('warning');
    expect(h.text).toMatch(/condense/);
    expect(h.text).toMatch(/deep setup/);
  });
});

describe('outdoor from the zone\'s own history', () => {
  const start = Date.UTC(2025, 2, 9, 23); // 2025-03-10 00:00 in Europe/Berlin (UTC+1)
  const n = 14 * 24 * 6; // 14 days every 10 min
  const series: ZoneSeries = {
    time: new Float64Array(n).map((_, i) => start + i * 600_000),
    indoor: new Float64Array(n).fill(20),
    outdoor: new Float64Array(n).map((_, i) => 5 + 4 * Math.sin((2 * Math.PI * i) / 144)),
    heatSetpoint: new Float64Array(n).fill(NaN),
    coolSetpoint: new Float64Array(n).fill(NaN),
    heat: new Float64Array(n).fill(0.3),
    cool: new Float64Array(n).fill(0),
  };
  it('takes the chosen week on the local clock', () => {
    const o = historyOutdoor(series, '2025-03-17', 'Europe/Berlin');
    expect(o.clock.dayLabel(0)).toBe('Mon 2025-03-17');
    expect(o.profile.time[0]).toBeLessThanOrEqual(0);
    expect(o.notes).toEqual([]);
    expect(latestHistoryWeek(series, 'Europe/Berlin')).toBe('2025-03-17');
  });
  it('refuses a week without enough outdoor readings, naming the gap', () => {
    const gappy = { ...series, outdoor: series.outdoor.map((v, i) => (i > 900 && i < 1000 ? NaN : v)) };
    expect(() => historyOutdoor(gappy, '2025-03-10', 'Europe/Berlin')).toThrow(/gap of 16\.\d h from 2025-03-16/);
    expect(() => historyOutdoor(series, '2025-04-14', 'Europe/Berlin')).toThrow(/no outdoor readings in the week/);
  });
  it('runs a plan on it', () => {
    const plan = planZone({ tauHours: 20, heatRate: 3, coolRate: 0, gain: 0.1 }, office(16), historyOutdoor(series, '2025-03-10', 'Europe/Berlin'));
    expect(plan.days[0]!.label).toBe('Mon 2025-03-10');
    expect(plan.week.savedHeatHours).toBeGreaterThan(0);
    expect(plan.curve.hours.length).toBe(plan.curve.indoorC.length);
    expect(plan.curve.heatFraction.length).toBe(plan.curve.hours.length - 1);
  });
  it('works on an irregular profile too (design clock)', () => {
    const p = { source: { kind: 'range' as const, lowC: 0, highC: 8, solarOffsetHours: 0 }, profile: outdoorProfile([0, 50, 168], [0, 8, 2]), clock: designClock(7), notes: [] };
    expect(() => planZone({ tauHours: 20, heatRate: 3, coolRate: 0, gain: 0.1 }, office(16), p)).not.toThrow();
  });
});
