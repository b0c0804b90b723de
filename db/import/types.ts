/**
 * Options and results of the log import and preview.
 */
import type { ColumnMapping, Delimiter, RuntimeFormat } from '../../core/mapping.ts';
import type { TempUnit, ZoneSeries } from '../../core/types.ts';

export interface ReadOptions {
  /** Column mapping; what it leaves out is detected from the header and the values. */
  mapping?: ColumnMapping;
  /** IANA time zone of local (offset-less) times; overrides mapping.timezone (the CLI's --tz). */
  timezone?: string;
  /** Unit of the file's temperatures; overrides mapping.units and the detection (the CLI's --units). */
  units?: TempUnit;
}

export interface ImportOptions extends ReadOptions {
  /** Zone the readings belong to. */
  zoneId: number;
  /** Progress of reading the file: bytes read so far and the file size. */
  onProgress?: (bytesRead: number, totalBytes: number) => void;
  /** Cancels the import (nothing is added) when aborted. */
  signal?: AbortSignal;
  /**
   * Also return the file's readings as imported (ImportResult.readings), so a caller that imported
   * into an empty zone (a one-off fit of a file) need not read them back from the store.
   */
  keepReadings?: boolean;
}

/** Where a row could not be read: 1-based line and column (null: the row as a whole), and why. */
export interface RejectedRowInfo {
  line: number;
  column: number | null;
  columnName: string | null;
  reason: string;
}

export interface ImportResult {
  /**
   * The log of the import. When it added no reading (`logAdded` false) no log was kept, and this is the
   * zone's log that holds the readings already: the earlier import of the same file, else the newest log.
   */
  logId: number;
  /** False when the import added no reading (every time was in the zone already): no log was kept. */
  logAdded: boolean;
  /** When the same file (the same bytes) was first imported into the zone before, epoch ms; else null. */
  alreadyImportedAt: number | null;
  /** The file's name (no directory). */
  file: string;
  /** Readings added to the store. */
  rowsAccepted: number;
  /** Rows that could not be read (all are stored with the log; see Store.rejectedRows). */
  rowsRejected: number;
  /** Readable rows whose time was in the file earlier or in the store already: counted, not added again. */
  duplicates: number;
  /** The first 1000 rejected rows (all are in the store). */
  rejected: RejectedRowInfo[];
  /** First and last readable reading of the file, epoch ms UTC. */
  firstTime: number;
  lastTime: number;
  /** Typical time between readings (median), minutes. */
  intervalMinutes: number;
  /** Unit the file's temperatures were read in (stored as °C). */
  units: TempUnit;
  /** The mapping used: the given one completed with what was detected. */
  mapping: ColumnMapping;
  encoding: string;
  sha256: string;
  bytes: number;
  /** Plain sentences about guesses and oddities (unit guessed from values, DST hours, capped runtime …). */
  warnings: string[];
  /**
   * With keepReadings: the file's readable readings in time order, internal units (NaN where missing).
   * For a zone that had no readings before, this is exactly what Store.loadSeries returns afterwards.
   */
  readings?: ZoneSeries;
}

/** What the detection made of one column. */
export interface ColumnGuess {
  /** 1-based column number. */
  index: number;
  name: string;
  /** The role it was given, or null (ignored). */
  role: ColumnRole | null;
  /** Temperature unit the header states, if any. */
  unit: TempUnit | null;
  /** How a runtime column is read. */
  runtimeAs?: RuntimeFormat;
}

export type ColumnRole =
  | 'time'
  | 'date'
  | 'clock'
  | 'indoor'
  | 'outdoor'
  | 'heatSetpoint'
  | 'coolSetpoint'
  | 'heating'
  | 'cooling'
  | 'heating+cooling';

export interface LogPreview {
  file: string;
  encoding: string;
  delimiter: Delimiter;
  decimal: '.' | ',';
  /** 1-based line of the header row (lines before it are skipped). */
  headerLine: number;
  header: string[];
  /** The first data rows (up to 20) as text fields. */
  rows: string[][];
  /** The detected (or given, completed) mapping; null when the time or indoor column could not be found. */
  mapping: ColumnMapping | null;
  columns: ColumnGuess[];
  /** Unit the temperatures would be read in; null if unknown. */
  units: TempUnit | null;
  /** How timestamps are read, in words, e.g. "ISO 8601 with UTC offset" or "dd.MM.yyyy HH:mm in Europe/Berlin". */
  timeFormat: string | null;
  /** Whether the times are local wall-clock times that need a time zone. */
  needsTimezone: boolean;
  /** Guesses and oddities a person should check. */
  warnings: string[];
  /** What would stop an import as things stand (e.g. "give a time zone"); empty when it can run. */
  problems: string[];
}
