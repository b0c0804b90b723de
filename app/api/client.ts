/**
 * The typed client of the API contract: one function per method, over any transport (Electron IPC
 * through the preload, or HTTP in browser mode). Outputs are validated against the contract, so a
 * backend that drifts from it fails loudly at the boundary instead of deep inside a screen.
 */
import {
  ApiError,
  contract,
  methodNames,
  type Envelope,
  type HeatlagApi,
  type Method,
} from './contract.ts';
import { FALLBACK_TIME_ZONE_KEY } from './time-zone.ts';

/** Carries one call to the backend and returns its envelope. */
export type Invoke = (method: Method, input: unknown) => Promise<Envelope<unknown>>;

/** What the client adds to the calls that take it. */
export interface ClientDefaults {
  /**
   * The caller's own IANA time zone, sent to every method whose input has `fallbackTimeZone` (unless
   * the call gives one), so the backend lays out the days of a zone with no time zone of its own as the
   * caller shows them.
   */
  fallbackTimeZone?: string;
}

/** Whether a method's input schema has the field `key`. */
function takes(name: Method, key: string): boolean {
  const shape = (contract[name].input as { shape?: Record<string, unknown> }).shape;
  return shape !== undefined && Object.prototype.hasOwnProperty.call(shape, key);
}

export function createApi(invoke: Invoke, defaults: ClientDefaults = {}): HeatlagApi {
  const api: Record<string, (input: unknown) => Promise<unknown>> = {};
  for (const name of methodNames) {
    const addZone = defaults.fallbackTimeZone !== undefined && takes(name, FALLBACK_TIME_ZONE_KEY);
    api[name] = async (input: unknown) => {
      let sent = input ?? {};
      if (addZone && typeof sent === 'object' && !(FALLBACK_TIME_ZONE_KEY in sent)) {
        sent = { ...sent, [FALLBACK_TIME_ZONE_KEY]: defaults.fallbackTimeZone };
      }
      const envelope = await invoke(name, sent);
      if (!envelope.ok) throw new ApiError(envelope.error);
      const parsed = contract[name].output.safeParse(envelope.value);
      if (!parsed.success) {
        throw new ApiError({
          code: 'contract',
          message: `The backend answered ${name} with data the app does not understand: ${parsed.error.issues[0]?.message ?? 'invalid'}.`,
        });
      }
      return parsed.data;
    };
  }
  return Object.freeze(api) as unknown as HeatlagApi;
}
