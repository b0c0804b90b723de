/**
 * What a log export looks like: line breaks, delimiter, decimal mark, where the header is, which column
 * plays which role (time, indoor, outdoor, setpoints, runtime) and in which unit, from the header words
 * (English and a few common German, French, Spanish and Dutch variants) and the values.
 */
import Papa from 'papaparse';
import type { Delimiter, RuntimeFormat } from '../../core/mapping.ts';
import type { TempUnit } from '../../core/types.ts';
import type { ColumnRole } from './types.ts';

export type Newline = '\n' | '\r\n' | '\r';

/** The line break of a text: the first one found ("\r\n", "\n" or a lone "\r"). */
export function detectNewline(text: string): Newline {
  const lf = text.indexOf('\n');
  if (lf > 0 && text.charCodeAt(lf - 1) === 13) return '\r\n';
  if (lf >= 0) return '\n';
  return text.indexOf('\r') >= 0 ? '\r' : '\n';
}

export interface SplitRows {
  rows: string[][];
  /** 1-based physical line of each row's start. */
  lines: number[];
  /** Rows with a quoted field left open (papaparse MissingQuotes), by index into rows. */
  openQuote: Set<number>;
  /** The text holds more rows than the `maxRows` asked for (those are the first `maxRows` of them). */
  truncated: boolean;
}

/**
 * Splits text into rows of fields (quotes honoured, papaparse's parser). `final` = the text is the whole
 * rest of the file; otherwise a last, possibly incomplete row is left out. With `maxRows` > 0 only the
 * first `maxRows` rows are split (papaparse's preview: the same rows as those of the whole text).
 */
export function splitRows(text: string, delimiter: string, newline: Newline, final: boolean, firstLine = 1, maxRows = 0): SplitRows {
  const parser = new Papa.Parser({ delimiter, newline, quoteChar: '"', ...(maxRows > 0 ? { preview: maxRows } : {}) });
  const res = parser.parse(text, 0, !final) as { data: string[][]; errors: { code: string; row?: number }[]; meta: { truncated?: boolean } };
  const lines: number[] = [];
  const nl = newline === '\r' ? '\r' : '\n';
  const quoted = text.indexOf('"') >= 0;
  let line = firstLine;
  for (const row of res.data) {
    lines.push(line);
    line++;
    if (quoted) for (const f of row) line += countChar(f, nl);
  }
  const openQuote = new Set<number>();
  for (const e of res.errors) if (e.code === 'MissingQuotes' && e.row !== undefined) openQuote.add(e.row);
  return { rows: res.data, lines, openQuote, truncated: maxRows > 0 && res.meta.truncated === true };
}

export function countChar(s: string, ch: string): number {
  let n = 0;
  let i = s.indexOf(ch);
  while (i >= 0) {
    n++;
    i = s.indexOf(ch, i + 1);
  }
  return n;
}

function isBlankRow(row: string[]): boolean {
  for (const f of row) if (f.trim() !== '') return false;
  return true;
}

/**
 * The delimiter (comma, semicolon, tab or bar) that splits the first lines into the same number (> 1) of
 * fields most consistently; null when none splits them.
 */
export function detectDelimiter(text: string, newline: Newline): Delimiter | null {
  const head = firstLines(text, newline, 40);
  let best: Delimiter | null = null;
  let bestScore = 0;
  for (const d of [',', ';', '\t', '|'] as const) {
    const rows = splitRows(head, d, newline, false).rows.filter((r) => !isBlankRow(r));
    if (rows.length === 0) continue;
    const counts = rows.map((r) => r.length);
    const modal = mode(counts);
    if (modal < 2) continue;
    // Consistency counted from the first row that has the modal count (lines before it may be a preamble).
    const start = counts.indexOf(modal);
    const tail = counts.slice(start);
    const same = tail.filter((c) => c === modal).length / tail.length;
    const score = same * 1000 + Math.min(modal, 100) - start * 0.5;
    if (score > bestScore) {
      bestScore = score;
      best = d;
    }
  }
  return best;
}

function firstLines(text: string, newline: Newline, n: number): string {
  let i = 0;
  for (let k = 0; k < n; k++) {
    const j = text.indexOf(newline, i);
    if (j < 0) return text;
    i = j + newline.length;
  }
  return text.slice(0, i);
}

