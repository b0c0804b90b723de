/**
 * `heatlag plan`: a weekly setback schedule simulated on a zone's fitted response — recovery start by
 * optimal start, the lowest (highest) temperature reached during setback (setup), runtime with and
 * without the schedule, equipment figures, and the cautions.
 */
import fs from 'node:fs';
import type { Command } from 'commander';
import {
  designDayOutdoor,
  historyOutdoor,
  latestHistoryWeek,
  lowHighOutdoor,
  parseScheduleText,
  planZone,
  type PlanOutdoor,
  type PlanRecovery,
  type PlanResult,
  type RuntimeSummary,
  type WeeklySchedule,
} from '../../../core/plan/index.ts';
import { capacityToWatts, parseSchedule } from '../../../core/plan/schedule.ts';
import { heatingOutdoorMean, heatPumpRatingC } from '../../../core/plan/equipment.ts';
import type { TempUnit, ZoneResponse } from '../../../core/types.ts';
import { degreeLabel, deltaFromKelvin, deltaToKelvin, fromCelsius, toCelsius } from '../../../core/units.ts';
import type { ZoneSource } from '../common.ts';
import { inputError, unitsOption, usageError } from '../options.ts';
import { prepareSource, type SourceOptions } from '../source.ts';
import { hours, num, table } from '../format.ts';
import { timeZoneFor } from '../../backend/fit-options.ts';

interface PlanCliOptions extends SourceOptions {
  schedule?: string;
  outdoor?: string;
  week?: string;
  designDb?: string;
  dailyRange?: string;
  solarOffset?: string;
  low?: string;
  high?: string;
  capacity?: string;
  refit?: boolean;
  curveMinutes?: string;
  json?: boolean;
}

