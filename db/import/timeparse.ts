/**
 * Timestamps of log rows to epoch ms UTC.
 *
 * - ISO 8601 ("2026-01-05T06:00:00-05:00", "2026-01-05 06:00Z", "2026-01-05T06:00"): a hand-written
 *   parser; with an offset or Z the instant is exact, without one it is a local wall-clock time.
 * - Unicode LDML patterns (luxon's fromFormat tokens), e.g. "dd.MM.yyyy HH:mm" or "M/d/yyyy h:mm a":
 *   numeric patterns are compiled to a small fast parser; anything else (month names, weekdays, offsets)
 *   goes to luxon's DateTime.fromFormat.
 * - Epoch numbers: seconds, milliseconds, microseconds or nanoseconds, told apart by magnitude.
 *
 * Local wall-clock times are placed in an IANA time zone by ZoneResolver, which caches the UTC offset per
 * local hour and, near a daylight-saving change, decides exactly: a time in the hour repeated in autumn
 * is placed by row order (the first pass at the earlier offset, the second at the later one), a time in
 * the hour skipped in spring does not exist and is refused with a reason. Offsets come from the platform's
 * IANA tz database through Intl (via luxon's IANAZone).
 */
import { DateTime, IANAZone } from 'luxon';

const MINUTE = 60_000;
const HOUR = 3_600_000;

/** A parse that failed leaves its reason here (read it right after a NaN result). */
export const timeError = { reason: '' };

function daysInMonth(y: number, m: number): number {
  if (m === 2) return (y % 4 === 0 && y % 100 !== 0) || y % 400 === 0 ? 29 : 28;
  return m === 4 || m === 6 || m === 9 || m === 11 ? 30 : 31;
}

/**
 * "Wall ms": the epoch ms a wall-clock reading would have if it were UTC. NaN (with timeError set) for
 * impossible fields such as 31 April or 25:00.
 */
export function wallMs(y: number, mo: number, d: number, h: number, mi: number, s: number, ms: number): number {
  if (mo < 1 || mo > 12 || d < 1 || d > daysInMonth(y, mo) || h > 23 || mi > 59 || s > 59) {
    timeError.reason = `${y}-${pad2(mo)}-${pad2(d)} ${pad2(h)}:${pad2(mi)} is not a valid date and time`;
    return NaN;
  }
  return Date.UTC(y, mo - 1, d, h, mi, s, ms);
}

function pad2(n: number): string {
  return n < 10 ? `0${n}` : String(n);
}

/** "2026-11-01 01:30" (seconds shown when not zero) of a wall ms. */
export function formatWall(wall: number): string {
  const iso = new Date(wall).toISOString();
  const sec = iso.slice(17, 19);
  return `${iso.slice(0, 10)} ${iso.slice(11, 16)}${sec === '00' ? '' : `:${sec}`}`;
}

/** "UTC−05:00" of an offset in ms. */
export function formatOffset(offsetMs: number): string {
  const m = Math.round(offsetMs / MINUTE);
  const a = Math.abs(m);
  return `UTC${m < 0 ? '−' : '+'}${pad2(Math.floor(a / 60))}:${pad2(a % 60)}`;
}

// ───────────────────────────── ISO 8601 ─────────────────────────────

/** Output of parseIso: the wall ms and the offset in minutes (NaN when the text had none). */
export const isoOut = { wall: NaN, offsetMin: NaN };

function dig2(s: string, i: number): number {
  const a = s.charCodeAt(i) - 48;
  const b = s.charCodeAt(i + 1) - 48;
  return a >= 0 && a <= 9 && b >= 0 && b <= 9 ? a * 10 + b : -1;
}

/** The day of the last ISO date read (consecutive rows share it): key y·10000 + m·100 + d and its ms. */
let lastDayKey = -1;
let lastDayMs = 0;

/**
 * Parses "YYYY-MM-DD[T ]HH:MM[:SS[.fff]][Z|±HH[:MM]|±HHMM]" (a space before the offset and "UTC"/"GMT"
 * for Z allowed) into isoOut. Returns false when the text is not of that form or its fields are out of range.
 */
export function parseIso(s: string): boolean {
  return parseIsoAt(s, 0, s.length);
}

