/**
 * The write of one import (Store.commitImport runs it inside its transaction): the log, its readings
 * (INSERT OR IGNORE on (zone, time), so times the zone has already are counted, not added, in
 * statements of SAMPLE_BATCH rows), its rejected rows and the counts. An import that adds no reading
 * (every time was in the zone already: a re-import) keeps no log: the zone lists no empty log and
 * nothing is counted twice.
 */
import type { ColumnMapping } from '../../core/mapping.ts';
import type { TempUnit } from '../../core/types.ts';
import type { RejectedRow } from '../types.ts';
import { nowMs } from './records.ts';
import { SAMPLE_BATCH, type Statements } from './statements.ts';

/** Readings and bookkeeping of one import, in time order, internal units (see importLog). */
export interface ImportBatch {
  zoneId: number;
  fileName: string;
  sha256: string;
  bytes: number;
  encoding: string;
  units: TempUnit;
  mapping: ColumnMapping;
  warnings: string[];
  intervalMinutes: number | null;
  firstTime: number | null;
  lastTime: number | null;
  /** Number of readings in the arrays below (the arrays may be longer). */
  count: number;
  time: Float64Array;
  indoor: Float64Array;
  outdoor: Float64Array;
  heatSetpoint: Float64Array;
  coolSetpoint: Float64Array;
  heat: Float64Array;
  cool: Float64Array;
  rejected: RejectedRow[];
  /** Readable rows dropped because the file had the same time earlier. */
  duplicatesInFile: number;
  /** Called with the number of readings written so far (every few thousand rows). */
  onRow?: (written: number) => void;
  /** Extra warnings once the counts are known (stored with the log, inside the same transaction; not called when no log is kept). */
  afterInsert?: (commit: ImportCommit) => string[];
}

export interface ImportCommit {
  /** The new log; null when the import added no reading, so no log was kept (nor its rejected rows). */
  logId: number | null;
  /** Readings added. */
  inserted: number;
  /** Readings whose time the zone already had. */
  duplicatesInStore: number;
}

/** Writes the batch with the store's statements; the caller holds the transaction and checks the zone. */
export function writeImport(st: Statements, b: ImportBatch): ImportCommit {
  const info = st.insertLog.run(
    b.zoneId,
    b.fileName,
    b.sha256,
    b.bytes,
    nowMs(),
    JSON.stringify(b.mapping),
    b.encoding,
    b.units,
    b.firstTime,
    b.lastTime,
    b.intervalMinutes,
    JSON.stringify(b.warnings),
  );
  const logId = Number(info.lastInsertRowid);
  const one = st.insertSample;
  const many = st.insertSamples;
  const { zoneId, time, indoor, outdoor, heatSetpoint, coolSetpoint, heat, cool, onRow } = b;
  const ids = { zone: zoneId, log: logId };
  const args: (number | null)[] = new Array(7 * SAMPLE_BATCH);
  let inserted = 0;
  let i = 0;
  for (; i + SAMPLE_BATCH <= b.count; i += SAMPLE_BATCH) {
    for (let j = 0, k = i, o = 0; j < SAMPLE_BATCH; j++, k++, o += 7) {
      const x = outdoor[k], hs = heatSetpoint[k], cs = coolSetpoint[k], h = heat[k], c = cool[k];
      args[o] = time[k];
      args[o + 1] = indoor[k];
      args[o + 2] = x === x ? x : null;
      args[o + 3] = hs === hs ? hs : null;
      args[o + 4] = cs === cs ? cs : null;
      args[o + 5] = h === h ? h : null;
      args[o + 6] = c === c ? c : null;
    }
    inserted += many.run(args, ids).changes;
    if (onRow !== undefined && (i & 8191) < SAMPLE_BATCH) onRow(i + SAMPLE_BATCH);
  }
  for (; i < b.count; i++) {
    const x = outdoor[i], hs = heatSetpoint[i], cs = coolSetpoint[i], h = heat[i], c = cool[i];
    inserted += one.run(time[i], indoor[i], x === x ? x : null, hs === hs ? hs : null, cs === cs ? cs : null, h === h ? h : null, c === c ? c : null, ids).changes;
  }
  if (inserted === 0) {
    // Nothing new: the log row goes again (no reading refers to it), in the same transaction.
    st.deleteLog.run(logId);
    return { logId: null, inserted: 0, duplicatesInStore: b.count };
  }
  const rej = st.insertRejected;
  for (const r of b.rejected) rej.run(logId, r.line, r.column, r.columnName, r.reason, r.raw);
  const duplicatesInStore = b.count - inserted;
  const commit: ImportCommit = { logId, inserted, duplicatesInStore };
  const warnings = b.afterInsert ? [...b.warnings, ...b.afterInsert(commit)] : b.warnings;
  st.finishLog.run(inserted, b.rejected.length, b.duplicatesInFile + duplicatesInStore, JSON.stringify(warnings), logId);
  st.setZoneUnits.run(b.units, b.zoneId);
  return commit;
}
