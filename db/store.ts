/**
 * The Heatlag store: one SQLite file (better-sqlite3) holding sites, zones, their imported logs and
 * readings, rejected rows, saved column mappings and fitted responses.
 *
 * - WAL journal for files, foreign keys on, STRICT tables, migrations run on open (db/migrate.ts).
 * - Prepared statements only; every write that touches several rows runs in one transaction.
 * - Internal units: °C, runtime fraction 0–1, epoch ms UTC.
 *
 * Throws StoreError (db/errors.ts) with a plain message for a newer or foreign database, an unknown id,
 * a duplicate or blank name.
 *
 * @example
 * const store = openStore('audit.heatlag');
 * const zone = store.getOrCreateZone('Maple Street School', 'Gym');
 * const series = store.loadSeries(zone.id);
 * store.close();
 */
import Database from 'better-sqlite3';
import { parseMapping, type ColumnMapping } from '../core/mapping.ts';
import type { TempUnit, ZoneResponse, ZoneSeries } from '../core/types.ts';
import { StoreError } from './errors.ts';
import { latestVersion, migrate } from './migrate.ts';
import { canonicalTimeZone, zoneTimeZone } from './timezone.ts';
import { checkSiteLocation } from '../core/solar.ts';
import type {
  DeleteCounts,
  LogSummary,
  RejectedRow,
  SavedMapping,
  Site,
  SiteSummary,
  StoredResponse,
  StoredSchedule,
  Zone,
  ZoneSummary,
} from './types.ts';

const MAX_NAME = 200;
/**
 * Readings written per INSERT statement during an import: one statement with this many rows of
 * placeholders (fewer calls into SQLite, about a third faster than one row per call). Only "?"
 * placeholders are repeated; no value is ever put into SQL text.
 */
const SAMPLE_BATCH = 256;
/** One reading: zone and log are the same for the whole statement (named), the rest positional. */
const SAMPLE_ROW = '(@zone, ?, @log, ?, ?, ?, ?, ?, ?)';
const SAMPLE_COLUMNS = 'zone_id, time, log_id, indoor, outdoor, heat_setpoint, cool_setpoint, heat, cool';
const MIN_TIME = Number.MIN_SAFE_INTEGER;
const MAX_TIME = Number.MAX_SAFE_INTEGER;

/** Readings and bookkeeping of one import, in time order, internal units (see importLog). */
export interface ImportBatch {
  zoneId: number;
  fileName: string;
  sha256: string;
  bytes: number;
  encoding: string;
  units: TempUnit;
  mapping: ColumnMapping;
  warnings: string[];
  intervalMinutes: number | null;
  firstTime: number | null;
  lastTime: number | null;
  /** Number of readings in the arrays below (the arrays may be longer). */
  count: number;
  time: Float64Array;
  indoor: Float64Array;
  outdoor: Float64Array;
  heatSetpoint: Float64Array;
  coolSetpoint: Float64Array;
  heat: Float64Array;
  cool: Float64Array;
  rejected: RejectedRow[];
  /** Readable rows dropped because the file had the same time earlier. */
  duplicatesInFile: number;
  /** Called with the number of readings written so far (every few thousand rows). */
  onRow?: (written: number) => void;
  /** Extra warnings once the counts are known (stored with the log, inside the same transaction). */
  afterInsert?: (commit: ImportCommit) => string[];
}

export interface ImportCommit {
  logId: number;
  /** Readings added. */
  inserted: number;
  /** Readings whose time the zone already had. */
  duplicatesInStore: number;
}

type Row = Record<string, unknown>;

function nowMs(): number {
  return Date.now();
}

function cleanName(kind: string, name: unknown): string {
  if (typeof name !== 'string' || name.trim() === '') throw new StoreError('invalid', `A ${kind} needs a name.`);
  const n = name.trim();
  if (n.length > MAX_NAME) throw new StoreError('invalid', `A ${kind} name can have at most ${MAX_NAME} characters.`);
  return n;
}

function isUniqueViolation(err: unknown): boolean {
  return err instanceof Database.SqliteError && (err.code === 'SQLITE_CONSTRAINT_UNIQUE' || err.code === 'SQLITE_CONSTRAINT_PRIMARYKEY');
}

/** JSON that keeps NaN and ±Infinity (as the strings "NaN", "Infinity", "-Infinity"). */
function toJson(value: unknown): string {
  return JSON.stringify(value, (_k, v: unknown) => (typeof v === 'number' && !Number.isFinite(v) ? String(v) : v));
}

function fromJson<T>(text: string): T {
  return JSON.parse(text, (_k, v: unknown) => (v === 'NaN' ? NaN : v === 'Infinity' ? Infinity : v === '-Infinity' ? -Infinity : v)) as T;
}

/**
 * A stored response with the fields added since it was saved filled in (responses saved before the
 * two-node model are one-node fits in UTC days with no selection, backtest or solar term).
 */