/** parseIso of s.substring(start, end), without making the substring. */
export function parseIsoAt(s: string, start: number, end: number): boolean {
  const n = end;
  const b = start;
  if (n - b < 16) return false;
  const y1 = dig2(s, b), y2 = dig2(s, b + 2);
  if (y1 < 0 || y2 < 0 || s.charCodeAt(b + 4) !== 45 || s.charCodeAt(b + 7) !== 45) return false;
  const mo = dig2(s, b + 5), d = dig2(s, b + 8);
  const sep = s.charCodeAt(b + 10);
  if (mo < 0 || d < 0 || (sep !== 84 && sep !== 32 && sep !== 116)) return false;
  const h = dig2(s, b + 11);
  if (h < 0 || s.charCodeAt(b + 13) !== 58) return false;
  const mi = dig2(s, b + 14);
  if (mi < 0) return false;
  let i = b + 16;
  let sec = 0;
  let ms = 0;
  if (i < n && s.charCodeAt(i) === 58) {
    sec = i + 2 < n ? dig2(s, i + 1) : -1;
    if (sec < 0) return false;
    i += 3;
    if (i < n && (s.charCodeAt(i) === 46 || s.charCodeAt(i) === 44)) {
      i++;
      let scale = 100;
      let digits = 0;
      while (i < n) {
        const c = s.charCodeAt(i) - 48;
        if (c < 0 || c > 9) break;
        ms += c * scale;
        scale /= 10;
        digits++;
        i++;
      }
      if (digits === 0) return false;
      ms = Math.round(ms);
    }
  }
  while (i < n && s.charCodeAt(i) === 32) i++;
  let off = NaN;
  if (i < n) {
    const c = s.charCodeAt(i);
    if (c === 90 || c === 122) {
      off = 0;
      i++;
    } else if (c === 43 || c === 45 || c === 0x2212) {
      const oh = i + 2 < n ? dig2(s, i + 1) : -1;
      if (oh < 0) return false;
      i += 3;
      let om = 0;
      if (i < n && s.charCodeAt(i) === 58) i++;
      if (i < n) {
        om = i + 1 < n ? dig2(s, i) : -1;
        if (om < 0) return false;
        i += 2;
      }
      if (oh > 14 || om > 59) return false;
      off = (c === 43 ? 1 : -1) * (oh * 60 + om);
    } else {
      const rest = s.slice(i, n).trim().toUpperCase();
      if (rest === 'UTC' || rest === 'GMT') {
        off = 0;
        i = n;
      } else return false;
    }
    while (i < n && s.charCodeAt(i) === 32) i++;
    if (i !== n) return false;
  }
  if (h > 23 || mi > 59 || sec > 59) return false;
  const y = y1 * 100 + y2;
  const key = y * 10000 + mo * 100 + d;
  if (key !== lastDayKey) {
    const day = wallMs(y, mo, d, 0, 0, 0, 0);
    if (day !== day) return false;
    lastDayKey = key;
    lastDayMs = day;
  }
  isoOut.wall = lastDayMs + ((h * 60 + mi) * 60 + sec) * 1000 + ms;
  isoOut.offsetMin = off;
  return true;
}

// ───────────────────────────── epoch numbers ─────────────────────────────

const EPOCH = /^\s*\d{9,19}(?:\.\d+)?\s*$/;

/** True when the text is a plain number long enough to be an epoch time (9–19 digits). */
export function looksLikeEpoch(s: string): boolean {
  return EPOCH.test(s);
}

/**
 * Epoch number to ms: ≥ 1e17 nanoseconds, ≥ 1e14 microseconds, ≥ 1e11 milliseconds, else seconds
 * (1e11 s would be the year 5138, 1e11 ms is 1973). NaN when not a number.
 */
export function parseEpoch(s: string): number {
  if (!EPOCH.test(s)) return NaN;
  const v = +s;
  const ms = v >= 1e17 ? v / 1e6 : v >= 1e14 ? v / 1e3 : v >= 1e11 ? v : v * 1000;
  return Math.round(ms);
}

// ───────────────────────────── LDML patterns ─────────────────────────────

