/**
 * The store on real better-sqlite3 files: migrations, sites and zones, series, responses, mappings.
 */
import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import Database from 'better-sqlite3';
import { describe, expect, it } from 'vitest';
import { MappingError } from '../../core/mapping.ts';
import type { ZoneResponse } from '../../core/types.ts';
import { APPLICATION_ID, canonicalTimeZone, importLog, latestVersion, loadMigrations, migrate, openStore, StoreError, zoneTimeZone } from '../../db/index.ts';
import { importText, lines, newStore, tempDir, writeLog } from './helpers.ts';
import { ONE_NODE_FIELDS } from '../support/response-fields.ts';

const response: ZoneResponse = {
  tauHours: 31.5,
  heatRate: 2.9,
  coolRate: 0,
  gain: 0.12,
  tauCI: [29.8, 33.1],
  heatRateCI: [2.7, 3.1],
  coolRateCI: null,
  hasHeating: true,
  hasCooling: false,
  heldOut: [{ from: Date.UTC(2026, 0, 12), to: Date.UTC(2026, 0, 13) }],
  rmse: 0.21,
  heldOutRmse: null,
  cvrmse: 1.1,
  nmbe: NaN,
  samplesUsed: 4032,
  daysUsed: 14,
  segments: 27,
  freeFloatHours: 96.5,
  firstTime: Date.UTC(2026, 0, 5),
  lastTime: Date.UTC(2026, 0, 19),
  warnings: ['Invented response for a test.'],
  ...ONE_NODE_FIELDS,
};

