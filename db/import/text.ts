/**
 * Reading numbers and words out of log cells, fast: a plain "21.5" takes the quick path, anything
 * unusual (blank markers, a unit after the number, a decimal comma, a percent sign) the careful one.
 */
import type { TempUnit } from '../../core/types.ts';

/** Result of a number read: a value, BLANK (NaN: the cell says nothing) or BAD (not a number). */
export const BLANK = NaN;
export const BAD = Number.NEGATIVE_INFINITY;

/** Cells that mean "no value" in exports (compared in lower case, trimmed). */
const MISSING = new Set(['', '-', '--', '---', 'na', 'n/a', 'nan', 'null', 'none', 'nil', '#n/a', '?', 'missing', 'unknown', 'err', 'error', '—', '–']);

const WITH_SUFFIX = /^([+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d{1,3})?)\s*(°\s*[CF]|º\s*[CF]|°|º|deg\s*[CF]|[CF]|%)?$/i;

/** True when the cell holds no value (blank or a missing-value marker such as "--", "N/A", "null"). */
export function isBlankCell(s: string): boolean {
  if (s.length === 0) return true;
  const c = s.charCodeAt(0);
  if ((c >= 48 && c <= 57) || (c === 45 && s.length > 1 && s.charCodeAt(1) >= 48 && s.charCodeAt(1) <= 57)) return false;
  return MISSING.has(s.trim().toLowerCase());
}

/** Suffix found by the last readNumber call: a temperature unit, '%' or null. */
export let lastSuffix: TempUnit | '%' | null = null;

/**
 * Reads a number; `comma` = the file writes decimal commas ("21,5"). Returns BLANK for an empty cell or a
 * missing-value marker, BAD for text that is not a number. A trailing unit ("72 °F", "21,5°C") or "%"
 * is allowed and left in lastSuffix.
 */
export function readNumber(s: string, comma: boolean): number {
  lastSuffix = null;
  const n = s.length;
  if (n === 0) return BLANK;
  const v = readPlainNumber(s, 0, n, comma);
  return v === NOT_PLAIN ? readNumberSlow(s, comma) : v;
}

/**
 * readNumber of s.substring(start, end) without making the substring in the usual case (plain digits
 * with at most one decimal mark); anything else goes the careful way, so the result is the same.
 */
export function readNumberRange(s: string, start: number, end: number, comma: boolean): number {
  lastSuffix = null;
  if (start >= end) return BLANK;
  const v = readPlainNumber(s, start, end, comma);
  return v === NOT_PLAIN ? readNumberSlow(s.substring(start, end), comma) : v;
}

/** readPlainNumber's answer for text that is not a plain number (it never yields +∞ itself). */
const NOT_PLAIN = Number.POSITIVE_INFINITY;

/**
 * The quick path: s[start, end) as [sign] digits [. or , digits], at most 15 digits; NOT_PLAIN for
 * anything else. m / 10^k of two exact integers is correctly rounded, so it equals what Number() gives
 * for the same text.
 */
function readPlainNumber(s: string, start: number, end: number, comma: boolean): number {
  let i = start;
  let c = s.charCodeAt(i);
  let neg = false;
  if (c === 45) {
    neg = true;
    i++;
  } else if (c === 43) i++;
  let m = 0;
  let digits = 0;
  let frac = -1;
  for (; i < end; i++) {
    c = s.charCodeAt(i);
    const d = c - 48;
    if (d >= 0 && d <= 9) {
      m = m * 10 + d;
      digits++;
      if (frac >= 0) frac++;
    } else if (frac < 0 && (c === 46 || (comma && c === 44))) frac = 0;
    else return NOT_PLAIN;
  }
  if (digits === 0 || digits > 15) return NOT_PLAIN;
  const v = frac > 0 ? m / POW10[frac] : m;
  return neg ? 0 - v : v;
}

const POW10 = [1, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15];

/** True for an empty or all-blank cell (cheap for the usual non-blank case). */
export function isEmptyCell(s: string): boolean {
  return s.length === 0 || (s.charCodeAt(0) <= 32 && s.trim() === '');
}

