/**
 * How numbers are shown: always with their unit, in the unit the person chose. Internal values are
 * °C, K (differences), K/h (rates) and hours; conversion goes through core/units.ts.
 */
import { deltaFromKelvin, fromCelsius, toCelsius, degreeLabel } from '../../../../core/units.ts';
import type { TempUnit } from '../../../../core/types.ts';

export type { TempUnit };
export { degreeLabel };

const cache = new Map<number, Intl.NumberFormat>();
function nf(digits: number): Intl.NumberFormat {
  let f = cache.get(digits);
  if (!f) {
    f = new Intl.NumberFormat('en-US', { minimumFractionDigits: digits, maximumFractionDigits: digits, useGrouping: true });
    cache.set(digits, f);
  }
  return f;
}

/** A plain number with a fixed number of decimals, '—' when missing. Minus sign is U+2212. */
export function num(value: number | null | undefined, digits = 1): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—';
  const s = nf(digits).format(Object.is(Math.round(value * 10 ** digits), -0) ? 0 : value);
  return s.replace('-', '−');
}

/** The unit of a temperature difference: K with °C, °F with °F. */
export function deltaLabel(unit: TempUnit): string {
  return unit === 'C' ? 'K' : '°F';
}

/** The unit of a rate in degrees per hour. */
export function rateLabel(unit: TempUnit): string {
  return `${deltaLabel(unit)}/h`;
}

/** A temperature (°C inside) in the chosen unit with its label, e.g. "68.0 °F". */
export function temp(c: number | null | undefined, unit: TempUnit, digits = 1): string {
  if (c === null || c === undefined || !Number.isFinite(c)) return '—';
  return `${num(fromCelsius(c, unit), digits)} ${degreeLabel(unit)}`;
}

/** A temperature difference (K inside) in the chosen unit, e.g. "3.6 °F" or "2.0 K". */
export function delta(k: number | null | undefined, unit: TempUnit, digits = 1): string {
  if (k === null || k === undefined || !Number.isFinite(k)) return '—';
  return `${num(deltaFromKelvin(k, unit), digits)} ${deltaLabel(unit)}`;
}

/** A rate (K/h inside) in the chosen unit, e.g. "1.25 °F/h". */
export function rate(kPerH: number | null | undefined, unit: TempUnit, digits = 2): string {
  if (kPerH === null || kPerH === undefined || !Number.isFinite(kPerH)) return '—';
  return `${num(deltaFromKelvin(kPerH, unit), digits)} ${rateLabel(unit)}`;
}

/** Hours as decimal hours, e.g. "34.4 h". */
export function hours(h: number | null | undefined, digits = 1): string {
  if (h === null || h === undefined || !Number.isFinite(h)) return '—';
  return `${num(h, digits)} h`;
}

/** A duration as hours and minutes, e.g. "2 h 05 min" or "45 min". */
export function duration(h: number | null | undefined): string {
  if (h === null || h === undefined || !Number.isFinite(h)) return '—';
  const totalMin = Math.round(h * 60);
  const hh = Math.floor(totalMin / 60);
  const mm = totalMin % 60;
  if (hh === 0) return `${mm} min`;
  return `${nf(0).format(hh)} h ${String(mm).padStart(2, '0')} min`;
}

/** Hours as an h:mm clock reading for chart axes, e.g. 2.25 → "2:15", 0.5 → "0:30". */
export function hoursClock(h: number): string {
  if (!Number.isFinite(h)) return '';
  const totalMin = Math.round(h * 60);
  return `${Math.floor(totalMin / 60)}:${String(totalMin % 60).padStart(2, '0')}`;
}

/** A count with thousands separators, e.g. "105,120". */
export function count(n: number): string {
  return nf(0).format(n);
}

/** A value typed by a person: accepts a decimal comma and a leading U+2212 minus. NaN when not a number. */
export function parseNumber(text: string): number {
  const t = text.trim().replace(/\u2212/g, '-').replace(',', '.');
  if (!/^[-+]?(\d+\.?\d*|\.\d+)(e[-+]?\d+)?$/i.test(t)) return NaN;
  return Number(t);
}

/** A temperature typed in `unit`, as °C (NaN when not a number). */
export function parseTemp(text: string, unit: TempUnit): number {
  const v = parseNumber(text);
  return Number.isFinite(v) ? toCelsius(v, unit) : NaN;
}

/** A °C value written in `unit` for an input box (rounded to `digits`). */
export function tempInputText(c: number, unit: TempUnit, digits = 1): string {
  if (!Number.isFinite(c)) return '';
  const v = fromCelsius(c, unit);
  return String(Math.round(v * 10 ** digits) / 10 ** digits);
}

const dateFormats = new Map<string, Intl.DateTimeFormat>();
/** A timestamp (epoch ms) as a local date and time in `timeZone` (the computer's when omitted). */
export function dateTime(ms: number | null | undefined, timeZone?: string): string {
  if (ms === null || ms === undefined || !Number.isFinite(ms)) return '—';
  const key = timeZone ?? '';
  let f = dateFormats.get(key);
  if (!f) {
    f = new Intl.DateTimeFormat('en-CA', {
      // hourCycle h23: midnight is 00:xx (hour12: false gives 24:xx in some ICU versions).
      year: 'numeric', month: '2-digit', day: '2-digit', hour: '2-digit', minute: '2-digit', hourCycle: 'h23',
      ...(timeZone ? { timeZone } : {}),
    });
    dateFormats.set(key, f);
  }
  return f.format(ms).replace(',', '');
}

/** A date only, e.g. "2025-01-14" (with non-breaking hyphens, so a date never splits across lines). */
export function date(ms: number | null | undefined, timeZone?: string): string {
  return dateTime(ms, timeZone).slice(0, 10).replace(/-/g, '\u2011');
}