type Token =
  | { kind: 'lit'; text: string }
  | { kind: 'space' }
  | { kind: 'num'; field: 'y' | 'M' | 'd' | 'H' | 'h' | 'm' | 's' | 'S'; min: number; max: number; twoDigitYear?: boolean }
  | { kind: 'ampm' };

/** Splits an LDML pattern into tokens; null when it has letters the fast parser does not handle. */
function tokenize(pattern: string): Token[] | null {
  const out: Token[] = [];
  let i = 0;
  while (i < pattern.length) {
    const c = pattern[i];
    if (c === "'") {
      const end = pattern.indexOf("'", i + 1);
      if (end < 0) return null;
      out.push({ kind: 'lit', text: end === i + 1 ? "'" : pattern.slice(i + 1, end) });
      i = end + 1;
      continue;
    }
    if (/[A-Za-z]/.test(c)) {
      let j = i;
      while (j < pattern.length && pattern[j] === c) j++;
      const len = j - i;
      i = j;
      switch (c) {
        case 'y':
          if (len === 2) out.push({ kind: 'num', field: 'y', min: 2, max: 2, twoDigitYear: true });
          else out.push({ kind: 'num', field: 'y', min: len === 1 ? 1 : len, max: len <= 4 ? 4 : len });
          break;
        case 'M':
        case 'd':
        case 'H':
        case 'h':
        case 'm':
        case 's':
          if (len > 2) return null;
          out.push({ kind: 'num', field: c, min: len, max: 2 });
          break;
        case 'S':
          out.push({ kind: 'num', field: 'S', min: 1, max: Math.max(3, len) });
          break;
        case 'a':
          if (len !== 1) return null;
          out.push({ kind: 'ampm' });
          break;
        default:
          return null;
      }
      continue;
    }
    if (c === ' ') {
      if (out.length === 0 || out[out.length - 1].kind !== 'space') out.push({ kind: 'space' });
    } else out.push({ kind: 'lit', text: c });
    i++;
  }
  return out;
}

/** A compiled pattern: text → wall ms (or exact epoch ms when `exact`), NaN with timeError.reason on failure. */
export interface TimePattern {
  pattern: string;
  /** The pattern carries an offset or zone (luxon tokens Z, ZZ, ZZZ, z, X, x): results are exact instants. */
  exact: boolean;
  parse(text: string): number;
  /** The compiled numeric parser alone (no luxon fallback), null when the pattern needs luxon; for detection. */
  strict: ((text: string) => number) | null;
}

