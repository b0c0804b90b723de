/**
 * The column mapping of a log file: which column holds what, and how to read it.
 *
 * A mapping is plain JSON, written by a person or saved from the import preview, e.g.
 *   { "time": ["Datum", "Uhrzeit"], "dateFormat": "dd.MM.yyyy HH:mm", "indoor": "Raumtemperatur",
 *     "heating": { "column": "Heizung", "as": "percent" }, "units": "C", "timezone": "Europe/Berlin" }
 *
 * Columns are named by their header text (matched exactly first, then ignoring case and surrounding
 * spaces). Every key but `time` and `indoor` is optional; what is left out is detected from the file.
 *
 * Pure TypeScript (zod only): reading a mapping file from disk lives in db/import/mapping-file.ts.
 */
import { z } from 'zod';
import { HeatlagError } from './errors.ts';
import { lineColumnAt } from './text.ts';
import { isValidTimeZone } from './zone-name.ts';
import type { TempUnit } from './types.ts';

export { isValidTimeZone, lineColumnAt };

/**
 * How a runtime column is written:
 * - seconds: seconds the equipment ran in the interval (converted to a fraction of the interval length);
 * - minutes: the same in minutes;
 * - fraction: 0–1 of the interval;
 * - percent: 0–100 % of the interval;
 * - onoff: the equipment state at the row's time (1/0, on/off, true/false, heat/idle …), taken as the
 *   fraction for the interval.
 */
export const RUNTIME_FORMATS = ['seconds', 'minutes', 'fraction', 'percent', 'onoff'] as const;
export type RuntimeFormat = (typeof RUNTIME_FORMATS)[number];

/** Field delimiters an import understands. */
export const DELIMITERS = [',', ';', '\t', '|'] as const;
export type Delimiter = (typeof DELIMITERS)[number];

const columnName = z
  .string({ error: 'must be a column name from the header (text)' })
  .trim()
  .min(1, { error: 'must not be empty' });

export const RuntimeColumnSchema = z.strictObject({
  column: columnName,
  as: z.enum(RUNTIME_FORMATS, { error: `must be one of ${RUNTIME_FORMATS.join(', ')}` }),
});
export type RuntimeColumn = z.infer<typeof RuntimeColumnSchema>;

export const ColumnMappingSchema = z.strictObject({
  /** One column holding date and time, or [date column, time-of-day column]. */
  time: z.union([columnName, z.tuple([columnName, columnName])], {
    error: 'must be a column name, or [date column, time column]',
  }),
  /** Unicode LDML pattern of the time (luxon tokens), e.g. "dd.MM.yyyy HH:mm"; split columns are joined by one space. */
  dateFormat: z.string({ error: 'must be a date pattern such as "dd.MM.yyyy HH:mm"' }).trim().min(1, { error: 'must not be empty' }).optional(),
  indoor: columnName,
  outdoor: columnName.optional(),
  heatSetpoint: columnName.optional(),
  coolSetpoint: columnName.optional(),
  heating: RuntimeColumnSchema.optional(),
  cooling: RuntimeColumnSchema.optional(),
  /** Unit of every temperature in the file. */
  units: z.enum(['F', 'C'], { error: 'must be "F" or "C"' }).optional(),
  delimiter: z.enum(DELIMITERS, { error: 'must be one of "," ";" "\\t" "|"' }).optional(),
  decimal: z.enum(['.', ','], { error: 'must be "." or ","' }).optional(),
  /** IANA time zone of local (offset-less) times, e.g. "America/Chicago". */
  timezone: z
    .string({ error: 'must be an IANA time zone name such as "America/Chicago"' })
    .trim()
    .refine(isValidTimeZone, { error: 'is not a known IANA time zone (e.g. "America/Chicago", "Europe/Berlin", "UTC")' })
    .optional(),
  /** Whether a row's runtime covers the interval ending at its time (default) or starting at it. */
  runtimeInterval: z.enum(['ending', 'starting'], { error: 'must be "ending" or "starting"' }).optional(),
});

/** A validated column mapping (see ColumnMappingSchema). */
export type ColumnMapping = z.infer<typeof ColumnMappingSchema>;
export type { TempUnit };

