/** Sites and zones: list, create, rename, set a site's time zone and location, delete (with the counts of what goes with them). */
import type { DeleteCounts, SiteInfo, ZoneInfo } from '../api/contract.ts';
import type { Store } from '../../db/store.ts';
import type { ZoneSummary } from '../../db/types.ts';
import type { ServiceContext } from './context.ts';
import { ServiceError } from './errors.ts';

function zoneInfo(store: Store, z: ZoneSummary): ZoneInfo {
  return {
    id: z.id,
    siteId: z.siteId,
    name: z.name,
    samples: z.samples,
    firstTime: z.firstTime,
    lastTime: z.lastTime,
    units: z.units,
    timezone: store.zoneTimeZone(z.id),
    logs: z.logs,
    hasResponse: store.listResponses(z.id).length > 0,
    lastImportAt: store.listLogs(z.id).reduce<number | null>((m, l) => (m === null || l.importedAt > m ? l.importedAt : m), null),
  };
}

/** The counts the API shows (the store's, without its own "sites" figure). */
function plainCounts(c: DeleteCounts & { sites: number }): DeleteCounts {
  return { zones: c.zones, logs: c.logs, samples: c.samples, rejectedRows: c.rejectedRows, responses: c.responses, schedules: c.schedules };
}

export function siteService(ctx: ServiceContext) {
  const { store } = ctx;

  const demoId = () => {
    const id = ctx.settings.get().demoSiteId;
    return id !== null && store.getSite(id) ? id : null;
  };

  function site(id: number): SiteInfo {
    const s = store.getSite(id);
    if (!s) throw new ServiceError('not-found', 'That site no longer exists.');
    return {
      id: s.id,
      name: s.name,
      isDemo: s.id === demoId(),
      timezone: s.timezone,
      location: store.siteLocation(s.id),
      zones: store.listZones(s.id).map((z) => zoneInfo(store, z)),
    };
  }

  function zone(id: number): ZoneInfo {
    const z = store.listZones().find((x) => x.id === id);
    if (!z) throw new ServiceError('not-found', 'That zone no longer exists.');
    return zoneInfo(store, z);
  }

  function requireSite(siteId: number) {
    if (!store.getSite(siteId)) throw new ServiceError('not-found', 'That site no longer exists.');
  }
  function requireZone(zoneId: number) {
    if (!store.getZone(zoneId)) throw new ServiceError('not-found', 'That zone no longer exists.');
  }

  return {
    async listSites(): Promise<SiteInfo[]> {
      const demo = demoId();
      const zones = store.listZones();
      return store.listSites().map((s) => ({
        id: s.id,
        name: s.name,
        isDemo: s.id === demo,
        timezone: s.timezone,
        location: store.siteLocation(s.id),
        zones: zones.filter((z) => z.siteId === s.id).map((z) => zoneInfo(store, z)),
      }));
    },
    async createSite({ name }: { name: string }): Promise<SiteInfo> {
      return site(store.createSite(name).id);
    },
    async renameSite({ siteId, name }: { siteId: number; name: string }): Promise<SiteInfo> {
      requireSite(siteId);
      store.renameSite(siteId, name);
      return site(siteId);
    },
    async setSiteTimezone({ siteId, timezone }: { siteId: number; timezone: string | null }): Promise<SiteInfo> {
      requireSite(siteId);
      store.setSiteTimezone(siteId, timezone);
      return site(siteId);
    },
    async setSiteLocation({ siteId, latDeg, lonDeg }: { siteId: number; latDeg: number | null; lonDeg: number | null }): Promise<SiteInfo> {
      requireSite(siteId);
      store.setSiteLocation(siteId, latDeg, lonDeg);
      return site(siteId);
    },
    async siteDeletePreview({ siteId }: { siteId: number }): Promise<DeleteCounts> {
      requireSite(siteId);
      return plainCounts(store.siteDeleteCounts(siteId));
    },
    async deleteSite({ siteId }: { siteId: number }): Promise<DeleteCounts> {
      requireSite(siteId);
      return plainCounts(store.deleteSite(siteId));
    },
    async createZone({ siteId, name }: { siteId: number; name: string }): Promise<ZoneInfo> {
      requireSite(siteId);
      return zone(store.createZone(siteId, name).id);
    },
    async renameZone({ zoneId, name }: { zoneId: number; name: string }): Promise<ZoneInfo> {
      requireZone(zoneId);
      store.renameZone(zoneId, name);
      return zone(zoneId);
    },
    async zoneDeletePreview({ zoneId }: { zoneId: number }): Promise<DeleteCounts> {
      requireZone(zoneId);
      return plainCounts(store.zoneDeleteCounts(zoneId));
    },
    async deleteZone({ zoneId }: { zoneId: number }): Promise<DeleteCounts> {
      requireZone(zoneId);
      return plainCounts(store.deleteZone(zoneId));
    },
  };
}
