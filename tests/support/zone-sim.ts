/**
 * Reference simulator of a thermostat-controlled zone, writing realistic thermostat logs.
 *
 * It exists so that the fitter and the recovery solver can be checked against a computation that
 * shares no code with them: the zone is integrated with the classical fourth-order Runge–Kutta method
 * (RK4; any numerical-analysis text, e.g. Burden & Faires, *Numerical Analysis*, §5.4) at a fine fixed
 * step, with the outdoor temperature evaluated at every Runge–Kutta stage, instead of core/step.ts's
 * exact one-interval solution with a linear ambient.
 *
 * The model (internal units: °C, K, hours):
 *   dT/dt = (T_out(t) − T)/τ + h·u_heat(t) − c·u_cool(t) + g
 * with u_heat, u_cool ∈ {0, 1} decided by a deadband thermostat between steps (equipment switches exactly
 * on a step boundary; with steps of 10–30 s the switching error is negligible next to the log's own
 * resolution).
 *
 * The log: one row every `intervalMinutes`, timestamped at the end of its interval, with the indoor
 * reading rounded in the log's unit, the outdoor reading, the setpoints in effect at the timestamp and
 * the runtime in the interval (t − interval, t] in seconds, minutes, as a fraction, in percent, or only as the
 * on/off state at the end of the interval. Optional gaps, duplicate rows, out-of-order rows and blank
 * outdoor cells make it look like a real export.
 *
 * Everything here is for tests and the invented demo; nothing of it is imported by core/, db/ or app/.
 */
import { DateTime } from 'luxon';
import type { TempUnit, ZoneModel, ZoneSeries } from '../../core/types.ts';
import { Prng } from './prng.ts';
import { makeWeather, type OutdoorFn, type WeatherOptions } from './weather.ts';

export { makeWeather, Prng };
export type { OutdoorFn, WeatherOptions };

const HOUR_MS = 3_600_000;
const MINUTE_MS = 60_000;

// ───────────────────────────── schedule ─────────────────────────────

/** Local wall-clock time: ISO weekday 1 = Monday … 7 = Sunday, hour of the day 0 ≤ hour < 24 (fractional). */
export interface LocalTime {
  weekday: number;
  hour: number;
}

/** Setpoints in effect, °C; null where that mode is off. */
export interface Setpoints {
  heatC: number | null;
  coolC: number | null;
}

/** A thermostat schedule: the setpoints in effect at a local wall-clock time. */
export type Schedule = (local: LocalTime) => Setpoints;

export interface SetbackScheduleOptions {
  /** Heating setpoint while occupied, °C (default 21). */
  occupiedHeatC?: number;
  /** Heating setpoint at night / unoccupied (the setback), °C (default 16). */
  setbackHeatC?: number;
  /** Cooling setpoint while occupied, °C (default: no cooling). */
  occupiedCoolC?: number | null;
  /** Cooling setpoint unoccupied (the setup), °C (default: the occupied cooling setpoint). */
  setupCoolC?: number | null;
  /** Local hour the occupied period starts (default 6). */
  startHour?: number;
  /** Local hour the occupied period ends (default 22). */
  endHour?: number;
  /** Per-weekday occupied hours [start, end), overriding start/endHour; null = unoccupied all day. Keys 1–7 (Mon–Sun). */
  days?: Partial<Record<number, [number, number] | null>>;
}

/**
 * A weekly schedule with one occupied period a day and a night setback (and setup, with cooling).
 * Throws RangeError when a period does not satisfy 0 ≤ start < end ≤ 24.
 *
 * @example setbackSchedule({ occupiedHeatC: 21, setbackHeatC: 16, startHour: 6, endHour: 22, days: { 7: null } })
 */
export function setbackSchedule(options: SetbackScheduleOptions = {}): Schedule {
  const occHeat = options.occupiedHeatC ?? 21;
  const backHeat = options.setbackHeatC ?? 16;
  const occCool = options.occupiedCoolC ?? null;
  const upCool = options.setupCoolC ?? occCool;
  const periods: ([number, number] | null)[] = [];
  for (let d = 1; d <= 7; d++) {
    const given = options.days?.[d];
    const p: [number, number] | null = given === undefined ? [options.startHour ?? 6, options.endHour ?? 22] : given;
    if (p && !(p[0] >= 0 && p[0] < p[1] && p[1] <= 24)) {
      throw new RangeError(`setbackSchedule: weekday ${d} needs 0 ≤ start < end ≤ 24, got [${p[0]}, ${p[1]}]`);
    }
    periods.push(p);
  }
  return ({ weekday, hour }) => {
    const p = periods[weekday - 1];
    const occupied = p !== null && hour >= p[0] && hour < p[1];
    return { heatC: occupied ? occHeat : backHeat, coolC: occupied ? occCool : upCool };
  };
}

// ───────────────────────────── options ─────────────────────────────

export type RuntimeFormat = 'seconds' | 'minutes' | 'fraction' | 'percent' | 'onoff';
export type TimestampFormat = 'iso' | 'local' | 'split' | 'epoch';

export interface ThermostatOptions {
  /** Full deadband width, K: heat comes on at setpoint − deadband/2 and goes off at setpoint + deadband/2 (default 1). */
  deadbandK?: number;
  /** Minimum on time of the equipment, minutes (default 0). */
  minOnMinutes?: number;
  /** Minimum off time of the equipment, minutes (default 0). */
  minOffMinutes?: number;
  /** What the thermostat acts on: the true temperature or its own reading rounded like the log (default 'true'). */
  senses?: 'true' | 'reading';
}

