/**
 * checkLog: the part of an import that the first rows decide, on its own: the file's sample read
 * (sample.ts: its first 256 KB at most, decoded, binary refused) and the plan worked out from it
 * (plan.ts: layout, columns, units, time format and zone). It opens no store and reads no further row,
 * so a refusal it makes (local times without a time zone, no indoor column …) comes at once whatever
 * the file's size. importLog runs the same checks (or takes their result) before it reads the rows.
 *
 * Throws ImportError with the file, line and column of the first problem; the messages are importLog's.
 *
 * @example
 * const checked = await checkLog('year.csv', { timezone: 'America/Chicago' });
 * await importLog(store, 'year.csv', { zoneId, timezone: 'America/Chicago', checked });
 */
import { ImportError } from '../errors.ts';
import { buildPlan, readSample, type Plan, type Sample } from './plan.ts';
import type { ReadOptions } from './types.ts';

/** A file whose first rows passed the import's checks: its sample and the plan to read it by. */
export interface CheckedLog {
  sample: Sample;
  plan: Plan;
}

/** The plan of `sample` under `options`, or the ImportError an import would throw for it. */
export function planOrRefuse(sample: Sample, options: ReadOptions): Plan {
  const planned = buildPlan(sample, options, { firstProblem: true });
  if (planned.plan === null) {
    const p = planned.problems[0] ?? { message: 'the layout of the file could not be worked out' };
    throw new ImportError(sample.file, p.message, { line: p.line, column: p.column, columnName: p.columnName });
  }
  return planned.plan;
}

/** Reads the file's sample and plans its import (see above). */
export async function checkLog(filePath: string, options: ReadOptions = {}): Promise<CheckedLog> {
  const sample = await readSample(filePath);
  return { sample, plan: planOrRefuse(sample, options) };
}