function responseFromJson(text: string): ZoneResponse {
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

function nullable(v: number): number | null {
  return Number.isFinite(v) ? v : null;
}

/** An open store. Create with openStore(). */
export class Store {
  /** The file given to openStore (':memory:' for an in-memory store). */
  readonly file: string;
  private readonly db: Database.Database;
  private readonly st: ReturnType<Store['prepareAll']>;
  private closed = false;
  /** Bumped by every write of this connection that adds or removes readings (see samplesVersion). */
  private samplesWrites = 0;

  constructor(file: string, options: StoreOptions = {}) {
    this.file = file;
    let db: Database.Database;
    try {
      db = new Database(file, {
        ...(options.nativeBinding ? { nativeBinding: options.nativeBinding } : {}),
        ...(options.readonly ? { readonly: true, fileMustExist: true } : {}),
      });
    } catch (err) {
      throw new StoreError('invalid', `Cannot open ${file}: ${(err as Error).message}`, { cause: err });
    }
    try {
      db.pragma('foreign_keys = ON');
      db.pragma('busy_timeout = 5000');
      if (options.readonly) {
        // A reader of a database another connection writes (and migrates): it must be current already.
        if (db.pragma('user_version', { simple: true }) !== latestVersion()) {
          throw new StoreError('invalid', `${file} must be opened for writing first (its schema is not this version's).`);
        }
      } else if (file !== ':memory:' && file !== '') {
        db.pragma('journal_mode = WAL');
        db.pragma('synchronous = NORMAL');
      }
      if (!options.readonly) migrate(db, file);
    } catch (err) {
      db.close();
      if (err instanceof StoreError) throw err;
      if (err instanceof Database.SqliteError && (err.code === 'SQLITE_NOTADB' || err.code === 'SQLITE_CORRUPT')) {
        throw new StoreError('not-a-store', `${file} is not a Heatlag database (not an SQLite file, or damaged).`, { cause: err });
      }
      throw err;
    }
    this.db = db;
    this.st = this.prepareAll();
  }

  private prepareAll() {
    const db = this.db;
    return {
      insertSite: db.prepare('INSERT INTO sites (name, created_at) VALUES (?, ?)'),
      renameSite: db.prepare('UPDATE sites SET name = ? WHERE id = ?'),
      deleteSite: db.prepare('DELETE FROM sites WHERE id = ?'),
      setSiteTimezone: db.prepare('UPDATE sites SET timezone = ? WHERE id = ?'),
      getSite: db.prepare('SELECT id, name, timezone, created_at FROM sites WHERE id = ?'),
      findSite: db.prepare('SELECT id, name, timezone, created_at FROM sites WHERE name = ?'),
      listSites: db.prepare(
        'SELECT s.id, s.name, s.timezone, s.created_at, (SELECT count(*) FROM zones z WHERE z.site_id = s.id) AS zones FROM sites s ORDER BY s.name, s.id',
      ),
      insertZone: db.prepare('INSERT INTO zones (site_id, name, created_at) VALUES (?, ?, ?)'),
      renameZone: db.prepare('UPDATE zones SET name = ? WHERE id = ?'),
      deleteZone: db.prepare('DELETE FROM zones WHERE id = ?'),
      setZoneUnits: db.prepare('UPDATE zones SET units = ? WHERE id = ?'),
      getZone: db.prepare(
        'SELECT z.id, z.site_id, s.name AS site, s.timezone AS site_timezone, z.name, z.units, z.created_at FROM zones z JOIN sites s ON s.id = z.site_id WHERE z.id = ?',
      ),
      findZone: db.prepare(
        'SELECT z.id, z.site_id, s.name AS site, s.timezone AS site_timezone, z.name, z.units, z.created_at FROM zones z JOIN sites s ON s.id = z.site_id WHERE s.name = ? AND z.name = ?',
      ),
      listZones: db.prepare(
        `SELECT z.id, z.site_id, s.name AS site, s.timezone AS site_timezone, z.name, z.units, z.created_at,
                (SELECT count(*) FROM samples m WHERE m.zone_id = z.id) AS samples,
                (SELECT min(time) FROM samples m WHERE m.zone_id = z.id) AS first_time,
                (SELECT max(time) FROM samples m WHERE m.zone_id = z.id) AS last_time,
                (SELECT count(*) FROM logs l WHERE l.zone_id = z.id) AS logs
           FROM zones z JOIN sites s ON s.id = z.site_id
          WHERE @site IS NULL OR z.site_id = @site
          ORDER BY s.name, z.name, z.id`,
      ),
      listZoneIds: db.prepare('SELECT z.id FROM zones z JOIN sites s ON s.id = z.site_id ORDER BY s.name, z.name, z.id').pluck(),
      countSiteZones: db.prepare('SELECT count(*) FROM zones WHERE site_id = ?').pluck(),
      countSiteLogs: db.prepare('SELECT count(*) FROM logs l JOIN zones z ON z.id = l.zone_id WHERE z.site_id = ?').pluck(),
      countSiteSamples: db.prepare('SELECT count(*) FROM samples m JOIN zones z ON z.id = m.zone_id WHERE z.site_id = ?').pluck(),
      countSiteRejected: db.prepare(
        'SELECT count(*) FROM rejected_rows r JOIN logs l ON l.id = r.log_id JOIN zones z ON z.id = l.zone_id WHERE z.site_id = ?',
      ).pluck(),
      countSiteResponses: db.prepare('SELECT count(*) FROM responses r JOIN zones z ON z.id = r.zone_id WHERE z.site_id = ?').pluck(),
      countZoneLogs: db.prepare('SELECT count(*) FROM logs WHERE zone_id = ?').pluck(),
      countZoneSamples: db.prepare('SELECT count(*) FROM samples WHERE zone_id = ?').pluck(),
      countZoneRejected: db.prepare('SELECT count(*) FROM rejected_rows r JOIN logs l ON l.id = r.log_id WHERE l.zone_id = ?').pluck(),
      countZoneResponses: db.prepare('SELECT count(*) FROM responses WHERE zone_id = ?').pluck(),
      countZoneSchedules: db.prepare('SELECT count(*) FROM schedules WHERE zone_id = ?').pluck(),
      countSiteSchedules: db.prepare('SELECT count(*) FROM schedules c JOIN zones z ON z.id = c.zone_id WHERE z.site_id = ?').pluck(),
      saveSchedule: db.prepare(
        `INSERT INTO schedules (zone_id, schedule_json, saved_at) VALUES (?, ?, ?)
         ON CONFLICT (zone_id) DO UPDATE SET schedule_json = excluded.schedule_json, saved_at = excluded.saved_at`,
      ),
      listSchedules: db.prepare('SELECT zone_id, schedule_json, saved_at FROM schedules ORDER BY zone_id'),
      getSchedule: db.prepare('SELECT zone_id, schedule_json, saved_at FROM schedules WHERE zone_id = ?'),
      deleteSchedule: db.prepare('DELETE FROM schedules WHERE zone_id = ?'),
      countSeries: db.prepare('SELECT count(*) FROM samples WHERE zone_id = ? AND time BETWEEN ? AND ?').pluck(),
      series: db
        .prepare(
          'SELECT time, indoor, outdoor, heat_setpoint, cool_setpoint, heat, cool FROM samples WHERE zone_id = ? AND time BETWEEN ? AND ? ORDER BY time',
        )
        .raw(true),
      insertLog: db.prepare(
        `INSERT INTO logs (zone_id, file_name, sha256, bytes, imported_at, mapping_json, encoding, units,
                           first_time, last_time, interval_minutes, warnings_json)
         VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)`,
      ),
      finishLog: db.prepare('UPDATE logs SET rows_accepted = ?, rows_rejected = ?, duplicates = ?, warnings_json = ? WHERE id = ?'),
      insertSample: db.prepare(`INSERT OR IGNORE INTO samples (${SAMPLE_COLUMNS}) VALUES ${SAMPLE_ROW}`),
      // The same statement with SAMPLE_BATCH rows of placeholders.
      insertSamples: db.prepare(`INSERT OR IGNORE INTO samples (${SAMPLE_COLUMNS}) VALUES ${Array(SAMPLE_BATCH).fill(SAMPLE_ROW).join(', ')}`),
      insertRejected: db.prepare(
        'INSERT INTO rejected_rows (log_id, line, column_index, column_name, reason, raw) VALUES (?, ?, ?, ?, ?, ?)',
      ),
      rejectedRows: db.prepare(
        'SELECT line, column_index, column_name, reason, raw FROM rejected_rows WHERE log_id = ? ORDER BY line, id LIMIT ? OFFSET ?',
      ),
      logColumns: db.prepare(
        `SELECT id, zone_id, file_name, sha256, bytes, imported_at, mapping_json, encoding, units, rows_accepted,
                rows_rejected, duplicates, first_time, last_time, interval_minutes, warnings_json
           FROM logs WHERE zone_id = ? ORDER BY imported_at, id`,
      ),
      getLog: db.prepare(
        `SELECT id, zone_id, file_name, sha256, bytes, imported_at, mapping_json, encoding, units, rows_accepted,
                rows_rejected, duplicates, first_time, last_time, interval_minutes, warnings_json
           FROM logs WHERE id = ?`,
      ),
      logSampleCounts: db.prepare('SELECT log_id, count(*) AS n FROM samples WHERE zone_id = ? GROUP BY log_id'),
      logSampleCount: db.prepare('SELECT count(*) FROM samples WHERE zone_id = ? AND log_id = ?').pluck(),
      logRejectedCount: db.prepare('SELECT count(*) FROM rejected_rows WHERE log_id = ?').pluck(),
      logsByHash: db.prepare('SELECT id, imported_at FROM logs WHERE zone_id = ? AND sha256 = ? ORDER BY id'),
      deleteLogSamples: db.prepare('DELETE FROM samples WHERE zone_id = ? AND log_id = ?'),
      deleteLog: db.prepare('DELETE FROM logs WHERE id = ?'),
      upsertMapping: db.prepare(
        `INSERT INTO mappings (name, mapping_json, created_at, updated_at) VALUES (?, ?, ?, ?)
         ON CONFLICT (name) DO UPDATE SET mapping_json = excluded.mapping_json, updated_at = excluded.updated_at
         RETURNING id`,
      ).pluck(),
      listMappings: db.prepare('SELECT id, name, mapping_json, created_at, updated_at FROM mappings ORDER BY name'),
      getMapping: db.prepare('SELECT id, name, mapping_json, created_at, updated_at FROM mappings WHERE name = ?'),
      deleteMapping: db.prepare('DELETE FROM mappings WHERE name = ?'),
      insertResponse: db.prepare(
        `INSERT INTO responses (zone_id, created_at, tau_hours, heat_rate, cool_rate, gain, rmse, held_out_rmse, cvrmse, nmbe,
                                samples_used, first_time, last_time, response_json)
         VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)`,
      ),
      latestResponse: db.prepare(
        'SELECT id, zone_id, created_at, response_json FROM responses WHERE zone_id = ? ORDER BY created_at DESC, id DESC LIMIT 1',
      ),
      listResponses: db.prepare(
        'SELECT id, zone_id, created_at, response_json FROM responses WHERE zone_id = ? ORDER BY created_at DESC, id DESC',
      ),
      deleteResponse: db.prepare('DELETE FROM responses WHERE id = ?'),
    };
  }

  // ───────────────────────────── lifetime ─────────────────────────────

  /** Closes the database (checkpointing the WAL). Further calls throw. Closing twice is harmless. */
  close(): void {
    if (this.closed) return;
    this.closed = true;
    this.db.close();
  }

  /** Whether close() was called. */
  get isOpen(): boolean {
    return !this.closed;
  }

  /**
   * A token that changes whenever the stored readings may have changed: a write of readings through
   * this Store (import, deleting a log, a zone or a site) or any commit by another connection (SQLite's
   * PRAGMA data_version). Lets a caller keep loaded series while the token stays the same.
   */
  samplesVersion(): string {
    return `${this.db.pragma('data_version', { simple: true }) as number}.${this.samplesWrites}`;
  }

  /** Schema version of the open file (PRAGMA user_version). */
  schemaVersion(): number {
    return this.db.pragma('user_version', { simple: true }) as number;
  }

  // ───────────────────────────── sites ─────────────────────────────

  createSite(name: string): Site {
    const n = cleanName('site', name);
    const created = nowMs();
    try {
      const info = this.st.insertSite.run(n, created);
      return { id: Number(info.lastInsertRowid), name: n, timezone: null, createdAt: created };
    } catch (err) {
      if (isUniqueViolation(err)) throw new StoreError('duplicate', `A site named "${n}" exists already.`, { cause: err });
      throw err;
    }
  }

  private siteFromRow(r: Row): Site {
    return { id: r.id as number, name: r.name as string, timezone: (r.timezone as string | null) ?? null, createdAt: r.created_at as number };
  }

  getSite(id: number): Site | null {
    const r = this.st.getSite.get(id) as Row | undefined;
    return r ? this.siteFromRow(r) : null;
  }

  findSite(name: string): Site | null {
    const r = this.st.findSite.get(String(name).trim()) as Row | undefined;
    return r ? this.siteFromRow(r) : null;
  }

  /**
   * Sets the site's IANA time zone (e.g. "America/Denver"; letter case is corrected), or clears it
   * with null. Its zones' times and plans then use it (see zoneTimeZone). Throws StoreError 'invalid'
   * for a name that is not a known time zone, 'not-found' for an unknown site.
   */
  setSiteTimezone(id: number, timezone: string | null): Site {
    let tz: string | null = null;
    if (timezone !== null) {
      tz = typeof timezone === 'string' ? canonicalTimeZone(timezone) : null;
      if (tz === null) {
        throw new StoreError('invalid', `"${String(timezone)}" is not a known IANA time zone (e.g. "America/Denver", "Europe/Berlin", "UTC").`);
      }
    }
    if (this.st.setSiteTimezone.run(tz, id).changes === 0) throw new StoreError('not-found', `There is no site #${id}.`);
    return this.getSite(id)!;
  }

  /**
   * Sets the site's location (decimal degrees, north and east positive) for the solar term of its
   * zones' fits, or clears it with nulls. Throws StoreError 'invalid' for a value out of range (the
   * message of core/solar.ts checkSiteLocation), 'not-found' for an unknown site.
   */
  setSiteLocation(id: number, latDeg: number | null, lonDeg: number | null): void {
    if ((latDeg === null) !== (lonDeg === null)) throw new StoreError('invalid', 'Give both the latitude and the longitude, or neither.');
    if (latDeg !== null && lonDeg !== null) {
      try {
        checkSiteLocation(latDeg, lonDeg);
      } catch (e) {
        throw new StoreError('invalid', (e as Error).message);
      }
    }
    const info = this.db.prepare('UPDATE sites SET latitude = ?, longitude = ? WHERE id = ?').run(latDeg, lonDeg, id);
    if (info.changes === 0) throw new StoreError('not-found', `There is no site #${id}.`);
  }

  /** The site's location, or null when not set. */
  siteLocation(id: number): { latDeg: number; lonDeg: number } | null {
    const r = this.db.prepare('SELECT latitude, longitude FROM sites WHERE id = ?').get(id) as { latitude: number | null; longitude: number | null } | undefined;
    return r && r.latitude !== null && r.longitude !== null ? { latDeg: r.latitude, lonDeg: r.longitude } : null;
  }

  /** The location of the zone's site, or null. */
  zoneLocation(zoneId: number): { latDeg: number; lonDeg: number } | null {
    const z = this.getZone(zoneId);
    return z ? this.siteLocation(z.siteId) : null;
  }

  renameSite(id: number, name: string): Site {
    const n = cleanName('site', name);
    try {
      const info = this.st.renameSite.run(n, id);
      if (info.changes === 0) throw new StoreError('not-found', `There is no site #${id}.`);
    } catch (err) {
      if (isUniqueViolation(err)) throw new StoreError('duplicate', `A site named "${n}" exists already.`, { cause: err });
      throw err;
    }
    return this.getSite(id)!;
  }

  /** What deleting a site would remove (its zones with everything they hold). */
  siteDeleteCounts(id: number): DeleteCounts {
    if (!this.getSite(id)) throw new StoreError('not-found', `There is no site #${id}.`);
    return {
      sites: 1,
      zones: this.st.countSiteZones.get(id) as number,
      logs: this.st.countSiteLogs.get(id) as number,
      samples: this.st.countSiteSamples.get(id) as number,
      rejectedRows: this.st.countSiteRejected.get(id) as number,
      responses: this.st.countSiteResponses.get(id) as number,
      schedules: this.st.countSiteSchedules.get(id) as number,
    };
  }

  /** Deletes a site with its zones, logs, readings, rejected rows, responses and schedules; returns what went. */
  deleteSite(id: number): DeleteCounts {
    return this.db.transaction(() => {
      const counts = this.siteDeleteCounts(id);
      this.st.deleteSite.run(id);
      this.samplesWrites++;
      return counts;
    }).immediate();
  }

  listSites(): SiteSummary[] {
    return (this.st.listSites.all() as Row[]).map((r) => ({ ...this.siteFromRow(r), zones: r.zones as number }));
  }

  // ───────────────────────────── zones ─────────────────────────────

  private zoneFromRow(r: Row): Zone {
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

  createZone(siteId: number, name: string): Zone {
    const n = cleanName('zone', name);
    const site = this.getSite(siteId);
    if (!site) throw new StoreError('not-found', `There is no site #${siteId}.`);
    try {
      const info = this.st.insertZone.run(siteId, n, nowMs());
      return this.getZone(Number(info.lastInsertRowid))!;
    } catch (err) {
      if (isUniqueViolation(err)) throw new StoreError('duplicate', `Site "${site.name}" has a zone named "${n}" already.`, { cause: err });
      throw err;
    }
  }

  getZone(id: number): Zone | null {
    const r = this.st.getZone.get(id) as Row | undefined;
    return r ? this.zoneFromRow(r) : null;
  }

  /** The zone named `zoneName` of the site named `siteName` (names compare ignoring ASCII case), or null. */
  findZone(siteName: string, zoneName: string): Zone | null {
    const r = this.st.findZone.get(String(siteName).trim(), String(zoneName).trim()) as Row | undefined;
    return r ? this.zoneFromRow(r) : null;
  }

  /** Finds the zone, creating the site and the zone when missing. */
  getOrCreateZone(siteName: string, zoneName: string): Zone {
    const s = cleanName('site', siteName);
    const z = cleanName('zone', zoneName);
    return this.db.transaction(() => {
      const found = this.findZone(s, z);
      if (found) return found;
      const site = this.findSite(s) ?? this.createSite(s);
      return this.createZone(site.id, z);
    }).immediate();
  }

  renameZone(id: number, name: string): Zone {
    const n = cleanName('zone', name);
    const zone = this.getZone(id);
    if (!zone) throw new StoreError('not-found', `There is no zone #${id}.`);
    try {
      this.st.renameZone.run(n, id);
    } catch (err) {
      if (isUniqueViolation(err)) throw new StoreError('duplicate', `Site "${zone.site}" has a zone named "${n}" already.`, { cause: err });
      throw err;
    }
    return this.getZone(id)!;
  }

  /** What deleting a zone would remove. */
  zoneDeleteCounts(id: number): DeleteCounts {
    if (!this.getZone(id)) throw new StoreError('not-found', `There is no zone #${id}.`);
    return {
      sites: 0,
      zones: 1,
      logs: this.st.countZoneLogs.get(id) as number,
      samples: this.st.countZoneSamples.get(id) as number,
      rejectedRows: this.st.countZoneRejected.get(id) as number,
      responses: this.st.countZoneResponses.get(id) as number,
      schedules: this.st.countZoneSchedules.get(id) as number,
    };
  }

  /** Deletes a zone with its logs, readings, rejected rows, responses and schedule; returns what went. */
  deleteZone(id: number): DeleteCounts {
    return this.db.transaction(() => {
      const counts = this.zoneDeleteCounts(id);
      this.st.deleteZone.run(id);
      this.samplesWrites++;
      return counts;
    }).immediate();
  }

  /** Every zone's id in listZones' order (site name, zone name), without counting readings. */
  listZoneIds(): number[] {
    return this.st.listZoneIds.all() as number[];
  }

  /** Every zone (or those of one site) with its number of readings, first and last time and unit. */
  listZones(siteId?: number): ZoneSummary[] {
    return (this.st.listZones.all({ site: siteId ?? null }) as Row[]).map((r) => ({
      ...this.zoneFromRow(r),
      samples: r.samples as number,
      firstTime: (r.first_time as number | null) ?? null,
      lastTime: (r.last_time as number | null) ?? null,
      logs: r.logs as number,
    }));
  }

  /**
   * The time zone the zone's times are shown and planned in: its site's when set, else that of its
   * newest log that names one, else null (this computer's). See db/timezone.ts. Throws StoreError
   * 'not-found' for an unknown zone.
   */
  zoneTimeZone(zoneId: number): string | null {
    const zone = this.getZone(zoneId);
    if (!zone) throw new StoreError('not-found', `There is no zone #${zoneId}.`);
    return zoneTimeZone(zone.siteTimezone, zone.siteTimezone ? [] : this.listLogs(zoneId));
  }

  /** Unit for showing the zone's temperatures: that of its latest log, °C when it has none. */
  zoneUnits(zoneId: number): TempUnit {
    const zone = this.getZone(zoneId);
    if (!zone) throw new StoreError('not-found', `There is no zone #${zoneId}.`);
    return zone.units ?? 'C';
  }

  /**
   * The zone's readings with fromMs ≤ time ≤ toMs (both optional, epoch ms UTC) in time order, internal
   * units, NaN where a value is missing. Throws StoreError 'not-found' for an unknown zone.
   */
  loadSeries(zoneId: number, fromMs?: number, toMs?: number): ZoneSeries {
    if (!this.getZone(zoneId)) throw new StoreError('not-found', `There is no zone #${zoneId}.`);
    const lo = fromMs === undefined || !Number.isFinite(fromMs) ? MIN_TIME : Math.ceil(fromMs);
    const hi = toMs === undefined || !Number.isFinite(toMs) ? MAX_TIME : Math.floor(toMs);
    // Count and read in one read transaction, so a concurrent import cannot change the count in between.
    return this.db.transaction(() => {
      const n = this.st.countSeries.get(zoneId, lo, hi) as number;
      const s: ZoneSeries = {
        time: new Float64Array(n),
        indoor: new Float64Array(n),
        outdoor: new Float64Array(n),
        heatSetpoint: new Float64Array(n),
        coolSetpoint: new Float64Array(n),
        heat: new Float64Array(n),
        cool: new Float64Array(n),
      };
      let i = 0;
      for (const r of this.st.series.iterate(zoneId, lo, hi) as IterableIterator<(number | null)[]>) {
        s.time[i] = r[0]!;
        s.indoor[i] = r[1] ?? NaN;
        s.outdoor[i] = r[2] ?? NaN;
        s.heatSetpoint[i] = r[3] ?? NaN;
        s.coolSetpoint[i] = r[4] ?? NaN;
        s.heat[i] = r[5] ?? NaN;
        s.cool[i] = r[6] ?? NaN;
        i++;
      }
      return s;
    })();
  }

  // ───────────────────────────── logs ─────────────────────────────

  private logFromRow(r: Row, samples: number): LogSummary {
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

  /** The zone's imported logs, oldest first, each with the number of its readings still stored. */
  listLogs(zoneId: number): LogSummary[] {
    const counts = new Map<number, number>();
    for (const r of this.st.logSampleCounts.all(zoneId) as Row[]) counts.set(r.log_id as number, r.n as number);
    return (this.st.logColumns.all(zoneId) as Row[]).map((r) => this.logFromRow(r, counts.get(r.id as number) ?? 0));
  }

  getLog(logId: number): LogSummary | null {
    const r = this.st.getLog.get(logId) as Row | undefined;
    return r ? this.logFromRow(r, this.st.logSampleCount.get(r.zone_id, logId) as number) : null;
  }

  /** Logs of the zone with this SHA-256 (the same file imported before), oldest first. */
  logsWithHash(zoneId: number, sha256: string): { id: number; importedAt: number }[] {
    return (this.st.logsByHash.all(zoneId, sha256) as Row[]).map((r) => ({ id: r.id as number, importedAt: r.imported_at as number }));
  }

  /** Removes a log with the readings it added and its rejected rows (undoing an import). */
  deleteLog(logId: number): { samples: number; rejectedRows: number } {
    return this.db.transaction(() => {
      const r = this.st.getLog.get(logId) as Row | undefined;
      if (!r) throw new StoreError('not-found', `There is no log #${logId}.`);
      const rejectedRows = this.st.logRejectedCount.get(logId) as number;
      const samples = this.st.deleteLogSamples.run(r.zone_id, logId).changes;
      this.st.deleteLog.run(logId);
      this.samplesWrites++;
      return { samples, rejectedRows };
    }).immediate();
  }

  /** Rejected rows of a log in line order, `limit` (default 100) from `offset` (default 0). */
  rejectedRows(logId: number, limit = 100, offset = 0): RejectedRow[] {
    const lim = Math.max(0, Math.floor(limit));
    const off = Math.max(0, Math.floor(offset));
    return (this.st.rejectedRows.all(logId, lim, off) as Row[]).map((r) => ({
      line: r.line as number,
      column: (r.column_index as number | null) ?? null,
      columnName: (r.column_name as string | null) ?? null,
      reason: r.reason as string,
      raw: r.raw as string,
    }));
  }

  /**
   * Writes one import in a single transaction: the log, its readings (INSERT OR IGNORE on (zone, time),
   * so times the zone has already are counted, not added) and its rejected rows. Used by importLog;
   * synchronous, so nothing else can interleave. Throws StoreError 'not-found' for an unknown zone
   * (nothing is written).
   */
  commitImport(b: ImportBatch): ImportCommit {
    return this.db.transaction((): ImportCommit => {
      if (!this.getZone(b.zoneId)) throw new StoreError('not-found', `There is no zone #${b.zoneId}.`);
      const info = this.st.insertLog.run(
        b.zoneId,
        b.fileName,
        b.sha256,
        b.bytes,
        nowMs(),
        JSON.stringify(b.mapping),
        b.encoding,
        b.units,
        b.firstTime,
        b.lastTime,
        b.intervalMinutes,
        JSON.stringify(b.warnings),
      );
      const logId = Number(info.lastInsertRowid);
      const one = this.st.insertSample;
      const many = this.st.insertSamples;
      const { zoneId, time, indoor, outdoor, heatSetpoint, coolSetpoint, heat, cool, onRow } = b;
      const ids = { zone: zoneId, log: logId };
      const args: (number | null)[] = new Array(7 * SAMPLE_BATCH);
      let inserted = 0;
      let i = 0;
      for (; i + SAMPLE_BATCH <= b.count; i += SAMPLE_BATCH) {
        for (let j = 0, k = i, o = 0; j < SAMPLE_BATCH; j++, k++, o += 7) {
          const x = outdoor[k], hs = heatSetpoint[k], cs = coolSetpoint[k], h = heat[k], c = cool[k];
          args[o] = time[k];
          args[o + 1] = indoor[k];
          args[o + 2] = x === x ? x : null;
          args[o + 3] = hs === hs ? hs : null;
          args[o + 4] = cs === cs ? cs : null;
          args[o + 5] = h === h ? h : null;
          args[o + 6] = c === c ? c : null;
        }
        inserted += many.run(args, ids).changes;
        if (onRow !== undefined && (i & 8191) < SAMPLE_BATCH) onRow(i + SAMPLE_BATCH);
      }
      for (; i < b.count; i++) {
        const x = outdoor[i], hs = heatSetpoint[i], cs = coolSetpoint[i], h = heat[i], c = cool[i];
        inserted += one.run(time[i], indoor[i], x === x ? x : null, hs === hs ? hs : null, cs === cs ? cs : null, h === h ? h : null, c === c ? c : null, ids).changes;
      }
      const rej = this.st.insertRejected;
      for (const r of b.rejected) rej.run(logId, r.line, r.column, r.columnName, r.reason, r.raw);
      const duplicatesInStore = b.count - inserted;
      const commit: ImportCommit = { logId, inserted, duplicatesInStore };
      const warnings = b.afterInsert ? [...b.warnings, ...b.afterInsert(commit)] : b.warnings;
      this.st.finishLog.run(inserted, b.rejected.length, b.duplicatesInFile + duplicatesInStore, JSON.stringify(warnings), logId);
      this.st.setZoneUnits.run(b.units, b.zoneId);
      this.samplesWrites++;
      return commit;
    }).immediate();
  }

  // ───────────────────────────── mappings ─────────────────────────────

  private mappingFromRow(r: Row): SavedMapping {
    return {
      id: r.id as number,
      name: r.name as string,
      mapping: JSON.parse(r.mapping_json as string) as ColumnMapping,
      createdAt: r.created_at as number,
      updatedAt: r.updated_at as number,
    };
  }

  /** Saves (or replaces) a named mapping after validating it (MappingError names a bad key). Returns its id. */
  saveMapping(name: string, mapping: ColumnMapping): number {
    const n = cleanName('mapping', name);
    const valid = parseMapping(mapping, `mapping "${n}"`);
    const now = nowMs();
    return this.st.upsertMapping.get(n, JSON.stringify(valid), now, now) as number;
  }

  listMappings(): SavedMapping[] {
    return (this.st.listMappings.all() as Row[]).map((r) => this.mappingFromRow(r));
  }

  getMapping(name: string): SavedMapping | null {
    const r = this.st.getMapping.get(String(name).trim()) as Row | undefined;
    return r ? this.mappingFromRow(r) : null;
  }

  /** Deletes a saved mapping; false when there was none of that name. */
  deleteMapping(name: string): boolean {
    return this.st.deleteMapping.run(String(name).trim()).changes > 0;
  }

  // ───────────────────────────── responses ─────────────────────────────

  /** Stores a fitted response of the zone; returns its id. Throws StoreError 'invalid' for non-finite model numbers. */
  saveResponse(zoneId: number, response: ZoneResponse): number {
    if (!this.getZone(zoneId)) throw new StoreError('not-found', `There is no zone #${zoneId}.`);
    for (const k of ['tauHours', 'heatRate', 'coolRate', 'gain'] as const) {
      if (!Number.isFinite(response[k])) throw new StoreError('invalid', `A response needs a finite ${k} (got ${response[k]}).`);
    }
    const info = this.st.insertResponse.run(
      zoneId,
      nowMs(),
      response.tauHours,
      response.heatRate,
      response.coolRate,
      response.gain,
      nullable(response.rmse),
      response.heldOutRmse === null ? null : nullable(response.heldOutRmse),
      nullable(response.cvrmse),
      nullable(response.nmbe),
      Math.round(response.samplesUsed),
      Number.isFinite(response.firstTime) ? Math.round(response.firstTime) : null,
      Number.isFinite(response.lastTime) ? Math.round(response.lastTime) : null,
      toJson(response),
    );
    return Number(info.lastInsertRowid);
  }

  /** Stores several fitted responses in one transaction (all or none); returns their ids in order. */
  saveResponses(items: ReadonlyArray<{ zoneId: number; response: ZoneResponse }>): number[] {
    return this.db.transaction(() => items.map((x) => this.saveResponse(x.zoneId, x.response))).immediate();
  }

  /** The zone's newest response, or null. */
  latestResponse(zoneId: number): ZoneResponse | null {
    const r = this.st.latestResponse.get(zoneId) as Row | undefined;
    return r ? responseFromJson(r.response_json as string) : null;
  }

  /** The zone's responses, newest first. */
  listResponses(zoneId: number): StoredResponse[] {
    return (this.st.listResponses.all(zoneId) as Row[]).map((r) => ({
      id: r.id as number,
      zoneId: r.zone_id as number,
      createdAt: r.created_at as number,
      response: responseFromJson(r.response_json as string),
    }));
  }

  deleteResponse(id: number): boolean {
    return this.st.deleteResponse.run(id).changes > 0;
  }

  // ───────────────────────────── schedules ─────────────────────────────

  private scheduleFromRow(r: Row): StoredSchedule {
    return { zoneId: r.zone_id as number, schedule: JSON.parse(r.schedule_json as string) as unknown, savedAt: r.saved_at as number };
  }

  /**
   * Saves (replaces) the schedules of the given zones in one transaction. The schedule's format is the
   * caller's to check (core/plan/schedule.ts); the store keeps it as JSON. Throws StoreError
   * 'not-found' for an unknown zone (nothing is written).
   */
  saveSchedules(items: Array<{ zoneId: number; schedule: unknown }>, now = nowMs()): void {
    this.db.transaction(() => {
      for (const { zoneId, schedule } of items) {
        if (!this.getZone(zoneId)) throw new StoreError('not-found', `There is no zone #${zoneId}.`);
        this.st.saveSchedule.run(zoneId, JSON.stringify(schedule), now);
      }
    }).immediate();
  }

  /** Every saved schedule, by zone id. */
  listSchedules(): StoredSchedule[] {
    return (this.st.listSchedules.all() as Row[]).map((r) => this.scheduleFromRow(r));
  }

  /** The zone's saved schedule, or null. */
  getSchedule(zoneId: number): StoredSchedule | null {
    const r = this.st.getSchedule.get(zoneId) as Row | undefined;
    return r ? this.scheduleFromRow(r) : null;
  }

  /** Forgets a zone's schedule; false when it had none. */
  deleteSchedule(zoneId: number): boolean {
    return this.st.deleteSchedule.run(zoneId).changes > 0;
  }
}

/**
 * Opens (creating if needed) a store file, or ':memory:'. Files use the WAL journal. Runs pending
 * migrations; refuses (StoreError) a database newer than this program or one that is not a Heatlag store.
 */
/** Options of openStore. */
export interface StoreOptions {
  /**
   * Path of a better-sqlite3 native module built for another runtime's ABI (the Electron build of
   * the desktop app); the Node build in node_modules is used when absent.
   */
  nativeBinding?: string;
  /** Open an existing, current database read-only (no migration, no journal change): a second reader. */
  readonly?: boolean;
}

export function openStore(file: string, options: StoreOptions = {}): Store {
  return new Store(file, options);
}