/** Column names of the written log; every one has a default that carries its unit. */
export interface ColumnNames {
  time: string;
  date: string;
  clock: string;
  indoor: string;
  outdoor: string;
  heatSetpoint: string;
  coolSetpoint: string;
  heat: string;
  cool: string;
}

/** A gap: no rows from `atHours` after the log start for `hours`. */
export interface LogGap {
  atHours: number;
  hours: number;
}

export interface LogFormatOptions {
  /** Minutes between rows (default 5); a whole multiple of the simulation step. */
  intervalMinutes?: number;
  /** Unit of every temperature in the log (default 'C'). */
  units?: TempUnit;
  /** Rounding step of the indoor reading in the log unit, e.g. 1 (°F), 0.5, 0.1; 0 = no rounding (default 0.1). */
  indoorResolution?: number;
  /** Rounding step of the outdoor reading in the log unit (default 0.1). */
  outdoorResolution?: number;
  /** Rounding step of the written setpoints in the log unit (default 0.1). */
  setpointResolution?: number;
  /** How runtime is written (default 'seconds'). */
  runtime?: RuntimeFormat;
  /** Decimals of a 'minutes' (default 1), 'fraction' (default 3) or 'percent' (default 0) runtime. */
  runtimeDecimals?: number;
  /** Words for the 'onoff' state (default ['1', '0']). */
  onOffLabels?: [string, string];
  /** Timestamp style (default 'iso': ISO 8601 with the zone's offset). */
  timestamps?: TimestampFormat;
  /** luxon pattern of a 'local' timestamp (default 'yyyy-MM-dd HH:mm'). */
  localPattern?: string;
  /** luxon patterns of the date and time columns of 'split' timestamps (default 'dd.MM.yyyy' and 'HH:mm'). */
  datePattern?: string;
  timePattern?: string;
  /** Field delimiter (default ','). */
  delimiter?: ',' | ';' | '\t';
  /** Decimal mark (default '.'). */
  decimal?: '.' | ',';
  /** Line ending (default '\n'). */
  lineEnding?: '\n' | '\r\n';
  columns?: Partial<ColumnNames>;
  /** Write the outdoor column (default true). */
  includeOutdoor?: boolean;
  /** Write the setpoint columns (default true). */
  includeSetpoints?: boolean;
  /** Write the cooling columns (default: when the model has cooling and the schedule a cooling setpoint). */
  includeCooling?: boolean;
  /** Rows to leave out. */
  gaps?: LogGap[];
  /** Number of rows written twice (random positions, seeded). */
  duplicates?: number;
  /** Number of adjacent row pairs swapped (random positions, seeded). */
  outOfOrder?: number;
  /** Number of rows with a blank outdoor cell (random positions, seeded). */
  missingOutdoor?: number;
}

/**
 * A two-node truth (air node and building-mass node, heat into the air; the continuous-time grey-box
 * form of Bacher & Madsen 2011, Energy and Buildings 43(7), "TiTe"):
 *   dTi/dt = (Tm − Ti)/τam + h·u_heat − c·u_cool + g + s·I(t)
 *   dTm/dt = (Ti − Tm)·k_ma + (T_out − Tm)/τmo,   k_ma = (1 − share)/(share·τam)
 * τam = C_air·R_air–mass, τmo = C_mass·R_mass–outdoor, share = C_mass/(C_air + C_mass).
 * The one-node model's τ is then ignored (its rates h, c, g act on the air node).
 */
export interface MassTruth {
  airMassHours: number;
  massOutdoorHours: number;
  massShare: number;
}

/**
 * A solar gain of the truth: s·I(t) K/h on the air node, with I(t) a clear-sky global horizontal
 * irradiance (kW/m²) of the simulator's own (Haurwitz 1945 clear-sky model, sun position from Cooper's
 * 1969 declination and the mean solar time, no equation of time), scaled each day by a seeded cloudiness factor. Independent of
 * core/solar.ts on purpose: the fitter's proxy is then imperfect, as it is on real buildings.
 */
export interface SolarTruth {
  /** s: K/h per kW/m² of global horizontal irradiance on the air node. */
  gainPerKWm2: number;
  latDeg: number;
  lonDeg: number;
  /** Lowest daily clearness factor (1 = every day clear; default 0.35): each day draws uniformly in [min, 1]. */
  minClearness?: number;
}

export interface ZoneSimOptions {
  /** The true zone model, internal units (τ h, rates K/h). */
  model: ZoneModel;
  /** A building-mass node (two-node truth); omitted: one lumped node. */
  mass?: MassTruth;
  /** A solar gain on the air node; omitted: none. */
  solar?: SolarTruth;
  /** First log timestamp: ISO 8601 (local wall clock in `timezone` unless it has an offset) or epoch ms (default '2025-01-06T00:00'). */
  start?: string | number;
  /** Length of the log, days (default 14). */
  days?: number;
  /** IANA time zone of the site (default 'UTC'); schedules and local timestamps follow its wall clock, DST included. */
  timezone?: string;
  /** Invented weather options, or any outdoor temperature function of epoch ms (°C). */
  weather?: WeatherOptions | OutdoorFn;
  /** Thermostat schedule (default setbackSchedule(): 21 °C 06–22, 16 °C at night, no cooling). */
  schedule?: Schedule;
  thermostat?: ThermostatOptions;
  /** Indoor temperature at the start of the warm-up, °C (default the heating setpoint then, or 20). */
  initialC?: number;
  /** Simulated hours before the first row, so the log starts in a settled state (default 24, or 168 with a mass node; at least one interval). */
  warmupHours?: number;
  /** RK4 step, seconds (default 20); must divide the log interval. */
  stepSeconds?: number;
  /** Standard deviation of Gaussian noise added to the logged indoor reading before rounding, K (default 0). */
  sensorNoiseK?: number;
  /** Seed of the sensor noise and of the log imperfections; also the weather seed unless it has its own (default 1). */
  seed?: number;
  log?: LogFormatOptions;
}

