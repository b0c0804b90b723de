/**
 * A zone's fitted response as the Response, Recovery and Plan screens hold it, under the one fit rule
 * (lib/fit-rule.ts): the latest stored fit is loaded when the screen opens, and when the zone has no
 * current fit (none stored, or one older than the zone's latest import) it is fitted there and then,
 * with `fitting` set so the screen shows its progress. "Fit again" (refit) is the person's explicit action.
 */
import type { FitResult, ZoneInfo } from '../../../api/contract.ts';
import { needsFit } from '../lib/fit-rule.ts';
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

  #zone(): ZoneInfo | null {
    for (const s of this.#app().sites) for (const z of s.zones) if (z.id === this.zoneId) return z;
    return null;
  }

  /**
   * Reads the latest stored fit (null when the zone has none), and `alongside`'s data with it; then
   * fits the zone when it has readings but no current fit (`alongside.use` runs again with the new fit).
   */
  async load<T>(alongside?: LoadAlongside<T>): Promise<void> {
    this.loading = true;
    this.failure = null;
    let more: T | undefined;
    try {
      const latest = this.#app().api.latestResponse({ zoneId: this.zoneId });
      if (alongside) {
        const [fit, m] = await Promise.all([latest, alongside.more()]);
        more = m;
        this.fit = fit;
        alongside.use(fit, m);
      } else {
        this.fit = await latest;
      }
    } catch (err) {
      this.failure = (err as Error).message;
      return;
    } finally {
      this.loading = false;
    }
    const zone = this.#zone();
    if (zone && needsFit(this.fit, zone)) {
      await this.refit(alongside && more !== undefined ? () => alongside.use(this.fit, more as T) : undefined);
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
