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
import { writeImport, type ImportBatch, type ImportCommit } from './store/import-commit.ts';
import {
  cleanName,
  isUniqueViolation,
  logFromRow,
  mappingFromRow,
  nowMs,
  nullable,
  responseFromJson,
  scheduleFromRow,
  siteFromRow,
  toJson,
  zoneFromRow,
  type Row,
} from './store/records.ts';
import { prepareStatements, type Statements } from './store/statements.ts';

export type { ImportBatch, ImportCommit } from './store/import-commit.ts';

const MIN_TIME = Number.MIN_SAFE_INTEGER;
const MAX_TIME = Number.MAX_SAFE_INTEGER;

/** An open store. Create with openStore(). */
export class Store {
  /** The file given to openStore (':memory:' for an in-memory store). */
  readonly file: string;
  private readonly db: Database.Database;
  private readonly st: Statements;
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
    this.st = prepareStatements(db);
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

  getSite(id: number): Site | null {
    const r = this.st.getSite.get(id) as Row | undefined;
    return r ? siteFromRow(r) : null;
  }

  findSite(name: string): Site | null {
    const r = this.st.findSite.get(String(name).trim()) as Row | undefined;
    return r ? siteFromRow(r) : null;
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
    const info = this.st.setSiteLocation.run(latDeg, lonDeg, id);
    if (info.changes === 0) throw new StoreError('not-found', `There is no site #${id}.`);
  }

  /** The site's location, or null when not set. */
  siteLocation(id: number): { latDeg: number; lonDeg: number } | null {
    const r = this.st.siteLocation.get(id) as { latitude: number | null; longitude: number | null } | undefined;
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
    return (this.st.listSites.all() as Row[]).map((r) => ({ ...siteFromRow(r), zones: r.zones as number }));
  }

  // ───────────────────────────── zones ─────────────────────────────

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
    return r ? zoneFromRow(r) : null;
  }

  /** The zone named `zoneName` of the site named `siteName` (names compare ignoring ASCII case), or null. */
  findZone(siteName: string, zoneName: string): Zone | null {
    const r = this.st.findZone.get(String(siteName).trim(), String(zoneName).trim()) as Row | undefined;
    return r ? zoneFromRow(r) : null;
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
      ...zoneFromRow(r),
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

  /** The zone's imported logs, oldest first, each with the number of its readings still stored. */
  listLogs(zoneId: number): LogSummary[] {
    const counts = new Map<number, number>();
    for (const r of this.st.logSampleCounts.all(zoneId) as Row[]) counts.set(r.log_id as number, r.n as number);
    return (this.st.logColumns.all(zoneId) as Row[]).map((r) => logFromRow(r, counts.get(r.id as number) ?? 0));
  }

  getLog(logId: number): LogSummary | null {
    const r = this.st.getLog.get(logId) as Row | undefined;
    return r ? logFromRow(r, this.st.logSampleCount.get(r.zone_id, logId) as number) : null;
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
      const commit = writeImport(this.st, b);
      this.samplesWrites++;
      return commit;
    }).immediate();
  }

  // ───────────────────────────── mappings ─────────────────────────────

  /** Saves (or replaces) a named mapping after validating it (MappingError names a bad key). Returns its id. */
  saveMapping(name: string, mapping: ColumnMapping): number {
    const n = cleanName('mapping', name);
    const valid = parseMapping(mapping, `mapping "${n}"`);
    const now = nowMs();
    return this.st.upsertMapping.get(n, JSON.stringify(valid), now, now) as number;
  }

  listMappings(): SavedMapping[] {
    return (this.st.listMappings.all() as Row[]).map((r) => mappingFromRow(r));
  }

  getMapping(name: string): SavedMapping | null {
    const r = this.st.getMapping.get(String(name).trim()) as Row | undefined;
    return r ? mappingFromRow(r) : null;
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
    return (this.st.listSchedules.all() as Row[]).map((r) => scheduleFromRow(r));
  }

  /** The zone's saved schedule, or null. */
  getSchedule(zoneId: number): StoredSchedule | null {
    const r = this.st.getSchedule.get(zoneId) as Row | undefined;
    return r ? scheduleFromRow(r) : null;
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
