/**
 * Test helpers for db/: temporary store files and log files on disk (real better-sqlite3 files).
 */
import { createHash } from 'node:crypto';
import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import Database from 'better-sqlite3';
import { afterEach } from 'vitest';
import { importLog, openStore, type ImportOptions, type ImportResult, type Store } from '../../db/index.ts';

const dirs: string[] = [];
const stores: Store[] = [];

afterEach(() => {
  while (stores.length) stores.pop()!.close();
  while (dirs.length) rmSync(dirs.pop()!, { recursive: true, force: true });
});

/** A fresh temporary directory, removed after the test. */
export function tempDir(): string {
  const d = mkdtempSync(join(tmpdir(), 'heatlag-db-test-'));
  dirs.push(d);
  return d;
}

/** A fresh store file in a temporary directory (closed after the test). */
export function newStore(dir = tempDir(), name = 'test.heatlag'): { store: Store; file: string; dir: string } {
  const file = join(dir, name);
  const store = openStore(file);
  stores.push(store);
  return { store, file, dir };
}

/** Writes a log file (text as UTF-8, or raw bytes) into `dir` and returns its path. */
export function writeLog(dir: string, name: string, content: string | Uint8Array): string {
  const p = join(dir, name);
  writeFileSync(p, content);
  return p;
}

/** Lines joined with "\n" and a final line break. */
export function lines(...rows: string[]): string {
  return rows.join('\n') + '\n';
}

/** A store, a zone and one import of `content`. */
export async function importText(
  content: string | Uint8Array,
  options: Omit<ImportOptions, 'zoneId'> = {},
  name = 'log.csv',
): Promise<{ store: Store; zoneId: number; result: ImportResult; path: string; dir: string }> {
  const { store, dir } = newStore();
  const zone = store.getOrCreateZone('Test Site', 'Test Zone');
  const path = writeLog(dir, name, content);
  const result = await importLog(store, path, { ...options, zoneId: zone.id });
  return { store, zoneId: zone.id, result, path, dir };
}

/** Every row of every table of a store file, as text (for "nothing changed" checks). */
export function dumpTables(file: string): string {
  const db = new Database(file, { readonly: true });
  try {
    const tables = db.prepare("SELECT name FROM sqlite_schema WHERE type = 'table' ORDER BY name").pluck().all() as string[];
    const out: string[] = [];
    for (const t of tables) {
      // Table names come from sqlite_schema of our own test file; quoted as identifiers.
      const rows = db.prepare(`SELECT * FROM "${t.replaceAll('"', '""')}"`).raw(true).all();
      out.push(`${t}: ${JSON.stringify(rows)}`);
    }
    return out.join('\n');
  } finally {
    db.close();
  }
}

/** SHA-256 of a file's bytes ('' when it does not exist). */
export function fileHash(path: string): string {
  return existsSync(path) ? createHash('sha256').update(readFileSync(path)).digest('hex') : '';
}

/** UTC epoch ms of an ISO string with offset (a test's expected value). */
export function utc(iso: string): number {
  const v = Date.parse(iso);
  if (Number.isNaN(v)) throw new Error(`bad ISO in test: ${iso}`);
  return v;
}
