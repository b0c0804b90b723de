/**
 * Weekly schedules for setback planning: occupied periods per day with heating and cooling setpoints,
 * one pair of unoccupied setpoints (heating setback, cooling setup), the thermostat deadband, optimal
 * start, the freeze-protection floor and optional equipment data.
 *
 * The file format is our own JSON (see SCHEDULE_FORMAT below and assets/plans/). It is validated with
 * zod; every message names the key that is wrong (e.g. `days.mon[0].to`). Internally every temperature
 * is °C and every temperature difference K (core/units.ts); times of day are minutes after local midnight.
 */
import { z } from 'zod';
import { InputError } from '../errors.ts';
import type { TempUnit } from '../types.ts';
import { deltaToKelvin, toCelsius } from '../units.ts';

/** Monday = 0 … Sunday = 6 (ISO weekday − 1). */
export type Weekday = 0 | 1 | 2 | 3 | 4 | 5 | 6;
export const WEEKDAY_KEYS = ['mon', 'tue', 'wed', 'thu', 'fri', 'sat', 'sun'] as const;
export const WEEKDAY_NAMES = ['Mon', 'Tue', 'Wed', 'Thu', 'Fri', 'Sat', 'Sun'] as const;

/** A heating and a cooling setpoint, °C; null = that equipment is off. */
export interface Setpoints {
  heatC: number | null;
  coolC: number | null;
}

/** One occupied period of a day, minutes after local midnight, [fromMinute, toMinute). */
export interface OccupiedPeriod extends Setpoints {
  fromMinute: number;
  toMinute: number;
}

/** Heat-pump data: output capacity as a straight line through two (outdoor °C, fraction) points. */
export interface HeatPumpSpec {
  /** Two points of the capacity line: outdoor temperature °C and the fraction of rated output (1 = 100 %). */
  capacityAt: [{ outdoorC: number; fraction: number }, { outdoorC: number; fraction: number }];
  /** Outdoor temperature below which auxiliary (electric resistance) heat is expected to run, °C; null = not given. */
  auxBelowC: number | null;
}

/** Equipment data, internal units (W, °C). */
export interface EquipmentSpec {
  /** Rated heating output, W (output, not input: input × steady-state efficiency). */
  heatingCapacityW: number | null;
  /** Rated cooling output, W. */
  coolingCapacityW: number | null;
  heatPump: HeatPumpSpec | null;
}

/** A validated weekly schedule in internal units. */
export interface WeeklySchedule {
  name: string;
  /** The unit the file was written in; used to show results back in the same unit. */
  units: TempUnit;
  /** Occupied periods per weekday, index 0 = Monday; sorted, non-overlapping. */
  days: OccupiedPeriod[][];
  /** Setpoints outside the occupied periods (heating setback, cooling setup). */
  unoccupied: Setpoints;
  /** What the schedule is compared against: these setpoints held all week. */
  baseline: Setpoints;
  /** Width of the thermostat's switching band around each setpoint, K (0 = ideal modulating control). */
  deadbandK: number;
  /** Start recovery at the latest time that still meets the occupied setpoint at occupancy. */
  optimalStart: boolean;
  /** Freeze-protection floor for the heating setback, °C (default 55 °F / 13 °C, common guidance). */
  setbackFloorC: number;
  equipment: EquipmentSpec | null;
}

/** A schedule problem with the key it concerns and, when known, where it is in the file. */
export class ScheduleError extends InputError {
  readonly key: string;
  readonly file?: string;
  readonly line?: number;
  readonly column?: number;

  constructor(key: string, message: string, where?: { file?: string; line?: number; column?: number }) {
    const place = where?.file
      ? `${where.file}${where.line !== undefined ? `:${where.line}${where.column !== undefined ? `:${where.column}` : ''}` : ''}: `
      : '';
    super(`${place}${key ? `${key}: ` : ''}${message}`);
    this.name = 'ScheduleError';
    this.key = key;
    this.file = where?.file;
    this.line = where?.line;
    this.column = where?.column;
  }
}

/** Default freeze-protection floor: 55 °F (≈ 12.8 °C), or 13 °C in a °C file (Red Cross guidance, REFERENCES.md). */
export function defaultSetbackFloor(units: TempUnit): number {
  return units === 'F' ? 55 : 13;
}

// ---------------------------------------------------------------------------------------------------
// The file format (zod)

