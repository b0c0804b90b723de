/**
 * The store's prepared statements, all made once when a store opens (db/store.ts). Only "?" and named
 * placeholders; no value is ever put into SQL text.
 */
import type Database from 'better-sqlite3';

/**
 * Readings written per INSERT statement during an import: one statement with this many rows of
 * placeholders (fewer calls into SQLite, about a third faster than one row per call). Only "?"
 * placeholders are repeated; no value is ever put into SQL text.
 */
export const SAMPLE_BATCH = 256;
/** One reading: zone and log are the same for the whole statement (named), the rest positional. */
const SAMPLE_ROW = '(@zone, ?, @log, ?, ?, ?, ?, ?, ?)';
const SAMPLE_COLUMNS = 'zone_id, time, log_id, indoor, outdoor, heat_setpoint, cool_setpoint, heat, cool';

/** Every statement of the store, by name. */
export function prepareStatements(db: Database.Database) {
  return {
    insertSite: db.prepare('INSERT INTO sites (name, created_at) VALUES (?, ?)'),
    renameSite: db.prepare('UPDATE sites SET name = ? WHERE id = ?'),
    deleteSite: db.prepare('DELETE FROM sites WHERE id = ?'),
    setSiteLocation: db.prepare('UPDATE sites SET latitude = ?, longitude = ? WHERE id = ?'),
    siteLocation: db.prepare('SELECT latitude, longitude FROM sites WHERE id = ?'),
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

export type Statements = ReturnType<typeof prepareStatements>;