/** The mapping file of INTERFACES.md (core/mapping.ts), as this simulator fills it in. */
export interface SimMapping {
  time: string | [string, string];
  /** luxon pattern of a local timestamp; for split columns, date and time patterns joined by one space. */
  dateFormat?: string;
  indoor: string;
  outdoor?: string;
  heatSetpoint?: string;
  coolSetpoint?: string;
  heating?: { column: string; as: RuntimeFormat };
  cooling?: { column: string; as: RuntimeFormat };
  units?: TempUnit;
  delimiter?: string;
  decimal?: '.' | ',';
  timezone?: string;
  runtimeInterval?: 'ending' | 'starting';
}

export interface ZoneSimResult {
  /** The log file's text. */
  csv: string;
  /** The true model (copy of options.model), internal units. */
  truth: ZoneModel;
  /** A mapping that reads this log (always filled in; needed when the header alone is not enough). */
  mapping: SimMapping;
  /**
   * Every log time (no gaps, duplicates or swaps), internal units, unrounded: true indoor and outdoor °C,
   * setpoints °C (NaN when off), exact runtime fractions of each interval.
   */
  trueSeries: ZoneSeries;
  /** Outdoor temperature used, °C, as a function of epoch ms. */
  outdoor: OutdoorFn;
  /** Total on-time of heating and cooling over the logged intervals, seconds (counted step by step). */
  onSeconds: { heat: number; cool: number };
  /** Number of times heating and cooling came on during the logged intervals. */
  starts: { heat: number; cool: number };
  /** Header fields and the number of data rows written. */
  header: string[];
  rowsWritten: number;
  intervalMinutes: number;
  units: TempUnit;
  timezone: string;
  /** First and last row time, epoch ms UTC. */
  startMs: number;
  endMs: number;
}

// ───────────────────────────── simulation ─────────────────────────────

interface Row {
  ms: number;
  indoorC: number;
  outdoorC: number;
  heatSp: number | null;
  coolSp: number | null;
  heatSec: number;
  coolSec: number;
  heatEnd: boolean;
  coolEnd: boolean;
}

/**
 * Simulates a thermostat-controlled zone by RK4 and writes its log.
 *
 * Throws RangeError with a plain message for an invalid model, time zone, start, step or interval.
 *
 * @example
 * const sim = simulateZone({ model: { tauHours: 30, heatRate: 3, coolRate: 0, gain: 0.1 }, days: 7,
 *   log: { units: 'F', indoorResolution: 1, runtime: 'seconds' } });
 * sim.csv;            // "time,indoor_f,outdoor_f,heat_setpoint_f,heat_runtime_s\n2025-01-06T00:00:00Z,…"
 * sim.trueSeries;     // unrounded ZoneSeries for checking predictions
 */
