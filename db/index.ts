/**
 * db/: the SQLite store and the log import. The explicit list of what other layers may use.
 *
 * Store (openStore(file | ':memory:')): sites and zones (create, find, rename, delete with counts,
 * listZones with readings and span), loadSeries → ZoneSeries (Float64Arrays, °C, NaN for missing),
 * logs (listLogs, getLog, deleteLog, rejectedRows), saved mappings, fitted responses; a site's time zone
 * (setSiteTimezone) and the one rule for a zone's time zone (zoneTimeZone, db/timezone.ts).
 *
 * Import: previewLog(file, { mapping?, timezone?, units? }) → LogPreview (no store needed);
 * checkLog(file, { mapping?, timezone?, units? }) → the sample and plan, or the ImportError an import
 * would throw from the first rows (no store needed; import db/import/check.ts directly to load no store);
 * importLog(store, file, { zoneId, mapping?, timezone?, units?, onProgress?, signal? }) → ImportResult,
 * all rows or none; readMappingFile(file) → ColumnMapping (core/mapping.ts).
 *
 * Errors: ImportError { file, line?, column?, columnName? } and StoreError { kind }, both HeatlagError.
 */
export { openStore, Store } from './store.ts';
export type { ImportBatch, ImportCommit, StoreOptions } from './store.ts';
export type {
  DeleteCounts,
  LogSummary,
  RejectedRow,
  SavedMapping,
  Site,
  SiteSummary,
  StoredResponse,
  StoredSchedule,
  Zone,
  ZoneSummary,
} from './types.ts';
export { ImportError, StoreError, formatPosition } from './errors.ts';
export { canonicalTimeZone, zoneTimeZone } from './timezone.ts';
export type { TimeZoneSource } from './timezone.ts';
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
export { importLog, type CheckedImportOptions } from './import/import.ts';
export { checkLog, type CheckedLog } from './import/check.ts';
export { previewLog } from './import/preview.ts';
export { readMappingFile, readMappingFileSync } from './import/mapping-file.ts';
export { INDOOR_RANGE_C, OUTDOOR_RANGE_C, SETPOINT_RANGE_C, TIME_RANGE_MS } from './import/rows.ts';
