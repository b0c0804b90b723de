/** Text output helpers of the command line: numbers with units, aligned tables, times. */
import { degreeLabel, deltaFromKelvin, fromCelsius } from '../../core/units.ts';
import type { TempUnit } from '../../core/types.ts';

/** A number with a fixed count of decimals, or an em dash for a missing value. */
export function num(value: number | null | undefined, decimals: number): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—';
  // No "-0.00": a value that rounds to zero is shown as zero.
  if (Math.abs(value) < 0.5 * 10 ** -decimals) value = 0;
  return value.toLocaleString('en-US', { minimumFractionDigits: decimals, maximumFractionDigits: decimals });
}

/** A temperature in °C shown in `unit`, e.g. "68.0 °F". */
export function temp(celsius: number, unit: TempUnit, decimals = 1): string {
  return `${num(fromCelsius(celsius, unit), decimals)} ${degreeLabel(unit)}`;
}

/** A temperature difference in K shown in `unit`, e.g. "2.3 °F". */
export function delta(kelvin: number, unit: TempUnit, decimals = 2): string {
  return `${num(deltaFromKelvin(kelvin, unit), decimals)} ${degreeLabel(unit)}`;
}

/** A rate in K/h shown in `unit`, e.g. "3.42 °F/h". */
export function rate(kelvinPerHour: number, unit: TempUnit, decimals = 2): string {
  return `${num(deltaFromKelvin(kelvinPerHour, unit), decimals)} ${degreeLabel(unit)}/h`;
}

/** A duration: "1 h 25 min" (or "40 min") below ten hours, "12.5 h" above. */
export function hours(h: number | null): string {
  if (h === null || !Number.isFinite(h)) return '—';
  if (h < 10) {
    const totalMin = Math.round(h * 60);
    const hh = Math.floor(totalMin / 60);
    const mm = totalMin % 60;
    return hh > 0 ? `${hh} h ${String(mm).padStart(2, '0')} min` : `${mm} min`;
  }
  return `${num(h, 1)} h`;
}

/** An epoch-ms time as ISO 8601 UTC without milliseconds. */
export function isoTime(ms: number): string {
  return new Date(ms).toISOString().replace('.000Z', 'Z');
}

/** An epoch-ms time as the wall clock of an IANA time zone, "YYYY-MM-DD HH:MM" (Intl). */
export function localTime(ms: number, timeZone: string): string {
  const parts = Object.fromEntries(
    new Intl.DateTimeFormat('en-US', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit', hour: '2-digit', minute: '2-digit', hourCycle: 'h23' })
      .formatToParts(ms)
      .map((p) => [p.type, p.value]),
  );
  return `${parts.year}-${parts.month}-${parts.day} ${parts.hour}:${parts.minute}`;
}

/** Rows of cells laid out in aligned columns (left-aligned text, two spaces apart). */
export function table(rows: string[][], indent = '  '): string {
  const widths: number[] = [];
  for (const row of rows) row.forEach((cell, i) => (widths[i] = Math.max(widths[i] ?? 0, [...cell].length)));
  return rows
    .map((row) => indent + row.map((cell, i) => (i === row.length - 1 ? cell : cell + ' '.repeat(widths[i] - [...cell].length))).join('  ').trimEnd())
    .join('\n');
}

/** The caution printed under every prediction. */
export const ESTIMATE_NOTE =
  'These figures are estimates from a model fitted to the log, not a design load calculation. Local codes and licensed HVAC professionals take precedence.';
