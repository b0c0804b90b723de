/**
 * importLog: reads a thermostat export (CSV/TSV) into a zone of the store.
 *
 * The file is streamed (fs.createReadStream, decoded with a streaming TextDecoder, split by papaparse's
 * parser chunk by chunk) into typed arrays; only then is everything written in one synchronous SQLite
 * transaction, so the import commits whole or not at all, and nothing asynchronous runs inside the
 * transaction. Rows that cannot be read are stored with the log as rejected rows (line, column, reason).
 *
 * Throws ImportError (nothing written) when the file cannot be read, its layout cannot be worked out
 * (no time or indoor column, local times without a time zone), no row is readable, or the write fails.
 *
 * @example
 * const zone = store.getOrCreateZone('Maple Street School', 'Gym');
 * const r = await importLog(store, 'gym.csv', { zoneId: zone.id, timezone: 'America/Chicago' });
 * r.rowsAccepted; r.rejected[0]?.reason; r.warnings;
 */
import { createHash } from 'node:crypto';
import { closeSync, createReadStream, openSync, readSync } from 'node:fs';
import { ImportError, StoreError } from '../errors.ts';
import type { Store } from '../store.ts';
import { makeStreamDecoder, zeroByte } from './decode.ts';
import { planOrRefuse, type CheckedLog } from './check.ts';
import { readSample } from './plan.ts';
import { RowReader } from './rows.ts';
import type { ImportOptions, ImportResult } from './types.ts';
import type { ZoneSeries } from '../../core/types.ts';

/** Rejected rows listed in an ImportResult (all of them are stored). */
const RESULT_REJECTED = 1000;
const CHUNK_BYTES = 1024 * 1024;

/** importLog's options, with the result of checkLog when the caller checked the file first. */
export interface CheckedImportOptions extends ImportOptions {
  /**
   * checkLog(filePath, the same read options), when the caller checked the file before it opened a store
   * (the command line refuses a bad file that way): its sample and plan are used instead of being read
   * and worked out again.
   */
  checked?: CheckedLog;
}

