/**
 * Equipment and envelope figures from a fitted response and a stated output capacity.
 *
 * Method (lumped model, REFERENCES.md "Equipment and envelope"): with full heating output Q (W) the
 * zone warms at h K/h over its losses, so its heat capacity is C = Q / h (W·h/K; ×3600 for J/K), and
 * with τ = C / UA the envelope's heat-loss coefficient is UA = C / τ (W/K). The steady rise with heat
 * fully on is then Q / UA = h·τ (the heating lift). The balance point, the outdoor temperature above
 * which the zone holds a heating setpoint with no heating, is setpoint − g·τ (internal gains lift the
 * zone g·τ above outdoor).
 *
 * Heat pump: output capacity falls with outdoor temperature; here a straight line through two points
 * (fraction of rated output at two outdoor temperatures), never below 0. The fitted h applies at a
 * reference outdoor temperature (ideally the mean outdoor temperature while the log's heating ran), so
 * h(T_out) = h · f(T_out) / f(T_ref).
 */
import { InputError } from '../errors.ts';
import type { ZoneModel, ZoneSeries } from '../types.ts';
import { BTUH_PER_F_PER_W_PER_K, BTUH_PER_W } from '../units.ts';
import type { HeatPumpSpec } from './schedule.ts';

/** J/K per Btu/°F: 1 Btu/°F = (3600 / 3.412142) J per (1/1.8) K. */
export const J_PER_K_PER_BTU_PER_F = (3600 / BTUH_PER_W) * 1.8;

/**
 * The capacity fraction of a heat pump at an outdoor temperature: linear through the two points, ≥ 0.
 * @param outdoorC °C
 * @example heatPumpFraction({ capacityAt: [{ outdoorC: 8.33, fraction: 1 }, { outdoorC: -8.33, fraction: 0.6 }], auxBelowC: null }, 0) // 0.8
 */
export function heatPumpFraction(hp: HeatPumpSpec, outdoorC: number): number {
  const [p, q] = hp.capacityAt;
  const f = p.fraction + ((q.fraction - p.fraction) * (outdoorC - p.outdoorC)) / (q.outdoorC - p.outdoorC);
  return Math.max(0, f);
}

/** The heat pump's rating point: the warmer of its two capacity points, °C. */
export function heatPumpRatingC(hp: HeatPumpSpec): number {
  return Math.max(hp.capacityAt[0].outdoorC, hp.capacityAt[1].outdoorC);
}

/** Envelope and equipment figures, internal units with both unit systems where people read them. */
export interface EquipmentReport {
  /** Rated heating output, W (null when not given). */
  heatingCapacityW: number | null;
  /** Output at the fit's reference outdoor temperature (heat pump), W; equals rated otherwise. */
  heatingCapacityAtReferenceW: number | null;
  /** Outdoor temperature at which the fitted heating rate applies (heat pump), °C; null otherwise. */
  referenceOutdoorC: number | null;
  /** Zone heat capacity C, J/K, and the same in Btu/°F and kWh/K; null without a capacity. */
  heatCapacityJPerK: number | null;
  heatCapacityBtuPerF: number | null;
  heatCapacityKWhPerK: number | null;
  /** Envelope heat-loss coefficient UA, W/K and Btu/(h·°F). */
  uaWPerK: number | null;
  uaBtuhPerF: number | null;
  /** Steady internal gain as a power, W (g·C); null without a capacity. */
  internalGainW: number | null;
  /** C and UA from the cooling capacity, for a cross-check; null without one. */
  coolingCapacityW: number | null;
  heatCapacityFromCoolingJPerK: number | null;
  uaFromCoolingWPerK: number | null;
  /** Heating lift h·τ = Q/UA, K. */
  heatingLiftK: number;
}

