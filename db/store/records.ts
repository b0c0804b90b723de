/**
 * Rows to records and back: names, JSON that keeps NaN and ±Infinity, stored responses read back with
 * the fields added since, and the mappers from table rows to the store's record types (db/store.ts).
 */
import Database from 'better-sqlite3';
import type { ColumnMapping } from '../../core/mapping.ts';
import type { TempUnit, ZoneResponse } from '../../core/types.ts';
import { StoreError } from '../errors.ts';
import type { LogSummary, SavedMapping, Site, StoredSchedule, Zone } from '../types.ts';

const MAX_NAME = 200;

/** A row as better-sqlite3 returns it. */
export type Row = Record<string, unknown>;

export function nowMs(): number {
  return Date.now();
}

export function cleanName(kind: string, name: unknown): string {
  if (typeof name !== 'string' || name.trim() === '') throw new StoreError('invalid', `A ${kind} needs a name.`);
  const n = name.trim();
  if (n.length > MAX_NAME) throw new StoreError('invalid', `A ${kind} name can have at most ${MAX_NAME} characters.`);
  return n;
}

export function isUniqueViolation(err: unknown): boolean {
  return err instanceof Database.SqliteError && (err.code === 'SQLITE_CONSTRAINT_UNIQUE' || err.code === 'SQLITE_CONSTRAINT_PRIMARYKEY');
}

/** JSON that keeps NaN and ±Infinity (as the strings "NaN", "Infinity", "-Infinity"). */
export function toJson(value: unknown): string {
  return JSON.stringify(value, (_k, v: unknown) => (typeof v === 'number' && !Number.isFinite(v) ? String(v) : v));
}

export function fromJson<T>(text: string): T {
  return JSON.parse(text, (_k, v: unknown) => (v === 'NaN' ? NaN : v === 'Infinity' ? Infinity : v === '-Infinity' ? -Infinity : v)) as T;
}

/**
 * A stored response with the fields added since it was saved filled in (responses saved before the
 * two-node model are one-node fits in UTC days with no selection, backtest or solar term).
 */
export function responseFromJson(text: string): ZoneResponse {
  const r = fromJson<Partial<ZoneResponse> & ZoneResponse>(text);
  return {
    ...r,
    model: r.model ?? 'one-node',
    twoNode: r.twoNode ?? null,
    mass: r.mass ?? null,
    solarGainCI: r.solarGainCI ?? null,
    gainCI: r.gainCI ?? [NaN, NaN],
    selection: r.selection ?? { criterion: 'none', candidates: [], effectiveReadings: r.samplesUsed ?? 0, reason: 'Fitted before Heatlag compared one and two nodes: one node.' },
    recoveryBacktest: r.recoveryBacktest ?? null,
    recoveryBacktestReason: r.recoveryBacktestReason ?? (r.recoveryBacktest ? null : 'Fitted before the recovery backtest existed: fit again to run it.'),
    timeZone: r.timeZone ?? 'UTC',
  };
}

export function nullable(v: number): number | null {
  return Number.isFinite(v) ? v : null;
}

export function siteFromRow(r: Row): Site {
  return { id: r.id as number, name: r.name as string, timezone: (r.timezone as string | null) ?? null, createdAt: r.created_at as number };
}

export function zoneFromRow(r: Row): Zone {
  return {
    id: r.id as number,
    siteId: r.site_id as number,
    site: r.site as string,
    siteTimezone: (r.site_timezone as string | null) ?? null,
    name: r.name as string,
    units: (r.units as TempUnit | null) ?? null,
    createdAt: r.created_at as number,
  };
}

export function logFromRow(r: Row, samples: number): LogSummary {
  return {
    id: r.id as number,
    zoneId: r.zone_id as number,
    fileName: r.file_name as string,
    sha256: r.sha256 as string,
    bytes: r.bytes as number,
    importedAt: r.imported_at as number,
    mapping: JSON.parse(r.mapping_json as string) as ColumnMapping,
    encoding: r.encoding as string,
    units: r.units as TempUnit,
    rowsAccepted: r.rows_accepted as number,
    rowsRejected: r.rows_rejected as number,
    duplicates: r.duplicates as number,
    firstTime: (r.first_time as number | null) ?? null,
    lastTime: (r.last_time as number | null) ?? null,
    intervalMinutes: (r.interval_minutes as number | null) ?? null,
    warnings: JSON.parse(r.warnings_json as string) as string[],
    samples,
  };
}

export function mappingFromRow(r: Row): SavedMapping {
  return {
    id: r.id as number,
    name: r.name as string,
    mapping: JSON.parse(r.mapping_json as string) as ColumnMapping,
    createdAt: r.created_at as number,
    updatedAt: r.updated_at as number,
  };
}

export function scheduleFromRow(r: Row): StoredSchedule {
  return { zoneId: r.zone_id as number, schedule: JSON.parse(r.schedule_json as string) as unknown, savedAt: r.saved_at as number };
}