export function register(program: Command): void {
  program
    .command('plan')
    .description('simulate a weekly setback schedule on the fitted zone: optimal start, lowest setback temperature, runtime saved')
    .argument('[log.csv]', 'a thermostat export (imported into a temporary in-memory database)')
    .option('--schedule <file.json>', 'the weekly schedule (JSON; see assets/plans/README.md); with --db and --zone, default: the schedule saved for the zone in the app')
    .option('--db <file>', 'a Heatlag database file')
    .option('--zone <site/zone>', 'the zone in the database')
    .option('--columns <map.json>', 'column mapping file for the log')
    .option('--tz <Area/City>', 'IANA time zone of the log and of the week (default: the site\'s, else the log\'s, else this computer\'s)')
    .option('--outdoor <source>', 'outdoor temperature: history (a week of the log), design (design day) or range (daily low and high)')
    .option('--week <YYYY-MM-DD>', 'with history: the first day of the week (default: the latest complete week from a Monday)')
    .option('--design-db <T>', 'with design: design dry-bulb (the day\'s maximum), e.g. 14F or -10C')
    .option('--daily-range <R>', 'with design: daily range in degrees (0 for a constant heating design day)')
    .option('--solar-offset <hours>', 'with design or range: solar time minus clock time, hours (default 0)')
    .option('--low <T>', 'with range: the daily low')
    .option('--high <T>', 'with range: the daily high')
    .option('--capacity <Q>', 'heating output, e.g. 60000btuh, 17.6kW or 5ton (overrides the schedule\'s)')
    .option('--units <F|C>', 'units of temperature options without a unit and of the output (default: the schedule\'s)')
    .option('--refit', 'fit the response again even if the database holds one')
    .option('--curve-minutes <n>', 'spacing of the predicted curve in --json output (default 10)')
    .option('--json', 'print one JSON object (internal units: °C, K, hours, W, Wh)')
    .action(async (logFile: string | undefined, options: PlanCliOptions) => {
      if (options.schedule === undefined && (logFile !== undefined || options.db === undefined)) {
        throw usageError('--schedule <file.json> is needed (a zone of a database can use the schedule saved for it in the app: --db FILE --zone SITE/ZONE).');
      }
      // The log's first rows checked before the store and the fitter load (common.ts).
      const prepared = await prepareSource(logFile, { db: options.db, zone: options.zone, columns: options.columns, tz: options.tz });
      const { fitSource, openPrepared } = await import('../common.ts');
      const source = await openPrepared(prepared);
      try {
        const schedule = options.schedule !== undefined ? readSchedule(options.schedule) : savedSchedule(source);
        const units = unitsOption(options.units) ?? schedule.units;
        const kind = outdoorKind(options);
        const curveMinutes = options.curveMinutes === undefined ? 10 : integerOption(options.curveMinutes, '--curve-minutes');
        const capacityW = options.capacity === undefined ? undefined : parseCapacity(options.capacity);
        const designArgs =
          kind === 'design'
            ? { db: tempArg(options.designDb, '--design-db', units), range: deltaArg(options.dailyRange, '--daily-range', units) }
            : null;
        const rangeArgs = kind === 'range' ? { low: tempArg(options.low, '--low', units), high: tempArg(options.high, '--high', units) } : null;
        const solarOffset = options.solarOffset === undefined ? 0 : numberArg(options.solarOffset, '--solar-offset');
        if (kind !== 'history' && options.week !== undefined) throw usageError('--week goes with --outdoor history.');

        let response: ZoneResponse | null = null;
        if (!options.refit && logFile === undefined) {
          const stored = source.store.latestResponse(source.zoneId);
          const last = source.series.time.length ? source.series.time[source.series.time.length - 1]! : -Infinity;
          if (stored && stored.lastTime >= last) response = stored;
        }
        response ??= fitSource(source);

        let outdoor: PlanOutdoor;
        if (kind === 'design') outdoor = designDayOutdoor(designArgs!.db, designArgs!.range, solarOffset);
        else if (kind === 'range') outdoor = lowHighOutdoor(rangeArgs!.low, rangeArgs!.high, solarOffset);
        else {
          // The zone's time zone by the app's rule (db/timezone.ts: the site's, else the newest log's, else this computer's).
          const tz = options.tz ?? timeZoneFor(source.store, source.zoneId);
          const week = options.week ?? latestHistoryWeek(source.series, tz);
          if (week === null) {
            throw inputError(`${source.label}: no week of the log has outdoor readings at least every 3 h; use --outdoor design or --outdoor range.`);
          }
          if (options.week !== undefined && !/^\d{4}-\d{2}-\d{2}$/.test(options.week)) throw usageError(`--week must be a date as YYYY-MM-DD, got '${options.week}'.`);
          outdoor = historyOutdoor(source.series, week, tz);
        }
        const hp = schedule.equipment?.heatPump ?? null;
        const heatRateReferenceC = hp ? (heatingOutdoorMean(source.series) ?? heatPumpRatingC(hp)) : undefined;
        const plan = planZone(response, schedule, outdoor, { heatingCapacityW: capacityW, heatRateReferenceC, curveMinutes });
        if (options.json) {
          process.stdout.write(`${JSON.stringify({ zone: source.label, scheduleFile: options.schedule ?? null, scheduleSaved: options.schedule === undefined, valueUnits: { temperature: '°C', difference: 'K', time: 'h', power: 'W', energy: 'Wh' }, ...plan })}\n`);
        } else {
          process.stdout.write(formatPlan(source.label, plan, units));
        }
      } finally {
        source.close();
      }
    });
}

// ------------------------------------------------------------------------------------------------
// Options

/** The schedule saved for the zone in the app (the store's schedules table). */
function savedSchedule(source: ZoneSource): WeeklySchedule {
  const saved = source.store.getSchedule(source.zoneId);
  if (!saved) throw inputError(`${source.label}: no schedule is saved for this zone; give one with --schedule file.json.`);
  return parseSchedule(saved.schedule, { file: `the schedule saved for ${source.label}` });
}

function readSchedule(file: string): WeeklySchedule {
  let text: string;
  try {
    text = fs.readFileSync(file, 'utf8');
  } catch {
    throw inputError(`${file}: cannot read the schedule file.`);
  }
  return parseScheduleText(text, file);
}