/** A mapping that cannot be used: names the offending key and, for a file, where it is. */
export class MappingError extends HeatlagError {
  /** Source name shown in the message (a file name, or "mapping"). */
  readonly source: string;
  /** Dotted key path of the problem, e.g. "heating.as"; undefined for a JSON syntax error. */
  readonly key?: string;
  /** 1-based line and column of a JSON syntax error. */
  readonly line?: number;
  readonly column?: number;

  constructor(source: string, message: string, where: { key?: string; line?: number; column?: number } = {}) {
    super('mapping', message);
    this.name = 'MappingError';
    this.source = source;
    this.key = where.key;
    this.line = where.line;
    this.column = where.column;
  }
}

const KEY_HELP: Record<string, string> = {
  time: 'the time column, or [date column, time column]',
  indoor: 'the indoor temperature column',
};

function describeIssue(issue: z.core.$ZodIssue): { key: string; text: string } {
  const path = issue.path.map(String);
  if (issue.code === 'unrecognized_keys') {
    const where = path.length ? `${path.join('.')}.` : '';
    const keys = issue.keys.map((k) => `"${where}${k}"`).join(', ');
    const known = path.length ? 'column, as' : Object.keys(ColumnMappingSchema.shape).join(', ');
    return { key: `${where}${issue.keys[0]}`, text: `unknown key ${keys} (known keys: ${known})` };
  }
  const key = path.join('.') || '(top level)';
  if (issue.code === 'invalid_type' && (issue as { input?: unknown }).input === undefined && path.length > 0) {
    const help = KEY_HELP[key] ?? (key.endsWith('.column') ? 'the column name' : key.endsWith('.as') ? RUNTIME_FORMATS.join(' | ') : undefined);
    return { key, text: `"${key}" is required${help ? ` (${help})` : ''}` };
  }
  if (path.length === 0) return { key, text: `a mapping must be a JSON object with at least "time" and "indoor"` };
  return { key, text: `"${key}" ${issue.message}` };
}

/**
 * Validates a mapping object. Throws MappingError whose message names the key, e.g.
 * `mapping.json: "heating.as" must be one of seconds, minutes, fraction, percent, onoff`.
 *
 * @example parseMapping({ time: 'time', indoor: 'Indoor Temp (F)', units: 'F' })
 */
export function parseMapping(value: unknown, source = 'mapping'): ColumnMapping {
  const result = ColumnMappingSchema.safeParse(value, { reportInput: true });
  if (result.success) return result.data;
  const described = result.error.issues.map(describeIssue);
  const first = described[0];
  const more = described.length > 1 ? `; also ${described.slice(1).map((d) => d.text).join('; ')}` : '';
  throw new MappingError(source, `${source}: ${first.text}${more}`, { key: first.key });
}

/**
 * Parses and validates the text of a mapping JSON file. A syntax error gives a MappingError with the
 * line and column, e.g. `mine.json line 3, column 12: Expected ',' or '}' after property value`.
 */
export function parseMappingJson(text: string, source = 'mapping'): ColumnMapping {
  const body = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  let value: unknown;
  try {
    value = JSON.parse(body);
  } catch (err) {
    const message = err instanceof Error ? err.message : String(err);
    const lc = /line (\d+) column (\d+)/.exec(message);
    const pos = /position (\d+)/.exec(message);
    const where = lc
      ? { line: Number(lc[1]), column: Number(lc[2]) }
      : pos
        ? lineColumnAt(body, Number(pos[1]))
        : body.trim() === ''
          ? { line: 1, column: 1 }
          : lineColumnAt(body, body.length);
    const reason = body.trim() === '' ? 'the file is empty' : message.replace(/\s*in JSON at position \d+.*$/, '').replace(/^JSON\.parse: /, '');
    throw new MappingError(source, `${source} line ${where.line}, column ${where.column}: ${reason} (not valid JSON)`, where);
  }
  return parseMapping(value, source);
}

/** The columns a mapping reads, in the order of the mapping keys (for messages and previews). */
export function mappedColumns(mapping: ColumnMapping): string[] {
  const out: string[] = [];
  if (Array.isArray(mapping.time)) out.push(...mapping.time);
  else out.push(mapping.time);
  out.push(mapping.indoor);
  for (const c of [mapping.outdoor, mapping.heatSetpoint, mapping.coolSetpoint, mapping.heating?.column, mapping.cooling?.column]) {
    if (c !== undefined && !out.includes(c)) out.push(c);
  }
  return out;
}
