/**
 * The zones' readings kept in memory between calls, so that the history chart's zoom and pan, a fit
 * and the plan of the same zone do not each read a year of readings from SQLite again (~100 ms for
 * 105,120 readings). One cache per store; each entry is checked against the store's samplesVersion()
 * (bumped by every import or deletion, and by any other process's commit), so a change of the
 * readings is never missed. Holds the last few zones only.
 *
 * The series handed out are shared: callers must treat them as read-only.
 */
import type { ZoneSeries } from '../../core/types.ts';
import { historySummary, type HistorySummary } from '../../core/history.ts';
import type { Store } from '../../db/store.ts';

const ZONES_KEPT = 3;

interface Entry {
  version: string;
  series: ZoneSeries;
  summary?: HistorySummary;
}

class SeriesCache {
  private readonly entries = new Map<number, Entry>();
  constructor(private readonly store: Store) {}

  private entry(zoneId: number): Entry {
    const version = this.store.samplesVersion();
    let e = this.entries.get(zoneId);
    if (e && e.version === version) {
      // Most recently used last.
      this.entries.delete(zoneId);
      this.entries.set(zoneId, e);
      return e;
    }
    e = { version, series: this.store.loadSeries(zoneId) };
    this.entries.delete(zoneId);
    this.entries.set(zoneId, e);
    while (this.entries.size > ZONES_KEPT) this.entries.delete(this.entries.keys().next().value!);
    return e;
  }

  /** The zone's whole series (read-only). Throws the store's 'not-found' error for an unknown zone. */
  series(zoneId: number): ZoneSeries {
    return this.entry(zoneId).series;
  }

  /** The zone's whole series with its history summary, computed once per version. */
  withSummary(zoneId: number): { series: ZoneSeries; summary: HistorySummary } {
    const e = this.entry(zoneId);
    e.summary ??= historySummary(e.series);
    return { series: e.series, summary: e.summary };
  }
}

const caches = new WeakMap<Store, SeriesCache>();

/** The series cache of a store (one per store, made on first use). */
export function seriesCache(store: Store): SeriesCache {
  let c = caches.get(store);
  if (!c) {
    c = new SeriesCache(store);
    caches.set(store, c);
  }
  return c;
}
