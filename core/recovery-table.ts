/**
 * The table of recovery times shown on the Recovery screen and printed in the zone report: outdoor
 * temperatures down, setback depths below the target across, each cell the time to recover with the
 * equipment fully on (recoveryTime of core/recovery.ts at a steady outdoor temperature). One function,
 * so the screen, the report and its CSV export show the same cells.
 */
import { recoveryTime } from './recovery.ts';
import type { TempUnit, ZoneModel } from './types.ts';
import { deltaToKelvin, toCelsius } from './units.ts';

/**
 * 55 °F (≈ 12.8 °C): a common floor for an unoccupied building in cold weather (American Red Cross
 * guidance, REFERENCES.md "Setback practice and cautions").
 */
export const FREEZE_GUARD_C = toCelsius(55, 'F');

/** Round outdoor temperatures (rows) and setback depths (columns) in each unit. */
export const RECOVERY_TABLE_AXES: Readonly<Record<TempUnit, { outdoors: readonly number[]; depths: readonly number[] }>> = Object.freeze({
  C: { outdoors: [-20, -15, -10, -5, 0, 5, 10, 15], depths: [1, 2, 3, 4, 6, 8] },
  F: { outdoors: [-10, 0, 10, 20, 30, 40, 50, 60], depths: [2, 4, 6, 8, 10, 15] },
});

export interface RecoveryTableCell {
  /** Start temperature of the recovery (target − depth), °C. */
  from: number;
  /** Hours to reach the target with the equipment fully on; null when never reached. */
  hours: number | null;
  /** The start is below the freeze-protection guard (55 °F). */
  belowFreezeGuard: boolean;
}

export interface RecoveryTableRow {
  /** The row's outdoor temperature in the table's unit (a round number). */
  outdoorShown: number;
  /** The same, °C. */
  outdoorC: number;
  cells: RecoveryTableCell[];
}

export interface RecoveryTable {
  unit: TempUnit;
  /** The target (occupied) temperature, °C. */
  targetC: number;
  /** Setback depths in the table's unit (°F or K), one per column. */
  depths: number[];
  /** The same depths, K. */
  depthsK: number[];
  rows: RecoveryTableRow[];
}

/**
 * Recovery times from setbacks of several depths to `targetC` at several steady outdoor temperatures.
 *
 * Method: each cell is recoveryTime(model, target − depth, target, outdoor), the exact solution of the
 * lumped model with full output, t = τ·ln((T_eq − T0)/(T_eq − T1)), T_eq = T_out + (h + g)·τ.
 * @param model the fitted response (τ h, rates K/h)
 * @param targetC the occupied temperature to reach, °C
 * @param unit the unit of the round row and column values
 * @throws InputError (from recoveryTime) for a non-finite target or an invalid model
 * @example recoveryTable({ tauHours: 40, heatRate: 1.5, coolRate: 0, gain: 0.05 }, 20, 'C').rows[0].cells[0].hours
 */
export function recoveryTable(model: ZoneModel, targetC: number, unit: TempUnit): RecoveryTable {
  const axes = RECOVERY_TABLE_AXES[unit];
  const depths = [...axes.depths];
  const depthsK = depths.map((d) => deltaToKelvin(d, unit));
  return {
    unit,
    targetC,
    depths,
    depthsK,
    rows: axes.outdoors.map((o) => {
      const outdoorC = toCelsius(o, unit);
      return {
        outdoorShown: o,
        outdoorC,
        cells: depthsK.map((k) => {
          const from = targetC - k;
          const r = recoveryTime(model, from, targetC, outdoorC);
          return { from, hours: r.hours, belowFreezeGuard: from < FREEZE_GUARD_C };
        }),
      };
    }),
  };
}