export function mode(values: number[]): number {
  const counts = new Map<number, number>();
  let best = values[0] ?? 0;
  let bestN = 0;
  for (const v of values) {
    const n = (counts.get(v) ?? 0) + 1;
    counts.set(v, n);
    if (n > bestN || (n === bestN && v > best)) {
      best = v;
      bestN = n;
    }
  }
  return best;
}

const COMMA_DECIMAL = /^\s*[+-]?\d+,\d+\s*(?:°?\s*[CF%])?\s*$/i;
const DOT_DECIMAL = /^\s*[+-]?\d+\.\d+\s*(?:°?\s*[CF%])?\s*$/i;

/** "," when the numeric cells (outside `skip` columns) are written with decimal commas and none with dots. */
export function detectDecimal(rows: string[][], skip: Set<number>): '.' | ',' {
  let comma = 0;
  let dot = 0;
  for (const r of rows) {
    for (let c = 0; c < r.length; c++) {
      if (skip.has(c)) continue;
      const f = r[c];
      if (COMMA_DECIMAL.test(f)) comma++;
      else if (DOT_DECIMAL.test(f)) dot++;
    }
  }
  return comma > 0 && dot === 0 ? ',' : '.';
}

// ───────────────────────────── header words ─────────────────────────────

/** Lower-case ASCII words of a header: accents dropped, ß → ss, camelCase and snake_case split. */
export function headerWords(name: string): string[] {
  const s = name
    .replace(/([a-z])([A-Z])/g, '$1 $2')
    .normalize('NFKD')
    .replace(/[\u0300-\u036f]/g, '')
    .replace(/ß/g, 'ss')
    .toLowerCase()
    .replace(/[°º]/g, ' ');
  return s.split(/[^a-z0-9%]+/).filter((w) => w !== '');
}