/** True when `pattern` names its own offset or zone (outside quoted literals). */
function patternHasZone(pattern: string): boolean {
  return /[ZzXx]/.test(pattern.replace(/'[^']*'/g, ''));
}

/**
 * Compiles an LDML date pattern (luxon tokens). Numeric patterns get a fast parser; others use luxon.
 * Throws Error with a plain message when luxon cannot use the pattern at all.
 */
export function compilePattern(pattern: string): TimePattern {
  const tokens = tokenize(pattern);
  const exact = patternHasZone(pattern);
  const viaLuxon = (text: string): number => {
    const dt = exact
      ? DateTime.fromFormat(text.trim(), pattern, { setZone: true })
      : DateTime.fromFormat(text.trim(), pattern, { zone: 'UTC' });
    if (!dt.isValid) {
      timeError.reason = `'${text}' does not match the date format "${pattern}"`;
      return NaN;
    }
    return dt.toMillis();
  };
  if (!tokens) return { pattern, exact, parse: viaLuxon, strict: null };

  // Two-digit numeric fields can be one digit wide when a non-digit follows.
  for (let k = 0; k < tokens.length; k++) {
    const t = tokens[k];
    if (t.kind === 'num' && t.min === 2 && !t.twoDigitYear && t.field !== 'S') {
      const next = tokens[k + 1];
      if (next === undefined || next.kind !== 'num') t.min = 1;
    }
  }
  const fast = (text: string): number => {
    const s = text;
    const n = s.length;
    let i = 0;
    while (i < n && s.charCodeAt(i) === 32) i++;
    let y = 1970, mo = 1, d = 1, h = 0, mi = 0, sec = 0, ms = 0;
    let h12 = -1;
    let pm = -1;
    for (let k = 0; k < tokens.length; k++) {
      const t = tokens[k];
      if (t.kind === 'num') {
        let v = 0;
        let len = 0;
        const start = i;
        while (len < t.max && i < n) {
          const c = s.charCodeAt(i) - 48;
          if (c < 0 || c > 9) break;
          v = v * 10 + c;
          len++;
          i++;
        }
        if (len < t.min) return NaN;
        switch (t.field) {
          case 'y':
            // Two-digit years as luxon reads them (its default cutoff: 00–60 → 2000s, 61–99 → 1900s).
            y = t.twoDigitYear ? (v > 60 ? 1900 + v : 2000 + v) : v;
            break;
          case 'M':
            mo = v;
            break;
          case 'd':
            d = v;
            break;
          case 'H':
            h = v;
            break;
          case 'h':
            h12 = v;
            break;
          case 'm':
            mi = v;
            break;
          case 's':
            sec = v;
            break;
          case 'S':
            ms = Math.round(v * Math.pow(10, 3 - (i - start)));
            break;
        }
      } else if (t.kind === 'lit') {
        if (s.startsWith(t.text, i)) i += t.text.length;
        else return NaN;
      } else if (t.kind === 'space') {
        if (i >= n || (s.charCodeAt(i) !== 32 && s.charCodeAt(i) !== 9)) return NaN;
        while (i < n && (s.charCodeAt(i) === 32 || s.charCodeAt(i) === 9)) i++;
      } else {
        const c = s.charCodeAt(i) | 0x20;
        if (c !== 97 && c !== 112) return NaN; // a / p
        pm = c === 112 ? 1 : 0;
        i++;
        if (s.charCodeAt(i) === 46) i++; // "a.m."
        if ((s.charCodeAt(i) | 0x20) !== 109) return NaN;
        i++;
        if (s.charCodeAt(i) === 46) i++;
      }
    }
    while (i < n && s.charCodeAt(i) === 32) i++;
    if (i !== n) return NaN;
    if (h12 >= 0) {
      if (h12 < 1 || h12 > 12) return NaN;
      h = (h12 % 12) + (pm === 1 ? 12 : 0);
    } else if (pm >= 0 && h <= 12) {
      h = (h % 12) + (pm === 1 ? 12 : 0);
    }
    return wallMs(y, mo, d, h, mi, sec, ms);
  };
  return {
    pattern,
    exact,
    strict: fast,
    parse(text: string): number {
      const v = fast(text);
      if (v === v) return v;
      // The fast parser is strict about widths and spaces; luxon is the reference for the pattern.
      return viaLuxon(text);
    },
  };
}

/** Common date-and-time layouts tried, in order, when no dateFormat is given (ISO and epoch are tried first). */
export const CANDIDATE_PATTERNS = [
  'M/d/yyyy H:mm:ss',
  'M/d/yyyy H:mm',
  'M/d/yyyy h:mm:ss a',
  'M/d/yyyy h:mm a',
  'd/M/yyyy H:mm:ss',
  'd/M/yyyy H:mm',
  'd/M/yyyy h:mm:ss a',
  'd/M/yyyy h:mm a',
  'd.M.yyyy H:mm:ss',
  'd.M.yyyy H:mm',
  'yyyy/M/d H:mm:ss',
  'yyyy/M/d H:mm',
  'yyyy.M.d H:mm:ss',
  'yyyy.M.d H:mm',
  'd-M-yyyy H:mm:ss',
  'd-M-yyyy H:mm',
  'M/d/yy H:mm:ss',
  'M/d/yy H:mm',
  'M/d/yy h:mm a',
  'd/M/yy H:mm',
  'd.M.yy H:mm:ss',
  'd.M.yy H:mm',
  'yyyyMMddHHmmss',
  'yyyyMMddHHmm',
  'yyyy-MM-dd HH:mm:ss',
  'yyyy-MM-dd HH:mm',
  "yyyy-MM-dd'T'HH:mm:ss",
  'dd MMM yyyy HH:mm:ss',
  'dd MMM yyyy HH:mm',
  'MMM d, yyyy h:mm:ss a',
  'MMM d, yyyy h:mm a',
  'MMM d yyyy HH:mm',
  'd MMM yyyy HH:mm',
] as const;

// ───────────────────────────── time zones ─────────────────────────────

/** A daylight-saving (or other) change of UTC offset near some local hours. */
interface Transition {
  /** Instant of the change, epoch ms UTC. */
  at: number;
  /** Offset before and after, ms (local = UTC + offset). */
  before: number;
  after: number;
  /** Readings placed in the repeated interval, and readings refused in the skipped one. */
  repeated: number;
  skipped: number;
  /** Row-order state: the file has moved on to the second pass of the repeated interval. */
  second: boolean;
  /** A row beyond the repeated interval (in file order direction) has been seen. */
  passed: boolean;
  lastWall: number;
}

/**
 * Local wall-clock time in an IANA zone → UTC, with the offset cached per local week or day when it does
 * not change, and per local hour on the days next to a change of offset (a year costs a few hundred Intl
 * offset look-ups, not one per reading).
 *
 * @example
 * const z = new ZoneResolver('America/New_York');
 * z.toUtc(Date.UTC(2026, 0, 5, 6, 0));   // 2026-01-05 06:00 EST → 11:00 UTC
 */
export class ZoneResolver {
  readonly zone: string;
  /** Rows run newest first: the first pass over a repeated hour is then the later offset. */
  readonly descending: boolean;
  private readonly iana: IANAZone | null;
  private readonly hours = new Map<number, number | Transition>();
  private readonly days = new Map<number, number | null>();
  private readonly weeks = new Map<number, number | null>();
  private readonly transitions = new Map<number, Transition>();
  private lastHour = NaN;
  private lastEntry: number | Transition = 0;

  constructor(zone: string, descending = false) {
    this.zone = zone;
    this.descending = descending;
    const fixedUtc = /^(utc|gmt|z|etc\/utc|etc\/gmt|etc\/zulu|zulu|universal|etc\/universal)$/i.test(zone);
    if (!fixedUtc && !IANAZone.isValidZone(zone)) throw new Error(`"${zone}" is not a known IANA time zone`);
    this.iana = fixedUtc ? null : IANAZone.create(zone);
  }

  /** UTC offset of the zone at an instant, ms. */
  offsetAt(utc: number): number {
    return this.iana === null ? 0 : this.iana.offset(utc) * MINUTE;
  }

  /** The offset of a local day when it is the same all day; null when a change of offset falls near it. */
  private dayOffset(dayKey: number): number | null {
    const cached = this.days.get(dayKey);
    if (cached !== undefined) return cached;
    const week = this.spanOffset(this.weeks, Math.floor(dayKey / 7), 7 * 24 * HOUR);
    const v = week !== null ? week : this.spanOffset(this.days, dayKey, 24 * HOUR);
    this.days.set(dayKey, v);
    return v;
  }

  /**
   * The offset over the local span [key·len, (key+1)·len) when it is the same throughout (the offsets just
   * before the earliest and just after the latest instant the span can name agree), else null; cached.
   */
  private spanOffset(cache: Map<number, number | null>, key: number, len: number): number | null {
    const cached = cache.get(key);
    if (cached !== undefined) return cached;
    const wall = key * len;
    const a = this.offsetAt(wall - 14 * HOUR - MINUTE);
    const b = this.offsetAt(wall + len + 13 * HOUR + MINUTE);
    const v = a === b ? a : null;
    cache.set(key, v);
    return v;
  }

  private entryFor(hourKey: number): number | Transition {
    const cached = this.hours.get(hourKey);
    if (cached !== undefined) return cached;
    const day = this.dayOffset(Math.floor(hourKey / 24));
    if (day !== null) return day;
    const wall = hourKey * HOUR;
    // Every instant this local hour can name lies within [wall − 14 h, wall + 1 h + 12 h] (offsets −12…+14 h).
    let lo = wall - 14 * HOUR - MINUTE;
    let hi = wall + 13 * HOUR + MINUTE;
    const a = this.offsetAt(lo);
    const b = this.offsetAt(hi);
    let entry: number | Transition;
    if (a === b) {
      entry = a;
    } else {
      // A change found for a neighbouring hour is the same change.
      for (const t of this.transitions.values()) {
        if (t.at > lo && t.at <= hi && t.before === a && t.after === b) {
          this.hours.set(hourKey, t);
          return t;
        }
      }
      while (hi - lo > 1) {
        const mid = Math.floor((lo + hi) / 2);
        if (this.offsetAt(mid) === a) lo = mid;
        else hi = mid;
      }
      let t = this.transitions.get(hi);
      if (t === undefined) {
        t = { at: hi, before: a, after: b, repeated: 0, skipped: 0, second: false, passed: false, lastWall: NaN };
        this.transitions.set(hi, t);
      }
      entry = t;
    }
    this.hours.set(hourKey, entry);
    return entry;
  }

  /**
   * UTC epoch ms of a wall ms in this zone. NaN (timeError.reason set) when the local time does not exist
   * (skipped by a spring-forward change). In a repeated interval, row order decides (see the class notes),
   * so call this in file order.
   */
  toUtc(wall: number): number {
    if (this.iana === null) return wall;
    const hk = Math.floor(wall / HOUR);
    let e: number | Transition;
    if (hk === this.lastHour) e = this.lastEntry;
    else {
      e = this.entryFor(hk);
      this.lastHour = hk;
      this.lastEntry = e;
    }
    if (typeof e === 'number') return wall - e;
    const u1 = wall - e.before;
    const u2 = wall - e.after;
    const v1 = u1 < e.at;
    const v2 = u2 >= e.at;
    if (v1 && v2) {
      // Repeated interval (clocks went back): first pass and second pass by row order.
      if (!e.second && (e.passed || (e.lastWall === e.lastWall && (this.descending ? wall >= e.lastWall : wall <= e.lastWall)))) e.second = true;
      e.lastWall = wall;
      e.repeated++;
      const earlier = this.descending ? e.second : !e.second;
      return earlier ? u1 : u2;
    }
    if (v1) {
      if (this.descending) e.passed = true;
      return u1;
    }
    if (v2) {
      if (!this.descending) e.passed = true;
      return u2;
    }
    e.skipped++;
    timeError.reason =
      `${formatWall(wall)} does not exist in ${this.zone}: clocks moved forward from ` +
      `${formatWall(e.at + e.before).slice(11)} to ${formatWall(e.at + e.after).slice(11)} that day`;
    return NaN;
  }

  /** Changes where clocks went back and readings fell in the repeated interval (see db/import/repeat-start.ts). */
  repeatedChanges(): { at: number; before: number; after: number; second: boolean }[] {
    const out: { at: number; before: number; after: number; second: boolean }[] = [];
    for (const t of this.transitions.values()) if (t.repeated > 0 && t.before > t.after) out.push({ at: t.at, before: t.before, after: t.after, second: t.second });
    return out;
  }

  /** Plain sentences about readings placed in repeated intervals or refused in skipped ones. */
  warnings(): string[] {
    const out: string[] = [];
    const list = [...this.transitions.values()].sort((x, y) => x.at - y.at);
    for (const t of list) {
      const start = formatWall(t.at + Math.min(t.before, t.after));
      const end = formatWall(t.at + Math.max(t.before, t.after)).slice(11);
      const len = Math.abs(t.before - t.after);
      const what = len === HOUR ? 'hour' : `${Math.round(len / MINUTE)} minutes`;
      if (t.repeated > 0) {
        out.push(
          `${t.repeated} reading${t.repeated === 1 ? '' : 's'} fell in the repeated ${what} of ${start}–${end} ${this.zone} ` +
            `(clocks went back) and ${t.repeated === 1 ? 'was' : 'were'} placed by row order: the first pass at ` +
            `${formatOffset(t.before)}, the second at ${formatOffset(t.after)}.`,
        );
      }
      if (t.skipped > 0) {
        out.push(
          `${t.skipped} reading${t.skipped === 1 ? '' : 's'} named a local time in the skipped ${what} of ${start}–${end} ${this.zone} ` +
            `(clocks moved forward), which does not exist; ${t.skipped === 1 ? 'it was' : 'they were'} rejected.`,
        );
      }
    }
    return out;
  }
}