export function simulateZone(options: ZoneSimOptions): ZoneSimResult {
  const model = options.model;
  checkModel(model);
  const zone = options.timezone ?? 'UTC';
  if (!DateTime.fromMillis(0, { zone }).isValid) throw new RangeError(`simulateZone: unknown time zone "${zone}"`);
  const startMs = parseStart(options.start ?? '2025-01-06T00:00', zone);
  const log = options.log ?? {};
  const units: TempUnit = log.units ?? 'C';
  const intervalMin = log.intervalMinutes ?? 5;
  const stepSec = options.stepSeconds ?? 20;
  const days = options.days ?? 14;
  if (!(stepSec > 0 && Number.isInteger(stepSec))) throw new RangeError(`simulateZone: stepSeconds must be a positive whole number, got ${stepSec}`);
  if (!(intervalMin > 0) || !Number.isInteger((intervalMin * 60) / stepSec)) {
    throw new RangeError(`simulateZone: the log interval (${intervalMin} min) must be a whole multiple of the ${stepSec} s step`);
  }
  if (!(days > 0)) throw new RangeError(`simulateZone: days must be > 0, got ${days}`);
  const intervalMs = intervalMin * MINUTE_MS;
  const stepMs = stepSec * 1000;
  const stepsPerInterval = intervalMs / stepMs;
  const nRows = Math.round((days * 24 * 60) / intervalMin);
  const warmupIntervals = Math.max(1, Math.ceil(((options.warmupHours ?? (options.mass ? 168 : 24)) * 60) / intervalMin));
  const simStartMs = startMs - warmupIntervals * intervalMs;
  const seed = options.seed ?? 1;

  const outdoor: OutdoorFn =
    typeof options.weather === 'function'
      ? options.weather
      : makeWeather({
          seed,
          originMs: simStartMs,
          solarOffsetHours: DateTime.fromMillis(startMs, { zone }).offset / 60,
          ...options.weather,
        });
  const schedule = options.schedule ?? setbackSchedule();
  const clock = localClock(zone);
  const th = options.thermostat ?? {};
  const halfBand = (th.deadbandK ?? 1) / 2;
  const minOnSec = (th.minOnMinutes ?? 0) * 60;
  const minOffSec = (th.minOffMinutes ?? 0) * 60;
  const indoorRes = log.indoorResolution ?? 0.1;
  const sensed =
    th.senses === 'reading'
      ? (c: number) => toC(quantise(fromC(c, units), indoorRes), units)
      : (c: number) => c;

  const tau = model.tauHours;
  const dtH = stepSec / 3600;
  let T = options.initialC ?? schedule(clock(simStartMs)).heatC ?? 20;
  const mass = options.mass ? massRates(options.mass) : null;
  // The mass starts where it would sit with the air held at T (steady state with the outdoor then).
  let Tm = mass ? (mass.kma * T + mass.kmo * outdoor(simStartMs)) / (mass.kma + mass.kmo) : 0;
  const sun = options.solar ? solarTruth(options.solar, seed) : null;
  let heatOn = false;
  let coolOn = false;
  let heatSince = Infinity; // seconds in the current state, for minimum on/off times
  let coolSince = Infinity;
  const rows: Row[] = [];
  let heatSteps = 0;
  let coolSteps = 0;
  const starts = { heat: 0, cool: 0 };

  for (let j = 1 - warmupIntervals; j < nRows; j++) {
    const intervalStart = startMs + (j - 1) * intervalMs;
    let heatSec = 0;
    let coolSec = 0;
    for (let s = 0; s < stepsPerInterval; s++) {
      const ms = intervalStart + s * stepMs;
      const sp = schedule(clock(ms));
      const reading = sensed(T);
      let wantHeat: boolean = sp.heatC !== null && model.heatRate > 0 && (heatOn ? reading < sp.heatC + halfBand : reading <= sp.heatC - halfBand);
      let wantCool: boolean = sp.coolC !== null && model.coolRate > 0 && (coolOn ? reading > sp.coolC - halfBand : reading >= sp.coolC + halfBand);
      if (heatOn && !wantHeat && heatSince < minOnSec) wantHeat = true;
      if (!heatOn && wantHeat && heatSince < minOffSec) wantHeat = false;
      if (coolOn && !wantCool && coolSince < minOnSec) wantCool = true;
      if (!coolOn && wantCool && coolSince < minOffSec) wantCool = false;
      if (wantHeat && wantCool) {
        // Never both at once: the one already running keeps going.
        if (coolOn) wantHeat = false;
        else wantCool = false;
      }
      if (wantHeat !== heatOn) {
        heatOn = wantHeat;
        heatSince = 0;
        if (heatOn && j >= 0) starts.heat++;
      }
      if (wantCool !== coolOn) {
        coolOn = wantCool;
        coolSince = 0;
        if (coolOn && j >= 0) starts.cool++;
      }

      // One classical RK4 step with the outdoor temperature (and the sun) at each stage.
      const q = (heatOn ? model.heatRate : 0) - (coolOn ? model.coolRate : 0) + model.gain;
      const a0 = outdoor(ms);
      const aMid = outdoor(ms + stepMs / 2);
      const a1 = outdoor(ms + stepMs);
      if (mass) {
        const s0 = sun ? sun(ms) : 0, sMid = sun ? sun(ms + stepMs / 2) : 0, s1 = sun ? sun(ms + stepMs) : 0;
        const fi = (Ti: number, Tmm: number, s: number) => (Tmm - Ti) * mass.kam + q + s;
        const fm = (Ti: number, Tmm: number, a: number) => (Ti - Tmm) * mass.kma + (a - Tmm) * mass.kmo;
        const i1 = fi(T, Tm, s0), m1 = fm(T, Tm, a0);
        const i2 = fi(T + (dtH / 2) * i1, Tm + (dtH / 2) * m1, sMid), m2 = fm(T + (dtH / 2) * i1, Tm + (dtH / 2) * m1, aMid);
        const i3 = fi(T + (dtH / 2) * i2, Tm + (dtH / 2) * m2, sMid), m3 = fm(T + (dtH / 2) * i2, Tm + (dtH / 2) * m2, aMid);
        const i4 = fi(T + dtH * i3, Tm + dtH * m3, s1), m4 = fm(T + dtH * i3, Tm + dtH * m3, a1);
        T += (dtH / 6) * (i1 + 2 * i2 + 2 * i3 + i4);
        Tm += (dtH / 6) * (m1 + 2 * m2 + 2 * m3 + m4);
      } else {
        const s0 = sun ? sun(ms) : 0, sMid = sun ? sun(ms + stepMs / 2) : 0, s1 = sun ? sun(ms + stepMs) : 0;
        const k1 = (a0 - T) / tau + q + s0;
        const k2 = (aMid - (T + (dtH / 2) * k1)) / tau + q + sMid;
        const k3 = (aMid - (T + (dtH / 2) * k2)) / tau + q + sMid;
        const k4 = (a1 - (T + dtH * k3)) / tau + q + s1;
        T += (dtH / 6) * (k1 + 2 * k2 + 2 * k3 + k4);
      }

      if (heatOn) heatSec += stepSec;
      if (coolOn) coolSec += stepSec;
      if (j >= 0) {
        if (heatOn) heatSteps++;
        if (coolOn) coolSteps++;
      }
      heatSince += stepSec;
      coolSince += stepSec;
    }
    if (j >= 0) {
      const ms = startMs + j * intervalMs;
      const sp = schedule(clock(ms));
      rows.push({
        ms,
        indoorC: T,
        outdoorC: outdoor(ms),
        heatSp: sp.heatC,
        coolSp: model.coolRate > 0 ? sp.coolC : null,
        heatSec,
        coolSec,
        heatEnd: heatOn,
        coolEnd: coolOn,
      });
    }
  }

  const trueSeries = seriesOf(rows, intervalMs);
  const hasCoolSetpoint = rows.some((r) => r.coolSp !== null);
  const written = writeLog(rows, {
    ...log,
    units,
    intervalMinutes: intervalMin,
    indoorResolution: indoorRes,
    includeCooling: log.includeCooling ?? (model.coolRate > 0 && hasCoolSetpoint),
  }, zone, new Prng(seed * 7919 + 17), options.sensorNoiseK ?? 0);

  return {
    csv: written.csv,
    truth: { tauHours: model.tauHours, heatRate: model.heatRate, coolRate: model.coolRate, gain: model.gain },
    mapping: written.mapping,
    trueSeries,
    outdoor,
    onSeconds: { heat: heatSteps * stepSec, cool: coolSteps * stepSec },
    starts,
    header: written.header,
    rowsWritten: written.rowsWritten,
    intervalMinutes: intervalMin,
    units,
    timezone: zone,
    startMs,
    endMs: startMs + (nRows - 1) * intervalMs,
  };
}

