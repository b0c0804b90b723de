/**
 * First launch: the invented demo site (assets/demo, made by assets/demo/generate.ts) is imported
 * once, so a new user sees a zone's drift and recovery straight away. It is clearly labelled as
 * invented data in the app; deleting it is final (it is not re-created on the next launch).
 */
import { existsSync, readFileSync } from 'node:fs';
import path from 'node:path';
import { z } from 'zod';
import { parseMappingJson } from '../../core/mapping.ts';
import { importLog } from '../../db/index.ts';
import type { ServiceContext } from './context.ts';

const TruthSchema = z.object({
  site: z.string().min(1),
  /** The invented site's IANA time zone (its logs' timestamps are local to it). */
  timezone: z.string().min(1).optional(),
  zones: z.array(z.object({ zone: z.string().min(1), file: z.string().min(1), mapping: z.string().min(1) })).min(1),
});

/**
 * Imports the demo site when the database is new (no sites) and the demo was never made.
 * Returns the demo site's id, or null when nothing was done. Never throws: a broken demo must not
 * stop the app from opening (the problem is logged).
 */
export async function seedDemo(ctx: ServiceContext): Promise<number | null> {
  const settings = ctx.settings.get();
  if (settings.demoSeeded || ctx.store.listSites().length > 0) {
    if (!settings.demoSeeded) ctx.settings.update({ demoSeeded: true });
    return null;
  }
  const truthFile = path.join(ctx.demoDir, 'truth.json');
  if (!existsSync(truthFile)) {
    ctx.log(`heatlag: the demo site is missing (${truthFile}); starting with an empty database.`);
    return null;
  }
  let siteId: number | null = null;
  try {
    const truth = TruthSchema.parse(JSON.parse(readFileSync(truthFile, 'utf8')));
    const site = ctx.store.createSite(truth.site);
    siteId = site.id;
    if (truth.timezone) ctx.store.setSiteTimezone(site.id, truth.timezone);
    for (const z of truth.zones) {
      const zone = ctx.store.createZone(site.id, z.zone);
      const mappingFile = path.join(ctx.demoDir, path.basename(z.mapping));
      const mapping = parseMappingJson(readFileSync(mappingFile, 'utf8'), path.basename(mappingFile));
      await importLog(ctx.store, path.join(ctx.demoDir, path.basename(z.file)), { zoneId: zone.id, mapping });
    }
    ctx.settings.update({ demoSeeded: true, demoSiteId: site.id });
    return site.id;
  } catch (err) {
    ctx.log(`heatlag: the demo site could not be imported: ${(err as Error).message}`);
    if (siteId !== null) {
      try {
        ctx.store.deleteSite(siteId);
      } catch {
        /* leave it */
      }
    }
    ctx.settings.update({ demoSeeded: true });
    return null;
  }
}
