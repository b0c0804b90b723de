/**
 * A zone with no time zone of its own (no site zone, no log that names one) is laid out in the
 * caller's fallback zone, sent with the request (the browser's in browser mode), so the server and the
 * page agree whatever the server computer's zone: plan weeks, plans of a zone and of a site, and the
 * fit's local days all follow it, exactly as if the site were set to that zone; a site's zone still wins.
 * The log is the invented demo's great-hall.csv (ISO-8601 offsets, no zone name).
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApi } from '../../app/api/client.ts';
import type { Method } from '../../app/api/contract.ts';
import { openBackend, type OpenBackend } from '../../app/backend/backend.ts';
import { dispatch } from '../../app/backend/dispatch.ts';
import { localTimeZone } from '../../app/backend/fit-options.ts';
import { importLog } from '../../db/index.ts';

const ROOT = path.resolve(import.meta.dirname, '../..');
// Far from the test machine's zone (and from UTC, which CI runs in), with no DST in March.
const BROWSER = 'Asia/Tokyo';
const SITE_ZONE = 'America/Denver';

let dir: string;
let backend: OpenBackend;
let zoneId: number;
let siteId: number;

beforeAll(async () => {
  dir = mkdtempSync(path.join(tmpdir(), 'heatlag-fallback-tz-'));
  backend = await openBackend({ dataDir: dir, mode: 'browser', version: 'test', demoDir: path.join(ROOT, 'assets', 'demo'), log: () => {} });
  const site = await backend.handlers.createSite({ name: 'Invented Annex' });
  siteId = site.id;
  zoneId = (await backend.handlers.createZone({ siteId, name: 'Hall' })).id;
  await importLog(backend.ctx.store, path.join(ROOT, 'assets', 'demo', 'great-hall.csv'), { zoneId });
  await backend.handlers.saveSchedules({ entries: [{ zoneId, schedule: (await import('../../assets/plans/great-hall.json', { with: { type: 'json' } })).default as never }] });
}, 60_000);
afterAll(() => {
  backend.close();
  rmSync(dir, { recursive: true, force: true });
});

describe('the fallback time zone of a zone without one', () => {
  it('plans and fits in the caller’s zone, the same as a site set to it; a site’s zone wins', async () => {
    const h = backend.handlers;
    expect(localTimeZone()).not.toBe(BROWSER);
    expect(backend.ctx.store.zoneTimeZone(zoneId)).toBeNull();

    const weeks = await h.planWeeks({ zoneId, fallbackTimeZone: BROWSER });
    expect(weeks.timeZone).toBe(BROWSER);
    expect((await h.planWeeks({ zoneId })).timeZone).toBe(localTimeZone());
    await h.fitZone({ zoneId, fallbackTimeZone: BROWSER });
    // The fit's local days (held-out days, interval days) are the browser's days.
    expect(backend.ctx.store.latestResponse(zoneId)!.timeZone).toBe(BROWSER);
    const schedule = backend.ctx.store.getSchedule(zoneId)!.schedule as never;
    const plan = await h.planZone({ zoneId, schedule, outdoor: { kind: 'history' }, fallbackTimeZone: BROWSER });
    expect(plan.basis.timeZone).toBe(BROWSER);
    expect(plan.plan.outdoor).toMatchObject({ kind: 'history', timeZone: BROWSER });
    const sitePlan = await h.planSite({ siteId, outdoor: { kind: 'history' }, fallbackTimeZone: BROWSER });
    expect(sitePlan.zones[0]!.basis?.timeZone).toBe(BROWSER);

    // The same answers as with the site's zone set to the browser's: one rule, no second path.
    await h.setSiteTimezone({ siteId, timezone: BROWSER });
    expect(await h.planWeeks({ zoneId })).toEqual(weeks);
    const asSite = await h.planZone({ zoneId, schedule, outdoor: { kind: 'history' } });
    expect(asSite.plan.recoveries.map((r) => r.optimalStartLabel)).toEqual(plan.plan.recoveries.map((r) => r.optimalStartLabel));
    expect(asSite.plan.week).toEqual(plan.plan.week);

    // A site's own zone is not overridden by the caller's.
    await h.setSiteTimezone({ siteId, timezone: SITE_ZONE });
    expect((await h.planWeeks({ zoneId, fallbackTimeZone: BROWSER })).timeZone).toBe(SITE_ZONE);
    await h.fitZone({ zoneId, fallbackTimeZone: BROWSER });
    expect(backend.ctx.store.latestResponse(zoneId)!.timeZone).toBe(SITE_ZONE);
    await h.setSiteTimezone({ siteId, timezone: null });
  }, 120_000);

  it('a fallback that is not a time zone is refused at the boundary with the field named', async () => {
    const r = await dispatch(backend.handlers, 'planWeeks', { zoneId, fallbackTimeZone: 'Mars/Olympus' });
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.error.message).toMatch(/fallbackTimeZone.*not a known IANA time zone/);
  });
});

describe('the client adds the fallback', () => {
  it('to the methods that take it, never overriding one given, and to no other method', async () => {
    const sent: Array<[Method, unknown]> = [];
    const api = createApi(async (method, input) => {
      sent.push([method, input]);
      return { ok: false, error: { code: 'test', message: 'not answered' } };
    }, { fallbackTimeZone: BROWSER });
    await Promise.allSettled([
      api.planWeeks({ zoneId: 1 }),
      api.fitZone({ zoneId: 1 }),
      api.planSite({ siteId: 1, outdoor: { kind: 'history' }, fallbackTimeZone: 'Europe/Oslo' }),
      api.listSites({}),
      api.latestResponse({ zoneId: 1 }),
    ]);
    expect(sent).toEqual([
      ['planWeeks', { zoneId: 1, fallbackTimeZone: BROWSER }],
      ['fitZone', { zoneId: 1, fallbackTimeZone: BROWSER }],
      ['planSite', { siteId: 1, outdoor: { kind: 'history' }, fallbackTimeZone: 'Europe/Oslo' }],
      ['listSites', {}],
      ['latestResponse', { zoneId: 1 }],
    ]);
  });
});
