/**
 * Saved schedules, one per zone, kept as a small JSON file beside the database
 * (`<database name>.schedules.json`), written atomically. The store has no table for schedules and
 * they are the person's settings for a zone rather than data the import produces, so they live with
 * the settings: the file travels with the database it belongs to. Each entry remembers when its zone
 * was created, so a schedule never attaches to a later zone that happens to reuse a deleted zone's id.
 */
import { mkdirSync, readFileSync, renameSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { z } from 'zod';
import { ScheduleFileSchema, type ScheduleFile } from '../../../core/plan/schedule.ts';

const EntrySchema = z.object({
  zoneId: z.number().int().positive(),
  zoneCreatedAt: z.number(),
  savedAt: z.number(),
  schedule: ScheduleFileSchema,
});
const FileSchema = z.object({ version: z.literal(1), schedules: z.array(z.unknown()) });

export type ScheduleEntry = z.infer<typeof EntrySchema>;

/** The schedules file that belongs to a database file. */
export function schedulesFileFor(databasePath: string): string {
  const dir = path.dirname(databasePath);
  const base = path.basename(databasePath).replace(/\.[^.]*$/, '') || 'heatlag';
  return path.join(dir, `${base}.schedules.json`);
}

export class ScheduleFileStore {
  readonly file: string;
  private entries: ScheduleEntry[];
  /** Entries of the file that could not be read (kept on write, never lost). */
  private unreadable: unknown[] = [];

  constructor(file: string) {
    this.file = file;
    this.entries = this.read();
  }

  private read(): ScheduleEntry[] {
    let raw: unknown;
    try {
      raw = JSON.parse(readFileSync(this.file, 'utf8'));
    } catch {
      return [];
    }
    const parsed = FileSchema.safeParse(raw);
    if (!parsed.success) return [];
    const out: ScheduleEntry[] = [];
    for (const e of parsed.data.schedules) {
      const ok = EntrySchema.safeParse(e);
      if (ok.success) out.push(ok.data);
      else this.unreadable.push(e);
    }
    return out;
  }

  private write(): void {
    mkdirSync(path.dirname(this.file), { recursive: true });
    const tmp = `${this.file}.${process.pid}.tmp`;
    writeFileSync(tmp, JSON.stringify({ version: 1, schedules: [...this.entries, ...this.unreadable] }, null, 2) + '\n', { mode: 0o600 });
    renameSync(tmp, this.file);
  }

  /** Entries whose zone still exists (`zoneCreatedAt(zoneId)` gives its creation time, null when gone). */
  list(zoneCreatedAt: (zoneId: number) => number | null): ScheduleEntry[] {
    return this.entries.filter((e) => zoneCreatedAt(e.zoneId) === e.zoneCreatedAt);
  }

  get(zoneId: number, createdAt: number): ScheduleEntry | null {
    return this.entries.find((e) => e.zoneId === zoneId && e.zoneCreatedAt === createdAt) ?? null;
  }

  /** Saves (replaces) the schedules of the given zones in one write. */
  save(items: Array<{ zoneId: number; zoneCreatedAt: number; schedule: ScheduleFile }>, now = Date.now()): void {
    const ids = new Set(items.map((i) => i.zoneId));
    this.entries = [...this.entries.filter((e) => !ids.has(e.zoneId)), ...items.map((i) => ({ ...i, savedAt: now }))];
    this.write();
  }

  /** Forgets a zone's schedule; false when it had none. */
  delete(zoneId: number): boolean {
    const before = this.entries.length;
    this.entries = this.entries.filter((e) => e.zoneId !== zoneId);
    if (this.entries.length === before) return false;
    this.write();
    return true;
  }

  /** Drops the entries of zones that no longer exist (or were replaced by a new zone with the same id). */
  prune(zoneCreatedAt: (zoneId: number) => number | null): void {
    const keep = this.list(zoneCreatedAt);
    if (keep.length !== this.entries.length) {
      this.entries = keep;
      this.write();
    }
  }
}
