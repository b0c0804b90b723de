/**
 * The invented example exports in tests/fixtures/import/ (written by make-fixtures.ts): they match
 * their generator, and each imports as described there.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { importLog, previewLog, readMappingFile } from '../../db/index.ts';
import { fixtures } from '../fixtures/import/make-fixtures.ts';
import { newStore, utc } from './helpers.ts';

const dir = fileURLToPath(new URL('../fixtures/import/', import.meta.url));
const f2c = (f: number) => (f - 32) / 1.8;

describe('import fixtures', () => {
  it('are what make-fixtures.ts writes', () => {
    for (const [name, bytes] of fixtures()) expect(Buffer.compare(readFileSync(join(dir, name)), Buffer.from(bytes)), name).toBe(0);
  });

  it('us-thermostat-f.csv: °F, ISO with offset, runtime seconds, detected from the header', async () => {
    const { store } = newStore();
    const z = store.getOrCreateZone('Prairie View Library (invented)', 'Reading Room');
    const r = await importLog(store, join(dir, 'us-thermostat-f.csv'), { zoneId: z.id });
    expect(r).toMatchObject({ rowsAccepted: 288, rowsRejected: 0, units: 'F', intervalMinutes: 5 });
    expect(r.mapping.heating).toEqual({ column: 'Heat Runtime (sec)', as: 'seconds' });
    const s = store.loadSeries(z.id);
    expect(s.time[0]).toBe(utc('2026-01-12T06:00:00Z'));
    expect(s.indoor[0]).toBeCloseTo(f2c(61.4), 12);
    expect(s.heat[0]).toBeCloseTo(268 / 300, 12);
    expect(Array.from(s.outdoor).filter(Number.isNaN).length).toBe(3);
  });

  it('lindenhof-latin1.csv: Latin-1, semicolons, decimal commas, split date and time, with its mapping file', async () => {
    const { store } = newStore();
    const z = store.getOrCreateZone('Lindenhof Kita (invented)', 'Gruppenraum');
    const mapping = await readMappingFile(join(dir, 'lindenhof-mapping.json'));
    const r = await importLog(store, join(dir, 'lindenhof-latin1.csv'), { zoneId: z.id, mapping });
    expect(r).toMatchObject({ rowsAccepted: 96, rowsRejected: 0, encoding: 'windows-1252', units: 'C' });
    // 00:00 CET (UTC+1 in February) = 23:00 UTC the day before.
    expect(store.loadSeries(z.id).time[0]).toBe(utc('2026-02-02T23:00:00Z'));
    // Without the mapping, detection gets the same columns once the time zone is given.
    const p = await previewLog(join(dir, 'lindenhof-latin1.csv'), { timezone: 'Europe/Berlin' });
    expect(p.mapping).toMatchObject({ time: ['Datum', 'Uhrzeit'], indoor: 'Raumtemperatur (°C)', heating: { column: 'Heizung (%)', as: 'percent' } });
  });

  it('harbor-utf16.tsv: UTF-16 LE with BOM, tabs, epoch seconds, runtime fractions', async () => {
    const { store } = newStore();
    const z = store.getOrCreateZone('Harbor Clinic (invented)', 'Waiting Room');
    const r = await importLog(store, join(dir, 'harbor-utf16.tsv'), { zoneId: z.id });
    expect(r).toMatchObject({ rowsAccepted: 144, rowsRejected: 0, encoding: 'utf-16le', intervalMinutes: 10 });
    expect(store.loadSeries(z.id).time[0]).toBe(utc('2026-02-09T00:00:00Z'));
  });

  it('elm-street-local-dst.csv: local New York times over the fall-back night', async () => {
    const { store } = newStore();
    const z = store.getOrCreateZone('Elm Street Office (invented)', 'Suite 2');
    const r = await importLog(store, join(dir, 'elm-street-local-dst.csv'), { zoneId: z.id, timezone: 'America/New_York' });
    expect(r).toMatchObject({ rowsAccepted: 7, duplicates: 0 });
    // EDT (UTC−4) until 2026-11-01 06:00 UTC, then EST (UTC−5): IANA tz database rules.
    expect(Array.from(store.loadSeries(z.id).time)).toEqual(
      ['2026-11-01T02:00:00Z', '2026-11-01T03:00:00Z', '2026-11-01T04:00:00Z', '2026-11-01T05:00:00Z', '2026-11-01T06:00:00Z', '2026-11-01T07:00:00Z', '2026-11-01T08:00:00Z'].map(utc),
    );
    expect(Array.from(store.loadSeries(z.id).heat)).toEqual([0, 1, 0, 1, 0, 1, 0]);
  });

  it('bad-rows.csv: rejected rows with line, column and reason', async () => {
    const { store } = newStore();
    const z = store.getOrCreateZone('Test (invented)', 'Z');
    const r = await importLog(store, join(dir, 'bad-rows.csv'), { zoneId: z.id });
    expect(r.rowsAccepted).toBe(2);
    expect(r.rejected.map((x) => [x.line, x.column])).toEqual([
      [3, 2],
      [4, 2],
      [5, 2],
      [6, 1],
      [7, 5],
      [9, 3],
    ]);
  });
});
