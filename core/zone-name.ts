/**
 * Whether a string names an IANA time zone the platform knows. Its own module (Intl only, no zod), so
 * the import's first checks (db/import/plan.ts) and the command line's fast refusals need not load the
 * mapping schema; core/mapping.ts exports it too.
 */

/** True when `zone` is an IANA time zone name the platform knows (Intl), e.g. "America/Chicago" or "UTC". */
export function isValidTimeZone(zone: string): boolean {
  if (zone.trim() === '') return false;
  try {
    new Intl.DateTimeFormat('en-US', { timeZone: zone });
    return true;
  } catch {
    return false;
  }
}
