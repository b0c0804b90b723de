/**
 * A zone's fitted response as the Response, Recovery and Plan screens hold it: the latest stored fit,
 * loaded when the screen opens, and a new fit when the person asks for one, with the flags the screens
 * show while either runs and the message of the last thing that failed.
 */
import type { FitResult } from '../../../api/contract.ts';
import type { AppState } from './app.svelte.ts';

/** What a screen loads together with the stored fit, and what it does with both once they are in. */
export interface LoadAlongside<T> {
  more: () => Promise<T>;
  use: (fit: FitResult | null, more: T) => void;
}

export class ZoneFit {
  fit = $state.raw<FitResult | null>(null);
  loading = $state(true);
  fitting = $state(false);
  /** The last failure's message; a screen may report its own failures here too (one line for all). */
  failure = $state<string | null>(null);

  readonly zoneId: number;
  readonly #app: () => AppState;

  /** `app` as a getter, the way a screen holds its props. */
  constructor(app: () => AppState, zoneId: number) {
    this.#app = app;
    this.zoneId = zoneId;
  }

  /** Reads the latest stored fit (null when the zone has none), and `alongside`'s data with it. */
  async load<T>(alongside?: LoadAlongside<T>): Promise<void> {
    this.loading = true;
    this.failure = null;
    try {
      const latest = this.#app().api.latestResponse({ zoneId: this.zoneId });
      if (alongside) {
        const [fit, more] = await Promise.all([latest, alongside.more()]);
        this.fit = fit;
        alongside.use(fit, more);
      } else {
        this.fit = await latest;
      }
    } catch (err) {
      this.failure = (err as Error).message;
    } finally {
      this.loading = false;
    }
  }

  /** Fits the zone again; `onFitted` runs as soon as the new fit is in, before the sites are re-read. */
  async refit(onFitted?: () => void): Promise<void> {
    this.fitting = true;
    this.failure = null;
    try {
      this.fit = await this.#app().api.fitZone({ zoneId: this.zoneId });
      onFitted?.();
      await this.#app().refreshSites();
    } catch (err) {
      this.failure = (err as Error).message;
    } finally {
      this.fitting = false;
    }
  }
}
