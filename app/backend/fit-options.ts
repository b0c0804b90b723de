/**
 * The fit options of a stored zone, the same for the screens, the report and the command line: its
 * local days in the zone's time zone (db/timezone.ts's rule, then the caller's fallback, then this
 * computer's zone) and, where the site has a location, the solar term.
 */
import type { FitOptions } from '../../core/fit/index.ts';
import type { Store } from '../../db/index.ts';
import { solarGainProxy } from '../../core/solar.ts';

/** This process's own time zone (the last fallback of the rule). */
export function localTimeZone(): string {
  return Intl.DateTimeFormat().resolvedOptions().timeZone || 'UTC';
}

/** The zone's time zone: the site's, else its newest log's, else `fallback` (e.g. the browser's), else this computer's. */
export function timeZoneFor(store: Store, zoneId: number, fallback?: string | null): string {
  return store.zoneTimeZone(zoneId) ?? fallback ?? localTimeZone();
}

/**
 * Options for fitResponse of a stored zone: its local days, and the clear-sky solar proxy of its site's
 * location when the site has one (core/solar.ts; without a location the fit has no solar term).
 */
export function fitOptionsFor(store: Store, zoneId: number, fallback?: string | null): FitOptions {
  const at = store.zoneLocation(zoneId);
  return {
    timeZone: timeZoneFor(store, zoneId, fallback),
    solarProxy: at ? (times: Float64Array) => solarGainProxy(times, at.latDeg, at.lonDeg) : null,
  };
}
