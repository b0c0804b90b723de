/**
 * The import plan: everything decided before the rows are read, from the first part of the file (the
 * sample), the mapping and the options: encoding, delimiter, decimal mark, header, the column of each
 * role, units, runtime formats and how timestamps are read. Shared by importLog and previewLog.
 */
import type { ColumnMapping, Delimiter, RuntimeFormat } from '../../core/mapping.ts';
import { isValidTimeZone } from '../../core/zone-name.ts';
import type { TempUnit } from '../../core/types.ts';
import type { TextEncoding } from './decode.ts';
import {
  classifyHeader,
  countChar,
  detectDecimal,
  detectDelimiter,
  detectNewline,
  headerWords,
  mode,
  splitRows,
  type HeaderGuess,
  type Newline,
} from './detect.ts';
import { BAD, isBlankCell, readNumber, stateWordSide } from './text.ts';
import type { Sample } from './sample.ts';
import { guessTimeFormat, sampleMs, type TimeFormatGuess, type TimeKind } from './time-format.ts';
import { parseIso, type TimePattern } from './timeparse.ts';
import type { ColumnGuess, ColumnRole, ReadOptions } from './types.ts';

// The sample and the time formats live in their own files; their names are still exported from here.
export { readSample, SAMPLE_BYTES, type Sample } from './sample.ts';
export { makeTimeReader, type TimeKind, type TimeReader } from './time-format.ts';

/** Data rows of the sample used to detect formats. */
const SAMPLE_ROWS = 2000;
/** Non-blank rows searched for the header. */
const HEADER_ROWS = 60;
/**
 * Rows of the sample split at first: the header search and SAMPLE_ROWS data rows fit in them unless
 * many lines are blank or do not have the header's fields (then the whole sample is split). A 256 KB
 * sample of a 5-minute log holds some 7,000 rows; splitting only those the detection reads makes a
 * refusal decided by the first rows (local times without a zone …) quicker.
 */
const FIRST_ROWS = SAMPLE_ROWS + 200;

export interface Columns {
  time: number;
  date: number;
  clock: number;
  indoor: number;
  outdoor: number;
  heatSetpoint: number;
  coolSetpoint: number;
  heating: number;
  cooling: number;
}

export interface Plan {
  file: string;
  path: string;
  bytes: number;
  encoding: TextEncoding;
  bomLength: number;
  newline: Newline;
  delimiter: Delimiter;
  decimal: '.' | ',';
  /** 1-based line of the header; rows on or before it are not data. */
  headerLine: number;
  header: string[];
  col: Columns;
  /** Unit of each temperature column. */
  units: { indoor: TempUnit; outdoor: TempUnit; heatSetpoint: TempUnit; coolSetpoint: TempUnit };
  /** The file's unit (that of the indoor column). */
  unit: TempUnit;
  heatingAs: RuntimeFormat | null;
  coolingAs: RuntimeFormat | null;
  runtimeInterval: 'ending' | 'starting';
  timeKind: TimeKind;
  pattern: TimePattern | null;
  /** Time zone of local times; null when the times are exact (offset, Z, epoch). */
  timezone: string | null;
  /** Rows run newest first (decides the row order in a repeated DST hour). */
  descending: boolean;
  timeFormat: string;
  /** Typical interval seen in the sample, ms (NaN if unknown). */
  sampleIntervalMs: number;
  /** Expected number of rows of the whole file (from the sample's bytes per line), for sizing arrays. */
  expectedRows: number;
  mapping: ColumnMapping;
  warnings: string[];
}

export interface PlanResult {
  plan: Plan | null;
  /** Header and first data rows of the sample (for the preview). */
  header: string[];
  headerLine: number;
  rows: string[][];
  delimiter: Delimiter;
  decimal: '.' | ',';
  columns: ColumnGuess[];
  mapping: ColumnMapping | null;
  units: TempUnit | null;
  timeFormat: string | null;
  needsTimezone: boolean;
  warnings: string[];
  problems: { message: string; line?: number; column?: number; columnName?: string }[];
}

const NO_COLUMNS: Columns = { time: -1, date: -1, clock: -1, indoor: -1, outdoor: -1, heatSetpoint: -1, coolSetpoint: -1, heating: -1, cooling: -1 };