const timeOfDay = z
  .string({ error: 'expected a time of day as "HH:MM"' })
  .regex(/^([01]\d|2[0-4]):[0-5]\d$/, { error: (iss) => `expected a time "HH:MM" from 00:00 to 24:00, got ${JSON.stringify(iss.input)}` })
  .refine((s) => s <= '24:00', { error: (iss) => `expected a time "HH:MM" from 00:00 to 24:00, got ${JSON.stringify(iss.input)}` });

const setpointValue = z.union([z.number().finite(), z.literal('off')], {
  error: (iss) => `expected a temperature (a number) or "off", got ${JSON.stringify(iss.input)}`,
});

const periodSchema = z.strictObject({
  from: timeOfDay,
  to: timeOfDay,
  heat: setpointValue.optional(),
  cool: setpointValue.optional(),
});

const setpointsSchema = z.strictObject({
  heat: setpointValue.optional(),
  cool: setpointValue.optional(),
});

const dayList = z.array(periodSchema, { error: 'expected a list of occupied periods, e.g. [{"from":"07:00","to":"18:00","heat":70,"cool":76}] ([] = unoccupied all day)' });

const daysSchema = z.strictObject(
  {
    mon: dayList.optional(),
    tue: dayList.optional(),
    wed: dayList.optional(),
    thu: dayList.optional(),
    fri: dayList.optional(),
    sat: dayList.optional(),
    sun: dayList.optional(),
    weekdays: dayList.optional(),
    weekend: dayList.optional(),
    everyday: dayList.optional(),
  },
  { error: 'expected an object with keys mon … sun, "weekdays" (mon–fri), "weekend" (sat, sun) or "everyday"' },
);

const positive = (what: string) => z.number({ error: `expected ${what} (a number)` }).finite().positive({ error: `${what} must be greater than 0` });

const capacitySchema = z.strictObject({
  value: positive('a capacity'),
  unit: z.enum(['Btu/h', 'kW', 'W', 'ton'], { error: 'expected "Btu/h", "kW", "W" or "ton"' }),
});

const heatPumpSchema = z.strictObject({
  capacityAt: z
    .array(
      z.strictObject({
        outdoor: z.number({ error: 'expected an outdoor temperature (a number)' }).finite(),
        percent: z.number({ error: 'expected a percentage of rated output (a number)' }).finite().min(0, { error: 'percent must be 0 or more' }),
      }),
    )
    .length(2, { error: 'expected two points, e.g. [{"outdoor":47,"percent":100},{"outdoor":17,"percent":60}]' }),
  auxBelow: z.number({ error: 'expected an outdoor temperature (a number)' }).finite().optional(),
});

const equipmentSchema = z.strictObject({
  heatingCapacity: capacitySchema.optional(),
  coolingCapacity: capacitySchema.optional(),
  heatPump: heatPumpSchema.optional(),
});

/** The zod schema of a schedule file (before conversion to internal units). */
export const ScheduleFileSchema = z.strictObject({
  name: z.string({ error: 'expected a name (text)' }).min(1, { error: 'the name must not be empty' }),
  units: z.enum(['F', 'C'], { error: 'expected "F" or "C"' }),
  days: daysSchema,
  unoccupied: setpointsSchema,
  baseline: setpointsSchema.optional(),
  deadband: z.number({ error: 'expected a deadband (a number of degrees)' }).finite().min(0, { error: 'the deadband must be 0 or more' }).max(10, { error: 'a deadband over 10 degrees is not a thermostat setting' }).optional(),
  optimalStart: z.boolean({ error: 'expected true or false' }).optional(),
  setbackFloor: z.number({ error: 'expected a temperature (a number)' }).finite().optional(),
  equipment: equipmentSchema.optional(),
});

export type ScheduleFile = z.infer<typeof ScheduleFileSchema>;

/** A short description of the format, for help texts. */
export const SCHEDULE_FORMAT = `{
  "name": "Office wing, winter",
  "units": "F",                                  // "F" or "C": unit of every temperature in the file
  "days": {                                      // mon tue wed thu fri sat sun, or "weekdays", "weekend", "everyday"
    "weekdays": [{ "from": "07:00", "to": "18:00", "heat": 70, "cool": 76 }],
    "weekend": []                                // [] = unoccupied all day
  },
  "unoccupied": { "heat": 60, "cool": 82 },      // setback / setup; a setpoint may be "off"
  "deadband": 1,                                 // switching band width, degrees (0 = modulating)
  "optimalStart": true,
  "setbackFloor": 55,                            // freeze-protection floor (default 55 °F / 13 °C)
  "baseline": { "heat": 70, "cool": 76 },        // optional: setpoints the savings are measured against
  "equipment": {
    "heatingCapacity": { "value": 60000, "unit": "Btu/h" },   // output; "Btu/h", "kW", "W", "ton"
    "coolingCapacity": { "value": 3, "unit": "ton" },
    "heatPump": { "capacityAt": [{ "outdoor": 47, "percent": 100 }, { "outdoor": 17, "percent": 60 }], "auxBelow": 30 }
  }
}`;