const set = (...w: string[]) => new Set(w);
const EXCLUDE = set(
  'humidity', 'hum', 'rh', 'feuchte', 'luftfeuchte', 'luftfeuchtigkeit', 'feuchtigkeit', 'humedad', 'humidite', 'vochtigheid',
  'dew', 'dewpoint', 'taupunkt', 'feels', 'apparent', 'windchill', 'wind', 'pressure', 'druck', 'co2', 'voc', 'battery', 'batterie',
  'voltage', 'signal', 'rssi', 'lux', 'light', 'occupancy', 'occupied', 'motion', 'presence', 'supply', 'discharge', 'return',
  'leaving', 'entering', 'flow', 'water', 'vorlauf', 'rucklauf', 'ruecklauf', 'coil', 'pipe', 'fan', 'lufter', 'luefter', 'ventilator',
  'aux', 'auxiliary', 'emergency', 'backup', 'hotwater', 'dhw', 'mode', 'modus', 'betriebsart', 'schedule', 'program', 'programm',
  'hold', 'event', 'comfort', 'id', 'serial', 'name', 'stage2',
);
/** Words that make a temperature column a statistic or a different reading, not the zone's temperature. */
const EXCLUDE_TEMP = set('min', 'max', 'minimum', 'maximum', 'avg', 'average', 'mean', 'low', 'high', 'forecast', 'sensor2', 'remote2');
const TIME_WORDS = set('time', 'zeit', 'uhrzeit', 'hora', 'heure', 'tijd', 'clock', 'ora', 'tid', 'aika');
const DATE_WORDS = set('date', 'datum', 'fecha', 'day', 'tag', 'data', 'jour', 'dag', 'dia');
const STAMP_WORDS = set('timestamp', 'datetime', 'zeitstempel', 'horodatage', 'tijdstip', 'epoch', 'unix', 'unixtime', 'ts', 'utc', 'gmt', 'when', 'instant', 'localtime');
const TEMP_WORDS = set('temp', 'temperature', 'temperatur', 'temperatura', 'temperatuur', 'tmp', 't', 'temps', 'temperatures');
/** Indoor words that name the reading on their own ("Indoor"), and those that need a temperature word ("Room Temp"). */
const INDOOR_STRONG = set('indoor', 'inside', 'indoors', 'innen', 'innentemperatur', 'raumtemperatur', 'tin', 'interior', 'binnen');
const INDOOR_WEAK = set('in', 'room', 'zone', 'space', 'internal', 'inner', 'raum', 'current', 'actual', 'ist', 'measured', 'thermostat', 'ambiance', 'habitacion', 'piece', 'sala', 'local');
const OUTDOOR_STRONG = set('outdoor', 'outside', 'outdoors', 'ambient', 'exterior', 'aussen', 'exterieur', 'exterieure', 'buiten', 'tout', 'oat', 'aussentemperatur');
const OUTDOOR_WEAK = set('out', 'external', 'ext', 'weather', 'oa', 'wetter');
const HEAT_WORDS = set('heat', 'heating', 'heater', 'heizung', 'heizen', 'heiz', 'chauffage', 'calefaccion', 'furnace', 'burner', 'brenner', 'boiler', 'kessel', 'verwarming');
const COOL_WORDS = set('cool', 'cooling', 'ac', 'aircon', 'kuhlen', 'kuehlen', 'kuhlung', 'kuehlung', 'klima', 'refroidissement', 'climatisation', 'refrigeracion', 'enfriamiento', 'koeling', 'chiller');
const SETPOINT_WORDS = set('setpoint', 'setpt', 'sp', 'set', 'target', 'sollwert', 'soll', 'consigne', 'consigna', 'desired', 'setting', 'setpoints', 'wunsch', 'wunschtemperatur');
const STATE_WORDS = set('state', 'status', 'action', 'equipment', 'activity', 'operation', 'operating', 'running', 'call', 'demand', 'betrieb', 'zustand', 'betriebszustand', 'hvac', 'etat', 'estado');
const SECONDS_WORDS = set('s', 'sec', 'secs', 'second', 'seconds', 'sekunden', 'segundos', 'secondes');
const MINUTES_WORDS = set('min', 'mins', 'minute', 'minutes', 'minuten', 'minutos');
const PERCENT_WORDS = set('%', 'pct', 'percent', 'percentage', 'prozent', 'porcentaje', 'pourcentage');
const FRACTION_WORDS = set('fraction', 'frac', 'ratio', 'duty', 'share', 'anteil');
const ONOFF_WORDS = set('state', 'status', 'on', 'onoff', 'active', 'aktiv', 'running', 'call', 'demand', 'relay', 'ein', 'flag');
const UNIT_WORDS = set('f', 'c', 'deg', 'degf', 'degc', 'fahrenheit', 'celsius', 'degree', 'degrees', 'grad');

const has = (words: string[], s: Set<string>) => words.some((w) => s.has(w));
const collapsedHas = (collapsed: string, parts: string[]) => parts.some((p) => collapsed.includes(p));

/** Temperature unit a header states: "(°F)", "[C]", "deg F", "Fahrenheit", "_f" after a temperature word. */
export function headerUnit(name: string): TempUnit | null {
  const m =
    /[°º]\s*([CF])(?![a-z])/i.exec(name) ??
    /\bdeg(?:rees?)?\.?\s*([CF])\b/i.exec(name) ??
    /[([]\s*([CF])\s*[)\]]/i.exec(name) ??
    /\b(fahrenheit|celsius)\b/i.exec(name);
  if (m) return m[1].toUpperCase().startsWith('F') ? 'F' : 'C';
  // A trailing "f" / "c" word ("indoor_f", "Temp C") counts only after a temperature word ("Zone C" does not).
  const words = headerWords(name);
  const last = words[words.length - 1];
  if (words.length >= 2 && (last === 'f' || last === 'c' || last === 'degf' || last === 'degc')) {
    const rest = words.slice(0, -1);
    const tempish =
      has(rest, TEMP_WORDS) || has(rest, INDOOR_STRONG) || has(rest, OUTDOOR_STRONG) || has(rest, SETPOINT_WORDS) || rest.some((w) => w.includes('temp'));
    if (tempish) return last.endsWith('f') ? 'F' : 'C';
  }
  return null;
}

