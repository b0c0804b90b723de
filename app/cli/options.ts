/**
 * The light plumbing of the command line: typed exits, option parsing and the error-to-exit mapping.
 * No CSV, date or database library is imported here, so `heatlag --help` and `heatlag estimate` start
 * fast (the zone sources that need the store are in common.ts).
 */
import { HeatlagError } from '../../core/errors.ts';
import type { TempUnit } from '../../core/types.ts';
import { toCelsius, deltaToKelvin } from '../../core/units.ts';

/** An error that ends the command with `exitCode` (1 usage, 2 bad input) and a message on stderr. */
export class CliError extends Error {
  readonly exitCode: number;

  constructor(exitCode: number, message: string) {
    super(message);
    this.name = 'CliError';
    this.exitCode = exitCode;
  }
}

export const usageError = (message: string): CliError => new CliError(1, message);
export const inputError = (message: string): CliError => new CliError(2, message);

/** Parses a number option ("-5", "68.5"); a usage error names the option otherwise. */
export function numberOption(value: string | undefined, option: string): number {
  if (value === undefined) throw usageError(`${option} is required.`);
  const v = Number(value.trim().replace(/,/, '.'));
  if (value.trim() === '' || !Number.isFinite(v)) throw usageError(`${option} must be a number, got '${value}'.`);
  return v;
}

/** Parses a unit option (--units, --log-units). */
export function unitsOption(value: string | undefined, option = '--units'): TempUnit | undefined {
  if (value === undefined) return undefined;
  const u = value.trim().toUpperCase().replace('°', '');
  if (u !== 'F' && u !== 'C') throw usageError(`${option} must be F or C, got '${value}'.`);
  return u;
}

/** A temperature option in the given units, as °C. */
export function tempOption(value: string | undefined, option: string, units: TempUnit): number {
  return toCelsius(numberOption(value, option), units);
}

/** A temperature-difference option in the given units, as K. */
export function deltaOption(value: string | undefined, option: string, units: TempUnit): number {
  return deltaToKelvin(numberOption(value, option), units);
}

/** Maps any error to its exit code and one plain message (never a stack trace). */
export function describeError(e: unknown): { code: number; message: string } {
  if (e instanceof CliError) return { code: e.exitCode, message: e.message };
  if (e instanceof HeatlagError) return { code: 2, message: e.message };
  if (e instanceof Error && 'code' in e && (e as { code?: string }).code === 'ENOENT') {
    const p = (e as { path?: string }).path;
    return { code: 2, message: `${p ?? 'file'}: no such file.` };
  }
  const message = e instanceof Error ? e.message : String(e);
  return { code: 3, message: `internal error: ${message} (please report this with the command you ran)` };
}