// ---------------------------------------------------------------------------------------------------
// Conversion to internal units

/** Capacity in W from a value and unit: 1 W = 3.412142 Btu/h; 1 ton = 12 000 Btu/h (trade definition). */
export function capacityToWatts(value: number, unit: 'Btu/h' | 'kW' | 'W' | 'ton'): number {
  switch (unit) {
    case 'W':
      return value;
    case 'kW':
      return value * 1000;
    case 'Btu/h':
      return value / 3.412142;
    case 'ton':
      return (value * 12000) / 3.412142;
  }
}

function minutesOf(hhmm: string): number {
  return Number(hhmm.slice(0, 2)) * 60 + Number(hhmm.slice(3, 5));
}

function setpoint(v: number | 'off' | undefined, unit: TempUnit): number | null {
  return v === undefined || v === 'off' ? null : toCelsius(v, unit);
}

function formatPath(path: ReadonlyArray<PropertyKey>): string {
  let s = '';
  for (const p of path) {
    if (typeof p === 'number') s += `[${p}]`;
    else s += s ? `.${String(p)}` : String(p);
  }
  return s;
}

/**
 * Validates a parsed schedule file and converts it to internal units.
 *
 * Checks beyond the shape: every weekday is given (directly or by "weekdays"/"weekend"/"everyday"),
 * periods run forward (`from` < `to`; split a period that crosses midnight at 24:00) and do not overlap,
 * each occupied period has a heating or cooling setpoint, heating is below cooling by at least the
 * deadband in every period, and a heat pump's capacity points are at two different outdoor temperatures.
 * A specific day (e.g. "sat") overrides "weekend", which overrides "everyday".
 *
 * @param json the value of JSON.parse(file text)
 * @param locate optional: maps a key path to its line and column in the file, for messages
 * @throws ScheduleError naming the key (and file, line, column when `locate` and `file` are given)
 * @example parseSchedule({ name: 'A', units: 'F', days: { everyday: [] }, unoccupied: { heat: 60 } })
 */