/** Runtime format a header states ("Heat Runtime (s)", "Heizung %", "Cool State"), if any. */
export function headerRuntimeFormat(name: string): RuntimeFormat | null {
  const words = headerWords(name);
  if (name.includes('%') || has(words, PERCENT_WORDS)) return 'percent';
  if (has(words, SECONDS_WORDS)) return 'seconds';
  if (has(words, MINUTES_WORDS)) return 'minutes';
  if (has(words, FRACTION_WORDS)) return 'fraction';
  if (has(words, ONOFF_WORDS)) return 'onoff';
  return null;
}

export interface HeaderGuess {
  role: ColumnRole | null;
  /** Confidence 1 (weak) … 3 (strong); 0 when there is no role. */
  score: number;
  unit: TempUnit | null;
  runtimeAs: RuntimeFormat | null;
  /** The header says its times are UTC ("Time (UTC)", "timestamp_utc"). */
  utc: boolean;
}

/** The role a header name suggests on its own. */
export function classifyHeader(name: string): HeaderGuess {
  const all = headerWords(name);
  const unit = headerUnit(name);
  const utc = all.includes('utc') || all.includes('gmt') || all.includes('zulu');
  // A trailing unit letter is not a word of the name.
  const words = all.filter((w, i) => !(UNIT_WORDS.has(w) && (i === all.length - 1 || w.length > 1)));
  const collapsed = words.join('');
  const none: HeaderGuess = { role: null, score: 0, unit, runtimeAs: null, utc };
  if (words.length === 0) return none;
  const g = (role: ColumnRole, score: number, runtimeAs: RuntimeFormat | null = null): HeaderGuess => ({ role, score, unit, runtimeAs, utc });

  const heat = has(words, HEAT_WORDS) || collapsedHas(collapsed, ['heiz', 'brenner', 'heating', 'chauff']);
  const cool = has(words, COOL_WORDS) || collapsedHas(collapsed, ['kuhl', 'kuehl', 'klima', 'cooling', 'refroid']);
  const setpoint = has(words, SETPOINT_WORDS) || collapsedHas(collapsed, ['setpoint', 'sollwert', 'consign', 'setpt']) || /set\s*point/i.test(name);
  const temp = has(words, TEMP_WORDS) || collapsed.includes('temp') || unit !== null;
  const indoorStrong = has(words, INDOOR_STRONG) || collapsedHas(collapsed, ['indoor', 'raumtemp', 'innentemp', 'inside']);
  const outdoorStrong = has(words, OUTDOOR_STRONG) || collapsedHas(collapsed, ['outdoor', 'outside', 'aussen', 'ambient']);
  const indoor = indoorStrong || (temp && has(words, INDOOR_WEAK));
  const outdoor = outdoorStrong || (temp && has(words, OUTDOOR_WEAK));

  if (has(words, EXCLUDE) && !(setpoint && (heat || cool))) return none;

  if (setpoint) {
    if (heat && !cool) return g('heatSetpoint', 3);
    if (cool && !heat) return g('coolSetpoint', 3);
    if (!heat && !cool && !outdoor) return g('heatSetpoint', 1);
    return none;
  }
  if (heat !== cool) {
    if (temp && !has(words, STATE_WORDS) && headerRuntimeFormat(name) === null) return none; // e.g. "Heating water temp"
    return g(heat ? 'heating' : 'cooling', 3, headerRuntimeFormat(name));
  }
  if ((temp || indoor || outdoor) && !has(words, EXCLUDE_TEMP)) {
    if (outdoor && !indoor) return g('outdoor', temp ? 3 : 2);
    if (indoor && !outdoor) return g('indoor', temp ? 3 : 2);
    if (temp && !indoor && !outdoor && !has(words, TIME_WORDS) && !has(words, DATE_WORDS)) return g('indoor', 1);
  }
  const hasDate = has(words, DATE_WORDS);
  const hasTime = has(words, TIME_WORDS);
  if (has(words, STAMP_WORDS) || (hasDate && hasTime) || collapsedHas(collapsed, ['datetime', 'timestamp', 'zeitstempel'])) return g('time', 3);
  if (hasDate) return g('date', 2);
  if (hasTime) return g(words.includes('clock') && words.length === 1 ? 'clock' : 'time', 2);
  if (has(words, STATE_WORDS) && !heat && !cool) return g('heating+cooling', 1, 'onoff');
  return none;
}
