/**
 * Time zone names in the API, and the caller's fallback zone: a zone whose site and logs name no time
 * zone is shown in the renderer's own zone (the browser's in browser mode), so the methods that lay
 * out local days or weeks take that zone with the request and the backend uses the same one
 * (app/backend/fit-options.ts timeZoneFor). The renderer's client adds it to every such call.
 */
import { z } from 'zod';
import { isValidTimeZone } from '../../core/mapping.ts';

/** An IANA time zone name this runtime knows, e.g. "America/Denver" (trimmed; letter case is corrected by the store). */
export const TimeZoneName = z
  .string()
  .trim()
  .max(100, 'A time zone name can have at most 100 characters.')
  .refine(isValidTimeZone, 'is not a known IANA time zone (e.g. "America/Denver", "Europe/Berlin", "UTC")');

/** The input field of the methods that use a zone's time zone. */
export const FALLBACK_TIME_ZONE_KEY = 'fallbackTimeZone';
export const FallbackTimeZoneShape = {
  /** The caller's own time zone, for a zone whose site and logs name none (else the backend computer's). */
  fallbackTimeZone: TimeZoneName.optional(),
};
