/**
 * Where a command's zone comes from, worked out before anything heavy is loaded: the options checked,
 * the column mapping read and, for a `<log.csv>` argument, the file's first rows checked the way the
 * import checks them (db/import/check.ts: the sample and the plan). A log that its first rows refuse
 * (local times without --tz, no indoor column …) is refused here, with the import's message, before the
 * command loads the store, better-sqlite3 or the fitter (common.ts, imported by the commands only after
 * prepareSource returns), so the refusal comes at once whatever the file's size.
 */
import fs from 'node:fs';
import type { ColumnMapping } from '../../core/mapping.ts';
import type { TempUnit } from '../../core/types.ts';
import { checkLog, type CheckedLog } from '../../db/import/check.ts';
import { inputError, unitsOption, usageError } from './options.ts';

export interface SourceOptions {
  db?: string;
  zone?: string;
  columns?: string;
  tz?: string;
  units?: string;
  logUnits?: string;
}

/** A command's source, checked: a log file (its first rows passed) or a zone of a database file. */
export type PreparedSource =
  | {
      kind: 'log';
      logFile: string;
      mapping: ColumnMapping | undefined;
      tz: string | undefined;
      logUnits: TempUnit | undefined;
      /** --units, when given. */
      units: TempUnit | undefined;
      checked: CheckedLog;
    }
  | { kind: 'zone'; db: string; ref: string; site: string; zone: string; units: TempUnit | undefined };

/** Reads and validates a --columns mapping file (exit 2 with file, line and column on a bad one). */
export async function readMappingFile(file: string): Promise<ColumnMapping> {
  let text: string;
  try {
    text = fs.readFileSync(file, 'utf8');
  } catch {
    throw inputError(`${file}: cannot read the column mapping file.`);
  }
  // The mapping schema (zod) only when a mapping file is given.
  const { parseMappingJson } = await import('../../core/mapping.ts');
  return parseMappingJson(text, file);
}

/** Splits "SITE/ZONE" at its first slash. */
export function parseZoneRef(ref: string): { site: string; zone: string } {
  const i = ref.indexOf('/');
  if (i <= 0 || i === ref.length - 1) throw usageError(`--zone must be SITE/ZONE, got '${ref}'.`);
  return { site: ref.slice(0, i), zone: ref.slice(i + 1) };
}

/**
 * Checks a command's source options and, for a log file, the file's first rows (the import's checks,
 * the import's messages). Throws the usage or input error the command would end with.
 */
export async function prepareSource(logFile: string | undefined, options: SourceOptions): Promise<PreparedSource> {
  const units = unitsOption(options.units, '--units');
  const logUnits = unitsOption(options.logUnits, '--log-units');
  if (logFile !== undefined) {
    if (options.db !== undefined || options.zone !== undefined) {
      throw usageError('Give either a log file or --db and --zone, not both.');
    }
    const mapping = options.columns !== undefined ? await readMappingFile(options.columns) : undefined;
    const checked = await checkLog(logFile, { mapping, timezone: options.tz, units: logUnits });
    return { kind: 'log', logFile, mapping, tz: options.tz, logUnits, units, checked };
  }
  if (options.db === undefined || options.zone === undefined) {
    throw usageError('Give a log file, or --db FILE and --zone SITE/ZONE.');
  }
  const { site, zone } = parseZoneRef(options.zone);
  return { kind: 'zone', db: options.db, ref: options.zone, site, zone, units };
}