describe('migrations', () => {
  it('creates the schema, sets user_version and the application id, and uses WAL for files', () => {
    const { store, file } = newStore();
    expect(store.schemaVersion()).toBe(latestVersion());
    expect(latestVersion()).toBe(loadMigrations().length);
    store.close();
    const db = new Database(file, { readonly: true });
    expect(db.pragma('user_version', { simple: true })).toBe(latestVersion());
    expect(db.pragma('application_id', { simple: true })).toBe(APPLICATION_ID);
    expect(db.pragma('journal_mode', { simple: true })).toBe('wal');
    const strict = db.prepare("SELECT name, strict FROM pragma_table_list WHERE schema = 'main' AND name NOT LIKE 'sqlite_%'").all() as {
      name: string;
      strict: number;
    }[];
    expect(strict.map((t) => t.name).sort()).toEqual(['logs', 'mappings', 'rejected_rows', 'responses', 'samples', 'schedules', 'sites', 'zones']);
    expect(strict.every((t) => t.strict === 1)).toBe(true);
    const wr = db.prepare("SELECT wr FROM pragma_table_list WHERE name = 'samples'").pluck().get();
    expect(wr).toBe(1); // WITHOUT ROWID
    db.close();
  });

  it('upgrades a version-1 database (before the schedules table) in place, keeping its data', () => {
    const file = join(tempDir(), 'v1.heatlag');
    const db = new Database(file);
    migrate(db, file, loadMigrations().slice(0, 1));
    db.prepare('INSERT INTO sites (name, created_at) VALUES (?, ?)').run('Old site', 1);
    db.close();
    const store = openStore(file);
    try {
      expect(store.schemaVersion()).toBe(latestVersion());
      const zone = store.getOrCreateZone('Old site', 'Hall');
      store.saveSchedules([{ zoneId: zone.id, schedule: { kept: true } }]);
      expect(store.getSchedule(zone.id)?.schedule).toEqual({ kept: true });
      expect(store.listSites().map((x) => x.name)).toEqual(['Old site']);
    } finally {
      store.close();
    }
  });

  it('upgrades a version-2 database (before the site time zone) in place, keeping its data', async () => {
    const file = join(tempDir(), 'v2.heatlag');
    const db = new Database(file);
    migrate(db, file, loadMigrations().slice(0, 2));
    expect(db.pragma('user_version', { simple: true })).toBe(2);
    const siteId = Number(db.prepare('INSERT INTO sites (name, created_at) VALUES (?, ?)').run('Old site', 11).lastInsertRowid);
    const zoneId = Number(db.prepare('INSERT INTO zones (site_id, name, units, created_at) VALUES (?, ?, ?, ?)').run(siteId, 'Hall', 'F', 12).lastInsertRowid);
    db.prepare('INSERT INTO schedules (zone_id, schedule_json, saved_at) VALUES (?, ?, ?)').run(zoneId, '{"kept":true}', 13);
    db.close();
    const store = openStore(file);
    try {
      expect(store.schemaVersion()).toBe(latestVersion());
      expect(store.getSite(siteId)).toEqual({ id: siteId, name: 'Old site', timezone: null, createdAt: 11 });
      expect(store.getZone(zoneId)).toMatchObject({ name: 'Hall', units: 'F', siteTimezone: null, createdAt: 12 });
      expect(store.getSchedule(zoneId)).toEqual({ zoneId, schedule: { kept: true }, savedAt: 13 });
      expect(store.setSiteTimezone(siteId, 'America/Denver').timezone).toBe('America/Denver');
    } finally {
      store.close();
    }
    const again = openStore(file);
    try {
      expect(again.listSites()).toEqual([{ id: siteId, name: 'Old site', timezone: 'America/Denver', createdAt: 11, zones: 1 }]);
    } finally {
      again.close();
    }
  });

  it('opens an existing store again without re-running migrations, keeping its data', () => {
    const dir = tempDir();
    const file = join(dir, 'a.heatlag');
    const s1 = openStore(file);
    s1.createSite('Kept');
    s1.close();
    const s2 = openStore(file);
    expect(s2.listSites().map((s) => s.name)).toEqual(['Kept']);
    s2.close();
  });

  it('refuses a database from a newer version, unchanged, with a plain message', () => {
    const dir = tempDir();
    const file = join(dir, 'newer.heatlag');
    openStore(file).close();
    const db = new Database(file);
    db.pragma(`user_version = ${latestVersion() + 1}`);
    db.close();
    let err: unknown;
    try {
      openStore(file);
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(StoreError);
    expect((err as StoreError).kind).toBe('newer-database');
    expect((err as Error).message).toMatch(/newer version of Heatlag/);
    expect((err as Error).message).toContain(`schema version ${latestVersion() + 1}`);
    const check = new Database(file, { readonly: true });
    expect(check.pragma('user_version', { simple: true })).toBe(latestVersion() + 1);
    check.close();
  });

  it("refuses another program's database and a file that is not SQLite", () => {
    const dir = tempDir();
    const other = join(dir, 'other.db');
    const db = new Database(other);
    db.exec('CREATE TABLE invoices (id INTEGER PRIMARY KEY)');
    db.close();
    expect(() => openStore(other)).toThrow(/not a Heatlag database/);
    const text = join(dir, 'notes.heatlag');
    writeFileSync(text, 'these are not the pages of an SQLite database, just a long enough line of text to fill a header '.repeat(10));
    expect(() => openStore(text)).toThrow(StoreError);
    expect(() => openStore(text)).toThrow(/not a Heatlag database/);
  });

  it('runs each migration in one transaction: a failing one leaves the version where it was', () => {
    const dir = tempDir();
    const migDir = join(dir, 'migrations');
    mkdirSync(migDir);
    writeFileSync(join(migDir, '001_one.sql'), 'CREATE TABLE a (x INTEGER) STRICT;\nPRAGMA user_version = 1;\n');
    writeFileSync(join(migDir, '002_broken.sql'), 'CREATE TABLE b (x INTEGER) STRICT;\nINSERT INTO nowhere VALUES (1);\nPRAGMA user_version = 2;\n');
    const db = new Database(join(dir, 'm.db'));
    db.pragma(`application_id = ${APPLICATION_ID}`);
    const migrations = loadMigrations(migDir);
    expect(() => migrate(db, 'm.db', migrations)).toThrow(/no such table: nowhere/);
    expect(db.pragma('user_version', { simple: true })).toBe(1);
    const tables = db.prepare("SELECT name FROM sqlite_schema WHERE type = 'table' ORDER BY name").pluck().all();
    expect(tables).toEqual(['a']);
    db.close();
  });
});

describe('sites and zones', () => {
  it('creates, finds, renames and lists; names are unique ignoring case', () => {
    const { store } = newStore();
    const site = store.createSite('  Maple Street School ');
    expect(site.name).toBe('Maple Street School');
    expect(() => store.createSite('maple street school')).toThrow(StoreError);
    expect(() => store.createSite('   ')).toThrow(/needs a name/);
    const gym = store.createZone(site.id, 'Gym');
    expect(() => store.createZone(site.id, 'GYM')).toThrow(/has a zone named/);
    expect(store.findZone('maple street school', 'gym')?.id).toBe(gym.id);
    expect(store.findZone('Maple Street School', 'Library')).toBeNull();
    const same = store.getOrCreateZone('Maple Street School', 'Gym');
    expect(same.id).toBe(gym.id);
    const lib = store.getOrCreateZone('Maple Street School', 'Library');
    const other = store.getOrCreateZone('Harbor Clinic', 'Lobby');
    expect(store.listSites().map((s) => [s.name, s.zones])).toEqual([
      ['Harbor Clinic', 1],
      ['Maple Street School', 2],
    ]);
    expect(store.renameZone(lib.id, 'Library West').name).toBe('Library West');
    expect(store.renameSite(other.siteId, 'Harbor Clinic East').name).toBe('Harbor Clinic East');
    expect(() => store.renameSite(other.siteId, 'Maple Street School')).toThrow(/exists already/);
    expect(() => store.renameZone(9999, 'x')).toThrow(/no zone #9999/);
    const zones = store.listZones();
    expect(zones.map((z) => `${z.site}/${z.name}`)).toEqual(['Harbor Clinic East/Lobby', 'Maple Street School/Gym', 'Maple Street School/Library West']);
    expect(zones[0]).toMatchObject({ samples: 0, firstTime: null, lastTime: null, units: null, logs: 0 });
    expect(store.listZones(site.id).length).toBe(2);
    expect(store.zoneUnits(gym.id)).toBe('C');
  });

  it('deleteZone and deleteSite return the counts of what went with them', async () => {
    const csv = lines('time,indoor_f,outdoor_f', '2026-01-05T06:00:00Z,68,30', '2026-01-05T06:05:00Z,abc,30', '2026-01-05T06:10:00Z,69,31');
    const { store, zoneId } = await importText(csv);
    store.saveResponse(zoneId, response);
    store.saveSchedules([{ zoneId, schedule: { name: 'nights' } }]);
    const zone = store.getZone(zoneId)!;
    const second = store.createZone(zone.siteId, 'Second');
    expect(store.zoneDeleteCounts(zoneId)).toEqual({ sites: 0, zones: 1, logs: 1, samples: 2, rejectedRows: 1, responses: 1, schedules: 1 });
    const summary = store.listZones().find((z) => z.id === zoneId)!;
    expect(summary).toMatchObject({ samples: 2, units: 'F', logs: 1, firstTime: Date.UTC(2026, 0, 5, 6, 0), lastTime: Date.UTC(2026, 0, 5, 6, 10) });
    expect(store.deleteZone(zoneId)).toEqual({ sites: 0, zones: 1, logs: 1, samples: 2, rejectedRows: 1, responses: 1, schedules: 1 });
    expect(store.getSchedule(zoneId)).toBeNull();
    expect(store.getZone(zoneId)).toBeNull();
    expect(store.deleteSite(zone.siteId)).toEqual({ sites: 1, zones: 1, logs: 0, samples: 0, rejectedRows: 0, responses: 0, schedules: 0 });
    expect(store.getZone(second.id)).toBeNull();
    expect(() => store.deleteSite(zone.siteId)).toThrow(/no site/);
  });

  it('deleteSite counts across all its zones', async () => {
    const { store, zoneId, dir } = await importText(lines('time,indoor_c', '2026-01-05T06:00:00Z,20', '2026-01-05T06:05:00Z,20.5'));
    const zone = store.getZone(zoneId)!;
    const z2 = store.createZone(zone.siteId, 'Upstairs');
    const p = join(dir, 'up.csv');
    writeFileSync(p, lines('time,indoor_c', '2026-01-05T06:00:00Z,19', '2026-01-05T06:05:00Z,19.5', '2026-01-05T06:10:00Z,19.7'));
    await importLog(store, p, { zoneId: z2.id });
    store.saveSchedules([{ zoneId, schedule: { a: 1 } }, { zoneId: z2.id, schedule: { b: 2 } }]);
    expect(store.siteDeleteCounts(zone.siteId)).toEqual({ sites: 1, zones: 2, logs: 2, samples: 5, rejectedRows: 0, responses: 0, schedules: 2 });
    expect(store.deleteSite(zone.siteId)).toEqual({ sites: 1, zones: 2, logs: 2, samples: 5, rejectedRows: 0, responses: 0, schedules: 2 });
    expect(store.listSchedules()).toEqual([]);
    expect(store.listZones()).toEqual([]);
  });
});

describe('site time zone', () => {
  it('sets, corrects the letter case of, reads back and clears a site time zone; refuses a bad one unchanged', () => {
    const { store } = newStore();
    const site = store.createSite('Front Range Office');
    expect(site.timezone).toBeNull();
    const zone = store.createZone(site.id, 'Lobby');
    expect(store.setSiteTimezone(site.id, ' america/denver ')).toMatchObject({ id: site.id, timezone: 'America/Denver' });
    expect(store.getSite(site.id)?.timezone).toBe('America/Denver');
    expect(store.findSite('front range office')?.timezone).toBe('America/Denver');
    expect(store.listSites()[0]?.timezone).toBe('America/Denver');
    expect(store.getZone(zone.id)?.siteTimezone).toBe('America/Denver');
    expect(store.listZones()[0]?.siteTimezone).toBe('America/Denver');
    // A link stays as written (not replaced by the zone it points to).
    expect(store.setSiteTimezone(site.id, 'US/Mountain').timezone).toBe('US/Mountain');
    for (const bad of ['Mars/Olympus_Mons', '', '   ', 'Denver', '+05:00']) {
      let err: unknown;
      try {
        store.setSiteTimezone(site.id, bad);
      } catch (e) {
        err = e;
      }
      expect(err, bad).toBeInstanceOf(StoreError);
      expect((err as StoreError).kind).toBe('invalid');
      expect((err as Error).message).toMatch(/not a known IANA time zone/);
      expect(store.getSite(site.id)?.timezone).toBe('US/Mountain');
    }
    expect(() => store.setSiteTimezone(9999, 'UTC')).toThrow(/no site #9999/);
    expect(store.setSiteTimezone(site.id, null).timezone).toBeNull();
    expect(store.getZone(zone.id)?.siteTimezone).toBeNull();
  });

  it("zoneTimeZone: the site's zone when set, else the newest log that names one, else null", async () => {
    const offsets = lines('time,indoor_c', '2026-01-12T06:00:00-07:00,18', '2026-01-12T06:05:00-07:00,18.2');
    const { store, zoneId, dir } = await importText(offsets);
    const siteId = store.getZone(zoneId)!.siteId;
    expect(store.listLogs(zoneId)[0]?.mapping.timezone).toBeUndefined();
    expect(store.zoneTimeZone(zoneId)).toBeNull();

    const local = writeLog(dir, 'local.csv', lines('time,indoor_c', '2026-01-13 06:00,18', '2026-01-13 06:05,18.2'));
    await importLog(store, local, { zoneId, timezone: 'America/Chicago' });
    const later = writeLog(dir, 'later.csv', lines('time,indoor_c', '2026-01-14T06:00:00Z,18', '2026-01-14T06:05:00Z,18.2'));
    await importLog(store, later, { zoneId });
    // The newest log names no zone: the one before it does.
    expect(store.listLogs(zoneId).map((l) => l.mapping.timezone ?? null)).toEqual([null, 'America/Chicago', null]);
    expect(store.zoneTimeZone(zoneId)).toBe('America/Chicago');

    store.setSiteTimezone(siteId, 'America/Denver');
    expect(store.zoneTimeZone(zoneId)).toBe('America/Denver');
    store.setSiteTimezone(siteId, null);
    expect(store.zoneTimeZone(zoneId)).toBe('America/Chicago');
    expect(() => store.zoneTimeZone(9999)).toThrow(/no zone #9999/);
  });

  it('zoneTimeZone (the pure rule) and canonicalTimeZone', () => {
    expect(zoneTimeZone('Europe/Berlin', [{ mapping: { timezone: 'America/Chicago' } }])).toBe('Europe/Berlin');
    expect(zoneTimeZone(null, [{ mapping: { timezone: 'America/Chicago' } }, { mapping: { timezone: 'Asia/Tokyo' } }, { mapping: {} }])).toBe('Asia/Tokyo');
    expect(zoneTimeZone(null, [{ mapping: {} }])).toBeNull();
    expect(zoneTimeZone(null, [])).toBeNull();
    expect(canonicalTimeZone('europe/BERLIN')).toBe('Europe/Berlin');
    expect(canonicalTimeZone('utc')).toBe('UTC');
    expect(canonicalTimeZone('Nowhere/Town')).toBeNull();
  });
});

describe('schedules', () => {
  it('saves, replaces, lists and forgets a schedule per zone; an unknown zone writes nothing', () => {
    const { store } = newStore();
    const a = store.getOrCreateZone('Site', 'A');
    const b = store.getOrCreateZone('Site', 'B');
    store.saveSchedules([{ zoneId: a.id, schedule: { v: 1 } }, { zoneId: b.id, schedule: { v: 2 } }], 1000);
    store.saveSchedules([{ zoneId: a.id, schedule: { v: 3 } }], 2000);
    expect(store.listSchedules()).toEqual([
      { zoneId: a.id, schedule: { v: 3 }, savedAt: 2000 },
      { zoneId: b.id, schedule: { v: 2 }, savedAt: 1000 },
    ]);
    expect(() => store.saveSchedules([{ zoneId: b.id, schedule: { v: 9 } }, { zoneId: 999, schedule: {} }])).toThrow(/no zone #999/);
    expect(store.getSchedule(b.id)).toEqual({ zoneId: b.id, schedule: { v: 2 }, savedAt: 1000 });
    expect(store.deleteSchedule(b.id)).toBe(true);
    expect(store.deleteSchedule(b.id)).toBe(false);
    expect(store.listSchedules().map((s) => s.zoneId)).toEqual([a.id]);
  });
});

describe('series, responses, mappings, logs', () => {
  it('loadSeries returns Float64Arrays in time order with NaN for missing values, and honours from/to', async () => {
    const csv = lines(
      'time,indoor_c,outdoor_c,heat_setpoint_c,heat_runtime_fraction',
      '2026-01-05T06:10:00Z,20.5,,21,0.5',
      '2026-01-05T06:00:00Z,20.0,1.5,21,',
      '2026-01-05T06:05:00Z,20.2,1.6,,1',
    );
    const { store, zoneId } = await importText(csv);
    const s = store.loadSeries(zoneId);
    expect(s.time).toBeInstanceOf(Float64Array);
    expect(Array.from(s.time)).toEqual([Date.UTC(2026, 0, 5, 6, 0), Date.UTC(2026, 0, 5, 6, 5), Date.UTC(2026, 0, 5, 6, 10)]);
    expect(Array.from(s.indoor)).toEqual([20, 20.2, 20.5]);
    expect(Array.from(s.outdoor)).toEqual([1.5, 1.6, NaN]);
    expect(Array.from(s.heatSetpoint)).toEqual([21, NaN, 21]);
    expect(Array.from(s.heat)).toEqual([NaN, 1, 0.5]);
    expect(Array.from(s.cool)).toEqual([NaN, NaN, NaN]);
    expect(s.coolSetpoint.length).toBe(3);
    const part = store.loadSeries(zoneId, Date.UTC(2026, 0, 5, 6, 5), Date.UTC(2026, 0, 5, 6, 5));
    expect(Array.from(part.time)).toEqual([Date.UTC(2026, 0, 5, 6, 5)]);
    expect(store.loadSeries(zoneId, Date.UTC(2027, 0, 1)).time.length).toBe(0);
    expect(() => store.loadSeries(4242)).toThrow(/no zone #4242/);
  });

  it('saves responses and returns the latest, keeping NaN and null', () => {
    const { store } = newStore();
    const zone = store.getOrCreateZone('S', 'Z');
    expect(store.latestResponse(zone.id)).toBeNull();
    const id1 = store.saveResponse(zone.id, response);
    const id2 = store.saveResponse(zone.id, { ...response, tauHours: 40 });
    expect(id2).toBeGreaterThan(id1);
    const latest = store.latestResponse(zone.id)!;
    expect(latest.tauHours).toBe(40);
    expect(latest.nmbe).toBeNaN();
    expect(latest.coolRateCI).toBeNull();
    expect(latest.tauCI).toEqual([29.8, 33.1]);
    expect(latest.heldOut).toEqual(response.heldOut);
    expect(store.listResponses(zone.id).map((r) => r.response.tauHours)).toEqual([40, 31.5]);
    expect(() => store.saveResponse(zone.id, { ...response, tauHours: NaN })).toThrow(/finite tauHours/);
    expect(() => store.saveResponse(999, response)).toThrow(/no zone/);
    expect(store.deleteResponse(id2)).toBe(true);
    expect(store.latestResponse(zone.id)!.tauHours).toBe(31.5);
  });

  it('saves mappings by name (replacing), validates them, lists and deletes them', () => {
    const { store } = newStore();
    store.saveMapping('Berlin export', { time: ['Datum', 'Uhrzeit'], dateFormat: 'dd.MM.yyyy HH:mm', indoor: 'Raumtemperatur', timezone: 'Europe/Berlin' });
    store.saveMapping('berlin export', { time: 'Zeit', indoor: 'Raum' });
    store.saveMapping('Chicago', { time: 'time', indoor: 'Indoor Temp (F)', units: 'F' });
    expect(store.listMappings().map((m) => [m.name, m.mapping.time])).toEqual([
      ['Berlin export', 'Zeit'],
      ['Chicago', 'time'],
    ]);
    expect(store.getMapping('CHICAGO')?.mapping.units).toBe('F');
    expect(() => store.saveMapping('bad', { time: 'time', indoor: 'x', units: 'K' } as never)).toThrow(MappingError);
    expect(() => store.saveMapping('bad', { time: 'time', indoor: 'x', units: 'K' } as never)).toThrow(/"units"/);
    expect(store.deleteMapping('chicago')).toBe(true);
    expect(store.deleteMapping('chicago')).toBe(false);
  });

  it('lists logs with their counts, pages rejected rows, and deleteLog removes the readings it added', async () => {
    const csv = lines('time,indoor_c', '2026-01-05T06:00:00Z,20', '2026-01-05T06:05:00Z,x', '2026-01-05T06:10:00Z,', '2026-01-05T06:15:00Z,21');
    const { store, zoneId, result, dir } = await importText(csv);
    const logs = store.listLogs(zoneId);
    expect(logs).toHaveLength(1);
    expect(logs[0]).toMatchObject({ id: result.logId, fileName: 'log.csv', rowsAccepted: 2, rowsRejected: 2, duplicates: 0, samples: 2, units: 'C', encoding: 'utf-8' });
    expect(logs[0].mapping).toMatchObject({ time: 'time', indoor: 'indoor_c' });
    expect(store.rejectedRows(result.logId)).toEqual([
      { line: 3, column: 2, columnName: 'indoor_c', reason: "'x' is not a number", raw: '2026-01-05T06:05:00Z,x' },
      { line: 4, column: 2, columnName: 'indoor_c', reason: 'the indoor temperature is blank', raw: '2026-01-05T06:10:00Z,' },
    ]);
    expect(store.rejectedRows(result.logId, 1, 1).map((r) => r.line)).toEqual([4]);
    // A second, overlapping log: deleting it keeps the readings the first one added.
    const p2 = join(dir, 'second.csv');
    writeFileSync(p2, lines('time,indoor_c', '2026-01-05T06:15:00Z,21', '2026-01-05T06:20:00Z,21.2'));
    const r2 = await importLog(store, p2, { zoneId });
    expect(r2).toMatchObject({ rowsAccepted: 1, duplicates: 1 });
    expect(store.deleteLog(r2.logId)).toEqual({ samples: 1, rejectedRows: 0 });
    expect(store.loadSeries(zoneId).time.length).toBe(2);
    expect(store.deleteLog(result.logId)).toEqual({ samples: 2, rejectedRows: 2 });
    expect(store.loadSeries(zoneId).time.length).toBe(0);
    expect(store.rejectedRows(result.logId)).toEqual([]);
  });

  it('works in memory too', () => {
    const store = openStore(':memory:');
    const z = store.getOrCreateZone('Mem', 'Z');
    expect(store.loadSeries(z.id).time.length).toBe(0);
    store.close();
    expect(store.isOpen).toBe(false);
  });
});
