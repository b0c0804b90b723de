/**
 * Savings: a setback of zero depth saves exactly nothing, and for a zone whose equipment always
 * recovers, a deeper or longer setback (or cooling setup) never saves less. The second is the
 * comparison principle of the first-order model (a lower setpoint schedule gives a pointwise lower
 * indoor curve, so lower losses, so less runtime); it holds exactly for the ideal (deadband 0)
 * thermostat, up to rounding.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { outdoorProfile } from '../../core/outdoor.ts';
import { designClock } from '../../core/plan/clock.ts';
import { designDayOutdoor, lowHighOutdoor, parseSchedule, planZone, type PlanOutdoor } from '../../core/plan/index.ts';
import type { ZoneModel } from '../../core/types.ts';

const hhmm = (m: number) => `${String(Math.floor(m / 60)).padStart(2, '0')}:${String(m % 60).padStart(2, '0')}`;

/** An irregular invented week of outdoor readings (every 20 min), like a log's. */
function irregularWeek(seed: number): PlanOutdoor {
  const time: number[] = [];
  const temp: number[] = [];
  let x = seed;
  for (let t = 0; t <= 168; t += 1 / 3) {
    x = (x * 1103515245 + 12345) % 2147483648;
    time.push(t);
    temp.push(-4 + 6 * Math.sin((2 * Math.PI * (t - 9)) / 24) + 3 * Math.sin((2 * Math.PI * t) / 71) + (x / 2147483648 - 0.5));
  }
  return { source: { kind: 'range', lowC: -13, highC: 5, solarOffsetHours: 0 }, profile: outdoorProfile(time, temp), clock: designClock(7), notes: [] };
}

describe('zero-depth setback', () => {
  const cases: Array<[string, number, boolean, PlanOutdoor]> = [
    ['deadband 1 °F, optimal start, irregular outdoor', 1, true, irregularWeek(7)],
    ['deadband 0, no optimal start, design day', 0, false, designDayOutdoor(-8, 10)],
    ['deadband 2 °F, optimal start, summer day', 2, true, lowHighOutdoor(22, 36)],
  ];
  for (const [name, deadband, optimalStart, outdoor] of cases) {
    it(`saves exactly zero (${name})`, () => {
      const model: ZoneModel = { tauHours: 28, heatRate: 3, coolRate: 2.5, gain: 0.2 };
      const schedule = parseSchedule({
        name: 'zero',
        units: 'F',
        days: { weekdays: [{ from: '07:00', to: '18:00', heat: 70, cool: 76 }], sat: [{ from: '09:00', to: '13:00', heat: 70, cool: 76 }], sun: [] },
        unoccupied: { heat: 70, cool: 76 },
        deadband,
        optimalStart,
        equipment: { heatingCapacity: { value: 60000, unit: 'Btu/h' }, coolingCapacity: { value: 3, unit: 'ton' } },
      });
      const plan = planZone(model, schedule, outdoor);
      expect(plan.week.heatHours + plan.week.coolHours).toBeGreaterThan(0); // something ran
      for (const d of [...plan.days, plan.week]) {
        expect(d.savedHeatHours).toBe(0);
        expect(d.savedCoolHours).toBe(0);
        expect(d.savedHours).toBe(0);
        expect(d.savedHeatEnergyWh).toBe(0);
        expect(d.savedCoolEnergyWh).toBe(0);
      }
      expect(plan.recoveries.length).toBe(0); // no setpoint rises, so nothing to recover
    });
  }
});

