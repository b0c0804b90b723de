/**
 * db/: the SQLite store and the log import. The explicit list of what other layers may use.
 */
export { openStore, Store } from './store.ts';
export type { ImportBatch, ImportCommit } from './store.ts';
export type {
  DeleteCounts,
  LogSummary,
  RejectedRow,
  SavedMapping,
  Site,
  SiteSummary,
  StoredResponse,
  Zone,
  ZoneSummary,
} from './types.ts';
export { ImportError, StoreError, formatPosition } from './errors.ts';
export type { FilePosition, StoreErrorCode } from './errors.ts';
export { APPLICATION_ID, latestVersion, loadMigrations, migrate } from './migrate.ts';
export type { Migration } from './migrate.ts';
export type {
  ColumnGuess,
  ColumnRole,
  ImportOptions,
  ImportResult,
  LogPreview,
  ReadOptions,
  RejectedRowInfo,
} from './import/types.ts';
export { importLog } from './import/import.ts';
export { previewLog } from './import/preview.ts';
export { readMappingFile, readMappingFileSync } from './import/mapping-file.ts';
export { INDOOR_RANGE_C, OUTDOOR_RANGE_C, SETPOINT_RANGE_C, TIME_RANGE_MS } from './import/rows.ts';
