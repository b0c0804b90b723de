/**
 * The planning service and the schedule editor's conversions, without a browser:
 * - every example schedule (assets/plans, invented) survives the editor's draft unchanged: loading a
 *   file and saving it again gives a file that parseSchedule reads as the same schedule;
 * - a schedule rewritten in the other unit (1 K = 1.8 °F, exact by definition of the scale) plans the
 *   same week to within 1e-6 of the runtime;
 * - saved schedules live beside the database, survive a restart and never attach to a new zone that
 *   reuses a deleted zone's id;
 * - the site plan says why a zone has no plan (no schedule, not fitted) instead of failing.
 */
import { mkdtempSync, readFileSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { scheduleInUnit } from '../../app/api/schedule-units.ts';
import { openBackend, type OpenBackend } from '../../app/backend/backend.ts';
import { describeKey, checkDraft, draftFromFile, fileFromDraft, scheduleFileName } from '../../app/renderer/src/lib/plan-draft.ts';
import { parseSchedule, type ScheduleFile } from '../../core/plan/schedule.ts';

const ROOT = path.resolve(import.meta.dirname, '../..');
const PLANS = path.join(ROOT, 'assets', 'plans');
const read = (f: string) => JSON.parse(readFileSync(path.join(PLANS, f), 'utf8')) as ScheduleFile;
const examples = readdirSync(PLANS).filter((f) => f.endsWith('.json'));

describe('schedule drafts', () => {
  it.each(examples)('%s: file → draft → file is the same schedule', (f) => {
    const file = read(f);
    const again = fileFromDraft(draftFromFile(file), file.units, true);
    expect(again.units).toBe(file.units);
    // Same validated schedule (internal units), to floating-point noise.
    const a = parseSchedule(file);
    const b = parseSchedule(again);
    expect(JSON.stringify(b, (_k, v) => (typeof v === 'number' ? Math.round(v * 1e9) / 1e9 : v))).toBe(
      JSON.stringify(a, (_k, v) => (typeof v === 'number' ? Math.round(v * 1e9) / 1e9 : v)),
    );
    expect(again.name).toBe(file.name);
  });

  it('writes identical days as weekdays / weekend, and reports problems in the screen’s words', () => {
    const d = draftFromFile(read('office-annex.json'));
    expect(Object.keys(fileFromDraft(d, 'C', true).days)).toEqual(['weekdays', 'weekend']);
    d.days[1]![0]!.to = '25:00';
    const bad = checkDraft(d, 'C');
    expect(bad).toEqual({ ok: false, where: 'Tuesday, period 1 (to)', message: 'expected a time "HH:MM" from 00:00 to 24:00, got "25:00"' });
    d.days[1]![0]!.to = '18:00';
    d.days[1]!.push({ from: '17:00', to: '19:00', heatC: 20, coolC: null });
    expect(checkDraft(d, 'C')).toMatchObject({ ok: false, where: 'Tuesday', message: 'occupied periods overlap; list them without overlap' });
    d.days[1]!.pop();
    d.unoccupiedHeatC = Number.NaN;
    expect(checkDraft(d, 'C')).toMatchObject({ ok: false, where: 'Unoccupied setpoints' });
    expect(describeKey('equipment.heatPump.capacityAt')).toBe('Heat pump');
    expect(scheduleFileName('Café Kitchen, heat pump')).toBe('cafe-kitchen-heat-pump.json');
  });

  it('a °F schedule rewritten in °C has the same internal values (1 K = 1.8 °F)', () => {
    const f = read('great-hall.json');
    const c = scheduleInUnit(f, 'C');
    expect(c.unoccupied.heat).toBeCloseTo((58 - 32) / 1.8, 9);
    expect(c.deadband).toBeCloseTo(1.5 / 1.8, 9);
    expect(c.setbackFloor).toBeCloseTo((55 - 32) / 1.8, 9);
    const a = parseSchedule(f);
    const b = parseSchedule(c);
    expect(b.deadbandK).toBeCloseTo(a.deadbandK, 12);
    expect(b.days[0]![0]!.heatC!).toBeCloseTo(a.days[0]![0]!.heatC!, 12);
    expect(b.setbackFloorC).toBeCloseTo(a.setbackFloorC, 12);
  });
});

describe('plan service', () => {
  let dir: string;
  let backend: OpenBackend;
  let zones: Record<string, number>;
  let siteId: number;

  beforeAll(async () => {
    dir = mkdtempSync(path.join(tmpdir(), 'heatlag-plan-svc-'));
    backend = await openBackend({ dataDir: dir, mode: 'browser', version: 'test', demoDir: path.join(ROOT, 'assets', 'demo'), log: () => {} });
    const sites = await backend.handlers.listSites({});
    siteId = sites[0]!.id;
    zones = Object.fromEntries(sites[0]!.zones.map((z) => [z.name, z.id]));
    await backend.handlers.fitZone({ zoneId: zones['Great Hall']! });
  });
  afterAll(() => {
    backend.close();
    rmSync(dir, { recursive: true, force: true });
  });

  it('plans the same week from a schedule in °F or rewritten in °C', async () => {
    const h = backend.handlers;
    const outdoor = { kind: 'design' as const, designDbC: -10, dailyRangeK: 0 };
    const f = await h.planZone({ zoneId: zones['Great Hall']!, schedule: read('great-hall.json'), outdoor });
    const c = await h.planZone({ zoneId: zones['Great Hall']!, schedule: read('great-hall.json'), outdoor, units: 'C' });
    // Tolerance: the thermostat's switching instants are found by bisection; 1e-6 h of runtime a week.
    expect(Math.abs(c.plan.week.heatHours - f.plan.week.heatHours)).toBeLessThan(1e-6);
    expect(Math.abs(c.plan.week.baselineHeatHours - f.plan.week.baselineHeatHours)).toBeLessThan(1e-6);
    expect(c.plan.recoveries.map((r) => r.optimalStartLabel)).toEqual(f.plan.recoveries.map((r) => r.optimalStartLabel));
    // The cautions follow the unit asked for.
    expect(f.plan.cautions.some((x) => x.text.includes('°F'))).toBe(true);
    expect(c.plan.cautions.some((x) => x.text.includes('°F'))).toBe(false);
    expect(c.basis.occupiedHours[0]).toEqual([7, 22]);
  });

  it('offers the weeks of the log with outdoor readings, latest first', async () => {
    const w = await backend.handlers.planWeeks({ zoneId: zones['Office Annex']! });
    expect(w.timeZone).toBe('Europe/Berlin'); // the time zone of the log's mapping
    expect(w.latest).toBe('2025-03-31');
    expect(w.weeks.map((x) => x.start)).toEqual(['2025-03-31', '2025-03-24', '2025-03-17', '2025-03-10']);
    // The demo log of this zone has a 20 h gap in its outdoor readings that week (invented, on purpose).
    expect(w.weeks[1]).toMatchObject({ usable: false });
    expect(w.weeks[1]!.problem).toContain('a gap of 20.2 h from 2025-03-26 14:50');
  });

  it('keeps saved schedules in the database, across a restart, and never for a reused zone id', async () => {
    const h = backend.handlers;
    const z = await h.createZone({ siteId, name: 'Scratch room' });
    await h.saveSchedules({ entries: [{ zoneId: z.id, schedule: read('office-annex.json') }, { zoneId: zones['Great Hall']!, schedule: read('great-hall.json') }] });
    expect(backend.ctx.store.getSchedule(z.id)?.schedule).toEqual(read('office-annex.json'));
    expect(readdirSync(dir).some((f) => f.includes('schedules'))).toBe(false);
    expect((await h.zoneDeletePreview({ zoneId: z.id })).schedules).toBe(1);
    backend.close();
    backend = await openBackend({ dataDir: dir, mode: 'browser', version: 'test', demoDir: path.join(ROOT, 'assets', 'demo'), log: () => {} });
    const again = await backend.handlers.listSchedules({});
    expect(again.map((s) => s.zoneId).sort()).toEqual([zones['Great Hall']!, z.id].sort());
    await backend.handlers.deleteZone({ zoneId: z.id });
    const z2 = await backend.handlers.createZone({ siteId, name: 'Another room' });
    const after = await backend.handlers.listSchedules({});
    expect(after.some((s) => s.zoneId === z2.id)).toBe(false);
    await expect(backend.handlers.saveSchedules({ entries: [{ zoneId: z2.id, schedule: { ...read('office-annex.json'), unoccupied: { heat: 22 }, days: { everyday: [{ from: '08:00', to: '07:00', heat: 21 }] } } }] })).rejects.toThrow(
      'days.everyday[0].to: "to" (07:00) must be after "from" (08:00)',
    );
  });

  it('moves the schedules an earlier version kept beside the database into it, once, for the zones that still exist', async () => {
    const hall = backend.ctx.store.getZone(zones['Great Hall']!)!;
    await backend.handlers.deleteSchedule({ zoneId: hall.id });
    const file = path.join(dir, 'heatlag.schedules.json');
    const entry = (zoneId: number, zoneCreatedAt: number) => ({ zoneId, zoneCreatedAt, savedAt: 5, schedule: read('great-hall.json') });
    // One entry for the hall, one for a zone id that was reused since (another creation time), one unreadable.
    writeFileSync(file, JSON.stringify({ version: 1, schedules: [entry(hall.id, hall.createdAt), entry(hall.id + 1000, 1), { nonsense: true }] }));
    backend.close();
    backend = await openBackend({ dataDir: dir, mode: 'browser', version: 'test', demoDir: path.join(ROOT, 'assets', 'demo'), log: () => {} });
    const after = await backend.handlers.listSchedules({});
    expect(after.filter((s) => s.zoneId === hall.id).map((s) => s.schedule)).toEqual([read('great-hall.json')]);
    expect(readdirSync(dir)).toContain('heatlag.schedules.json.imported');
    expect(readdirSync(dir)).not.toContain('heatlag.schedules.json');
  });

  it("a site's time zone decides its zones' time zone, the weeks offered and the plan (not a cached plan of the old zone)", async () => {
    const h = backend.handlers;
    const hall = zones['Great Hall']!;
    const outdoor = { kind: 'history' as const, weekStart: '2025-03-17' };
    const request = { zoneId: hall, schedule: read('great-hall.json'), outdoor };
    const zoneTz = async (id: number) => (await h.listSites({})).find((s) => s.id === siteId)!.zones.find((z) => z.id === id)!.timezone;
    // The Great Hall's log has ISO-8601 offsets and names no zone: without a site time zone its times
    // and plan are in this computer's zone; the Office Annex's log of local times names Europe/Berlin.
    const local = Intl.DateTimeFormat().resolvedOptions().timeZone;
    const siteTz = local === 'America/Denver' ? 'Asia/Tokyo' : 'America/Denver';
    // The demo site opens with its own time zone (assets/demo/truth.json); cleared here to start from none.
    expect((await h.listSites({})).find((s) => s.id === siteId)!.timezone).toBe('Europe/Berlin');
    await h.setSiteTimezone({ siteId, timezone: null });
    expect((await h.listSites({})).find((s) => s.id === siteId)!.timezone).toBeNull();
    expect(await zoneTz(hall)).toBeNull();
    expect(await zoneTz(zones['Office Annex']!)).toBe('Europe/Berlin');
    const before = await h.planZone(request);
    expect(before.basis.timeZone).toBe(local);

    const set = await h.setSiteTimezone({ siteId, timezone: siteTz });
    expect(set).toMatchObject({ id: siteId, timezone: siteTz });
    expect(set.zones.find((z) => z.id === hall)!.timezone).toBe(siteTz);
    expect(await zoneTz(hall)).toBe(siteTz);
    expect(await zoneTz(zones['Office Annex']!)).toBe(siteTz); // the site's zone wins over the log's
    expect((await h.planWeeks({ zoneId: hall })).timeZone).toBe(siteTz);
    const after = await h.planZone(request);
    expect(after.basis.timeZone).toBe(siteTz);
    // The same Monday starts hours apart in the two zones: other outdoor readings, other runtime.
    expect(after.plan.week.heatHours).not.toBe(before.plan.week.heatHours);

    await expect(h.setSiteTimezone({ siteId, timezone: 'Mars/Olympus_Mons' })).rejects.toThrow(/not a known IANA time zone/);
    expect(await zoneTz(hall)).toBe(siteTz);
    const cleared = await h.setSiteTimezone({ siteId, timezone: null });
    expect(cleared.timezone).toBeNull();
    expect(await zoneTz(hall)).toBeNull();
    expect(await zoneTz(zones['Office Annex']!)).toBe('Europe/Berlin');
    expect((await h.planZone(request)).basis.timeZone).toBe(local);
    await expect(h.setSiteTimezone({ siteId: 99_999, timezone: 'UTC' })).rejects.toThrow('That site no longer exists.');
  });

  it('the site plan says why a zone has no plan', async () => {
    const site = await backend.handlers.planSite({ siteId, outdoor: { kind: 'range', lowC: -5, highC: 5 } });
    const by = Object.fromEntries(site.zones.map((z) => [z.name, z]));
    expect(by['Great Hall']!.state).toBe('ok');
    expect(by['Great Hall']!.plan!.days).toHaveLength(7);
    expect(by['Office Annex']!.state).toBe('no-schedule');
    expect(by['Another room']!.state).toBe('no-schedule');
    await backend.handlers.saveSchedules({ entries: [{ zoneId: zones['Café Kitchen']!, schedule: read('cafe-kitchen.json') }] });
    const again = await backend.handlers.planSite({ siteId, outdoor: { kind: 'range', lowC: -5, highC: 5 } });
    expect(again.zones.find((z) => z.name === 'Café Kitchen')).toMatchObject({ state: 'no-response' });
  });
});
