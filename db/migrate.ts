/**
 * Schema migrations: the numbered files db/migrations/NNN_name.sql, run in order.
 *
 * Each file runs in one transaction and ends by setting `PRAGMA user_version = NNN` itself, so no SQL is
 * ever assembled from strings here; the runner checks the file did set it. A database whose
 * user_version is newer than the newest file is refused (StoreError 'newer-database'), and a database
 * that is not a Heatlag store (another application_id, or tables but no version) is refused
 * ('not-a-store').
 */
import { readdirSync, readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import type Database from 'better-sqlite3';
import { StoreError } from './errors.ts';

/** PRAGMA application_id of a Heatlag store ("HTLG" read as a big-endian 32-bit integer). */
export const APPLICATION_ID = 0x48544c47;

export interface Migration {
  version: number;
  name: string;
  sql: string;
}

const MIGRATIONS_DIR = fileURLToPath(new URL('./migrations/', import.meta.url));

/** The migration files, checked to be numbered 1, 2, 3 … without gaps. */
export function loadMigrations(dir: string = MIGRATIONS_DIR): Migration[] {
  const files = readdirSync(dir).filter((f) => /^\d{3}_[\w-]+\.sql$/.test(f)).sort();
  const list = files.map((name) => ({ version: Number(name.slice(0, 3)), name, sql: readFileSync(`${dir}/${name}`, 'utf8') }));
  list.forEach((m, i) => {
    if (m.version !== i + 1) throw new Error(`migration ${m.name}: expected number ${String(i + 1).padStart(3, '0')} (numbers must run 001, 002, … without gaps)`);
  });
  return list;
}

/** The schema version this program writes (the newest migration's number). */
export function latestVersion(migrations: Migration[] = loadMigrations()): number {
  return migrations.length === 0 ? 0 : migrations[migrations.length - 1].version;
}

/**
 * Brings `db` up to the newest schema. Returns the versions applied (empty when already current).
 * Throws StoreError ('newer-database' or 'not-a-store'); a failing migration rolls back whole.
 */
export function migrate(db: Database.Database, label: string, migrations: Migration[] = loadMigrations()): number[] {
  const current = db.pragma('user_version', { simple: true }) as number;
  const appId = db.pragma('application_id', { simple: true }) as number;
  const latest = latestVersion(migrations);
  if (current > 0 && appId !== APPLICATION_ID) {
    throw new StoreError('not-a-store', `${label} is not a Heatlag database (it belongs to another program).`);
  }
  if (current === 0) {
    const tables = db.prepare("SELECT count(*) AS n FROM sqlite_schema WHERE type = 'table'").get() as { n: number };
    if (tables.n > 0 || (appId !== 0 && appId !== APPLICATION_ID)) {
      throw new StoreError('not-a-store', `${label} is not a Heatlag database (it already holds tables of another program).`);
    }
  }
  if (current > latest) {
    throw new StoreError(
      'newer-database',
      `${label} was written by a newer version of Heatlag (schema version ${current}; this version knows up to ${latest}). ` +
        'Update Heatlag to open it; the file was not changed.',
    );
  }
  const applied: number[] = [];
  for (const m of migrations) {
    if (m.version <= current) continue;
    db.transaction(() => {
      db.exec(m.sql);
      const now = db.pragma('user_version', { simple: true }) as number;
      if (now !== m.version) throw new Error(`migration ${m.name} must end with PRAGMA user_version = ${m.version} (it left ${now})`);
    }).immediate();
    applied.push(m.version);
  }
  return applied;
}
