/** App information and the person's settings. */
import { MAX_UPLOAD_BYTES, type AppInfo, type Settings } from '../api/contract.ts';
import type { ServiceContext } from './context.ts';

export function settingsService(ctx: ServiceContext) {
  return {
    async appInfo(): Promise<AppInfo> {
      const id = ctx.settings.get().demoSiteId;
      return {
        version: ctx.version,
        mode: ctx.mode,
        databasePath: ctx.databasePath,
        demoSiteId: id !== null && ctx.store.getSite(id) ? id : null,
        maxUploadBytes: Math.min(ctx.uploads.maxBytes, MAX_UPLOAD_BYTES),
      };
    },
    async getSettings(): Promise<Settings> {
      return { units: ctx.settings.get().units };
    },
    async setSettings(patch: Partial<Settings>): Promise<Settings> {
      const next = ctx.settings.update(patch.units ? { units: patch.units } : {});
      return { units: next.units };
    },
  };
}
