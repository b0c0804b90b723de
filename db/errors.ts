/**
 * Typed errors of the store and the log import. Both extend core's HeatlagError (stable `code`, plain
 * message), so callers can catch every deliberate error of the program in one place.
 */
import { HeatlagError } from '../core/errors.ts';

/** Where in a log file an import problem sits (line and column 1-based). */
export interface FilePosition {
  line?: number;
  column?: number;
  /** Header name of the column, when known. */
  columnName?: string;
}

/**
 * A log file that cannot be imported (nothing was added to the store), or a row that cannot be read.
 * The message names the file, and the line and column where known, e.g.
 * `log.csv line 12, column 3 (Indoor): 'abc' is not a number`.
 */
export class ImportError extends HeatlagError {
  /** The file's name as given (for messages). */
  readonly file: string;
  readonly line?: number;
  readonly column?: number;
  readonly columnName?: string;

  constructor(file: string, reason: string, where: FilePosition = {}, options?: { cause?: unknown }) {
    super('import', `${formatPosition(file, where)}: ${reason}`, options);
    this.name = 'ImportError';
    this.file = file;
    this.line = where.line;
    this.column = where.column;
    this.columnName = where.columnName;
  }
}

/** "log.csv line 12, column 3 (Indoor)". */
export function formatPosition(file: string, where: FilePosition): string {
  let s = file;
  if (where.line !== undefined) s += ` line ${where.line}`;
  if (where.column !== undefined) {
    s += `${where.line !== undefined ? ',' : ''} column ${where.column}`;
    if (where.columnName !== undefined && where.columnName !== '') s += ` (${where.columnName})`;
  }
  return s;
}

/**
 * Kinds of store errors:
 * - newer-database: the file was written by a newer Heatlag (its schema version is unknown here);
 * - not-a-store: the file is not a Heatlag database;
 * - not-found: no site, zone, log, response or mapping with that id or name;
 * - duplicate: a site, zone or mapping with that name exists already;
 * - invalid: a name or value that cannot be stored (blank name, not-finite number).
 */
export type StoreErrorCode = 'newer-database' | 'not-a-store' | 'not-found' | 'duplicate' | 'invalid';

/** A store operation that cannot be done; `kind` says which kind (see StoreErrorCode). */
export class StoreError extends HeatlagError {
  readonly kind: StoreErrorCode;

  constructor(kind: StoreErrorCode, message: string, options?: { cause?: unknown }) {
    super(`store-${kind}`, message, options);
    this.name = 'StoreError';
    this.kind = kind;
  }
}