export function parseSchedule(
  json: unknown,
  options: { file?: string; locate?: (path: ReadonlyArray<PropertyKey>, atKey: boolean) => { line: number; column: number } | undefined } = {},
): WeeklySchedule {
  const fail = (path: ReadonlyArray<PropertyKey>, message: string, atKey = false): never => {
    const where = options.locate?.(path, atKey);
    throw new ScheduleError(formatPath(path), message, { file: options.file, line: where?.line, column: where?.column });
  };

  const parsed = ScheduleFileSchema.safeParse(json);
  if (!parsed.success) {
    const issue = parsed.error.issues[0]!;
    let message = issue.message;
    if (issue.code === 'unrecognized_keys') {
      const keys = (issue as { keys?: string[] }).keys ?? [];
      message = `unknown key${keys.length > 1 ? 's' : ''} ${keys.map((k) => JSON.stringify(k)).join(', ')}`;
      return fail([...issue.path, ...(keys.length === 1 ? [keys[0]!] : [])], message, keys.length === 1);
    }
    // A missing key: say so rather than describing the expected value.
    let at: unknown = json;
    for (const p of issue.path) at = at !== null && typeof at === 'object' ? (at as Record<PropertyKey, unknown>)[p as string] : undefined;
    if (at === undefined && issue.path.length > 0) message = 'this key is required';
    return fail(issue.path, message);
  }
  const f = parsed.data;
  const unit = f.units;

  const deadbandK = deltaToKelvin(f.deadband ?? (unit === 'F' ? 1 : 0.5), unit);
  const checkPair = (path: PropertyKey[], sp: Setpoints) => {
    if (sp.heatC !== null && sp.coolC !== null && sp.coolC - sp.heatC < deadbandK - 1e-9) {
      fail(path, 'the cooling setpoint must be at least the deadband above the heating setpoint (heating and cooling would fight)');
    }
  };

  // Days: specific > weekdays/weekend > everyday.
  const days: OccupiedPeriod[][] = [];
  for (let d = 0; d < 7; d++) {
    const key = WEEKDAY_KEYS[d]!;
    const group = d < 5 ? 'weekdays' : 'weekend';
    const source: [string, ScheduleFile['days']['mon']] | undefined =
      f.days[key] !== undefined
        ? [key, f.days[key]]
        : f.days[group] !== undefined
          ? [group, f.days[group]]
          : f.days.everyday !== undefined
            ? ['everyday', f.days.everyday]
            : undefined;
    if (!source) return fail(['days'], `no entry for ${key}: give "${key}", "${group}" or "everyday" ([] for a day with no occupancy)`);
    const [srcKey, list] = source;
    const periods: OccupiedPeriod[] = [];
    list!.forEach((p, i) => {
      const from = minutesOf(p.from);
      const to = minutesOf(p.to);
      if (to <= from) {
        fail(['days', srcKey, i, 'to'], `"to" (${p.to}) must be after "from" (${p.from}); split a period that runs past midnight at 24:00`);
      }
      const heatC = setpoint(p.heat, unit);
      const coolC = setpoint(p.cool, unit);
      if (heatC === null && coolC === null) fail(['days', srcKey, i], 'an occupied period needs a "heat" or a "cool" setpoint');
      checkPair(['days', srcKey, i], { heatC, coolC });
      periods.push({ fromMinute: from, toMinute: to, heatC, coolC });
    });
    periods.sort((a, b) => a.fromMinute - b.fromMinute);
    for (let i = 1; i < periods.length; i++) {
      if (periods[i]!.fromMinute < periods[i - 1]!.toMinute) {
        return fail(['days', srcKey], 'occupied periods overlap; list them without overlap');
      }
    }
    days.push(periods);
  }

  const unoccupied: Setpoints = { heatC: setpoint(f.unoccupied.heat, unit), coolC: setpoint(f.unoccupied.cool, unit) };

  // Baseline: given, or the occupied comfort setpoints (highest heating, lowest cooling of the week).
  let baseline: Setpoints;
  if (f.baseline) {
    baseline = { heatC: setpoint(f.baseline.heat, unit), coolC: setpoint(f.baseline.cool, unit) };
  } else {
    const heats = days.flat().map((p) => p.heatC).filter((v): v is number => v !== null);
    const cools = days.flat().map((p) => p.coolC).filter((v): v is number => v !== null);
    baseline = {
      heatC: heats.length ? Math.max(...heats) : unoccupied.heatC,
      coolC: cools.length ? Math.min(...cools) : unoccupied.coolC,
    };
  }

  checkPair(['unoccupied'], unoccupied);
  checkPair(['baseline'], baseline);

  let equipment: EquipmentSpec | null = null;
  if (f.equipment) {
    const e = f.equipment;
    let heatPump: HeatPumpSpec | null = null;
    if (e.heatPump) {
      const [a, b] = e.heatPump.capacityAt as [{ outdoor: number; percent: number }, { outdoor: number; percent: number }];
      if (a.outdoor === b.outdoor) fail(['equipment', 'heatPump', 'capacityAt'], 'the two points must be at different outdoor temperatures');
      heatPump = {
        capacityAt: [
          { outdoorC: toCelsius(a.outdoor, unit), fraction: a.percent / 100 },
          { outdoorC: toCelsius(b.outdoor, unit), fraction: b.percent / 100 },
        ],
        auxBelowC: e.heatPump.auxBelow === undefined ? null : toCelsius(e.heatPump.auxBelow, unit),
      };
    }
    equipment = {
      heatingCapacityW: e.heatingCapacity ? capacityToWatts(e.heatingCapacity.value, e.heatingCapacity.unit) : null,
      coolingCapacityW: e.coolingCapacity ? capacityToWatts(e.coolingCapacity.value, e.coolingCapacity.unit) : null,
      heatPump,
    };
  }

  return {
    name: f.name,
    units: unit,
    days,
    unoccupied,
    baseline,
    deadbandK,
    optimalStart: f.optimalStart ?? true,
    setbackFloorC: toCelsius(f.setbackFloor ?? defaultSetbackFloor(unit), unit),
    equipment,
  };
}

/**
 * The setpoints in force at a minute of a weekday: the occupied period's, else the unoccupied ones.
 * @example setpointsAt(schedule, 0, 8 * 60) // Monday 08:00
 */
export function setpointsAt(schedule: WeeklySchedule, weekday: number, minuteOfDay: number): Setpoints & { occupied: boolean } {
  for (const p of schedule.days[weekday] ?? []) {
    if (minuteOfDay >= p.fromMinute && minuteOfDay < p.toMinute) return { heatC: p.heatC, coolC: p.coolC, occupied: true };
  }
  return { ...schedule.unoccupied, occupied: false };
}
