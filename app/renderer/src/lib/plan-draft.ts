/**
 * The schedule being edited on the plan screen, and its conversion to and from the schedule file
 * format (assets/plans/README.md). Temperatures are held in °C and differences in K at full precision,
 * whatever unit the person types in; a file is written in the unit it was read in (a new schedule: the
 * unit the person works in), so loading and saving a file never changes its numbers.
 *
 * Validation is core/plan's parseSchedule, the command line's own check, after a field-level check
 * that every box holds a number, with the key it names translated into the words of the screen.
 */
import { defaultSetbackFloor, parseSchedule, ScheduleError, WEEKDAY_KEYS, type ScheduleFile } from '../../../../core/plan/schedule.ts';
import type { TempUnit } from '../../../../core/types.ts';
import { deltaFromKelvin, deltaToKelvin, fromCelsius, toCelsius } from '../../../../core/units.ts';
import { tidy } from '../../../api/schedule-units.ts';

export const DAY_NAMES = ['Monday', 'Tuesday', 'Wednesday', 'Thursday', 'Friday', 'Saturday', 'Sunday'] as const;
export const CAPACITY_UNITS = ['Btu/h', 'kW', 'W', 'ton'] as const;
export type CapacityUnit = (typeof CAPACITY_UNITS)[number];

export interface PeriodDraft {
  /** "HH:MM" as typed. */
  from: string;
  to: string;
  /** °C; null = off; NaN = not a number. */
  heatC: number | null;
  coolC: number | null;
}

export interface CapacityDraft {
  /** null = not given; NaN = not a number. */
  value: number | null;
  unit: CapacityUnit;
}

export interface HeatPumpDraft {
  enabled: boolean;
  /** Two points of the capacity line: outdoor °C and % of rated output. */
  points: [{ outdoorC: number; percent: number }, { outdoorC: number; percent: number }];
  /** Outdoor °C below which auxiliary heat is expected; null = not given. */
  auxBelowC: number | null;
}

export interface ScheduleDraft {
  name: string;
  /** The unit the schedule is written in when saved or exported. */
  fileUnit: TempUnit;
  /** Occupied periods, index 0 = Monday. */
  days: PeriodDraft[][];
  unoccupiedHeatC: number | null;
  unoccupiedCoolC: number | null;
  deadbandK: number;
  optimalStart: boolean;
  /** Freeze-protection floor, °C: the file's, else the default of the file's unit (55 °F / 13 °C). */
  setbackFloorC: number;
  /** null = the default baseline (the occupied setpoints held all week). */
  baseline: { heatC: number | null; coolC: number | null } | null;
  heating: CapacityDraft;
  cooling: CapacityDraft;
  heatPump: HeatPumpDraft;
}

const pad = (n: number) => String(n).padStart(2, '0');
export const hhmm = (minute: number) => `${pad(Math.floor(minute / 60))}:${pad(minute % 60)}`;

/** A new schedule in `unit`: weekdays occupied 07:00–18:00, weekends unoccupied. */
export function defaultDraft(name: string, unit: TempUnit, withCooling: boolean): ScheduleDraft {
  const c = (f: number, cel: number) => (unit === 'F' ? toCelsius(f, 'F') : cel);
  const weekday = (): PeriodDraft[] => [{ from: '07:00', to: '18:00', heatC: c(70, 21), coolC: withCooling ? c(76, 24) : null }];
  return {
    name,
    fileUnit: unit,
    days: [weekday(), weekday(), weekday(), weekday(), weekday(), [], []],
    unoccupiedHeatC: c(60, 16),
    unoccupiedCoolC: withCooling ? c(82, 28) : null,
    deadbandK: unit === 'F' ? deltaToKelvin(1, 'F') : 0.5,
    optimalStart: true,
    setbackFloorC: toCelsius(defaultSetbackFloor(unit), unit),
    baseline: null,
    heating: { value: null, unit: unit === 'F' ? 'Btu/h' : 'kW' },
    cooling: { value: null, unit: unit === 'F' ? 'ton' : 'kW' },
    heatPump: { enabled: false, points: [{ outdoorC: c(47, 8), percent: 100 }, { outdoorC: c(17, -8), percent: 60 }], auxBelowC: null },
  };
}

/**
 * A draft from a schedule file (already shaped like ScheduleFileSchema).
 * @throws ScheduleError when the file does not validate (parseSchedule)
 */
