/**
 * Schedules saved by earlier versions of Heatlag, which kept them in a JSON file beside the database
 * (`<database name>.schedules.json`) before the store had a table for them (db migration 002). On the
 * first open by this version the file's schedules are copied into the store, each only if its zone
 * still exists (the same zone: same id and creation time) and has no schedule in the store yet; the
 * file is then renamed to `….schedules.json.imported`, so it is never read twice and nothing is lost.
 */
import { existsSync, readFileSync, renameSync } from 'node:fs';
import path from 'node:path';
import { z } from 'zod';
import { ScheduleFileSchema } from '../../core/plan/schedule.ts';
import type { Store } from '../../db/store.ts';

const EntrySchema = z.object({
  zoneId: z.number().int().positive(),
  zoneCreatedAt: z.number(),
  savedAt: z.number(),
  schedule: ScheduleFileSchema,
});
const FileSchema = z.object({ version: z.literal(1), schedules: z.array(z.unknown()) });

/** The schedules file an earlier version kept beside a database file. */
export function legacySchedulesFile(databasePath: string): string {
  const dir = path.dirname(databasePath);
  const base = path.basename(databasePath).replace(/\.[^.]*$/, '') || 'heatlag';
  return path.join(dir, `${base}.schedules.json`);
}

/** Copies the legacy file's schedules into the store (see the module comment). Returns how many. */
export function importLegacySchedules(store: Store, databasePath: string, log: (msg: string) => void = () => {}): number {
  const file = legacySchedulesFile(databasePath);
  if (databasePath === ':memory:' || !existsSync(file)) return 0;
  let raw: unknown;
  try {
    raw = JSON.parse(readFileSync(file, 'utf8'));
  } catch (err) {
    log(`The schedules file ${file} could not be read (${(err as Error).message}); it is left as it is.`);
    return 0;
  }
  const parsed = FileSchema.safeParse(raw);
  if (!parsed.success) {
    log(`The schedules file ${file} is not in the expected format; it is left as it is.`);
    return 0;
  }
  const items: Array<{ zoneId: number; schedule: unknown }> = [];
  for (const e of parsed.data.schedules) {
    const ok = EntrySchema.safeParse(e);
    if (!ok.success) continue;
    const zone = store.getZone(ok.data.zoneId);
    if (!zone || zone.createdAt !== ok.data.zoneCreatedAt || store.getSchedule(zone.id)) continue;
    items.push({ zoneId: zone.id, schedule: ok.data.schedule });
  }
  store.saveSchedules(items);
  renameSync(file, `${file}.imported`);
  log(`Moved ${items.length} saved schedule${items.length === 1 ? '' : 's'} from ${file} into the database.`);
  return items.length;
}
