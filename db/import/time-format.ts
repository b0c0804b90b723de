/**
 * How a log's times are written and read: the guess of the time format from the sample's values (ISO
 * 8601, epoch, or a date pattern among the candidates) and the per-row time reader of a plan.
 */
import {
  CANDIDATE_PATTERNS,
  compilePattern,
  isoOut,
  looksLikeEpoch,
  parseEpoch,
  parseIso,
  parseIsoAt,
  timeError,
  ZoneResolver,
  type TimePattern,
} from './timeparse.ts';

export type TimeKind = 'iso' | 'epoch' | 'pattern';

/** A reader of one row's time text (one column, or "date time" of two) → epoch ms UTC, NaN with timeError.reason. */
export type TimeReader = (text: string) => number;

/** Builds the timestamp reader of a plan (a new ZoneResolver each time: row-order state is per read). */
export function makeTimeReader(plan: { timeKind: TimeKind; pattern: TimePattern | null; timezone: string | null; descending: boolean }): {
  read: TimeReader;
  /** For ISO times: the same reader on s.substring(start, end) without making the substring. */
  readRange: ((s: string, start: number, end: number) => number) | null;
  zone: ZoneResolver | null;
} {
  const zone = plan.timezone === null ? null : new ZoneResolver(plan.timezone, plan.descending);
  const noZone = 'the time has no UTC offset and no time zone was given (use --tz or "timezone" in the mapping)';
  let read: TimeReader;
  let readRange: ((s: string, start: number, end: number) => number) | null = null;
  if (plan.timeKind === 'iso') {
    readRange = (s, a, b) => {
      if (!parseIsoAt(s, a, b)) return read(s.substring(a, b));
      const off = isoOut.offsetMin;
      if (off === off) return isoOut.wall - off * 60_000;
      if (zone === null) {
        timeError.reason = noZone;
        return NaN;
      }
      return zone.toUtc(isoOut.wall);
    };
    read = (s) => {
      if (!parseIso(s) && !parseIso(s.trim())) {
        timeError.reason = `'${s}' is not a date and time (expected ISO 8601 such as 2026-01-05T06:00:00-05:00)`;
        return NaN;
      }
      const off = isoOut.offsetMin;
      if (off === off) return isoOut.wall - off * 60_000;
      if (zone === null) {
        timeError.reason = noZone;
        return NaN;
      }
      return zone.toUtc(isoOut.wall);
    };
  } else if (plan.timeKind === 'epoch') {
    read = (s) => {
      const v = parseEpoch(s);
      if (v !== v) timeError.reason = `'${s}' is not an epoch time (a whole number of seconds or milliseconds)`;
      return v;
    };
  } else {
    const p = plan.pattern!;
    read = (s) => {
      const v = p.parse(s);
      if (v !== v || p.exact) return v;
      if (zone === null) {
        timeError.reason = noZone;
        return NaN;
      }
      return zone.toUtc(v);
    };
  }
  return { read, readRange, zone };
}

export interface TimeFormatGuess {
  kind: TimeKind;
  pattern: TimePattern | null;
  /** Some or all times are local (need a zone). */
  local: boolean;
  describe: string;
  warning?: string;
}

/** Wall or exact ms of one value under a format (for comparing candidate patterns). */
export function sampleMs(kind: TimeKind, pattern: TimePattern | null, s: string): number {
  if (kind === 'iso') return parseIso(s.trim()) ? isoOut.wall - (isoOut.offsetMin === isoOut.offsetMin ? isoOut.offsetMin * 60_000 : 0) : NaN;
  if (kind === 'epoch') return parseEpoch(s);
  return pattern!.parse(s);
}

function roughness(values: number[]): number {
  let sum = 0;
  for (let i = 1; i < values.length; i++) sum += Math.abs(values[i] - values[i - 1]);
  return sum;
}

