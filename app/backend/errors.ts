/**
 * Errors the services raise on purpose, and the translation of any thrown value into the contract's
 * error envelope (a stable code and a plain sentence, with file, line and column where known).
 */
import type { ApiErrorInfo } from '../api/contract.ts';

export class ServiceError extends Error {
  readonly code: string;
  constructor(code: string, message: string) {
    super(message);
    this.name = 'ServiceError';
    this.code = code;
  }
}

function str(value: unknown): string | undefined {
  return typeof value === 'string' && value.length > 0 ? value : undefined;
}

/**
 * Turns a thrown value into an error envelope. Errors with a `code` (ServiceError, core's
 * HeatlagError, db's ImportError) keep their message; anything else is an internal error whose
 * details go to the log, not to the screen.
 */
export function toApiError(err: unknown, log: (msg: string) => void = (m) => console.error(m)): ApiErrorInfo {
  if (err instanceof Error) {
    const e = err as Error & { code?: unknown; file?: unknown; line?: unknown; column?: unknown };
    const known = typeof e.code === 'string' && !/^[A-Z_]+$/.test(e.code); // Node's ENOENT etc. are not ours
    if (known || e.name === 'ImportError') {
      const info: ApiErrorInfo = { code: known ? (e.code as string) : 'import', message: e.message };
      const file = str(e.file);
      if (file) info.file = file.split(/[\\/]/).pop() ?? file;
      if (typeof e.line === 'number' && Number.isInteger(e.line)) info.line = e.line;
      const column = typeof e.column === 'number' ? String(e.column) : str(e.column);
      if (column) info.column = column;
      return info;
    }
    if (e.code === 'ENOENT') return { code: 'not-found', message: 'A file the app needed was not found.' };
    log(`heatlag: internal error: ${err.stack ?? err.message}`);
    return { code: 'internal', message: `Something went wrong inside Heatlag: ${err.message}` };
  }
  log(`heatlag: internal error: ${String(err)}`);
  return { code: 'internal', message: 'Something went wrong inside Heatlag.' };
}