function readNumberSlow(s: string, comma: boolean): number {
  const t0 = s.trim();
  if (MISSING.has(t0.toLowerCase())) return BLANK;
  let t = t0.replace(/\u2212/g, '-'); // Unicode minus sign
  if (comma || (t.indexOf(',') >= 0 && t.indexOf('.') < 0)) {
    // A single comma between digits is a decimal comma (a file may mix "21,5" into a dot file only if quoted).
    if (/^[+-]?\d*,\d+/.test(t) && t.indexOf(',') === t.lastIndexOf(',')) t = t.replace(',', '.');
  }
  const m = WITH_SUFFIX.exec(t);
  if (!m) return BAD;
  const suffix = m[2];
  if (suffix !== undefined) {
    const u = suffix.replace(/[\s°º]|deg/gi, '').toUpperCase();
    lastSuffix = u === '%' ? '%' : u === 'F' ? 'F' : u === 'C' ? 'C' : null;
  }
  const v = +m[1];
  return Number.isFinite(v) ? v : BAD;
}

/** On/off words, compared in lower case. `heat` and `cool` words are "on" only for their own side. */
const ON_WORDS = new Set(['1', 'on', 'true', 'yes', 'y', 'ein', 'an', 'ja', 'si', 'oui', 'running', 'run', 'active', 'aktiv', 'enabled']);
const OFF_WORDS = new Set(['0', 'off', 'false', 'no', 'n', 'aus', 'nein', 'non', 'idle', 'standby', 'inactive', 'inaktiv', 'disabled', 'stopped', 'stop', 'fan', 'fan only', 'none']);
const HEAT_WORDS = new Set(['heat', 'heating', 'heat on', 'heating on', 'heizen', 'heizung', 'heizbetrieb', 'chauffage', 'calefaccion', 'aux', 'aux heat', 'emergency heat', 'heat stage 1', 'heat1', 'heat stage 2', 'heat2']);
const COOL_WORDS = new Set(['cool', 'cooling', 'cool on', 'cooling on', 'kuehlen', 'kuhlen', 'kühlen', 'kuehlung', 'kuhlung', 'kühlung', 'klima', 'climatisation', 'refroidissement', 'refrigeracion', 'ac', 'a/c', 'cool stage 1', 'cool1', 'cool stage 2', 'cool2']);

/**
 * Reads an on/off state as 1 or 0 for the heating (`side` 'heat') or cooling ('cool') column.
 * A shared equipment-state column ("heating", "cooling", "idle") is on only for its own side.
 * Returns BLANK for an empty cell, BAD for a word it does not know.
 */
export function readOnOff(s: string, side: 'heat' | 'cool'): number {
  if (s.length === 1) {
    if (s === '1') return 1;
    if (s === '0') return 0;
  }
  const t = s.trim().toLowerCase().replace(/[_-]+/g, ' ');
  if (t === '') return BLANK;
  if (ON_WORDS.has(t)) return 1;
  if (OFF_WORDS.has(t)) return 0;
  if (HEAT_WORDS.has(t)) return side === 'heat' ? 1 : 0;
  if (COOL_WORDS.has(t)) return side === 'cool' ? 1 : 0;
  if (MISSING.has(t)) return BLANK;
  const v = readNumber(t, false);
  if (v === 0 || v === 1) return v;
  return BAD;
}

/** True for words that readOnOff understands as heating-on or cooling-on (used by the detection). */
export function stateWordSide(s: string): 'heat' | 'cool' | 'onoff' | null {
  const t = s.trim().toLowerCase().replace(/[_-]+/g, ' ');
  if (HEAT_WORDS.has(t)) return 'heat';
  if (COOL_WORDS.has(t)) return 'cool';
  if (ON_WORDS.has(t) || OFF_WORDS.has(t)) return 'onoff';
  return null;
}

/** Reads a duration "h:mm:ss" or "mm:ss" as seconds, or BAD. */
export function readDuration(s: string): number {
  const m = /^\s*(?:(\d+):)?(\d{1,2}):(\d{2})\s*$/.exec(s);
  if (!m) return BAD;
  return (m[1] === undefined ? 0 : Number(m[1]) * 3600) + Number(m[2]) * 60 + Number(m[3]);
}