/**
 * Heat capacity, UA and internal gain from a capacity and the fitted response.
 *
 * @param model τ (h), h and c (K/h), g (K/h)
 * @param equipment heatingCapacityW / coolingCapacityW (W output) and an optional heat pump
 * @param referenceOutdoorC outdoor °C at which the fitted h applies (heat pump only; default the rating point)
 * @throws InputError when a capacity is given for a rate that is 0 (heating or cooling never observed)
 * @example envelopeFromCapacity({ tauHours: 30, heatRate: 3, coolRate: 0, gain: 0.2 }, { heatingCapacityW: 17585, coolingCapacityW: null, heatPump: null })
 *   // C ≈ 21.1 MJ/K, UA ≈ 195 W/K
 */
export function envelopeFromCapacity(
  model: ZoneModel,
  equipment: { heatingCapacityW: number | null; coolingCapacityW: number | null; heatPump: HeatPumpSpec | null },
  referenceOutdoorC?: number,
): EquipmentReport {
  const hp = equipment.heatPump;
  const refC = hp ? (referenceOutdoorC ?? heatPumpRatingC(hp)) : null;
  const refFraction = hp ? heatPumpFraction(hp, refC!) : 1;
  if (hp && !(refFraction > 0)) throw new InputError('The heat pump has no output at the reference outdoor temperature of the fit; check the capacity points.');
  const Qref = equipment.heatingCapacityW === null ? null : equipment.heatingCapacityW * refFraction;
  let C: number | null = null;
  if (Qref !== null) {
    if (!(model.heatRate > 0)) throw new InputError('A heating capacity was given but the response has no heating rate (no heating in the log).');
    C = (Qref * 3600) / model.heatRate;
  }
  let Ccool: number | null = null;
  if (equipment.coolingCapacityW !== null) {
    if (!(model.coolRate > 0)) throw new InputError('A cooling capacity was given but the response has no cooling rate (no cooling in the log).');
    Ccool = (equipment.coolingCapacityW * 3600) / model.coolRate;
  }
  const Cuse = C ?? Ccool;
  const ua = Cuse === null ? null : Cuse / (model.tauHours * 3600);
  return {
    heatingCapacityW: equipment.heatingCapacityW,
    heatingCapacityAtReferenceW: Qref,
    referenceOutdoorC: refC,
    heatCapacityJPerK: Cuse,
    heatCapacityBtuPerF: Cuse === null ? null : Cuse / J_PER_K_PER_BTU_PER_F,
    heatCapacityKWhPerK: Cuse === null ? null : Cuse / 3.6e6,
    uaWPerK: ua,
    uaBtuhPerF: ua === null ? null : ua * BTUH_PER_F_PER_W_PER_K,
    internalGainW: Cuse === null ? null : (model.gain * Cuse) / 3600,
    coolingCapacityW: equipment.coolingCapacityW,
    heatCapacityFromCoolingJPerK: Ccool,
    uaFromCoolingWPerK: Ccool === null ? null : Ccool / (model.tauHours * 3600),
    heatingLiftK: model.heatRate * model.tauHours,
  };
}

/**
 * The balance point: the outdoor temperature (°C) at which the zone holds `setpointC` with no heating,
 * setpoint − g·τ. Above it no heating is needed (steady state).
 * @example balancePointC({ tauHours: 30, heatRate: 3, coolRate: 0, gain: 0.1 }, 21) // 18
 */
export function balancePointC(model: ZoneModel, setpointC: number): number {
  return setpointC - model.gain * model.tauHours;
}

/**
 * Mean outdoor temperature weighted by heating runtime, °C: where a heat pump's fitted heating rate
 * applies (the rule of `heatlag plan`). Null when the log has no heating runtime with outdoor readings.
 */
export function heatingOutdoorMean(series: ZoneSeries): number | null {
  let w = 0;
  let s = 0;
  for (let i = 1; i < series.time.length; i++) {
    const u = series.heat[i]!;
    const a = 0.5 * (series.outdoor[i - 1]! + series.outdoor[i]!);
    if (u > 0 && Number.isFinite(u) && Number.isFinite(a)) {
      const dt = (series.time[i]! - series.time[i - 1]!) / 3_600_000;
      w += u * dt;
      s += u * dt * a;
    }
  }
  return w > 0 ? s / w : null;
}
