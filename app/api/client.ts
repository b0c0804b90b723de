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

/** Carries one call to the backend and returns its envelope. */
export type Invoke = (method: Method, input: unknown) => Promise<Envelope<unknown>>;

export function createApi(invoke: Invoke): HeatlagApi {
  const api: Record<string, (input: unknown) => Promise<unknown>> = {};
  for (const name of methodNames) {
    api[name] = async (input: unknown) => {
      const envelope = await invoke(name, input ?? {});
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
