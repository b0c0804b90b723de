/**
 * The one rule every screen follows for a zone's fitted response: a zone without a current fit is
 * fitted on first need; "Fit again" is the person's explicit action. A fit is current when it exists,
 * was made after the zone's latest import, and covers the zone's last reading.
 */

/** What the rule needs of a stored fit (FitResult). */
export interface FitStamp {
  fittedAt: number | null;
  response: { lastTime: number };
}

/** What the rule needs of a zone (ZoneInfo). */
export interface ZoneStamp {
  samples: number;
  lastTime: number | null;
  /** When the zone's newest log was imported (epoch ms); null before any import. */
  lastImportAt?: number | null;
}

/** Whether `fit` is the zone's current response (false for none). */
export function fitIsCurrent(fit: FitStamp | null | undefined, zone: ZoneStamp): boolean {
  if (!fit) return false;
  if (zone.lastImportAt !== null && zone.lastImportAt !== undefined && (fit.fittedAt === null || fit.fittedAt < zone.lastImportAt)) return false;
  if (zone.lastTime !== null && fit.response.lastTime < zone.lastTime) return false;
  return true;
}

/** Whether a screen should fit the zone now, without being asked (it has readings and no current fit). */
export function needsFit(fit: FitStamp | null | undefined, zone: ZoneStamp): boolean {
  return zone.samples > 0 && !fitIsCurrent(fit, zone);
}
