/**
 * The person's preferences (°C or °F) and the app's own bookkeeping (whether the demo site was made),
 * kept as a small JSON file beside the database, so they survive restarts in both the desktop and
 * the browser mode (whose page origin changes with its port, so browser storage would not).
 */
import { mkdirSync, readFileSync, renameSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { z } from 'zod';

const StoredSchema = z.object({
  units: z.enum(['C', 'F']).catch('C'),
  demoSeeded: z.boolean().catch(false),
  demoSiteId: z.number().int().positive().nullable().catch(null),
});
export type StoredSettings = z.infer<typeof StoredSchema>;

const DEFAULTS: StoredSettings = { units: 'C', demoSeeded: false, demoSiteId: null };

export class SettingsFile {
  readonly file: string;
  private value: StoredSettings;

  constructor(file: string) {
    this.file = file;
    this.value = SettingsFile.read(file);
  }

  private static read(file: string): StoredSettings {
    try {
      const parsed = StoredSchema.safeParse(JSON.parse(readFileSync(file, 'utf8')));
      return parsed.success ? parsed.data : { ...DEFAULTS };
    } catch {
      return { ...DEFAULTS };
    }
  }

  get(): Readonly<StoredSettings> {
    return this.value;
  }

  /** Merges and writes atomically (temp file, then rename). */
  update(patch: Partial<StoredSettings>): StoredSettings {
    this.value = { ...this.value, ...patch };
    mkdirSync(path.dirname(this.file), { recursive: true });
    const tmp = `${this.file}.${process.pid}.tmp`;
    writeFileSync(tmp, JSON.stringify(this.value, null, 2) + '\n', { mode: 0o600 });
    renameSync(tmp, this.file);
    return this.value;
  }
}