/** Decides how the sample's time values are written. Null when nothing fits. */
export function guessTimeFormat(values: string[], dateFormat: string | undefined): TimeFormatGuess | { error: string; example: string } {
  const vals = values.filter((v) => v.trim() !== '');
  if (vals.length === 0) return { error: 'the time column is blank in the first rows', example: '' };
  if (dateFormat !== undefined) {
    let p: TimePattern;
    try {
      p = compilePattern(dateFormat);
    } catch (err) {
      return { error: `the dateFormat "${dateFormat}" cannot be used: ${(err as Error).message}`, example: '' };
    }
    const probe = vals.slice(0, 200);
    const bad = probe.find((v) => p.parse(v) !== p.parse(v));
    if (bad !== undefined && probe.every((v) => p.parse(v) !== p.parse(v))) {
      return { error: `the times do not match the dateFormat "${dateFormat}" (e.g. '${bad}')`, example: bad };
    }
    return { kind: 'pattern', pattern: p, local: !p.exact, describe: `"${dateFormat}"` };
  }
  // A format is taken when most of the first values fit it (a few bad rows are rejected later).
  const probe = vals.slice(0, 400);
  const most = (ok: (v: string) => boolean) => probe.filter(ok).length >= Math.max(1, 0.8 * probe.length);
  if (most((v) => parseIso(v.trim()))) {
    const local = probe.some((v) => parseIso(v.trim()) && isoOut.offsetMin !== isoOut.offsetMin);
    const offset = probe.some((v) => parseIso(v.trim()) && isoOut.offsetMin === isoOut.offsetMin);
    return {
      kind: 'iso',
      pattern: null,
      local,
      describe: local ? (offset ? 'ISO 8601, some with and some without UTC offset' : 'ISO 8601 local time (no UTC offset)') : 'ISO 8601 with UTC offset',
    };
  }
  if (most(looksLikeEpoch)) {
    const v = Number(probe.find(looksLikeEpoch));
    const unit = v >= 1e17 ? 'nanoseconds' : v >= 1e14 ? 'microseconds' : v >= 1e11 ? 'milliseconds' : 'seconds';
    return { kind: 'epoch', pattern: null, local: false, describe: `epoch ${unit} (UTC)` };
  }
  const few = probe.slice(0, 60);
  const fits: { p: TimePattern; ms: number[] }[] = [];
  for (const pat of CANDIDATE_PATTERNS) {
    const p = compilePattern(pat);
    const read = p.strict ?? p.parse; // luxon only for the patterns with names (MMM)
    const all = few.map((v) => read(v));
    const ms = all.filter((m) => m === m);
    if (ms.length >= Math.max(1, 0.8 * few.length)) fits.push({ p, ms });
  }
  if (fits.length === 0) {
    return {
      error: `could not read '${few[0]}' as a date and time; give "dateFormat" in a mapping (e.g. "dd.MM.yyyy HH:mm", luxon / Unicode LDML tokens)`,
      example: few[0],
    };
  }
  // The layout that reads the most values; among equals (month/day against day/month) the one whose
  // times move in the smallest steps.
  let best = fits[0];
  for (const f of fits) {
    if (f.ms.length > best.ms.length || (f.ms.length === best.ms.length && roughness(f.ms) < roughness(best.ms))) best = f;
  }
  const same = fits.filter(
    (f) => f !== best && f.ms.length === best.ms.length && f.ms.some((m, i) => m !== best.ms[i]) && roughness(f.ms) === roughness(best.ms),
  );
  const full = probe.map((v) => best.p.parse(v));
  const failing = probe.find((_v, i) => full[i] !== full[i]);
  const guess: TimeFormatGuess = { kind: 'pattern', pattern: best.p, local: !best.p.exact, describe: `"${best.p.pattern}"` };
  if (same.length > 0) {
    guess.warning =
      `Dates such as '${few[0]}' could be read as "${best.p.pattern}" or "${same[0].p.pattern}"; they were read as "${best.p.pattern}". ` +
      `Give "dateFormat" in a mapping if that is wrong.`;
  } else if (failing !== undefined) {
    guess.warning = `Times were read as "${best.p.pattern}", but '${failing}' does not fit it; give "dateFormat" in a mapping.`;
  } else {
    guess.warning = `Times were read with the date format "${best.p.pattern}" (detected).`;
  }
  return guess;
}
