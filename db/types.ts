/**
 * Shapes the store hands out. Internal units: temperatures °C, timestamps epoch ms UTC.
 */
import type { ColumnMapping } from '../core/mapping.ts';
import type { TempUnit, ZoneResponse } from '../core/types.ts';

export interface Site {
  id: number;
  name: string;
  /** IANA time zone of the building (e.g. "America/Denver"), null when not set. */
  timezone: string | null;
  /** Epoch ms. */
  createdAt: number;
}

export interface SiteSummary extends Site {
  /** Number of zones of the site. */
  zones: number;
}

export interface Zone {
  id: number;
  siteId: number;
  /** The site's name. */
  site: string;
  /** The site's time zone (Site.timezone), null when not set. */
  siteTimezone: string | null;
  name: string;
  /** Unit the zone's latest log was written in (for display); null before the first import. */
  units: TempUnit | null;
  createdAt: number;
}

export interface ZoneSummary extends Zone {
  /** Number of stored readings. */
  samples: number;
  /** First and last reading, epoch ms UTC; null without readings. */
  firstTime: number | null;
  lastTime: number | null;
  /** Number of imported logs. */
  logs: number;
}

/** What a delete removed along with the site or zone. */
export interface DeleteCounts {
  sites: number;
  zones: number;
  logs: number;
  samples: number;
  rejectedRows: number;
  responses: number;
  schedules: number;
}

/** A saved setback schedule (JSON in the format of core/plan/schedule.ts, checked by its user). */
export interface StoredSchedule {
  zoneId: number;
  schedule: unknown;
  savedAt: number;
}

export interface LogSummary {
  id: number;
  zoneId: number;
  fileName: string;
  sha256: string;
  bytes: number;
  /** Epoch ms. */
  importedAt: number;
  /** The mapping used (given or detected, with units, delimiter, decimal and time zone filled in). */
  mapping: ColumnMapping;
  /** Text encoding the file was read in, e.g. "utf-8", "windows-1252", "utf-16le". */
  encoding: string;
  units: TempUnit;
  /** Readings this log added to the store. */
  rowsAccepted: number;
  /** Rows that could not be read (see rejectedRows). */
  rowsRejected: number;
  /** Readable rows whose time was already present (in the file or in the store), not added again. */
  duplicates: number;
  firstTime: number | null;
  lastTime: number | null;
  intervalMinutes: number | null;
  warnings: string[];
  /** Readings of this log still in the store. */
  samples: number;
}

export interface RejectedRow {
  /** 1-based physical line in the file. */
  line: number;
  /** 1-based column, null when the row as a whole is at fault. */
  column: number | null;
  /** Header name of that column, when there is one. */
  columnName: string | null;
  reason: string;
  /** The row's text (up to 1000 characters). */
  raw: string;
}

export interface SavedMapping {
  id: number;
  name: string;
  mapping: ColumnMapping;
  createdAt: number;
  updatedAt: number;
}

export interface StoredResponse {
  id: number;
  zoneId: number;
  /** Epoch ms. */
  createdAt: number;
  response: ZoneResponse;
}