const CLOCK = /^\s*\d{1,2}:\d{2}(?::\d{2}(?:[.,]\d+)?)?(?:\s*[ap]\.?m\.?)?\s*$/i;

function isDataLike(cell: string): boolean {
  const t = cell.trim();
  if (t === '') return false;
  if (readNumber(t, true) !== BAD) return true;
  return parseIso(t) || CLOCK.test(t) || /^\d{1,4}[./-]\d{1,2}[./-]\d{1,4}/.test(t);
}

/** Finds a header name in the header row: exact, then ignoring case and spaces, then by its words. */
export function findColumn(header: string[], name: string): number {
  let i = header.indexOf(name);
  if (i >= 0) return i;
  const low = name.trim().toLowerCase();
  i = header.findIndex((h) => h.trim().toLowerCase() === low);
  if (i >= 0) return i;
  const words = headerWords(name).join(' ');
  return words === '' ? -1 : header.findIndex((h) => headerWords(h).join(' ') === words);
}

function median(values: number[]): number {
  if (values.length === 0) return NaN;
  const s = [...values].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m] : (s[m - 1] + s[m]) / 2;
}

function q(name: string): string {
  return `"${name}"`;
}

function fmtNumber(v: number): string {
  return Number.isInteger(v) ? String(v) : v.toFixed(1);
}


/**
 * Decides how to read a file from its sample, the mapping and the options. Never throws for content;
 * what would stop an import is listed in `problems` (and `plan` is null then). With `firstProblem`
 * (an import, which refuses with the first problem) it returns as soon as a problem is found: the
 * problems are then the first ones only, and the columns, units and mapping are not worked out.
 */
