/**
 * The cautions shown with every plan, where the advice is given. Texts are plain sentences with every
 * number in the schedule's unit. Sources: freeze floor 55 °F (Red Cross guidance, REFERENCES.md);
 * heat-pump auxiliary heat cancelling savings (DOE guidance, REFERENCES.md); the others are common
 * practice.
 */
import type { TempUnit } from '../types.ts';
import { degreeLabel, deltaFromKelvin, fromCelsius } from '../units.ts';

export type CautionLevel = 'note' | 'warning' | 'danger';

export interface Caution {
  /** 'note' informs, 'warning' asks for care, 'danger' is a risk to the building or to people. */
  level: CautionLevel;
  topic: 'estimate' | 'runtime' | 'outdoor' | 'freeze' | 'heat-pump' | 'humidity' | 'occupants' | 'ventilation' | 'capacity' | 'model';
  text: string;
}

/** What the cautions are decided from (internal units). */
export interface CautionFacts {
  units: TempUnit;
  tauHours: number;
  gainKPerH: number;
  setbackFloorC: number;
  occupiedHeatC: number | null; // highest occupied heating setpoint
  occupiedCoolC: number | null; // lowest occupied cooling setpoint
  unoccupiedHeatC: number | null; // null = heating off when unoccupied
  unoccupiedCoolC: number | null;
  hasHeatingSetpoints: boolean;
  hasCoolingSetpoints: boolean;
  outdoorMinC: number;
  indoorMinUnoccupiedC: number | null;
  indoorMaxUnoccupiedC: number | null;
  heatPump: { auxBelowC: number | null } | null;
  /** Recoveries where auxiliary heat would likely run: "Mon 05:40" and why. */
  auxRecoveries: Array<{ when: string; reason: string }>;
  /** Recoveries that miss the setpoint at occupancy: "Tue 07:00" and how far short, K. */
  lateRecoveries: Array<{ when: string; mode: 'heat' | 'cool'; shortfallK: number; reachable: boolean }>;
  capacityKnown: boolean;
  /** Whether cooling ran in the baseline this week (humidity advice is then a warning, else a note). */
  coolingRan: boolean;
  /** Notes about the outdoor data. */
  outdoorNotes: string[];
  modelHasHeating: boolean;
  modelHasCooling: boolean;
}

/** Heating setback this deep or more counts as deep, K (10 °F: the top of DOE's 7–10 °F advice). */
export const DEEP_SETBACK_K = 10 / 1.8;
/** Cooling setup this deep or more counts as deep for humidity, K (common practice, our threshold). */
export const DEEP_SETUP_K = 4;

/**
 * Builds the cautions for a plan.
 * @example planCautions(facts).map((c) => c.text)
 */
