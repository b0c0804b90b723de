/**
 * The screens' fit rule (app/renderer/src/lib/fit-rule.ts), the recovery backtest's chart
 * (report/backtest-chart.ts) and the command line's printing of plausibility sentences. Invented
 * figures; the expectations follow from the rules as written (a fit older than the latest import is
 * not current; a perfect prediction lies on the 1:1 line).
 */
import { describe, expect, it } from 'vitest';
import { fitIsCurrent, needsFit } from '../../app/renderer/src/lib/fit-rule.ts';
import { backtestChart, backtestRange, minutesClock } from '../../app/renderer/src/report/backtest-chart.ts';
import { formatResponse } from '../../app/cli/commands/fit.ts';
import type { RecoveryBacktest } from '../../core/types.ts';
import type { PresentedResponse } from '../../core/present.ts';

const zone = { samples: 100, lastTime: 5_000, lastImportAt: 10_000 };

describe('fit rule', () => {
  it('no fit, or one older than the latest import or the last reading, is not current', () => {
    expect(fitIsCurrent(null, zone)).toBe(false);
    expect(fitIsCurrent({ fittedAt: 9_999, response: { lastTime: 5_000 } }, zone)).toBe(false);
    expect(fitIsCurrent({ fittedAt: 10_000, response: { lastTime: 4_000 } }, zone)).toBe(false);
    expect(fitIsCurrent({ fittedAt: 10_001, response: { lastTime: 5_000 } }, zone)).toBe(true);
    expect(fitIsCurrent({ fittedAt: null, response: { lastTime: 5_000 } }, { ...zone, lastImportAt: null })).toBe(true);
  });
  it('a zone is fitted on first need only when it has readings', () => {
    expect(needsFit(null, zone)).toBe(true);
    expect(needsFit(null, { ...zone, samples: 0 })).toBe(false);
    expect(needsFit({ fittedAt: 20_000, response: { lastTime: 5_000 } }, zone)).toBe(false);
  });
});

const bt: RecoveryBacktest = {
  cases: 3,
  medianErrorMinutes: 10,
  p90ErrorMinutes: 25,
  medianBiasMinutes: 5,
  mornings: [
    { startMs: 0, fromC: 15, toC: 20, outdoorC: -2, actualMinutes: 95, predictedMinutes: 100 },
    { startMs: 1, fromC: 16, toC: 20, outdoorC: 3, actualMinutes: 60, predictedMinutes: 50 },
    { startMs: 2, fromC: 14, toC: 21, outdoorC: -6, actualMinutes: 150, predictedMinutes: 175 },
  ],
};

describe('recovery backtest chart', () => {
  it('draws each morning at (actual, predicted) and the 1:1 line over the whole shared range', () => {
    const c = backtestChart(bt);
    const [mornings, line] = c.data.datasets;
    expect(mornings!.data).toEqual([{ x: 95, y: 100 }, { x: 60, y: 50 }, { x: 150, y: 175 }]);
    expect(mornings!.showLine).toBe(false);
    const { max, step } = backtestRange(bt);
    expect(max).toBeGreaterThanOrEqual(175 * 1.05); // every point inside, with room
    expect(max % step).toBe(0);
    expect(line!.data).toEqual([{ x: 0, y: 0 }, { x: max, y: max }]);
    const scales = c.options!.scales as Record<string, { min: number; max: number }>;
    expect([scales.x!.min, scales.x!.max, scales.y!.min, scales.y!.max]).toEqual([0, max, 0, max]);
  });
  it('writes minutes as h:mm', () => {
    expect(minutesClock(135)).toBe('2:15');
    expect(minutesClock(45)).toBe('0:45');
  });
});

