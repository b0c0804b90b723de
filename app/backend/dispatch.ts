/**
 * The one entry point through which IPC (desktop) and HTTP (browser mode) reach the services:
 * checks the method name, validates the input against the contract, runs the handler, and returns
 * an envelope. Nothing a caller sends reaches a handler unvalidated.
 */
import {
  contract,
  describeZodError,
  isMethod,
  type Envelope,
  type HeatlagApi,
} from '../api/contract.ts';
import { toApiError } from './errors.ts';

export type Handlers = HeatlagApi;

export interface DispatchOptions {
  /** Also validate outputs (tests and development); the renderer's client validates them anyway. */
  checkOutput?: boolean;
  log?: (msg: string) => void;
}

export async function dispatch(
  handlers: Handlers,
  method: string,
  rawInput: unknown,
  options: DispatchOptions = {},
): Promise<Envelope<unknown>> {
  if (!isMethod(method)) {
    return { ok: false, error: { code: 'unknown-method', message: `There is no method called ${JSON.stringify(method).slice(0, 80)}.` } };
  }
  const parsed = contract[method].input.safeParse(rawInput ?? {});
  if (!parsed.success) {
    return { ok: false, error: { code: 'input', message: describeZodError(method, parsed.error) } };
  }
  try {
    const handler = handlers[method] as (input: unknown) => Promise<unknown>;
    const value = await handler(parsed.data);
    if (options.checkOutput) {
      const out = contract[method].output.safeParse(value);
      if (!out.success) {
        throw new Error(`${method} returned data outside the contract: ${describeZodError(method, out.error)}`);
      }
    }
    return { ok: true, value };
  } catch (err) {
    return { ok: false, error: toApiError(err, options.log) };
  }
}
