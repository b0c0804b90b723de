/**
 * importLog's keepReadings (used by `heatlag fit file.csv`, which fits a file without a database of its
 * own): the readings it hands back must be exactly what the store returns for the new zone afterwards,
 * value for value, missing values included. The logs are the invented demo logs (assets/demo).
 */
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { importLog, openStore } from '../../db/index.ts';
import { readMappingFileSync } from '../../db/index.ts';

const demo = (f: string) => path.join(import.meta.dirname, '../../assets/demo', f);
const columns = ['time', 'indoor', 'outdoor', 'heatSetpoint', 'coolSetpoint', 'heat', 'cool'] as const;

describe('importLog keepReadings', () => {
  for (const [file, mapping] of [['great-hall.csv', 'great-hall.mapping.json'], ['cafe-kitchen.tsv', 'cafe-kitchen.mapping.json'], ['office-annex.csv', 'office-annex.mapping.json']] as const) {
    it(`hands back the readings the store then holds (${file})`, async () => {
      const store = openStore(':memory:');
      try {
        const zone = store.getOrCreateZone('Check', file);
        const result = await importLog(store, demo(file), { zoneId: zone.id, mapping: readMappingFileSync(demo(mapping)), keepReadings: true });
        const stored = store.loadSeries(zone.id);
        expect(result.readings).toBeDefined();
        expect(result.readings!.time.length).toBe(result.rowsAccepted);
        for (const c of columns) {
          const a = Array.from(result.readings![c]), b = Array.from(stored[c]);
          expect(a.length).toBe(b.length);
          // Object.is: NaN equals NaN, and −0 would differ from 0.
          expect(a.every((v, i) => Object.is(v, b[i]))).toBe(true);
        }
      } finally {
        store.close();
      }
    });
  }

  it('hands back nothing unless asked', async () => {
    const store = openStore(':memory:');
    const zone = store.getOrCreateZone('Check', 'plain');
    const result = await importLog(store, demo('great-hall.csv'), { zoneId: zone.id, mapping: readMappingFileSync(demo('great-hall.mapping.json')) });
    expect(result.readings).toBeUndefined();
    store.close();
  });
});