export function planCautions(f: CautionFacts): Caution[] {
  const u = f.units;
  const T = (c: number) => `${fromCelsius(c, u).toFixed(1)} ${degreeLabel(u)}`;
  // A difference is a difference: K with °C, °F (difference) with °F.
  const D = (k: number) => `${deltaFromKelvin(k, u).toFixed(1)} ${u === 'C' ? 'K' : '°F'}`;
  const out: Caution[] = [];
  out.push({
    level: 'note',
    topic: 'estimate',
    text:
      'Every figure here is an estimate from a zone model fitted to thermostat data, not a design load calculation. ' +
      'Weather, occupants and equipment will differ. Follow local codes and ask a licensed professional before changing how a building is heated or cooled.',
  });
  out.push({
    level: 'note',
    topic: 'runtime',
    text:
      'Savings are equipment runtime (hours the heating or cooling ran), an energy proxy, compared with holding the baseline setpoints all week' +
      (f.capacityKnown ? '; energy figures are heat delivered by the equipment (output), not fuel or electricity bought.' : '.'),
  });

  for (const n of f.outdoorNotes) out.push({ level: 'note', topic: 'outdoor', text: n });

  // Freeze protection.
  const depth = f.occupiedHeatC !== null && f.unoccupiedHeatC !== null ? f.occupiedHeatC - f.unoccupiedHeatC : null;
  const freezing = f.outdoorMinC < 0;
  if (f.hasHeatingSetpoints && f.unoccupiedHeatC === null) {
    out.push({
      level: freezing ? 'danger' : 'warning',
      topic: 'freeze',
      text: `Heating is off when unoccupied: nothing protects the building from freezing${freezing ? ` and the outdoor temperature falls to ${T(f.outdoorMinC)}` : ''}. Keep heating on at no less than ${T(f.setbackFloorC)} (freeze protection, common guidance).`,
    });
  } else if (f.unoccupiedHeatC !== null && f.unoccupiedHeatC < f.setbackFloorC - 1e-9) {
    out.push({
      level: 'warning',
      topic: 'freeze',
      text: `The heating setback ${T(f.unoccupiedHeatC)} is below the ${T(f.setbackFloorC)} floor. Pipes in outside walls, unheated spaces and sprinkler lines can freeze; do not set heating below ${T(f.setbackFloorC)} when a building is left in cold weather (common guidance).`,
    });
  }
  if (f.indoorMinUnoccupiedC !== null && f.indoorMinUnoccupiedC < f.setbackFloorC - 1e-6 && f.unoccupiedHeatC !== null && f.unoccupiedHeatC >= f.setbackFloorC - 1e-9) {
    out.push({
      level: 'warning',
      topic: 'freeze',
      text: `The zone is predicted to fall to ${T(f.indoorMinUnoccupiedC)}, below the ${T(f.setbackFloorC)} floor, although the setback is above it: the equipment cannot hold the setback in this weather.`,
    });
  }
  if (freezing && f.hasHeatingSetpoints && (f.unoccupiedHeatC === null || f.unoccupiedHeatC < f.setbackFloorC - 1e-9 || (depth !== null && depth >= DEEP_SETBACK_K - 1e-9))) {
    // With heating failed, how long until the floor at the week's lowest outdoor temperature (Newton's law, gains included).
    const start = f.unoccupiedHeatC ?? f.occupiedHeatC ?? f.setbackFloorC;
    const eq = f.outdoorMinC + f.gainKPerH * f.tauHours;
    const hours = start > f.setbackFloorC && eq < f.setbackFloorC ? f.tauHours * Math.log((start - eq) / (f.setbackFloorC - eq)) : null;
    const belowFloor = f.unoccupiedHeatC === null || f.unoccupiedHeatC < f.setbackFloorC - 1e-9;
    out.push({
      level: belowFloor ? 'danger' : 'warning',
      topic: 'freeze',
      text:
        `Deep setback in freezing weather (outdoor down to ${T(f.outdoorMinC)}${depth !== null ? `, setback ${D(depth)} below the occupied setpoint` : ''}). ` +
        (hours !== null ? `If the heating failed, the zone would fall from ${T(start)} to ${T(f.setbackFloorC)} in about ${hours.toFixed(1)} h (estimate). ` : '') +
        'Keep the setback modest, check on the building, and use a low-temperature alarm.',
    });
  }

  // Heat pump and auxiliary heat.
  if (f.heatPump) {
    out.push({
      level: 'warning',
      topic: 'heat-pump',
      text:
        'Heat pump: a deep setback can bring on electric-resistance auxiliary heat during recovery and cancel the savings (DOE guidance). ' +
        'Many heat-pump thermostats also call auxiliary heat whenever the setpoint jumps by more than a few degrees (common practice): prefer small setbacks, gradual recovery, and an outdoor lockout of auxiliary heat.',
    });
    for (const a of f.auxRecoveries) {
      out.push({ level: 'warning', topic: 'heat-pump', text: `Recovery ${a.when}: auxiliary heat would likely run (${a.reason}), which can cancel the savings.` });
    }
  }

  // Undersized or slow recovery.
  if (f.lateRecoveries.length > 0) {
    const never = f.lateRecoveries.filter((r) => !r.reachable);
    const list = f.lateRecoveries.map((r) => `${r.when} (${D(r.shortfallK)} short)`).join(', ');
    out.push({
      level: 'warning',
      topic: 'capacity',
      text:
        `Cannot recover in time: even starting at the beginning of the ${f.lateRecoveries[0]!.mode === 'heat' ? 'setback' : 'setup'}, the zone misses the occupied setpoint at ${list}. ` +
        (never.length > 0 ? `At ${never.map((r) => r.when).join(', ')} full output cannot reach the setpoint at all in that weather (equipment undersized for it). ` : '') +
        'Use a smaller setback there; have a licensed professional check the equipment size.',
    });
  }

  // Humidity with cooling setup.
  if (f.hasCoolingSetpoints) {
    const setup = f.occupiedCoolC !== null && f.unoccupiedCoolC !== null ? f.unoccupiedCoolC - f.occupiedCoolC : null;
    if (f.unoccupiedCoolC === null || (setup !== null && setup > 0)) {
      const deep = f.unoccupiedCoolC === null || (setup !== null && setup >= DEEP_SETUP_K - 1e-9);
      out.push({
        level: f.coolingRan ? 'warning' : 'note',
        topic: 'humidity',
        text:
          (f.unoccupiedCoolC === null ? 'Cooling is off when unoccupied' : `Cooling setup of ${D(setup!)}`) +
          ': with the cooling off, humidity builds up; in humid weather moisture can condense on cold surfaces (ducts, diffusers, chilled furnishings) when cooling restarts, and mould can grow. ' +
          (deep ? 'This is a deep setup: keep it smaller in humid climates, or keep dehumidification running while unoccupied.' : 'Keep dehumidification running in humid climates.'),
      });
    }
  }

  // People and commercial rules.
  const anySetback = (depth !== null && depth > 0) || (f.hasHeatingSetpoints && f.unoccupiedHeatC === null);
  const anySetup = f.hasCoolingSetpoints && (f.unoccupiedCoolC === null || (f.occupiedCoolC !== null && f.unoccupiedCoolC > f.occupiedCoolC));
  if (anySetback || anySetup) {
    out.push({
      level: 'warning',
      topic: 'occupants',
      text:
        'Vulnerable occupants: infants, older people and people who are ill or on some medications are harmed by cold and heat sooner than others. ' +
        'Do not set back or set up spaces where they live, sleep or stay outside the scheduled hours.',
    });
  }
  out.push({
    level: 'note',
    topic: 'ventilation',
    text:
      'Commercial spaces: occupied-hours ventilation and temperature requirements (local codes, the ventilation design, leases) apply from the moment people arrive. ' +
      'Optimal start moves only the heating or cooling start; keep the outdoor-air schedule and any pre-occupancy purge as required.',
  });

  if (f.hasHeatingSetpoints && !f.modelHasHeating) {
    out.push({ level: 'warning', topic: 'model', text: 'The response has no heating rate (the log had no heating runtime): heating is not simulated, so recovery and savings for heating are not known.' });
  }
  if (f.hasCoolingSetpoints && !f.modelHasCooling) {
    out.push({ level: 'note', topic: 'model', text: 'The response has no cooling rate (the log had no cooling runtime): cooling is not simulated.' });
  }
  return out;
}