export function draftFromFile(file: ScheduleFile): ScheduleDraft {
  const s = parseSchedule(file);
  const u = file.units;
  const e = file.equipment;
  const hp = e?.heatPump;
  return {
    name: file.name,
    fileUnit: u,
    days: s.days.map((periods) => periods.map((p) => ({ from: hhmm(p.fromMinute), to: hhmm(p.toMinute), heatC: p.heatC, coolC: p.coolC }))),
    unoccupiedHeatC: s.unoccupied.heatC,
    unoccupiedCoolC: s.unoccupied.coolC,
    deadbandK: s.deadbandK,
    optimalStart: s.optimalStart,
    setbackFloorC: s.setbackFloorC,
    baseline: file.baseline ? { heatC: s.baseline.heatC, coolC: s.baseline.coolC } : null,
    heating: e?.heatingCapacity ? { value: e.heatingCapacity.value, unit: e.heatingCapacity.unit } : { value: null, unit: u === 'F' ? 'Btu/h' : 'kW' },
    cooling: e?.coolingCapacity ? { value: e.coolingCapacity.value, unit: e.coolingCapacity.unit } : { value: null, unit: u === 'F' ? 'ton' : 'kW' },
    heatPump: hp
      ? {
          enabled: true,
          points: [
            { outdoorC: toCelsius(hp.capacityAt[0]!.outdoor, u), percent: hp.capacityAt[0]!.percent },
            { outdoorC: toCelsius(hp.capacityAt[1]!.outdoor, u), percent: hp.capacityAt[1]!.percent },
          ],
          auxBelowC: hp.auxBelow === undefined ? null : toCelsius(hp.auxBelow, u),
        }
      : defaultDraft('', u, false).heatPump,
  };
}

type Periods = NonNullable<ScheduleFile['days']['mon']>;

/**
 * The draft as a schedule file in `unit`.
 * @param compress for a file a person reads: identical days written as "everyday", "weekdays" and
 *        "weekend", and conversion noise rounded away (1e-9 of a degree); otherwise conversions are exact
 */
export function fileFromDraft(d: ScheduleDraft, unit: TempUnit, compress = false): ScheduleFile {
  const t = (c: number) => (compress ? tidy(fromCelsius(c, unit)) : fromCelsius(c, unit));
  const tk = (k: number) => (compress ? tidy(deltaFromKelvin(k, unit)) : deltaFromKelvin(k, unit));
  const sp = (c: number | null) => (c === null ? 'off' : t(c));
  // Times such as "7:00" are written "07:00".
  const time = (s: string) => (/^\d:\d{2}$/.test(s.trim()) ? `0${s.trim()}` : s.trim());
  const periods = (list: PeriodDraft[]): Periods =>
    list.map((p) => ({
      from: time(p.from),
      to: time(p.to),
      ...(p.heatC !== null ? { heat: t(p.heatC) } : {}),
      ...(p.coolC !== null ? { cool: t(p.coolC) } : {}),
    }));
  const lists = d.days.map(periods);
  const days: ScheduleFile['days'] = {};
  const same = (a: Periods, b: Periods) => JSON.stringify(a) === JSON.stringify(b);
  if (compress && lists.every((l) => same(l, lists[0]!))) {
    days.everyday = lists[0]!;
  } else if (compress) {
    const weekdaysSame = lists.slice(0, 5).every((l) => same(l, lists[0]!));
    if (weekdaysSame) days.weekdays = lists[0]!;
    else for (let i = 0; i < 5; i++) days[WEEKDAY_KEYS[i]!] = lists[i]!;
    if (same(lists[5]!, lists[6]!)) days.weekend = lists[5]!;
    else {
      days.sat = lists[5]!;
      days.sun = lists[6]!;
    }
  } else {
    for (let i = 0; i < 7; i++) days[WEEKDAY_KEYS[i]!] = lists[i]!;
  }
  const file: ScheduleFile = {
    name: d.name.trim(),
    units: unit,
    days,
    unoccupied: { heat: sp(d.unoccupiedHeatC), cool: sp(d.unoccupiedCoolC) },
    deadband: tk(d.deadbandK),
    optimalStart: d.optimalStart,
    setbackFloor: t(d.setbackFloorC),
  };
  if (d.baseline) file.baseline = { heat: sp(d.baseline.heatC), cool: sp(d.baseline.coolC) };
  const equipment: NonNullable<ScheduleFile['equipment']> = {};
  if (d.heating.value !== null) equipment.heatingCapacity = { value: d.heating.value, unit: d.heating.unit };
  if (d.cooling.value !== null) equipment.coolingCapacity = { value: d.cooling.value, unit: d.cooling.unit };
  if (d.heatPump.enabled) {
    equipment.heatPump = {
      capacityAt: d.heatPump.points.map((p) => ({ outdoor: t(p.outdoorC), percent: p.percent })),
      ...(d.heatPump.auxBelowC !== null ? { auxBelow: t(d.heatPump.auxBelowC) } : {}),
    };
  }
  if (Object.keys(equipment).length > 0) file.equipment = equipment;
  return file;
}

