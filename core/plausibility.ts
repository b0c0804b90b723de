/**
 * Plausibility checks of a fitted response: plain sentences for figures outside what buildings do, each
 * naming the likely cause and what to check. Shown by the command line, the screens and the report, in
 * the person's units (differences in K or °F difference).
 *
 * Bounds and where they come from:
 * - Time constant 2–300 h (from memory; common practice): a lightweight room with the heating off
 *   drifts over several hours, a heavy masonry or concrete building over days to about two weeks;
 *   below 2 h or above 300 h a thermostat log is far more likely mis-mapped (minutes taken for hours,
 *   the wrong temperature column) than the building that unusual.
 * - Heating lift h·τ (how far above outdoor full heat could hold the zone) 3–80 K (common practice):
 *   heating is sized near the design load, i.e. a lift of about the design temperature difference
 *   (roughly 20–55 K across climates, from memory of ASHRAE Fundamentals design conditions), and
 *   rarely above twice it. Above 80 K the runtime is probably in the wrong unit (seconds read as
 *   minutes, percent as a fraction) or the wrong column; below 3 K the equipment cannot heat the zone
 *   on a cold day (or the runtime column is not the heating's).
 * - Internal gain g·τ −2 to +15 K (from memory: occupants, lighting and appliances raise a home or office
 *   by a few kelvin): a strongly negative gain means a heat loss the model does not see (an unheated
 *   neighbour, ventilation, an open window); a very large one an unlogged heat source (a neighbouring
 *   zone, another heater, sun through glazing).
 * - Fit error (RMSE) above 1 K (common practice: a thermostat holds its setpoint within about ±0.5 K, so
 *   a model that misses by more than the whole control band cannot predict recoveries to the minute).
 * - Held-out error more than twice the fit error plus 0.2 K: the response changes over the log.
 */
import type { TempUnit, ZoneResponse } from './types.ts';
import { deltaFromKelvin } from './units.ts';

export const PLAUSIBLE = {
  tauHours: [2, 300] as const,
  liftK: [3, 80] as const,
  gainRiseK: [-2, 15] as const,
  rmseK: 1,
} as const;

/** The two-node slow time constant, or τ for one node (the time constant a person reads). */
export function headlineTauHours(r: ZoneResponse): number {
  return r.model === 'two-node' && r.twoNode ? r.twoNode.slowHours : r.tauHours;
}

/**
 * Plausibility sentences for a response, in `units` (empty when every figure is in range).
 * @example plausibilityNotes({ ...response, heatRate: 4, tauHours: 35 }, 'C') // ['A heating lift of 140.0 K …']
 */
export function plausibilityNotes(r: ZoneResponse, units: TempUnit): string[] {
  const notes: string[] = [];
  const d = (k: number) => deltaFromKelvin(k, units);
  const du = units === 'F' ? '°F' : 'K';
  const diff = (k: number) => `${d(k).toFixed(1)} ${du}`;
  const tau = headlineTauHours(r);
  const [tLo, tHi] = PLAUSIBLE.tauHours;
  if (tau < tLo) {
    notes.push(`A time constant of ${tau.toFixed(1)} h is shorter than buildings show (usually ${tLo}–${tHi} h): check that the indoor temperature column is the zone's air and that the timestamps are read in the right unit.`);
  } else if (tau > tHi) {
    notes.push(`A time constant of ${tau.toFixed(0)} h is longer than buildings show (usually ${tLo}–${tHi} h): the zone may be held by a neighbouring heated space, or the log has too few free-floating hours to see the drift.`);
  }
  if (r.hasHeating && r.heatRate > 0) {
    const lift = r.heatRate * r.tauHours;
    const [lLo, lHi] = PLAUSIBLE.liftK;
    if (lift > lHi) {
      notes.push(`A heating lift of ${diff(lift)} (how far above outdoor full heat could hold the zone) is far above any design temperature difference: the heating runtime is probably in the wrong unit (seconds read as minutes, percent as a fraction) or the wrong column is mapped; equipment this oversized is rare.`);
    } else if (lift < lLo) {
      notes.push(`A heating lift of only ${diff(lift)} means full heat could barely warm the zone above outdoor: check that the runtime column is the heating's and its unit; if it is right, the equipment is undersized and the zone cannot be held on a cold day.`);
    }
  }
  const rise = r.gain * r.tauHours;
  const [gLo, gHi] = PLAUSIBLE.gainRiseK;
  if (rise < gLo) {
    notes.push(`The internal gain is negative (it would hold the zone ${diff(-rise)} below outdoor): the zone loses heat the model does not see, e.g. to an unheated neighbour, ventilation or an open window; check the outdoor temperature column too.`);
  } else if (rise > gHi) {
    notes.push(`The internal gain would hold the zone ${diff(rise)} above outdoor with the heating off, more than occupants and appliances give: look for an unlogged heat source (a neighbouring zone, a second heater, sun through glazing) or heating runtime missing from the log.`);
  }
  if (r.rmse > PLAUSIBLE.rmseK) {
    notes.push(`The model misses the readings by ${diff(r.rmse)} on average, more than a thermostat's control band: sun, occupants, open windows or a neighbouring zone may drive this zone more than the model can see, so recovery times are rough.`);
  }
  if (r.heldOutRmse !== null && r.heldOutRmse > 2 * r.rmse + 0.2) {
    notes.push(`The days held out of the fit are missed by ${diff(r.heldOutRmse)}, much more than the fitted days (${diff(r.rmse)}): the response may change over the log (season, use or equipment); fit a shorter, steadier stretch.`);
  }
  return notes;
}
