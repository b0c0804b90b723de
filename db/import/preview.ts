/**
 * previewLog: what an import of a file would do, without touching any store: delimiter, decimal mark,
 * header, the first rows, the detected mapping, units, the time format and the warnings. Problems that
 * would stop an import (no indoor column, local times without a time zone …) are listed, not thrown.
 *
 * Throws ImportError only when the file cannot be read as a text table at all (missing, empty, binary,
 * no header row).
 *
 * @example
 * const p = await previewLog('export.csv', { timezone: 'Europe/Berlin' });
 * p.mapping;   // { time: 'Zeit', indoor: 'Raumtemperatur (°C)', … } or null
 * p.problems;  // [] when importLog would run
 */
import { ImportError } from '../errors.ts';
import { buildPlan, readSample } from './plan.ts';
import type { LogPreview, ReadOptions } from './types.ts';

export async function previewLog(filePath: string, options: ReadOptions = {}): Promise<LogPreview> {
  const sample = await readSample(filePath);
  const r = buildPlan(sample, options);
  if (r.header.length === 0) {
    const p = r.problems[r.problems.length - 1];
    throw new ImportError(sample.file, p?.message ?? 'the file holds no table', { line: p?.line });
  }
  return {
    file: sample.file,
    encoding: sample.encoding,
    delimiter: r.delimiter,
    decimal: r.decimal,
    headerLine: r.headerLine,
    header: r.header,
    rows: r.rows,
    mapping: r.mapping,
    columns: r.columns,
    units: r.units,
    timeFormat: r.timeFormat,
    needsTimezone: r.needsTimezone,
    warnings: r.warnings,
    problems: r.problems.map((p) =>
      p.line !== undefined ? `line ${p.line}${p.column !== undefined ? `, column ${p.column}${p.columnName ? ` (${p.columnName})` : ''}` : ''}: ${p.message}` : p.message,
    ),
  };
}