/** Where in the editor a problem is, in the screen's words, from a schedule key such as "days.tue[1].to". */
export function describeKey(key: string): string {
  const m = /^days\.(\w+)(?:\[(\d+)\](?:\.(\w+))?)?$/.exec(key);
  if (m) {
    const i = (WEEKDAY_KEYS as readonly string[]).indexOf(m[1]!);
    const day = i >= 0 ? DAY_NAMES[i]! : m[1] === 'weekdays' ? 'Weekdays' : m[1] === 'weekend' ? 'Weekend' : 'Every day';
    if (m[2] === undefined) return day;
    const field = m[3] === 'from' ? ' (from)' : m[3] === 'to' ? ' (to)' : m[3] === 'heat' ? ' (heating setpoint)' : m[3] === 'cool' ? ' (cooling setpoint)' : '';
    return `${day}, period ${Number(m[2]) + 1}${field}`;
  }
  if (key.startsWith('unoccupied')) return 'Unoccupied setpoints';
  if (key.startsWith('baseline')) return 'Baseline setpoints';
  if (key.startsWith('deadband')) return 'Deadband';
  if (key.startsWith('setbackFloor')) return 'Setback floor';
  if (key.startsWith('equipment.heatPump')) return 'Heat pump';
  if (key.startsWith('equipment.heatingCapacity')) return 'Heating output';
  if (key.startsWith('equipment.coolingCapacity')) return 'Cooling output';
  if (key === 'name') return 'Schedule name';
  return key || 'Schedule';
}

export type DraftCheck = { ok: true; file: ScheduleFile } | { ok: false; where: string; message: string };

const notNumber = (v: number | null) => v !== null && !Number.isFinite(v);

/**
 * Checks a draft: every box a number (or empty where empty means off), then the schedule rules of
 * parseSchedule (times, order, overlaps, heating below cooling by the deadband, heat-pump points).
 * @returns the file in `unit` (one key per day) when it is valid, else where and what is wrong
 */
export function checkDraft(d: ScheduleDraft, unit: TempUnit): DraftCheck {
  const bad = (where: string, message: string): DraftCheck => ({ ok: false, where, message });
  if (d.name.trim() === '') return bad('Schedule name', 'give the schedule a name.');
  for (let i = 0; i < 7; i++) {
    const list = d.days[i]!;
    for (let k = 0; k < list.length; k++) {
      const p = list[k]!;
      const where = `${DAY_NAMES[i]}, period ${k + 1}`;
      for (const [label, v] of [['from', p.from], ['to', p.to]] as const) {
        if (!/^\d{1,2}:\d{2}$/.test(v.trim())) return bad(where, `“${label}” must be a time as HH:MM (00:00 to 24:00), got “${v}”.`);
      }
      if (notNumber(p.heatC)) return bad(where, 'the heating setpoint is not a number (leave it empty for heating off).');
      if (notNumber(p.coolC)) return bad(where, 'the cooling setpoint is not a number (leave it empty for cooling off).');
    }
  }
  if (notNumber(d.unoccupiedHeatC) || notNumber(d.unoccupiedCoolC)) return bad('Unoccupied setpoints', 'not a number (leave a box empty for that equipment off).');
  if (!Number.isFinite(d.deadbandK)) return bad('Deadband', 'not a number.');
  if (!Number.isFinite(d.setbackFloorC)) return bad('Setback floor', 'not a number.');
  if (d.baseline && (notNumber(d.baseline.heatC) || notNumber(d.baseline.coolC))) return bad('Baseline setpoints', 'not a number.');
  if (notNumber(d.heating.value)) return bad('Heating output', 'not a number (leave it empty when unknown).');
  if (notNumber(d.cooling.value)) return bad('Cooling output', 'not a number (leave it empty when unknown).');
  if (d.heatPump.enabled) {
    const pts = d.heatPump.points;
    if (pts.some((p) => !Number.isFinite(p.outdoorC) || !Number.isFinite(p.percent)) || notNumber(d.heatPump.auxBelowC)) {
      return bad('Heat pump', 'every capacity point needs an outdoor temperature and a percentage.');
    }
  }
  const file = fileFromDraft(d, unit);
  try {
    parseSchedule(file);
  } catch (err) {
    if (err instanceof ScheduleError) {
      const prefix = err.key ? `${err.key}: ` : '';
      const message = err.message.startsWith(prefix) ? err.message.slice(prefix.length) : err.message;
      return bad(describeKey(err.key), message);
    }
    throw err;
  }
  return { ok: true, file };
}

/** A file name for an exported schedule: its name in lower case with dashes, ".json". */
export function scheduleFileName(name: string): string {
  const slug = name
    .normalize('NFKD')
    .replace(/[\u0300-\u036f]/g, '')
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, '-')
    .replace(/^-+|-+$/g, '')
    .slice(0, 60);
  return `${slug || 'schedule'}.json`;
}
