/**
 * The mapping file: schema (core/mapping.ts) and reading it from disk (db/import/mapping-file.ts).
 */
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { ColumnMappingSchema, MappingError, parseMapping, parseMappingJson } from '../../core/mapping.ts';
import { readMappingFile, readMappingFileSync } from '../../db/index.ts';
import { tempDir, writeLog } from './helpers.ts';

function mappingError(fn: () => unknown): MappingError {
  try {
    fn();
  } catch (err) {
    expect(err).toBeInstanceOf(MappingError);
    return err as MappingError;
  }
  throw new Error('no MappingError');
}

describe('ColumnMappingSchema', () => {
  it('accepts the full form and the smallest one', () => {
    const full = {
      time: ['Datum', 'Uhrzeit'],
      dateFormat: 'dd.MM.yyyy HH:mm',
      indoor: 'Raum',
      outdoor: 'Außen',
      heatSetpoint: 'Soll',
      coolSetpoint: 'Soll kühl',
      heating: { column: 'Heizung', as: 'percent' },
      cooling: { column: 'Klima', as: 'onoff' },
      units: 'C',
      delimiter: ';',
      decimal: ',',
      timezone: 'Europe/Berlin',
      runtimeInterval: 'starting',
    };
    expect(parseMapping(full)).toEqual(full);
    expect(parseMapping({ time: 'time', indoor: 'indoor' })).toEqual({ time: 'time', indoor: 'indoor' });
    expect(ColumnMappingSchema.safeParse({ time: 'time' }).success).toBe(false);
  });

  it('names the key in every message', () => {
    expect(mappingError(() => parseMapping({ time: 't' }, 'm.json')).message).toBe('m.json: "indoor" is required (the indoor temperature column)');
    const e = mappingError(() => parseMapping({ time: 't', indoor: 'i', heating: { column: 'h', as: 'secs' } }, 'm.json'));
    expect(e.key).toBe('heating.as');
    expect(e.message).toBe('m.json: "heating.as" must be one of seconds, minutes, fraction, percent, onoff');
    expect(mappingError(() => parseMapping({ time: 't', indoor: 'i', units: 'K' })).message).toBe('mapping: "units" must be "F" or "C"');
    expect(mappingError(() => parseMapping({ time: 't', indoor: 'i', timezone: 'Europe/Atlantis' })).key).toBe('timezone');
    const unknown = mappingError(() => parseMapping({ time: 't', indoor: 'i', indor: 'x' }));
    expect(unknown.key).toBe('indor');
    expect(unknown.message).toMatch(/unknown key "indor" \(known keys: time, dateFormat, indoor/);
    expect(mappingError(() => parseMapping({ time: ['a'], indoor: 'i' })).message).toBe('mapping: "time" must be a column name, or [date column, time column]');
    expect(mappingError(() => parseMapping({ time: 't', indoor: '  ' })).message).toBe('mapping: "indoor" must not be empty');
    expect(mappingError(() => parseMapping([1, 2])).message).toBe('mapping: a mapping must be a JSON object with at least "time" and "indoor"');
  });

  it('gives line and column of a JSON syntax error', () => {
    const e = mappingError(() => parseMappingJson('{\n  "time": "t",\n  "indoor": "i"\n  "units": "F"\n}', 'mine.json'));
    expect({ line: e.line, column: e.column }).toEqual({ line: 4, column: 3 });
    expect(e.message).toMatch(/^mine\.json line 4, column 3: .* \(not valid JSON\)$/);
    expect(mappingError(() => parseMappingJson('', 'e.json')).message).toBe('e.json line 1, column 1: the file is empty (not valid JSON)');
    expect(parseMappingJson('\uFEFF{"time":"t","indoor":"i"}')).toEqual({ time: 't', indoor: 'i' });
  });
});

describe('readMappingFile', () => {
  it('reads, validates and reports file problems', async () => {
    const dir = tempDir();
    const good = writeLog(dir, 'good.json', JSON.stringify({ time: 'time', indoor: 'Indoor Temp (F)', units: 'F' }));
    expect(await readMappingFile(good)).toEqual({ time: 'time', indoor: 'Indoor Temp (F)', units: 'F' });
    expect(readMappingFileSync(good).units).toBe('F');
    const bad = writeLog(dir, 'bad.json', '{"time": "time", "indoor": "x", "cooling": {"column": "c", "as": "percent", "scale": 2}}');
    await expect(readMappingFile(bad)).rejects.toThrow('bad.json: unknown key "cooling.scale" (known keys: column, as)');
    await expect(readMappingFile(join(dir, 'missing.json'))).rejects.toThrow(/missing\.json: the mapping file does not exist/);
    const broken = writeLog(dir, 'broken.json', '{"time": "time",,}');
    const e = await readMappingFile(broken).catch((err: MappingError) => err);
    expect(e).toBeInstanceOf(MappingError);
    expect((e as MappingError).line).toBe(1);
    expect((e as MappingError).column).toBe(17);
  });
});
