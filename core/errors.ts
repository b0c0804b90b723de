/**
 * Typed errors of the zone response engine. Every error a solver or fitter throws on purpose is a
 * HeatlagError with a stable `code` (for programs) and a plain message (for people).
 */

/** Base class: `code` is a short stable identifier such as 'input' or 'underdetermined'. */
export class HeatlagError extends Error {
  readonly code: string;

  constructor(code: string, message: string, options?: { cause?: unknown }) {
    super(message, options);
    this.name = 'HeatlagError';
    this.code = code;
  }
}

/** Input that cannot be used as given (out of range, not finite, inconsistent). */
export class InputError extends HeatlagError {
  constructor(message: string, options?: { cause?: unknown }) {
    super('input', message, options);
    this.name = 'InputError';
  }
}

/** The data cannot determine the requested quantity (e.g. τ from readings that never move). */
export class UnderdeterminedError extends HeatlagError {
  constructor(message: string, options?: { cause?: unknown }) {
    super('underdetermined', message, options);
    this.name = 'UnderdeterminedError';
  }
}