export function buildPlan(sample: Sample, options: ReadOptions = {}, { firstProblem = false } = {}): PlanResult {
  const mapping = options.mapping;
  const warnings: string[] = [];
  const problems: PlanResult['problems'] = [];
  const newline = detectNewline(sample.text);
  const fail = (message: string, extra: Partial<PlanResult> = {}, line?: number): PlanResult => ({
    plan: null,
    header: [],
    headerLine: 0,
    rows: [],
    delimiter: ',',
    decimal: '.',
    columns: [],
    mapping: null,
    units: null,
    timeFormat: null,
    needsTimezone: false,
    warnings,
    problems: [...problems, line === undefined ? { message } : { message, line }],
    ...extra,
  });

  // Delimiter and rows of the sample.
  const delimiter: Delimiter | null = mapping?.delimiter ?? detectDelimiter(sample.text, newline);
  if (delimiter === null) {
    return fail('could not find the columns: no comma, semicolon, tab or bar separates the fields of the first lines', {}, 1);
  }
  let split = splitRows(sample.text, delimiter, newline, sample.whole, 1, FIRST_ROWS);
  const nonBlank: number[] = [];
  const findNonBlank = () => {
    for (let i = nonBlank.length ? nonBlank[nonBlank.length - 1] + 1 : 0; i < split.rows.length && nonBlank.length < HEADER_ROWS; i++) {
      if (split.rows[i].some((f) => f.trim() !== '')) nonBlank.push(i);
    }
  };
  findNonBlank();
  if (nonBlank.length < HEADER_ROWS && split.truncated) {
    split = splitRows(sample.text, delimiter, newline, sample.whole);
    findNonBlank();
  }
  if (nonBlank.length === 0) return fail('the file holds no rows');

  // Header: the first row with the typical number of fields (lines before it are a preamble).
  const counts = nonBlank.map((i) => split.rows[i].length);
  const modal = mode(counts.slice(Math.min(counts.length - 1, 1)));
  let hi = nonBlank.find((i) => split.rows[i].length === modal) ?? nonBlank[0];
  if (split.rows[hi].length < modal) hi = nonBlank[0];
  const headerLine = split.lines[hi];
  const header = split.rows[hi].map((h, i) => (h.trim() === '' ? `Column ${i + 1}` : h.trim()));
  if (header.length < 2) {
    const seen = mapping?.delimiter !== undefined ? detectDelimiter(sample.text, newline) : null;
    if (seen !== null && seen !== delimiter) {
      const name = (d: string) => (d === '\t' ? 'tab' : `"${d}"`);
      return fail(`the header has only one column split at the mapping's delimiter ${name(delimiter)}; the file's fields seem to be separated by ${name(seen)} (fix "delimiter" in the mapping)`, {}, headerLine);
    }
    return fail('the header has only one column; the file needs a header row and at least a time and an indoor column', {}, headerLine);
  }
  const dataLike = header.filter(isDataLike).length;
  if (dataLike >= Math.max(2, header.length - 1) && !mapping) {
    // The real header may sit above, written with another delimiter than the rows.
    const first = nonBlank[0] < hi ? split.rows[nonBlank[0]].join(delimiter) : '';
    const other = ([',', ';', '\t', '|'] as const).find((d) => d !== delimiter && first.split(d).length === header.length);
    if (other !== undefined) {
      const name = (d: string) => (d === '\t' ? 'tab' : `"${d}"`);
      return fail(
        `the header separates its fields with ${name(other)} but the rows below it with ${name(delimiter)}; use one delimiter throughout the file`,
        {},
        split.lines[nonBlank[0]],
      );
    }
    return fail(
      `line ${headerLine} holds readings ('${split.rows[hi].slice(0, 3).join(delimiter)}…'), not column names: the file needs a header row naming its columns`,
    );
  }
  const skipped = nonBlank.filter((i) => i < hi).length;
  if (skipped > 0) warnings.push(`Skipped ${skipped} line${skipped === 1 ? '' : 's'} before the header on line ${headerLine}.`);
  const dupes = header.filter((h, i) => header.indexOf(h) !== i);
  if (dupes.length > 0) warnings.push(`The header names ${[...new Set(dupes)].map(q).join(', ')} more than once; the first column of that name is used.`);

  const dataIdx: number[] = [];
  const findData = () => {
    for (let i = dataIdx.length ? dataIdx[dataIdx.length - 1] + 1 : hi + 1; i < split.rows.length && dataIdx.length < SAMPLE_ROWS; i++) {
      const r = split.rows[i];
      if (r.length === header.length && r.some((f) => f.trim() !== '')) dataIdx.push(i);
    }
  };
  findData();
  if (dataIdx.length < SAMPLE_ROWS && split.truncated) {
    // The first rows held too few data rows: all the sample's (the rows split so far are the same).
    split = splitRows(sample.text, delimiter, newline, sample.whole);
    findData();
  }
  // Rows of the whole sample (for sizing the import's arrays): counted, not split, when only the first were.
  const sampleRows = split.truncated ? countChar(sample.text, newline === '\r' ? '\r' : '\n') + (sample.whole ? 1 : 0) : split.rows.length;
  const rows = dataIdx.map((i) => split.rows[i]);
  const previewRows = rows.slice(0, 20);
  if (rows.length === 0 && sample.whole) {
    const anyData = split.rows.slice(hi + 1).some((r) => r.some((f) => f.trim() !== ''));
    if (!anyData) return fail('the file has a header but no data rows', { header, headerLine, delimiter }, headerLine);
  }
  const column = (c: number) => rows.map((r) => r[c] ?? '');

  // Roles: from the mapping, else from the header words.
  const guesses: HeaderGuess[] = header.map(classifyHeader);
  const col: Columns = { ...NO_COLUMNS };
  const given = (key: string, name: string | undefined): number => {
    if (name === undefined) return -1;
    const i = findColumn(header, name);
    if (i < 0) {
      problems.push({
        message: `the mapping's "${key}" names the column ${q(name)}, which is not in the header (columns: ${header.map(q).join(', ')})`,
        line: headerLine,
      });
    }
    return i;
  };
  const taken = new Set<number>();
  if (mapping) {
    if (Array.isArray(mapping.time)) {
      col.date = given('time', mapping.time[0]);
      col.clock = given('time', mapping.time[1]);
    } else col.time = given('time', mapping.time);
    col.indoor = given('indoor', mapping.indoor);
    col.outdoor = given('outdoor', mapping.outdoor);
    col.heatSetpoint = given('heatSetpoint', mapping.heatSetpoint);
    col.coolSetpoint = given('coolSetpoint', mapping.coolSetpoint);
    col.heating = given('heating.column', mapping.heating?.column);
    col.cooling = given('cooling.column', mapping.cooling?.column);
    for (const c of Object.values(col)) if (c >= 0) taken.add(c);
  }
  const pick = (role: ColumnRole): number => {
    let best = -1;
    for (let i = 0; i < guesses.length; i++) {
      if (taken.has(i) || guesses[i].role !== role) continue;
      if (best < 0 || guesses[i].score > guesses[best].score) best = i;
    }
    if (best >= 0) {
      taken.add(best);
      const others = guesses.map((g, i) => (g.role === role && i !== best && g.score === guesses[best].score ? i : -1)).filter((i) => i >= 0);
      if (others.length > 0 && (role === 'indoor' || role === 'outdoor' || role === 'time')) {
        warnings.push(
          `Several columns could be the ${role === 'time' ? 'time' : `${role} temperature`}: ${[best, ...others].map((i) => q(header[i])).join(', ')}; ` +
            `used ${q(header[best])}. Give a mapping to choose another.`,
        );
      }
    }
    return best;
  };
  if (mapping) {
    // Roles the mapping leaves out are detected among the columns it does not use.
    const detected: string[] = [];
    for (const [key, role] of [
      ['outdoor', 'outdoor'],
      ['heatSetpoint', 'heatSetpoint'],
      ['coolSetpoint', 'coolSetpoint'],
      ['heating', 'heating'],
      ['cooling', 'cooling'],
    ] as const) {
      if (mapping[key] !== undefined) continue;
      const c = pick(role);
      if (c >= 0) {
        col[role] = c;
        detected.push(`${q(header[c])} as "${key}"`);
      }
    }
    if (detected.length > 0) warnings.push(`Not in the mapping but detected from the header: ${detected.join(', ')}.`);
  } else {
    col.time = pick('time');
    col.date = pick('date');
    col.clock = pick('clock');
    col.indoor = pick('indoor');
    col.outdoor = pick('outdoor');
    col.heatSetpoint = pick('heatSetpoint');
    col.coolSetpoint = pick('coolSetpoint');
    col.heating = pick('heating');
    col.cooling = pick('cooling');
    if (col.heatSetpoint >= 0 && guesses[col.heatSetpoint].score === 1) {
      warnings.push(`The column ${q(header[col.heatSetpoint])} was taken as the heating setpoint.`);
    }
    // Date and time of day in two columns, or one of them holding both.
    if (col.time >= 0 && col.date < 0 && column(col.time).slice(0, 50).every((v) => v.trim() === '' || CLOCK.test(v))) {
      col.clock = col.time;
      col.time = -1;
    }
    if (col.date >= 0 && col.clock < 0 && col.time >= 0 && column(col.time).slice(0, 50).every((v) => v.trim() === '' || CLOCK.test(v))) {
      col.clock = col.time;
      col.time = -1;
    }
    if (col.date >= 0 && col.clock >= 0) {
      if (!column(col.clock).slice(0, 50).every((v) => v.trim() === '' || CLOCK.test(v))) {
        col.time = col.clock;
        col.clock = -1;
        col.date = -1;
      }
    } else if (col.date >= 0 && col.time < 0) {
      col.time = col.date;
      col.date = -1;
    } else col.date = -1;
    if (col.time < 0 && col.clock < 0) {
      // No time header: the first column whose values read as times.
      for (let c = 0; c < header.length; c++) {
        if (taken.has(c)) continue;
        const g = guessTimeFormat(column(c).slice(0, 60), undefined);
        if (!('error' in g)) {
          col.time = c;
          taken.add(c);
          warnings.push(`No column is named as the time; ${q(header[c])} holds times and was used.`);
          break;
        }
      }
    }
    // A shared equipment-state column ("heating" / "cooling" / "idle").
    const state = guesses.findIndex((g, i) => g.role === 'heating+cooling' && !taken.has(i));
    if (state >= 0 && (col.heating < 0 || col.cooling < 0)) {
      const sides = new Set(column(state).map(stateWordSide));
      if (col.heating < 0 && sides.has('heat')) col.heating = state;
      if (col.cooling < 0 && sides.has('cool')) col.cooling = state;
      if (col.heating === state || col.cooling === state) {
        warnings.push(`The column ${q(header[state])} was read as the equipment state (on/off) for ${col.heating === state && col.cooling === state ? 'heating and cooling' : col.heating === state ? 'heating' : 'cooling'}.`);
      }
    }
  }
  if (col.time < 0 && (col.date < 0 || col.clock < 0) && !problems.some((p) => p.message.includes('"time"'))) {
    problems.push({ message: `no column holds the time; give "time" in a mapping (columns: ${header.map(q).join(', ')})`, line: headerLine });
  }
  if (col.indoor < 0 && !problems.some((p) => p.message.includes('"indoor"'))) {
    problems.push({
      message: `could not tell which column holds the indoor temperature; give "indoor" in a mapping (columns: ${header.map(q).join(', ')})`,
      line: headerLine,
    });
  }

  // The early answer of `firstProblem` (the first problems as found; the rest not worked out).
  const refused = (): PlanResult => ({
    plan: null, header, headerLine, rows: previewRows, delimiter, decimal: '.', columns: [], mapping: null, units: null,
    timeFormat: null, needsTimezone: false, warnings, problems,
  });
  if (firstProblem && problems.length > 0) return refused();

  // Decimal mark.
  const timeCols = new Set([col.time, col.date, col.clock].filter((c) => c >= 0));
  const decimal = mapping?.decimal ?? detectDecimal(rows, timeCols);
  if (decimal === ',' && delimiter === ',' && !mapping?.decimal) warnings.push('Numbers are written with decimal commas in quoted fields.');
  const comma = decimal === ',';
  const numbers = (c: number) => column(c).map((v) => readNumber(v, comma)).filter((v) => v === v && v !== BAD);

  // Time format and zone.
  let timeGuess: TimeFormatGuess | null = null;
  let timeDescribe: string | null = null;
  let needsTimezone = false;
  let timezone: string | null = null;
  let descending = false;
  let sampleIntervalMs = NaN;
  const timeText = (r: string[]) => (col.time >= 0 ? r[col.time] ?? '' : `${(r[col.date] ?? '').trim()} ${(r[col.clock] ?? '').trim()}`);
  if (col.time >= 0 || (col.date >= 0 && col.clock >= 0)) {
    const tcName = col.time >= 0 ? header[col.time] : `${header[col.date]} + ${header[col.clock]}`;
    const g = guessTimeFormat(rows.map(timeText), mapping?.dateFormat);
    if ('error' in g) {
      if (rows.length > 0) {
        const at = rows.findIndex((r) => timeText(r) === g.example);
        problems.push({
          message: `${g.error}`,
          line: at >= 0 ? split.lines[dataIdx[at]] : undefined,
          column: (col.time >= 0 ? col.time : col.date) + 1,
          columnName: tcName,
        });
      }
    } else {
      timeGuess = g;
      if (g.warning && !mapping?.dateFormat) warnings.push(g.warning);
      const headerUtc = (col.time >= 0 && guesses[col.time].utc) || (col.date >= 0 && guesses[col.date].utc);
      const given = options.timezone ?? mapping?.timezone;
      if (given !== undefined && !isValidTimeZone(given)) {
        problems.push({ message: `"${given}" is not a known IANA time zone (e.g. America/Chicago, Europe/Berlin, UTC)` });
      } else if (g.local) {
        needsTimezone = true;
        if (given !== undefined) timezone = given;
        else if (headerUtc) {
          timezone = 'UTC';
          warnings.push(`The header ${q(tcName)} says the times are UTC; they were read as UTC.`);
        } else {
          const at = rows.findIndex((r) => timeText(r).trim() !== '');
          const example = at >= 0 ? timeText(rows[at]) : '';
          problems.push({
            line: at >= 0 ? split.lines[dataIdx[at]] : undefined,
            message:
              `the times are local wall-clock times without a UTC offset (e.g. '${example}'): say which time zone they are in ` +
              `with --tz (e.g. --tz America/Chicago) or "timezone" in the mapping`,
            column: (col.time >= 0 ? col.time : col.date) + 1,
            columnName: tcName,
          });
        }
      }
      timeDescribe = g.describe + (timezone !== null ? ` in ${timezone}` : '');
      // Direction and typical interval (from wall or exact times of the sample).
      const ms = rows.slice(0, 400).map((r) => sampleMs(g.kind, g.pattern, timeText(r))).filter((v) => v === v);
      let up = 0;
      let down = 0;
      const deltas: number[] = [];
      for (let i = 1; i < ms.length; i++) {
        if (ms[i] > ms[i - 1]) up++;
        else if (ms[i] < ms[i - 1]) down++;
        if (ms[i] !== ms[i - 1]) deltas.push(Math.abs(ms[i] - ms[i - 1]));
      }
      descending = down > up;
      if (descending) warnings.push('The rows run newest first; they are stored in time order.');
      sampleIntervalMs = median(deltas);
    }
  }

  if (firstProblem && problems.length > 0) return refused();

  // Units: options, mapping, header markers, then the indoor values.
  let units: Plan['units'] = { indoor: 'C', outdoor: 'C', heatSetpoint: 'C', coolSetpoint: 'C' };
  let unit: TempUnit | null = options.units ?? mapping?.units ?? null;
  let uniform = true;
  if (unit !== null) {
    units = { indoor: unit, outdoor: unit, heatSetpoint: unit, coolSetpoint: unit };
    const stated = [col.indoor, col.outdoor, col.heatSetpoint, col.coolSetpoint].filter((c) => c >= 0 && guesses[c].unit !== null && guesses[c].unit !== unit);
    if (stated.length > 0) {
      warnings.push(`The header says ${q(header[stated[0]])} is in °${guesses[stated[0]].unit}, but the temperatures were read as °${unit} as asked.`);
    }
  } else {
    const tempCols = { indoor: col.indoor, outdoor: col.outdoor, heatSetpoint: col.heatSetpoint, coolSetpoint: col.coolSetpoint };
    const stated = Object.values(tempCols).map((c) => (c >= 0 ? guesses[c].unit : null));
    const first = stated.find((u) => u !== null) ?? null;
    if (first !== null) {
      unit = col.indoor >= 0 && guesses[col.indoor].unit !== null ? guesses[col.indoor].unit! : first;
      for (const k of Object.keys(tempCols) as (keyof typeof tempCols)[]) {
        const c = tempCols[k];
        units[k] = c >= 0 && guesses[c].unit !== null ? guesses[c].unit! : unit;
      }
      uniform = Object.values(units).every((u) => u === unit);
      if (!uniform) warnings.push('The header states different units for different temperature columns; each column was read in its own unit.');
    } else if (col.indoor >= 0) {
      const vals = numbers(col.indoor);
      const m = median(vals);
      if (m === m) {
        unit = m >= 40 ? 'F' : m <= 35 ? 'C' : m >= 37.5 ? 'F' : 'C';
        const typical = unit === 'F' ? 'readings around 60–80 are typical of °F' : 'readings around 15–28 are typical of °C';
        warnings.push(
          `The header does not say which unit the temperatures are in; indoor readings around ${fmtNumber(m)} were taken as °${unit} (${typical}). ` +
            'Give --units or "units" in a mapping if that is wrong.',
        );
      } else unit = 'C';
      units = { indoor: unit, outdoor: unit, heatSetpoint: unit, coolSetpoint: unit };
    }
  }

  // Runtime formats.
  const intervalS = sampleIntervalMs === sampleIntervalMs ? sampleIntervalMs / 1000 : NaN;
  const runtimeAs = (c: number, given: RuntimeFormat | undefined, role: 'heating' | 'cooling'): RuntimeFormat | null => {
    if (c < 0) return null;
    if (given !== undefined) return given;
    const fromHeader = guesses[c].role === role || guesses[c].role === 'heating+cooling' ? guesses[c].runtimeAs : null;
    if (fromHeader !== null) return fromHeader;
    const cells = column(c).filter((v) => !isBlankCell(v));
    const vals = cells.map((v) => readNumber(v, comma));
    const name = q(header[c]);
    if (vals.some((v) => v === BAD)) return 'onoff'; // words: on/off, heat/idle …
    const max = vals.reduce((a, b) => Math.max(a, b), 0);
    const every = intervalS === intervalS ? ` with readings every ${fmtNumber(intervalS / 60)} min` : '';
    if (vals.every((v) => v === 0 || v === 1)) return 'onoff';
    if (max <= 1) return 'fraction';
    if (max <= 100 && !(intervalS === intervalS && intervalS <= 100)) {
      warnings.push(`The column ${name} does not say how runtime is written; values up to ${fmtNumber(max)}${every} were read as percent of the interval. Give "${role}": {"column", "as"} in a mapping if that is wrong.`);
      return 'percent';
    }
    warnings.push(`The column ${name} does not say how runtime is written; values up to ${fmtNumber(max)}${every} were read as seconds per interval. Give "${role}": {"column", "as"} in a mapping if that is wrong.`);
    return 'seconds';
  };
  const heatingAs = runtimeAs(col.heating, mapping?.heating?.as, 'heating');
  const coolingAs = runtimeAs(col.cooling, mapping?.cooling?.as, 'cooling');
  const runtimeInterval = mapping?.runtimeInterval ?? 'ending';

  // The effective mapping.
  let effective: ColumnMapping | null = null;
  if (col.indoor >= 0 && (col.time >= 0 || (col.date >= 0 && col.clock >= 0))) {
    effective = {
      time: col.time >= 0 ? header[col.time] : [header[col.date], header[col.clock]],
      ...(timeGuess?.kind === 'pattern' ? { dateFormat: timeGuess.pattern!.pattern } : {}),
      indoor: header[col.indoor],
      ...(col.outdoor >= 0 ? { outdoor: header[col.outdoor] } : {}),
      ...(col.heatSetpoint >= 0 ? { heatSetpoint: header[col.heatSetpoint] } : {}),
      ...(col.coolSetpoint >= 0 ? { coolSetpoint: header[col.coolSetpoint] } : {}),
      ...(col.heating >= 0 && heatingAs ? { heating: { column: header[col.heating], as: heatingAs } } : {}),
      ...(col.cooling >= 0 && coolingAs ? { cooling: { column: header[col.cooling], as: coolingAs } } : {}),
      ...(unit !== null && uniform ? { units: unit } : {}),
      delimiter,
      decimal,
      ...(timezone !== null ? { timezone } : {}),
      runtimeInterval,
    };
  }

  const roleOf = (i: number): ColumnRole | null => {
    if (i === col.heating && i === col.cooling) return 'heating+cooling';
    for (const k of ['time', 'date', 'clock', 'indoor', 'outdoor', 'heatSetpoint', 'coolSetpoint', 'heating', 'cooling'] as const) {
      if (col[k] === i) return k;
    }
    return null;
  };
  const columns: ColumnGuess[] = header.map((name, i) => {
    const role = roleOf(i);
    const g: ColumnGuess = { index: i + 1, name, role, unit: guesses[i].unit };
    if (role === 'heating' || role === 'heating+cooling') g.runtimeAs = heatingAs ?? undefined;
    else if (role === 'cooling') g.runtimeAs = coolingAs ?? undefined;
    return g;
  });
  const ignored = columns.filter((c) => c.role === null).map((c) => q(c.name));
  if (ignored.length > 0 && !mapping) warnings.push(`Columns not used: ${ignored.join(', ')}.`);

  const base = {
    header,
    headerLine,
    rows: previewRows,
    delimiter,
    decimal,
    columns,
    mapping: effective,
    units: unit,
    timeFormat: timeDescribe,
    needsTimezone,
    warnings,
    problems,
  };
  if (problems.length > 0 || effective === null || timeGuess === null) return { plan: null, ...base };
  const plan: Plan = {
    file: sample.file,
    path: sample.path,
    bytes: sample.bytes,
    encoding: sample.encoding,
    bomLength: sample.bomLength,
    newline,
    delimiter,
    decimal,
    headerLine,
    header,
    col,
    units,
    unit: unit ?? 'C',
    heatingAs,
    coolingAs,
    runtimeInterval,
    timeKind: timeGuess.kind,
    pattern: timeGuess.pattern,
    timezone,
    descending,
    timeFormat: timeDescribe ?? '',
    sampleIntervalMs,
    expectedRows: Math.ceil((sample.bytes / Math.max(1, sample.sampleBytes)) * sampleRows * 1.02) + 16,
    mapping: effective,
    warnings,
  };
  return { plan, ...base };
}