/** Rates of a two-node truth, per hour: air→mass k_am = 1/τam, mass→air k_ma, mass→outdoor k_mo = 1/τmo. */
export function massRates(m: MassTruth): { kam: number; kma: number; kmo: number } {
  if (!(m.airMassHours > 0 && m.massOutdoorHours > 0 && m.massShare > 0 && m.massShare < 1)) {
    throw new RangeError(`mass node: need airMassHours > 0, massOutdoorHours > 0 and 0 < massShare < 1, got ${JSON.stringify(m)}`);
  }
  const kam = 1 / m.airMassHours;
  return { kam, kma: (kam * (1 - m.massShare)) / m.massShare, kmo: 1 / m.massOutdoorHours };
}

/**
 * The simulator's own sun: s·I(t) K/h, I the Haurwitz (1945) clear-sky global horizontal irradiance
 * GHI = 1098·cos z·exp(−0.057/cos z) W/m², z from Cooper's (1969) declination δ = 23.45°·sin(360°(284 + n)/365)
 * and the hour angle of mean solar time (longitude/15 h from UTC), times a daily clearness in [min, 1].
 */
function solarTruth(o: SolarTruth, seed: number): (ms: number) => number {
  const rnd = new Prng(seed * 104729 + 3);
  const minClear = o.minClearness ?? 0.35;
  const clear = new Map<number, number>();
  const lat = (o.latDeg * Math.PI) / 180;
  return (ms) => {
    const day = Math.floor(ms / 86_400_000);
    let k = clear.get(day);
    if (k === undefined) {
      // Draw in day order from the first day asked for (the simulator walks forward in time).
      k = minClear + (1 - minClear) * rnd.next();
      clear.set(day, k);
    }
    const n = Math.floor((ms - Date.UTC(new Date(ms).getUTCFullYear(), 0, 1)) / 86_400_000) + 1;
    const decl = ((23.45 * Math.PI) / 180) * Math.sin((2 * Math.PI * (284 + n)) / 365);
    const solarHour = ((((ms / HOUR_MS + o.lonDeg / 15) % 24) + 24) % 24);
    const omega = ((solarHour - 12) * 15 * Math.PI) / 180;
    const cosZ = Math.sin(lat) * Math.sin(decl) + Math.cos(lat) * Math.cos(decl) * Math.cos(omega);
    if (cosZ <= 0.01) return 0;
    const ghi = 1098 * cosZ * Math.exp(-0.057 / cosZ);
    return (o.gainPerKWm2 * k * ghi) / 1000;
  };
}

function checkModel(m: ZoneModel): void {
  if (!(m.tauHours > 0 && Number.isFinite(m.tauHours))) throw new RangeError(`zone model: tauHours must be > 0, got ${m.tauHours}`);
  for (const [k, v] of [['heatRate', m.heatRate], ['coolRate', m.coolRate]] as const) {
    if (!(v >= 0 && Number.isFinite(v))) throw new RangeError(`zone model: ${k} must be ≥ 0 K/h, got ${v}`);
  }
  if (!Number.isFinite(m.gain)) throw new RangeError(`zone model: gain must be a finite K/h, got ${m.gain}`);
}

function parseStart(start: string | number, zone: string): number {
  if (typeof start === 'number') {
    if (!Number.isFinite(start)) throw new RangeError(`simulateZone: start must be finite epoch ms, got ${start}`);
    return start;
  }
  const dt = DateTime.fromISO(start, { zone });
  if (!dt.isValid) throw new RangeError(`simulateZone: start "${start}" is not an ISO 8601 time (${dt.invalidExplanation ?? dt.invalidReason})`);
  return dt.toMillis();
}

