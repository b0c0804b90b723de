/**
 * Generates the invented demo site: three zones of "Kestelbrück Community House" in the invented town
 * of Kestelbrück, four weeks of thermostat logs in three different export formats, from a known model.
 *
 *   npx tsx assets/demo/generate.ts        (or: npm run demo)
 *
 * Nothing here is real: the site, the town, the zones, the weather and the equipment are made up. The
 * logs come from the reference simulator in tests/support/zone-sim.ts (RK4 integration of the lumped
 * zone model under a deadband thermostat), so the true τ, heating and cooling rates and gains are known
 * and written to truth.json. Deterministic: every random draw is seeded, so running this twice writes
 * identical files.
 */
import { writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { DateTime } from 'luxon';
import { parseMapping } from '../../core/mapping.ts';
import type { ZoneModel } from '../../core/types.ts';
import {
  makeWeather,
  setbackSchedule,
  simulateZone,
  type LogFormatOptions,
  type SetbackScheduleOptions,
  type ThermostatOptions,
  type WeatherOptions,
  type ZoneSimResult,
} from '../../tests/support/zone-sim.ts';

const here = dirname(fileURLToPath(import.meta.url));

const SITE = 'Kestelbrück Community House';
const TOWN = 'Kestelbrück (an invented town)';
const TIMEZONE = 'Europe/Berlin';
/** Monday 10 March 2025, 00:00 local: four weeks of late winter into spring, across the change to summer time on 30 March. */
const START = '2025-03-10T00:00';
const DAYS = 28;
const startMs = DateTime.fromISO(START, { zone: TIMEZONE }).toMillis();
/** 28 calendar days end at local midnight: 671 hours, since the change to summer time skips one. */
const spanDays = (DateTime.fromISO(START, { zone: TIMEZONE }).plus({ days: DAYS }).toMillis() - startMs) / 86_400_000;

/** Invented weather shared by all three zones: a cold snap in week 2, a warm spell in week 4. */
const WEATHER: WeatherOptions = {
  seed: 20250310,
  originMs: startMs,
  solarOffsetHours: 1, // local standard time; the sun keeps no summer time
  meanC: 4.5,
  trendKPerDay: 0.25,
  dailyRangeK: 9,
  minHour: 6,
  maxHour: 15,
  wanderK: 2.2,
  wanderMemory: 0.75,
  coldSnaps: [{ startHours: 8 * 24 + 12, hours: 80, depthK: 7 }],
  warmSpells: [{ startHours: 20 * 24, hours: 156, riseK: 9.5 }],
};
const outdoor = makeWeather(WEATHER);

interface DemoZone {
  name: string;
  construction: string;
  file: string;
  mappingFile: string;
  model: ZoneModel;
  schedule: SetbackScheduleOptions;
  scheduleText: string;
  thermostat: ThermostatOptions;
  sensorNoiseK: number;
  seed: number;
  log: LogFormatOptions;
  formatText: string;
}

const zones: DemoZone[] = [
  {
    name: 'Great Hall',
    construction: 'heavy masonry: solid brick walls, concrete floor, high ceiling; gas boiler and radiators',
    file: 'great-hall.csv',
    mappingFile: 'great-hall.mapping.json',
    model: { tauHours: 46, heatRate: 1.5, coolRate: 0, gain: 0.05 },
    // 68 °F = 20 °C and 59 °F = 15 °C exactly: the hall's controller is set in °F.
    schedule: { occupiedHeatC: 20, setbackHeatC: 15, startHour: 7, endHour: 22, days: { 7: [9, 18] } },
    scheduleText: 'Mon–Sat 07:00–22:00 and Sun 09:00–18:00 at 68 °F (20 °C); otherwise setback 59 °F (15 °C)',
    thermostat: { deadbandK: 1.5 / 1.8, minOnMinutes: 5, minOffMinutes: 5 },
    sensorNoiseK: 0.05,
    seed: 11,
    log: {
      intervalMinutes: 5,
      units: 'F',
      indoorResolution: 1,
      outdoorResolution: 1,
      setpointResolution: 1,
      runtime: 'seconds',
      timestamps: 'iso',
      delimiter: ',',
      decimal: '.',
      columns: {
        time: 'timestamp',
        indoor: 'zone_temp_F',
        outdoor: 'outside_temp_F',
        heatSetpoint: 'heat_setpoint_F',
        heat: 'heat_run_seconds',
      },
      gaps: [{ atHours: 11 * 24 + 13, hours: 5 }],
      duplicates: 4,
    },
    formatText: 'comma-separated; ISO 8601 timestamps with UTC offset; °F, indoor in whole degrees; heating runtime in seconds per 5-minute interval',
  },
  {
    name: 'Office Annex',
    construction: 'light timber frame with mineral-wool insulation; gas-fired warm-air heater',
    file: 'office-annex.csv',
    mappingFile: 'office-annex.mapping.json',
    model: { tauHours: 16, heatRate: 4, coolRate: 0, gain: 0.15 },
    schedule: { occupiedHeatC: 21, setbackHeatC: 16, startHour: 7.5, endHour: 18, days: { 6: null, 7: null } },
    scheduleText: 'Mon–Fri 07:30–18:00 at 21 °C; nights and weekends setback 16 °C',
    thermostat: { deadbandK: 0.6 },
    sensorNoiseK: 0.03,
    seed: 23,
    log: {
      intervalMinutes: 10,
      units: 'C',
      indoorResolution: 0.5,
      outdoorResolution: 0.1,
      setpointResolution: 0.5,
      runtime: 'percent',
      timestamps: 'split',
      datePattern: 'dd.MM.yyyy',
      timePattern: 'HH:mm',
      delimiter: ';',
      decimal: ',',
      lineEnding: '\r\n',
      columns: {
        date: 'Datum',
        clock: 'Uhrzeit',
        indoor: 'Raumtemperatur',
        outdoor: 'Außentemperatur',
        heatSetpoint: 'Sollwert',
        heat: 'Heizung',
      },
      gaps: [
        { atHours: 4 * 24 + 9, hours: 3 },
        { atHours: 16 * 24 + 15, hours: 20 },
      ],
      duplicates: 3,
      outOfOrder: 2,
      missingOutdoor: 6,
    },
    formatText:
      'semicolon-separated with decimal commas and CRLF line ends; local wall-clock time (Europe/Berlin) in separate date (dd.MM.yyyy) and time (HH:mm) columns; °C, indoor in 0.5 °C steps; heating runtime in percent of each 10-minute interval',
  },
  {
    name: 'Café Kitchen',
    construction: 'mid-weight: rendered block walls, timber roof; reversible air-to-air heat pump; kitchen gains',
    file: 'cafe-kitchen.tsv',
    mappingFile: 'cafe-kitchen.mapping.json',
    model: { tauHours: 24, heatRate: 2.6, coolRate: 2.2, gain: 0.35 },
    schedule: { occupiedHeatC: 20, setbackHeatC: 17, occupiedCoolC: 24, setupCoolC: 27, startHour: 7, endHour: 20 },
    scheduleText: 'daily 07:00–20:00 heat 20 °C / cool 24 °C; otherwise setback 17 °C / setup 27 °C',
    thermostat: { deadbandK: 0.8, minOnMinutes: 6, minOffMinutes: 6 },
    sensorNoiseK: 0.03,
    seed: 37,
    log: {
      intervalMinutes: 5,
      units: 'C',
      indoorResolution: 0.1,
      outdoorResolution: 0.1,
      setpointResolution: 0.5,
      runtime: 'onoff',
      onOffLabels: ['on', 'off'],
      timestamps: 'epoch',
      delimiter: '\t',
      decimal: '.',
      columns: {
        time: 'unix_time',
        indoor: 'room_c',
        outdoor: 'outdoor_c',
        heatSetpoint: 'heat_sp_c',
        coolSetpoint: 'cool_sp_c',
        heat: 'heating',
        cool: 'cooling',
      },
      gaps: [{ atHours: 6 * 24 + 2, hours: 2 }],
      duplicates: 5,
      outOfOrder: 1,
    },
    formatText:
      'tab-separated; epoch seconds (UTC); °C to 0.1; heating and cooling given only as the on/off state at the end of each 5-minute interval',
  },
];

const truthZones = [];
for (const z of zones) {
  const sim: ZoneSimResult = simulateZone({
    model: z.model,
    start: START,
    days: spanDays,
    timezone: TIMEZONE,
    weather: outdoor,
    schedule: setbackSchedule(z.schedule),
    thermostat: z.thermostat,
    warmupHours: 48,
    stepSeconds: 20,
    sensorNoiseK: z.sensorNoiseK,
    seed: z.seed,
    log: z.log,
  });
  const mapping = parseMapping(sim.mapping, z.mappingFile); // checked against the project's mapping schema
  writeFileSync(join(here, z.file), sim.csv);
  writeFileSync(join(here, z.mappingFile), JSON.stringify(mapping, null, 2) + '\n');
  const unit = sim.units;
  const perHour = unit === 'F' ? 1.8 : 1;
  truthZones.push({
    zone: z.name,
    construction: z.construction,
    file: z.file,
    mapping: z.mappingFile,
    format: z.formatText,
    model: {
      tauHours: z.model.tauHours,
      heatRateKPerHour: z.model.heatRate,
      coolRateKPerHour: z.model.coolRate,
      gainKPerHour: z.model.gain,
      heatingLiftK: round(z.model.heatRate * z.model.tauHours, 6),
    },
    modelInLogUnits: {
      unit: unit === 'F' ? '°F' : '°C',
      tauHours: z.model.tauHours,
      heatRatePerHour: round(z.model.heatRate * perHour, 6),
      coolRatePerHour: round(z.model.coolRate * perHour, 6),
      gainPerHour: round(z.model.gain * perHour, 6),
      heatingLift: round(z.model.heatRate * z.model.tauHours * perHour, 6),
    },
    schedule: z.scheduleText,
    thermostat: {
      deadbandK: round(z.thermostat.deadbandK ?? 1, 6),
      minOnMinutes: z.thermostat.minOnMinutes ?? 0,
      minOffMinutes: z.thermostat.minOffMinutes ?? 0,
    },
    sensorNoiseK: z.sensorNoiseK,
    intervalMinutes: sim.intervalMinutes,
    rowsWritten: sim.rowsWritten,
    firstTime: DateTime.fromMillis(sim.startMs, { zone: TIMEZONE }).toISO({ suppressMilliseconds: true }),
    lastTime: DateTime.fromMillis(sim.endMs, { zone: TIMEZONE }).toISO({ suppressMilliseconds: true }),
    heatingOnHours: round(sim.onSeconds.heat / 3600, 4),
    coolingOnHours: round(sim.onSeconds.cool / 3600, 4),
    imperfections: {
      gaps: (z.log.gaps ?? []).map((g) => ({
        from: DateTime.fromMillis(sim.startMs + g.atHours * 3_600_000, { zone: TIMEZONE }).toISO({ suppressMilliseconds: true }),
        hours: g.hours,
      })),
      duplicateRows: z.log.duplicates ?? 0,
      swappedRowPairs: z.log.outOfOrder ?? 0,
      blankOutdoorCells: z.log.missingOutdoor ?? 0,
    },
  });
  console.log(
    `${z.file}: ${sim.rowsWritten} rows, ${(sim.csv.length / 1024).toFixed(0)} KiB, heating ${(sim.onSeconds.heat / 3600).toFixed(1)} h, cooling ${(sim.onSeconds.cool / 3600).toFixed(1)} h`,
  );
}

const truth = {
  note: 'Invented demo data: the site, town, zones, weather and equipment are made up. Generated by assets/demo/generate.ts from the known models below.',
  site: SITE,
  town: TOWN,
  timezone: TIMEZONE,
  period: { start: DateTime.fromMillis(startMs, { zone: TIMEZONE }).toISO({ suppressMilliseconds: true }), days: DAYS },
  units: 'model in internal units: τ in hours, rates and gain in K/h (1 K = 1.8 °F); modelInLogUnits repeats them per hour in the log unit',
  modelEquation: 'dT/dt = (T_out(t) − T)/τ + h·u_heat − c·u_cool + g',
  simulation: 'classical RK4, 20 s steps, outdoor evaluated at every stage; deadband thermostat switching between steps; 48 h warm-up before the first row',
  weather: { ...WEATHER, originMs: undefined, origin: START + ' local' },
  zones: truthZones,
};
writeFileSync(join(here, 'truth.json'), JSON.stringify(truth, null, 2) + '\n');
console.log('truth.json written');

function round(x: number, digits: number): number {
  const f = 10 ** digits;
  return Math.round(x * f) / f;
}