describe('heatlag fit text output', () => {
  it('prints the plausibility sentences of the response', () => {
    const shown = {
      units: 'C', model: 'one-node', modelReason: 'One node.', timeConstantHours: 30, timeConstantHoursCI: [28, 32], twoNode: null,
      heatingRatePerHour: 5, heatingRatePerHourCI: [4.9, 5.1], coolingRatePerHour: null, coolingRatePerHourCI: null, gainPerHour: 0.1,
      gainPerHourCI: null, solarGainPerHour: null, solarGainPerHourCI: null, heatingLift: 150, rmse: 0.2, heldOutRmse: 0.25,
      cvrmsePercent: 1, nmbePercent: 0, samplesUsed: 1000, daysUsed: 10, segments: 1, freeFloatHours: 50, freeFloatShare: 0.2,
      recoveryBacktest: null, recoveryBacktestReason: 'none', timeZone: 'UTC', firstTime: 'a', lastTime: 'b', heldOutDays: [], warnings: [],
      plausibility: ['A heating lift of 150.0 K is far above any design temperature difference.'],
    } satisfies PresentedResponse;
    const text = formatResponse('x.csv', shown);
    expect(text).toContain('Check these figures:\n  - A heating lift of 150.0 K is far above any design temperature difference.');
  });
});

import { sortSites } from '../../app/renderer/src/lib/site-order.ts';

describe('site order', () => {
  it('lists sites by name with the demo site last', () => {
    const sites = [
      { name: 'Kestelbrück Community House', isDemo: true },
      { name: 'zeta Lofts', isDemo: false },
      { name: 'Alder School', isDemo: false },
      { name: 'Block 10', isDemo: false },
      { name: 'Block 9', isDemo: false },
    ];
    expect(sortSites(sites).map((s) => s.name)).toEqual(['Alder School', 'Block 9', 'Block 10', 'zeta Lofts', 'Kestelbrück Community House']);
  });
});

import { hoursClock } from '../../app/renderer/src/lib/format.ts';

describe('recovery chart ticks', () => {
  it('writes hours as h:mm, like the recovery time', () => {
    expect(hoursClock(2.25)).toBe('2:15');
    expect(hoursClock(0.5)).toBe('0:30');
    expect(hoursClock(10)).toBe('10:00');
  });
});

import { importNoteForScreen } from '../../app/renderer/src/lib/import-notes.ts';

describe('importer notes on the Import screen', () => {
  it('shows the earlier import time in the zone’s time zone and counts with separators', () => {
    // 2026-01-19 23:30 UTC is 2026-01-20 00:30 in Berlin (UTC+1 in winter; IANA tz database).
    const dup = importNoteForScreen('This file was imported into the zone before (log #3, 2026-01-19 23:30 UTC); readings already stored were not added again.', 'Europe/Berlin');
    expect(dup).toContain('log #3, 2026-01-20 00:30 (Europe/Berlin)');
    expect(dup).not.toContain('UTC');
    expect(importNoteForScreen('All 2688 readings were in the store already; nothing new was added.', 'UTC')).toBe('All 2,688 readings were in the store already; nothing new was added.');
    // Years in dates and log numbers stay as written.
    expect(importNoteForScreen('The longest gap is after 2025-03-21 (log #12345).', 'UTC')).toBe('The longest gap is after 2025-03-21 (log #12345).');
  });
});

import { planCautions, type CautionFacts } from '../../core/plan/cautions.ts';

describe('plan cautions write differences as differences', () => {
  // Invented week: setback 21 → 15 °C in freezing weather, cooling set up from 24 to 28 °C.
  const facts: CautionFacts = {
    units: 'C', tauHours: 30, gainKPerH: 0.1, setbackFloorC: 13, occupiedHeatC: 21, occupiedCoolC: 24, unoccupiedHeatC: 15, unoccupiedCoolC: 28,
    hasHeatingSetpoints: true, hasCoolingSetpoints: true, outdoorMinC: -5, indoorMinUnoccupiedC: 15, indoorMaxUnoccupiedC: 27, heatPump: null,
    auxRecoveries: [], lateRecoveries: [], capacityKnown: false, coolingRan: true, outdoorNotes: [], modelHasHeating: true, modelHasCooling: true,
  };
  it('a setback depth and a cooling setup read in K (°C mode) and in °F (°F mode), never °C', () => {
    const c = planCautions(facts).map((x) => x.text).join('\n');
    expect(c).toContain('Cooling setup of 4.0 K');
    expect(c).not.toMatch(/setup of [\d.]+ °C|setback [\d.]+ °C below/);
    const f = planCautions({ ...facts, units: 'F' }).map((x) => x.text).join('\n');
    expect(f).toContain('Cooling setup of 7.2 °F'); // 4 K × 1.8 = 7.2 °F difference
  });
});