/** Local wall clock of epoch ms in an IANA zone; the UTC offset is looked up once per quarter hour. */
function localClock(zone: string): (ms: number) => LocalTime {
  const quarter = 15 * MINUTE_MS;
  const cache = new Map<number, number>();
  return (ms) => {
    const block = Math.floor(ms / quarter);
    let offsetMin = cache.get(block);
    if (offsetMin === undefined) {
      offsetMin = DateTime.fromMillis(block * quarter, { zone }).offset;
      cache.set(block, offsetMin);
    }
    const d = new Date(ms + offsetMin * MINUTE_MS);
    return {
      weekday: ((d.getUTCDay() + 6) % 7) + 1,
      hour: d.getUTCHours() + d.getUTCMinutes() / 60 + d.getUTCSeconds() / 3600 + d.getUTCMilliseconds() / HOUR_MS,
    };
  };
}

function seriesOf(rows: Row[], intervalMs: number): ZoneSeries {
  const n = rows.length;
  const s: ZoneSeries = {
    time: new Float64Array(n),
    indoor: new Float64Array(n),
    outdoor: new Float64Array(n),
    heatSetpoint: new Float64Array(n),
    coolSetpoint: new Float64Array(n),
    heat: new Float64Array(n),
    cool: new Float64Array(n),
  };
  const intervalSec = intervalMs / 1000;
  rows.forEach((r, i) => {
    s.time[i] = r.ms;
    s.indoor[i] = r.indoorC;
    s.outdoor[i] = r.outdoorC;
    s.heatSetpoint[i] = r.heatSp ?? NaN;
    s.coolSetpoint[i] = r.coolSp ?? NaN;
    s.heat[i] = r.heatSec / intervalSec;
    s.cool[i] = r.coolSec / intervalSec;
  });
  return s;
}

// ───────────────────────────── log writing ─────────────────────────────

function fromC(c: number, unit: TempUnit): number {
  return unit === 'C' ? c : c * 1.8 + 32;
}

function toC(v: number, unit: TempUnit): number {
  return unit === 'C' ? v : (v - 32) / 1.8;
}

/** Rounds `x` to the nearest multiple of `step` (step ≤ 0: unchanged). */
export function quantise(x: number, step: number): number {
  return step > 0 ? Math.round(x / step) * step : x;
}

/** Decimals needed to write multiples of `step` (0.5 → 1, 1 → 0); 3 for unrounded values. */
function decimalsOf(step: number): number {
  if (!(step > 0)) return 3;
  for (let d = 0; d < 6; d++) {
    const scaled = step * 10 ** d;
    if (Math.abs(scaled - Math.round(scaled)) < 1e-9) return d;
  }
  return 6;
}

function formatNumber(x: number, decimals: number, mark: '.' | ','): string {
  let s = x.toFixed(decimals);
  if (/^-0(\.0*)?$/.test(s)) s = s.slice(1);
  return mark === ',' ? s.replace('.', ',') : s;
}

function defaultColumns(units: TempUnit, runtime: RuntimeFormat): ColumnNames {
  const u = units === 'C' ? 'c' : 'f';
  const suffix = { seconds: 'runtime_s', minutes: 'runtime_min', fraction: 'runtime_fraction', percent: 'runtime_pct', onoff: 'state' }[runtime];
  return {
    time: 'time',
    date: 'date',
    clock: 'clock',
    indoor: `indoor_${u}`,
    outdoor: `outdoor_${u}`,
    heatSetpoint: `heat_setpoint_${u}`,
    coolSetpoint: `cool_setpoint_${u}`,
    heat: `heat_${suffix}`,
    cool: `cool_${suffix}`,
  };
}

