/**
 * All service handlers, one object per service, merged into the contract's method set. Shared by the
 * Electron main process (IPC) and the browser-mode server (HTTP) through dispatch.ts.
 */
import type { ServiceContext } from './context.ts';
import type { Handlers } from './dispatch.ts';
import { importService } from './imports.ts';
import { planService } from './plan.ts';
import { reportService } from './report.ts';
import { responseService } from './responses.ts';
import { settingsService } from './settings-service.ts';
import { siteService } from './sites.ts';

export function createHandlers(ctx: ServiceContext): Handlers {
  const handlers = {
    ...settingsService(ctx),
    ...siteService(ctx),
    ...importService(ctx),
    ...responseService(ctx),
    ...planService(ctx),
    ...reportService(ctx),
  } satisfies Handlers;
  return Object.freeze(handlers);
}

export type { ServiceContext, NativeDialogs } from './context.ts';
export { dispatch, type Handlers } from './dispatch.ts';
export { seedDemo } from './demo.ts';
export { SettingsFile } from './settings.ts';
export { UploadRegistry } from './uploads.ts';
export { defaultDataDir, DATABASE_FILE, SETTINGS_FILE } from './paths.ts';
