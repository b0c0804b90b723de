/**
 * Which time zone a zone's times are shown and planned in: the one rule, used by the app's zone list,
 * the setback plan and the command line.
 *
 * 1. the site's time zone, when the person set one (sites.timezone, migration 003);
 * 2. else the newest imported log whose mapping names one (logs with local wall-clock timestamps);
 * 3. else null: the caller uses this computer's time zone.
 *
 * Logs with UTC offsets ("2026-01-12T06:00:00-07:00") or epoch seconds name no zone, so without step 1
 * an auditor away from the building would see start times in their own zone.
 */
import { isValidTimeZone } from '../core/zone-name.ts';

/** What zoneTimeZone needs of a log: its mapping's time zone, if any. */
export interface TimeZoneSource {
  mapping: { timezone?: string | undefined };
}

/**
 * The zone's time zone by the rule above. `logs` oldest first (as Store.listLogs returns them).
 *
 * @example zoneTimeZone(null, [{ mapping: { timezone: 'America/Denver' } }, { mapping: {} }]) // 'America/Denver'
 */
export function zoneTimeZone(siteTimezone: string | null, logs: readonly TimeZoneSource[]): string | null {
  if (siteTimezone) return siteTimezone;
  for (let i = logs.length - 1; i >= 0; i--) {
    const tz = logs[i]!.mapping.timezone;
    if (tz) return tz;
  }
  return null;
}

/**
 * An IANA time zone name as given (trimmed), its letter case corrected ("america/denver" →
 * "America/Denver"); null when it is not a zone this runtime knows. Links such as "US/Mountain" are
 * kept as written, not replaced by their target.
 */
export function canonicalTimeZone(name: string): string | null {
  const tz = name.trim();
  if (!isValidTimeZone(tz)) return null;
  const resolved = new Intl.DateTimeFormat('en-US', { timeZone: tz }).resolvedOptions().timeZone;
  return resolved.toLowerCase() === tz.toLowerCase() ? resolved : tz;
}