function writeLog(
  rows: Row[],
  log: LogFormatOptions & { units: TempUnit; intervalMinutes: number; indoorResolution: number; includeCooling: boolean },
  zone: string,
  rnd: Prng,
  noiseK: number,
): { csv: string; header: string[]; mapping: SimMapping; rowsWritten: number } {
  const units = log.units;
  const runtime = log.runtime ?? 'seconds';
  const stamps = log.timestamps ?? 'iso';
  const delim = log.delimiter ?? ',';
  const mark = log.decimal ?? '.';
  const eol = log.lineEnding ?? '\n';
  const cols = { ...defaultColumns(units, runtime), ...log.columns };
  const withOutdoor = log.includeOutdoor ?? true;
  const withSetpoints = log.includeSetpoints ?? true;
  const withCool = log.includeCooling;
  const inRes = log.indoorResolution;
  const outRes = log.outdoorResolution ?? 0.1;
  const spRes = log.setpointResolution ?? 0.1;
  const rtDecimals = log.runtimeDecimals ?? (runtime === 'fraction' ? 3 : runtime === 'minutes' ? 1 : 0);
  const [onWord, offWord] = log.onOffLabels ?? ['1', '0'];
  const localPattern = log.localPattern ?? 'yyyy-MM-dd HH:mm';
  const datePattern = log.datePattern ?? 'dd.MM.yyyy';
  const timePattern = log.timePattern ?? 'HH:mm';
  const intervalSec = log.intervalMinutes * 60;

  // Fields of every row, formatted once (noise drawn in time order, so it does not depend on the imperfections).
  const formatted = rows.map((r) => {
    const dt = DateTime.fromMillis(r.ms, { zone });
    const time: string[] =
      stamps === 'iso'
        ? [dt.toISO({ suppressMilliseconds: true })!]
        : stamps === 'local'
          ? [dt.toFormat(localPattern)]
          : stamps === 'split'
            ? [dt.toFormat(datePattern), dt.toFormat(timePattern)]
            : [String(Math.round(r.ms / 1000))];
    const noisy = fromC(r.indoorC, units) + (noiseK > 0 ? noiseK * (units === 'F' ? 1.8 : 1) * rnd.normal() : 0);
    const fields = [...time, formatNumber(quantise(noisy, inRes), decimalsOf(inRes), mark)];
    if (withOutdoor) fields.push(formatNumber(quantise(fromC(r.outdoorC, units), outRes), decimalsOf(outRes), mark));
    const sp = (c: number | null) => (c === null ? '' : formatNumber(quantise(fromC(c, units), spRes), decimalsOf(spRes), mark));
    if (withSetpoints) {
      fields.push(sp(r.heatSp));
      if (withCool) fields.push(sp(r.coolSp));
    }
    const rt = (sec: number, end: boolean): string => {
      switch (runtime) {
        case 'seconds':
          return String(Math.round(sec));
        case 'minutes':
          return formatNumber(sec / 60, rtDecimals, mark);
        case 'fraction':
          return formatNumber(sec / intervalSec, rtDecimals, mark);
        case 'percent':
          return formatNumber((100 * sec) / intervalSec, rtDecimals, mark);
        case 'onoff':
          return end ? onWord : offWord;
      }
    };
    fields.push(rt(r.heatSec, r.heatEnd));
    if (withCool) fields.push(rt(r.coolSec, r.coolEnd));
    return { ms: r.ms, fields };
  });

  const header = stamps === 'split' ? [cols.date, cols.clock] : [cols.time];
  header.push(cols.indoor);
  const outdoorIndex = header.length;
  if (withOutdoor) header.push(cols.outdoor);
  if (withSetpoints) {
    header.push(cols.heatSetpoint);
    if (withCool) header.push(cols.coolSetpoint);
  }
  header.push(cols.heat);
  if (withCool) header.push(cols.cool);

  // Imperfections: gaps, blank outdoor cells, duplicates, swapped neighbours.
  const t0 = rows.length > 0 ? rows[0].ms : 0;
  let list = formatted.filter(
    (r) => !(log.gaps ?? []).some((g) => r.ms >= t0 + g.atHours * HOUR_MS && r.ms < t0 + (g.atHours + g.hours) * HOUR_MS),
  );
  if (withOutdoor) {
    const blank = new Set<number>();
    while (blank.size < Math.min(log.missingOutdoor ?? 0, list.length)) blank.add(rnd.int(0, list.length - 1));
    for (const i of blank) list[i] = { ms: list[i].ms, fields: list[i].fields.map((f, c) => (c === outdoorIndex ? '' : f)) };
  }
  for (let k = 0; k < (log.duplicates ?? 0) && list.length > 0; k++) {
    const i = rnd.int(0, list.length - 1);
    list = [...list.slice(0, i + 1), list[i], ...list.slice(i + 1)];
  }
  for (let k = 0; k < (log.outOfOrder ?? 0) && list.length > 2; k++) {
    let i = rnd.int(1, list.length - 3);
    while (i < list.length - 2 && list[i].ms === list[i + 1].ms) i++;
    [list[i], list[i + 1]] = [list[i + 1], list[i]];
  }

  const cell = (f: string) => (f.includes(delim) || f.includes('"') ? `"${f.replaceAll('"', '""')}"` : f);
  const lines = [header.map(cell).join(delim), ...list.map((r) => r.fields.map(cell).join(delim))];

  const mapping: SimMapping = {
    time: stamps === 'split' ? [cols.date, cols.clock] : cols.time,
    indoor: cols.indoor,
    units,
    delimiter: delim,
    decimal: mark,
    timezone: zone,
    runtimeInterval: 'ending',
    heating: { column: cols.heat, as: runtime },
  };
  if (stamps === 'local') mapping.dateFormat = localPattern;
  if (stamps === 'split') mapping.dateFormat = `${datePattern} ${timePattern}`;
  if (withOutdoor) mapping.outdoor = cols.outdoor;
  if (withSetpoints) {
    mapping.heatSetpoint = cols.heatSetpoint;
    if (withCool) mapping.coolSetpoint = cols.coolSetpoint;
  }
  if (withCool) mapping.cooling = { column: cols.cool, as: runtime };
  return { csv: lines.join(eol) + eol, header, mapping, rowsWritten: list.length };
}

// ───────────────────────────── RK4 helpers for tests ─────────────────────────────

/**
 * Outdoor temperature for the helpers, °C: a constant, a function of hours, or samples
 * { time (hours), temp (°C) } read piecewise-linearly and held constant beyond the ends.
 */
export type OutdoorInput = number | ((tHours: number) => number) | { time: ArrayLike<number>; temp: ArrayLike<number> };

