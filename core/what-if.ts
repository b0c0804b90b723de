/**
 * "What if": the same zone with a different heating output or a different envelope, for a client
 * conversation, and the figures that compare it with the zone as fitted.
 *
 * Method (lumped model, REFERENCES.md "Equipment and envelope"): the zone's heat capacity C stays the
 * same in both changes. The heating rate is h = Q/C, so scaling the heating output Q by f scales h by f
 * and leaves τ alone. The time constant is τ = C/UA, so scaling the envelope's heat loss UA by f (better
 * insulation or air sealing: f < 1) divides τ by f and leaves h alone. The internal gain rate g = P/C
 * keeps its value in both. Cooling is left as fitted.
 */
import { InputError } from './errors.ts';
import { driftCurve, recoveryTime } from './recovery.ts';
import { effectiveTau } from './modes.ts';
import type { ZoneModel } from './types.ts';

export interface WhatIf {
  /** Heating output as a fraction of today's (1 = as fitted; 1.5 = half as much again). */
  capacityFactor: number;
  /** Envelope heat loss (UA) as a fraction of today's (0.75 = a quarter less heat loss). */
  heatLossFactor: number;
}

export const NO_CHANGE: Readonly<WhatIf> = Object.freeze({ capacityFactor: 1, heatLossFactor: 1 });

function checkFactor(name: string, f: number): void {
  if (!Number.isFinite(f) || f <= 0 || f > 20) throw new InputError(`${name} must be a factor above 0 and at most 20, got ${f}.`);
}

/**
 * The zone model with a different heating output and envelope heat loss (C unchanged).
 * @param model the fitted response: τ h, h, c, g K/h
 * @param change capacityFactor (×Q) and heatLossFactor (×UA), both > 0
 * @throws InputError for a factor that is not a positive number up to 20
 * @example whatIfModel({ tauHours: 40, heatRate: 1.5, coolRate: 0, gain: 0.1 }, { capacityFactor: 1, heatLossFactor: 0.8 }).tauHours // 50
 */
export function whatIfModel(model: ZoneModel, change: WhatIf): ZoneModel {
  checkFactor('The heating output factor', change.capacityFactor);
  checkFactor('The heat-loss factor', change.heatLossFactor);
  const heatRate = model.heatRate * change.capacityFactor;
  if (model.mass) {
    // Two nodes: the envelope is the mass–outdoor resistance (its UA scales, the capacities stay).
    const mass = { ...model.mass, massOutdoorHours: model.mass.massOutdoorHours / change.heatLossFactor };
    return { ...model, mass, tauHours: effectiveTau(mass), heatRate };
  }
  return { ...model, tauHours: model.tauHours / change.heatLossFactor, heatRate };
}

/** One scenario's figures, internal units (°C, K, hours). */
export interface ScenarioFigures {
  model: ZoneModel;
  /** h·τ: how far above outdoor full heat can hold the zone, K. */
  heatingLiftK: number;
  /** Where the zone levels off with the heating fully on at the outdoor temperature, °C. */
  fullHeatLevelC: number;
  /** Hours from the setback to the target with full heat; null when never reached. */
  recoveryHours: number | null;
  /** The zone's temperature after `driftHours` with the heating off, starting at the target, °C. */
  driftEndC: number;
  /** Hours from the target down to the setback with the heating off; null when it never gets there. */
  hoursToSetback: number | null;
}

export interface ScenarioConditions {
  /** Setback (start of the recovery), °C. */
  fromC: number;
  /** Target (occupied) temperature, °C. */
  toC: number;
  /** Steady outdoor temperature, °C. */
  outdoorC: number;
  /** Length of the unheated night for the drift figure, h (default 8). */
  driftHours?: number;
}

/**
 * Recovery, full-heat level, heating lift and overnight drift of one model at steady conditions
 * (recoveryTime and driftCurve of core/recovery.ts).
 * @throws InputError for invalid temperatures or model
 */
export function scenarioFigures(model: ZoneModel, c: ScenarioConditions): ScenarioFigures {
  const rec = recoveryTime(model, c.fromC, c.toC, c.outdoorC);
  const hours = c.driftHours ?? 8;
  const drift = driftCurve(model, c.toC, c.outdoorC, hours, hours);
  // Free drift from the target to the setback: Newton's law with the gain, T_free = T_out + g·τ
  // (two nodes: the drift curve, searched minute by minute over two weeks and interpolated).
  const free = c.outdoorC + model.gain * model.tauHours;
  let hoursToSetback: number | null;
  if (c.fromC >= c.toC) hoursToSetback = 0;
  else if (!(free < c.fromC)) hoursToSetback = null;
  else if (!model.mass) hoursToSetback = model.tauHours * Math.log((c.toC - free) / (c.fromC - free));
  else {
    const curve = driftCurve(model, c.toC, c.outdoorC, 336, 1 / 60);
    hoursToSetback = null;
    for (let i = 1; i < curve.temp.length; i++) {
      if (curve.temp[i]! <= c.fromC) {
        const t0 = curve.t[i - 1]!, t1 = curve.t[i]!, T0 = curve.temp[i - 1]!, T1 = curve.temp[i]!;
        hoursToSetback = t0 + ((T0 - c.fromC) / (T0 - T1)) * (t1 - t0);
        break;
      }
    }
  }
  return {
    model,
    heatingLiftK: model.heatRate * model.tauHours,
    fullHeatLevelC: rec.equilibriumC,
    recoveryHours: rec.hours,
    driftEndC: drift.temp[drift.temp.length - 1]!,
    hoursToSetback,
  };
}

export interface Comparison {
  change: WhatIf;
  today: ScenarioFigures;
  whatIf: ScenarioFigures;
}

/**
 * The zone as fitted against the changed zone, at the same conditions.
 * @example compareWhatIf(model, { capacityFactor: 1.5, heatLossFactor: 1 }, { fromC: 14, toC: 20, outdoorC: -7 })
 */
export function compareWhatIf(model: ZoneModel, change: WhatIf, conditions: ScenarioConditions): Comparison {
  return { change, today: scenarioFigures(model, conditions), whatIf: scenarioFigures(whatIfModel(model, change), conditions) };
}