function outdoorKind(o: PlanCliOptions): 'history' | 'design' | 'range' {
  if (o.outdoor !== undefined) {
    const k = o.outdoor.trim().toLowerCase();
    if (k !== 'history' && k !== 'design' && k !== 'range') throw usageError(`--outdoor must be history, design or range, got '${o.outdoor}'.`);
    if (k === 'design' && (o.designDb === undefined || o.dailyRange === undefined)) throw usageError('--outdoor design needs --design-db and --daily-range.');
    if (k === 'range' && (o.low === undefined || o.high === undefined)) throw usageError('--outdoor range needs --low and --high.');
    if (k !== 'design' && (o.designDb !== undefined || o.dailyRange !== undefined)) throw usageError(`--design-db and --daily-range go with --outdoor design, not ${k}.`);
    if (k !== 'range' && (o.low !== undefined || o.high !== undefined)) throw usageError(`--low and --high go with --outdoor range, not ${k}.`);
    return k;
  }
  const design = o.designDb !== undefined || o.dailyRange !== undefined;
  const range = o.low !== undefined || o.high !== undefined;
  if (design && range) throw usageError('Give either --design-db/--daily-range or --low/--high, not both.');
  if (design) return outdoorKind({ ...o, outdoor: 'design' });
  if (range) return outdoorKind({ ...o, outdoor: 'range' });
  return 'history';
}

function numberArg(value: string | undefined, option: string): number {
  if (value === undefined) throw usageError(`${option} is required.`);
  const v = Number(value.trim().replace(',', '.'));
  if (value.trim() === '' || !Number.isFinite(v)) throw usageError(`${option} must be a number, got '${value}'.`);
  return v;
}

function integerOption(value: string, option: string): number {
  const v = numberArg(value, option);
  if (!Number.isInteger(v)) throw usageError(`${option} must be a whole number, got '${value}'.`);
  return v;
}

/** "14", "14F", "-10 °C": a number with an optional unit letter. */
function splitUnit(value: string | undefined, option: string, units: TempUnit): { v: number; u: TempUnit } {
  if (value === undefined) throw usageError(`${option} is required.`);
  const m = /^\s*([+-]?\d+(?:[.,]\d+)?)\s*(?:°?\s*([FfCc]))?\s*$/.exec(value);
  if (!m) throw usageError(`${option} must be a temperature such as 14, 14F or -10C, got '${value}'.`);
  return { v: Number(m[1]!.replace(',', '.')), u: m[2] ? (m[2].toUpperCase() as TempUnit) : units };
}

function tempArg(value: string | undefined, option: string, units: TempUnit): number {
  const { v, u } = splitUnit(value, option, units);
  return toCelsius(v, u);
}

function deltaArg(value: string | undefined, option: string, units: TempUnit): number {
  const { v, u } = splitUnit(value, option, units);
  return deltaToKelvin(v, u);
}

/**
 * "60000btuh", "60,000 Btu/h", "60kBtu/h", "17.6kW", "17600W", "5ton": heating output in W.
 * @throws CliError (usage) for anything else
 */
export function parseCapacity(value: string): number {
  const m = /^\s*(\d+(?:[.,]\d+)?|\d{1,3}(?:,\d{3})+)\s*(btu\/?h|btuh|kbtu\/?h|kbtuh|kw|w|tons?)\s*$/i.exec(value);
  if (!m) throw usageError(`--capacity must be an output such as 60000btuh, 17.6kW or 5ton, got '${value}'.`);
  const raw = m[1]!;
  const n = /^\d{1,3}(,\d{3})+$/.test(raw) ? Number(raw.replace(/,/g, '')) : Number(raw.replace(',', '.'));
  if (!(n > 0)) throw usageError(`--capacity must be more than 0, got '${value}'.`);
  const unit = m[2]!.toLowerCase().replace('/', '');
  if (unit === 'btuh') return capacityToWatts(n, 'Btu/h');
  if (unit === 'kbtuh') return capacityToWatts(n * 1000, 'Btu/h');
  if (unit === 'kw') return capacityToWatts(n, 'kW');
  if (unit === 'w') return n;
  return capacityToWatts(n, 'ton');
}

// ------------------------------------------------------------------------------------------------
// Text output

const WRAP = 100;

function wrap(text: string, first: string, rest: string): string[] {
  const words = text.split(/\s+/);
  const lines: string[] = [];
  let line = first;
  let empty = true;
  for (const w of words) {
    if (!empty && line.length + 1 + w.length > WRAP) {
      lines.push(line);
      line = rest + w;
    } else {
      line += (empty ? '' : ' ') + w;
    }
    empty = false;
  }
  lines.push(line);
  return lines;
}

const pctText = (p: number | null) => (p === null ? '' : ` (${num(p, 1)} %)`);