function outdoorOf(outdoor: OutdoorInput): (tHours: number) => number {
  if (typeof outdoor === 'number') return () => outdoor;
  if (typeof outdoor === 'function') return outdoor;
  const { time, temp } = outdoor;
  const n = time.length;
  if (n === 0 || temp.length !== n) throw new RangeError('outdoor samples: time and temp must be non-empty and of equal length');
  return (t) => {
    if (t <= time[0]) return temp[0];
    if (t >= time[n - 1]) return temp[n - 1];
    let lo = 0;
    let hi = n - 1;
    while (hi - lo > 1) {
      const mid = (lo + hi) >> 1;
      if (time[mid] <= t) lo = mid;
      else hi = mid;
    }
    const w = (t - time[lo]) / (time[hi] - time[lo]);
    return temp[lo] + w * (temp[hi] - temp[lo]);
  };
}

function rk4(T: number, t: number, dt: number, tau: number, q: number, out: (t: number) => number): number {
  const aMid = out(t + dt / 2);
  const k1 = (out(t) - T) / tau + q;
  const k2 = (aMid - (T + (dt / 2) * k1)) / tau + q;
  const k3 = (aMid - (T + (dt / 2) * k2)) / tau + q;
  const k4 = (out(t + dt) - (T + dt * k3)) / tau + q;
  return T + (dt / 6) * (k1 + 2 * k2 + 2 * k3 + k4);
}

export interface TrajectoryOptions {
  /** Heating and cooling runtime fractions, held constant (default 0: free-floating). */
  uHeat?: number;
  uCool?: number;
  /** Largest RK4 step, seconds (default 10). */
  stepSeconds?: number;
  /** Model time of the start, hours, for a time-varying outdoor (default 0). */
  startHours?: number;
  /** Spacing of the returned samples, hours (default 0.25). */
  sampleEveryHours?: number;
}

/**
 * The zone's temperature over `hours` from `startC` by RK4, sampled every `sampleEveryHours`
 * (t measured from startHours). Throws RangeError for hours < 0 or a non-positive step.
 *
 * @example rk4Trajectory({ tauHours: 10, heatRate: 0, coolRate: 0, gain: 0 }, 21, 5, 24).temp.at(-1) // ≈ 5 + 16e^{−2.4}
 */
export function rk4Trajectory(
  model: ZoneModel,
  startC: number,
  outdoor: OutdoorInput,
  hours: number,
  options: TrajectoryOptions = {},
): { t: Float64Array; temp: Float64Array } {
  checkModel(model);
  const every = options.sampleEveryHours ?? 0.25;
  const maxDt = (options.stepSeconds ?? 10) / 3600;
  if (!(hours >= 0) || !(every > 0) || !(maxDt > 0)) throw new RangeError('rk4Trajectory: need hours ≥ 0, sampleEveryHours > 0 and stepSeconds > 0');
  const out = outdoorOf(outdoor);
  const t0 = options.startHours ?? 0;
  const q = model.heatRate * (options.uHeat ?? 0) - model.coolRate * (options.uCool ?? 0) + model.gain;
  const nSamples = Math.ceil(hours / every - 1e-9);
  const t = new Float64Array(nSamples + 1);
  const temp = new Float64Array(nSamples + 1);
  temp[0] = startC;
  let T = startC;
  for (let k = 1; k <= nSamples; k++) {
    const a = (k - 1) * every;
    const b = Math.min(k * every, hours);
    const m = Math.max(1, Math.ceil((b - a) / maxDt - 1e-9));
    const dt = (b - a) / m;
    for (let i = 0; i < m; i++) T = rk4(T, t0 + a + i * dt, dt, model.tauHours, q, out);
    t[k] = b;
    temp[k] = T;
  }
  return { t, temp };
}

export interface RecoveryOptions {
  /** Model time the recovery starts, hours, for a time-varying outdoor (default 0). */
  startHours?: number;
  /** Give up after this many hours (default 240). */
  maxHours?: number;
  /** RK4 step, seconds (default 10). */
  stepSeconds?: number;
}

/**
 * "True" recovery time by RK4, independent of core/recovery.ts: hours for the zone to go from `fromC`
 * to `toC` with heating fully on (toC > fromC) or cooling fully on (toC < fromC; with coolRate 0 this is
 * a free drift), the crossing located inside its step by bisection on the step length.
 * Returns 0 when fromC = toC and null when the target is not reached within maxHours.
 *
 * @example trueRecoveryTime({ tauHours: 40, heatRate: 2, coolRate: 0, gain: 0 }, 16, 21, 0) // ≈ 40·ln(64/59)
 */
export function trueRecoveryTime(
  model: ZoneModel,
  fromC: number,
  toC: number,
  outdoor: OutdoorInput,
  options: RecoveryOptions = {},
): number | null {
  checkModel(model);
  if (fromC === toC) return 0;
  const up = toC > fromC;
  const out = outdoorOf(outdoor);
  const t0 = options.startHours ?? 0;
  const maxHours = options.maxHours ?? 240;
  const dt = (options.stepSeconds ?? 10) / 3600;
  const q = (up ? model.heatRate : -model.coolRate) + model.gain;
  const reached = (T: number) => (up ? T >= toC : T <= toC);
  let T = fromC;
  for (let i = 0; i * dt < maxHours; i++) {
    const t = i * dt;
    const next = rk4(T, t0 + t, dt, model.tauHours, q, out);
    if (reached(next)) {
      let lo = 0;
      let hi = dt;
      for (let i = 0; i < 60; i++) {
        const mid = (lo + hi) / 2;
        if (reached(rk4(T, t0 + t, mid, model.tauHours, q, out))) hi = mid;
        else lo = mid;
      }
      return t + (lo + hi) / 2;
    }
    T = next;
  }
  return null;
}
