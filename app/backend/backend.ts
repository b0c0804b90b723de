/**
 * Opens everything the services need (database, settings, upload folder), seeds the demo on first
 * launch, and builds the handlers. One function, used by both composition roots.
 */
import { mkdirSync } from 'node:fs';
import path from 'node:path';
import { openStore, type Store } from '../../db/index.ts';
import type { NativeDialogs, ServiceContext } from './context.ts';
import { seedDemo } from './demo.ts';
import type { Handlers } from './dispatch.ts';
import { createHandlers } from './index.ts';
import { DATABASE_FILE, SETTINGS_FILE } from './paths.ts';
import { SettingsFile } from './settings.ts';
import { UploadRegistry } from './uploads.ts';

export interface BackendOptions {
  /** Folder of the database and settings (created if missing). */
  dataDir: string;
  /** Database file; default <dataDir>/heatlag.db. */
  databaseFile?: string;
  mode: 'desktop' | 'browser';
  version: string;
  demoDir: string;
  /** Import the demo site into a new database (default true). */
  demo?: boolean;
  dialogs?: NativeDialogs;
  /** Opens the store (desktop: with the Electron build of better-sqlite3). */
  open?: (file: string) => Store;
  maxUploadBytes?: number;
  log?: (msg: string) => void;
}

export interface OpenBackend {
  ctx: ServiceContext;
  handlers: Handlers;
  close(): void;
}

export async function openBackend(options: BackendOptions): Promise<OpenBackend> {
  mkdirSync(options.dataDir, { recursive: true });
  const databasePath = path.resolve(options.databaseFile ?? path.join(options.dataDir, DATABASE_FILE));
  const store = (options.open ?? openStore)(databasePath);
  const log = options.log ?? ((m: string) => console.error(m));
  const ctx: ServiceContext = {
    store,
    settings: new SettingsFile(path.join(options.dataDir, SETTINGS_FILE)),
    uploads: new UploadRegistry(options.maxUploadBytes),
    mode: options.mode,
    version: options.version,
    databasePath,
    demoDir: options.demoDir,
    log,
    ...(options.dialogs ? { dialogs: options.dialogs } : {}),
  };
  if (options.demo !== false) await seedDemo(ctx);
  else if (!ctx.settings.get().demoSeeded) ctx.settings.update({ demoSeeded: true });
  return {
    ctx,
    handlers: createHandlers(ctx),
    close() {
      ctx.uploads.dispose();
      store.close();
    },
  };
}