describe('deeper and longer setbacks never save less (no capacity limit)', () => {
  const arb = fc.record({
    tau: fc.double({ min: 4, max: 80, noNaN: true }),
    heatRate: fc.double({ min: 25, max: 60, noNaN: true }), // ample output: every recovery succeeds
    gain: fc.double({ min: 0, max: 0.4, noNaN: true }),
    low: fc.double({ min: -20, max: 8, noNaN: true }),
    swing: fc.double({ min: 0, max: 14, noNaN: true }),
    occupiedHeat: fc.double({ min: 18, max: 23, noNaN: true }),
    depthA: fc.double({ min: 0, max: 10, noNaN: true }),
    extraDepth: fc.double({ min: 0, max: 6, noNaN: true }),
    from: fc.integer({ min: 5 * 60, max: 9 * 60 }),
    to: fc.integer({ min: 15 * 60, max: 20 * 60 }),
    laterStart: fc.integer({ min: 0, max: 180 }),
    earlierEnd: fc.integer({ min: 0, max: 180 }),
    optimalStart: fc.boolean(),
  });

  it('heating setback (ideal thermostat)', () => {
    fc.assert(
      fc.property(arb, (p) => {
        const model: ZoneModel = { tauHours: p.tau, heatRate: p.heatRate, coolRate: 0, gain: p.gain };
        const outdoor = lowHighOutdoor(p.low, p.low + p.swing);
        const make = (depth: number, from: number, to: number) =>
          parseSchedule({
            name: 'p',
            units: 'C',
            days: { weekdays: [{ from: hhmm(from), to: hhmm(to), heat: p.occupiedHeat }], weekend: [] },
            unoccupied: { heat: p.occupiedHeat - depth },
            setbackFloor: -50,
            deadband: 0,
            optimalStart: p.optimalStart,
          });
        const A = planZone(model, make(p.depthA, p.from, p.to), outdoor);
        const deeper = planZone(model, make(p.depthA + p.extraDepth, p.from, p.to), outdoor);
        const longer = planZone(model, make(p.depthA, p.from + p.laterStart, p.to - p.earlierEnd), outdoor);
        const both = planZone(model, make(p.depthA + p.extraDepth, p.from + p.laterStart, p.to - p.earlierEnd), outdoor);
        for (const plan of [A, deeper, longer, both]) {
          for (const r of plan.recoveries) expect(r.cannotRecoverInTime).toBe(false); // the premise: no capacity limit
        }
        // Tolerance 1e-9 h: rounding only (the comparison is exact in the model).
        expect(deeper.week.savedHeatHours).toBeGreaterThanOrEqual(A.week.savedHeatHours - 1e-9);
        expect(longer.week.savedHeatHours).toBeGreaterThanOrEqual(A.week.savedHeatHours - 1e-9);
        expect(both.week.savedHeatHours).toBeGreaterThanOrEqual(deeper.week.savedHeatHours - 1e-9);
        expect(both.week.savedHeatHours).toBeGreaterThanOrEqual(longer.week.savedHeatHours - 1e-9);
        expect(A.week.savedHeatHours).toBeGreaterThanOrEqual(-1e-9); // any setback saves something or nothing, never costs
      }),
      { numRuns: 40, seed: 20260112 },
    );
  });

  it('cooling setup (ideal thermostat)', () => {
    fc.assert(
      fc.property(arb, (p) => {
        const model: ZoneModel = { tauHours: p.tau, heatRate: 0, coolRate: p.heatRate, gain: p.gain };
        const outdoor = lowHighOutdoor(p.low + 20, p.low + 20 + p.swing);
        const occupiedCool = p.occupiedHeat + 3;
        const make = (depth: number, from: number, to: number) =>
          parseSchedule({
            name: 'p',
            units: 'C',
            days: { weekdays: [{ from: hhmm(from), to: hhmm(to), cool: occupiedCool }], weekend: [] },
            unoccupied: { cool: occupiedCool + depth },
            deadband: 0,
            optimalStart: p.optimalStart,
          });
        const A = planZone(model, make(p.depthA, p.from, p.to), outdoor);
        const deeper = planZone(model, make(p.depthA + p.extraDepth, p.from, p.to), outdoor);
        const longer = planZone(model, make(p.depthA, p.from + p.laterStart, p.to - p.earlierEnd), outdoor);
        for (const plan of [A, deeper, longer]) {
          for (const r of plan.recoveries) expect(r.cannotRecoverInTime).toBe(false);
        }
        expect(deeper.week.savedCoolHours).toBeGreaterThanOrEqual(A.week.savedCoolHours - 1e-9);
        expect(longer.week.savedCoolHours).toBeGreaterThanOrEqual(A.week.savedCoolHours - 1e-9);
      }),
      { numRuns: 25, seed: 20260713 },
    );
  });
});