export async function importLog(store: Store, filePath: string, options: CheckedImportOptions): Promise<ImportResult> {
  const checked = options.checked;
  if (checked !== undefined && checked.sample.path !== filePath) {
    throw new Error(`importLog: options.checked is the check of ${checked.sample.path}, not of ${filePath}`);
  }
  const sample = checked?.sample ?? (await readSample(filePath));
  const file = sample.file;
  if (!store.getZone(options.zoneId)) throw new ImportError(file, `there is no zone #${options.zoneId} to import into`);
  const plan = checked?.plan ?? planOrRefuse(sample, options);
  const reader = new RowReader(plan);
  const decoder = makeStreamDecoder(plan.encoding, plan.bomLength);
  const hash = createHash('sha256');
  const total = sample.bytes;
  let done = 0;
  const signal = options.signal;
  const cancelled = () => new ImportError(file, 'the import was cancelled; nothing was added');
  if (signal?.aborted) throw cancelled();

  // A zero byte past the sample (which sniffEncoding checked) is found chunk by chunk (memchr), in
  // 8-bit and UTF-8 text where it never belongs; its line is counted only then, from the file's start.
  const nulCheck = !plan.encoding.startsWith('utf-16');
  const stream = createReadStream(filePath, { highWaterMark: CHUNK_BYTES });
  try {
    for await (const chunk of stream as AsyncIterable<Buffer>) {
      const z = nulCheck ? chunk.indexOf(0) : -1;
      if (z >= 0) {
        const at = done + z;
        const head = Buffer.alloc(at + 1);
        const fd = openSync(filePath, 'r');
        try {
          readSync(fd, head, 0, at + 1, 0);
        } finally {
          closeSync(fd);
        }
        const found = zeroByte(head, at, 0, 0);
        throw new ImportError(file, `${found.binary}. Export the log as CSV or TSV text.`, { line: found.line });
      }
      hash.update(chunk);
      done += chunk.length;
      reader.feed(decoder.write(chunk), false);
      options.onProgress?.(done, Math.max(total, done));
      if (signal?.aborted) throw cancelled();
    }
    reader.feed(decoder.end(), true);
  } catch (err) {
    stream.destroy();
    if (err instanceof ImportError) throw err;
    throw new ImportError(file, `reading the file failed: ${(err as Error).message}`, {}, { cause: err });
  }

  const cols = reader.finish();
  if (cols.count === 0) {
    const first = cols.rejected[0];
    if (first === undefined) throw new ImportError(file, 'the file has a header but no data rows', { line: plan.headerLine });
    throw new ImportError(
      file,
      `no row could be imported (${cols.rejected.length} rejected); the first: ${first.reason}`,
      { line: first.line, column: first.column ?? undefined, columnName: first.columnName ?? undefined },
    );
  }

  const sha256 = hash.digest('hex');
  const warnings = [...plan.warnings, ...cols.warnings];
  const before = store.logsWithHash(options.zoneId, sha256);
  const earlier = before.length > 0 ? `This file was imported into the zone before (log #${before[0].id}, ${new Date(before[0].importedAt).toISOString().slice(0, 16).replace('T', ' ')} UTC)` : null;
  const nRejected = cols.rejected.length;
  const rejectedNote = nRejected > 0 ? `${nRejected} row${nRejected === 1 ? '' : 's'} could not be read and ${nRejected === 1 ? 'was' : 'were'} rejected` : null;
  // Stored with the log (when it is kept: see noLogWarnings below for an import that adds nothing).
  const logWarnings = [...warnings];
  if (earlier !== null) logWarnings.push(`${earlier}; readings already stored were not added again.`);
  if (rejectedNote !== null) logWarnings.push(`${rejectedNote} (see the rejected rows of the log).`);
  const intervalMinutes = cols.intervalMs === cols.intervalMs ? cols.intervalMs / 60_000 : NaN;
  const firstTime = cols.time[0];
  const lastTime = cols.time[cols.count - 1];

  if (signal?.aborted) throw cancelled();
  let commit;
  let extra: string[] = [];
  try {
    commit = store.commitImport({
      zoneId: options.zoneId,
      fileName: file,
      sha256,
      bytes: done,
      encoding: plan.encoding,
      units: plan.unit,
      mapping: plan.mapping,
      warnings: logWarnings,
      intervalMinutes: Number.isFinite(intervalMinutes) ? intervalMinutes : null,
      firstTime,
      lastTime,
      count: cols.count,
      time: cols.time,
      indoor: cols.indoor,
      outdoor: cols.outdoor,
      heatSetpoint: cols.heatSetpoint,
      coolSetpoint: cols.coolSetpoint,
      heat: cols.heat,
      cool: cols.cool,
      rejected: cols.rejected,
      duplicatesInFile: cols.duplicatesInFile,
      afterInsert: (c) => {
        const more: string[] = [];
        if (c.duplicatesInStore > 0) {
          const one = c.duplicatesInStore === 1;
          more.push(`${c.duplicatesInStore} reading${one ? ' was' : 's were'} in the store already (same zone and time) and ${one ? 'was' : 'were'} not added again.`);
        }
        extra = more;
        return more;
      },
    });
  } catch (err) {
    if (err instanceof StoreError && err.kind === 'not-found') throw new ImportError(file, `the zone #${options.zoneId} no longer exists; nothing was added`, {}, { cause: err });
    throw new ImportError(file, `writing to the store failed, nothing was added: ${(err as Error).message}`, {}, { cause: err });
  }
  let logId: number;
  if (commit.logId !== null) {
    logId = commit.logId;
    warnings.splice(0, warnings.length, ...logWarnings, ...extra);
  } else {
    // Every reading was in the zone already: no log was kept (writeImport). Said once, plainly.
    warnings.push(
      earlier !== null
        ? `${earlier} and every reading of it is there already: it added no readings, so no log was added.`
        : `All ${commit.duplicatesInStore} readings were in the zone already: the file added no readings, so no log was added.`,
    );
    if (rejectedNote !== null) warnings.push(`${rejectedNote}.`);
    logId = before[0]?.id ?? store.listLogs(options.zoneId).at(-1)!.id;
  }
  options.onProgress?.(done, Math.max(total, done));

  return {
    logId,
    logAdded: commit.logId !== null,
    alreadyImportedAt: before[0]?.importedAt ?? null,
    file,
    rowsAccepted: commit.inserted,
    rowsRejected: cols.rejected.length,
    duplicates: cols.duplicatesInFile + commit.duplicatesInStore,
    rejected: cols.rejected.slice(0, RESULT_REJECTED).map((r) => ({ line: r.line, column: r.column, columnName: r.columnName, reason: r.reason })),
    firstTime,
    lastTime,
    intervalMinutes,
    units: plan.unit,
    mapping: plan.mapping,
    encoding: plan.encoding,
    sha256,
    bytes: done,
    warnings,
    ...(options.keepReadings ? { readings: keptReadings(cols) } : {}),
  };
}

/** The first `count` readings of the import's columns, as a series (views, not copies). */
function keptReadings(cols: { count: number; time: Float64Array; indoor: Float64Array; outdoor: Float64Array; heatSetpoint: Float64Array; coolSetpoint: Float64Array; heat: Float64Array; cool: Float64Array }): ZoneSeries {
  const n = cols.count;
  return {
    time: cols.time.subarray(0, n),
    indoor: cols.indoor.subarray(0, n),
    outdoor: cols.outdoor.subarray(0, n),
    heatSetpoint: cols.heatSetpoint.subarray(0, n),
    coolSetpoint: cols.coolSetpoint.subarray(0, n),
    heat: cols.heat.subarray(0, n),
    cool: cols.cool.subarray(0, n),
  };
}