function recoveryText(r: PlanRecovery): string {
  const time = (label: string | null) => (label ? label.slice(4) : '—');
  const startLabel = r.optimalStartLabel ? (r.optimalStartLabel.slice(0, 3) === r.occupancyLabel.slice(0, 3) ? time(r.optimalStartLabel) : r.optimalStartLabel) : '';
  switch (r.status) {
    case 'not-needed':
      return `not needed (${time(r.occupancyLabel)})`;
    case 'met':
      return `start ${startLabel}, lead ${hours(r.leadHours)}`;
    case 'late':
      return r.cannotRecoverInTime
        ? `cannot recover in time: reached ${r.reachedLabel}`
        : `late: reached ${r.reachedLabel}${r.optimalStartLabel ? ` (optimal start ${startLabel})` : ''}`;
    case 'not-reached':
      return r.cannotRecoverInTime ? `cannot recover${r.reachable ? ' in time' : ''}: not reached` : `not reached${r.optimalStartLabel ? ` (optimal start ${startLabel})` : ''}`;
  }
}

function energyText(wh: number | null): string {
  if (wh === null) return '—';
  return `${num(wh / 1000, 1)} kWh (${num((wh * 3.412142) / 1000, 0)} kBtu)`;
}

/** The readable plan: every number with its unit, cautions with the results. */
export function formatPlan(label: string, p: PlanResult, units: TempUnit): string {
  const deg = degreeLabel(units);
  const T = (c: number | null) => (c === null ? '—' : `${num(fromCelsius(c, units), 1)} ${deg}`);
  const D = (k: number) => `${num(deltaFromKelvin(k, units), 1)} ${deg}`;
  const h = (x: number) => `${num(x, 2)} h`;
  const showCool = p.week.coolHours > 0 || p.week.baselineCoolHours > 0;
  const showHeat = p.week.heatHours > 0 || p.week.baselineHeatHours > 0 || !showCool;
  const lines: string[] = [];
  lines.push(`Setback plan "${p.scheduleName}" for ${label}`);
  const o = p.outdoor;
  const oRange = `${T(o.minC)} to ${T(o.maxC)}`;
  if (o.kind === 'history') lines.push(`  Outdoor: the log's readings, week from ${o.weekStart} (${o.timeZone}), ${oRange}`);
  else if (o.kind === 'design') lines.push(`  Outdoor: design day, dry-bulb ${T(o.designDbC)}, daily range ${D(o.dailyRangeK)} (ASHRAE hourly fractions), every day of the week`);
  else lines.push(`  Outdoor: daily low ${T(o.lowC)}, high ${T(o.highC)} (ASHRAE hourly shape), every day of the week`);
  const m = p.model;
  lines.push(
    `  Zone response: τ ${num(m.tauHours, 1)} h` +
      (m.heatRate > 0 ? `, heating ${num(deltaFromKelvin(m.heatRate, units), 2)} ${deg}/h (lift ${D(m.heatRate * m.tauHours)})` : ', no heating rate') +
      (m.coolRate > 0 ? `, cooling ${num(deltaFromKelvin(m.coolRate, units), 2)} ${deg}/h` : '') +
      `, gain ${num(deltaFromKelvin(m.gain, units), 2)} ${deg}/h`,
  );
  lines.push(`  Thermostat: deadband ${D(p.deadbandK)}, optimal start ${p.optimalStart ? 'on' : 'off'}; baseline holds the occupied setpoints all week`);
  lines.push('');

  const header = ['Day'];
  if (showHeat) header.push('Heating', 'Baseline', 'Saved');
  if (showCool) header.push('Cooling', 'Baseline', 'Saved');
  header.push(showCool && !showHeat ? 'Highest setup' : 'Lowest setback', 'Recovery');
  const row = (name: string, s: RuntimeSummary, extreme: string, rec: string) => {
    const r = [name];
    if (showHeat) r.push(h(s.heatHours), h(s.baselineHeatHours), `${h(s.savedHeatHours)}${pctText(s.savedHeatPercent)}`);
    if (showCool) r.push(h(s.coolHours), h(s.baselineCoolHours), `${h(s.savedCoolHours)}${pctText(s.savedCoolPercent)}`);
    r.push(extreme, rec);
    return r;
  };
  const rows = [header];
  for (const d of p.days) {
    const extreme = showCool && !showHeat ? T(d.highestUnoccupiedC) : T(d.lowestUnoccupiedC);
    const rec = d.recoveries.length ? d.recoveries.map((r) => `${r.mode === 'cool' && showHeat ? 'cool: ' : ''}${recoveryText(r)}`).join('; ') : 'no occupancy';
    rows.push(row(d.label, d, extreme, rec));
  }
  const weekExtreme =
    showCool && !showHeat
      ? T(Math.max(...p.days.map((d) => d.highestUnoccupiedC ?? -Infinity)))
      : T(Math.min(...p.days.map((d) => d.lowestUnoccupiedC ?? Infinity)));
  rows.push(row('Week', p.week, weekExtreme, ''));
  lines.push(table(rows));
  lines.push('');
  lines.push('  Runtime is the hours the equipment ran (an energy proxy); Saved = baseline − plan, % of the baseline.');

  const e = p.equipment;
  lines.push('');
  if (e) {
    lines.push('Equipment and envelope');
    const eqRows: string[][] = [];
    if (e.heatingCapacityW !== null) {
      eqRows.push([
        'Heating output',
        `${num(e.heatingCapacityW / 1000, 1)} kW (${num(e.heatingCapacityW * 3.412142, 0)} Btu/h)` +
          (e.referenceOutdoorC !== null ? `; ${num(e.heatingCapacityAtReferenceW! / 1000, 1)} kW at ${T(e.referenceOutdoorC)}, where the log's heating ran on average` : ''),
      ]);
    }
    if (e.coolingCapacityW !== null) eqRows.push(['Cooling output', `${num(e.coolingCapacityW / 1000, 1)} kW (${num(e.coolingCapacityW * 3.412142, 0)} Btu/h)`]);
    if (e.heatCapacityJPerK !== null) {
      eqRows.push(['Heat capacity C', `${num(e.heatCapacityJPerK / 1e6, 1)} MJ/K = ${num(e.heatCapacityKWhPerK, 2)} kWh/K (${num(e.heatCapacityBtuPerF, 0)} Btu/°F)`]);
      eqRows.push(['Envelope UA', `${num(e.uaWPerK, 0)} W/K (${num(e.uaBtuhPerF, 0)} Btu/(h·°F))`]);
      eqRows.push(['Internal gain', `${num(e.internalGainW, 0)} W (${num(e.internalGainW! * 3.412142, 0)} Btu/h)`]);
    }
    if (e.heatCapacityFromCoolingJPerK !== null && e.heatingCapacityW !== null) {
      eqRows.push(['C from cooling', `${num(e.heatCapacityFromCoolingJPerK / 1e6, 1)} MJ/K (cross-check of the heating figure)`]);
    }
    if (p.week.heatEnergyWh !== null) {
      eqRows.push(['Heat delivered', `${energyText(p.week.heatEnergyWh)}, baseline ${energyText(p.week.baselineHeatEnergyWh)}, saved ${energyText(p.week.savedHeatEnergyWh)}`]);
    }
    if (p.week.coolEnergyWh !== null && showCool) {
      eqRows.push(['Cooling delivered', `${energyText(p.week.coolEnergyWh)}, baseline ${energyText(p.week.baselineCoolEnergyWh)}, saved ${energyText(p.week.savedCoolEnergyWh)}`]);
    }
    lines.push(table(eqRows));
  }
  const bp = p.balancePoint;
  if (bp.occupiedC !== null) {
    const occ = Math.max(...p.curve.heatSetpointC.filter((v, i): v is number => v !== null && p.curve.occupied[i]!));
    lines.push(
      `  Balance point: no heating needed above ${T(bp.occupiedC)} outdoor at ${Number.isFinite(occ) ? T(occ) : 'the occupied setpoint'}` +
        (bp.unoccupiedC !== null ? `, above ${T(bp.unoccupiedC)} at the setback` : '') +
        ' (setpoint − internal gain lift g·τ)',
    );
  }
  lines.push('');
  lines.push('Cautions');
  const mark = { note: 'Note', warning: 'Warning', danger: 'DANGER' } as const;
  for (const c of p.cautions) {
    const head = `  ${mark[c.level]}: `;
    lines.push(...wrap(c.text, head, ' '.repeat(head.length)));
  }
  lines.push('');
  return lines.join('\n');
}
