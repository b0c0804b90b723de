/**
 * Shared plumbing of the command line: where a zone's data comes from (a log file imported into a
 * temporary in-memory store, or a zone of a database file), typed exits, and option parsing helpers.
 * One path for both sources: a `<log.csv>` argument is imported into ':memory:' and then read back
 * exactly like a stored zone.
 */
import fs from 'node:fs';
import path from 'node:path';
import { HeatlagError } from '../../core/errors.ts';
import { parseMappingJson, type ColumnMapping } from '../../core/mapping.ts';
import { fitResponse } from '../../core/fit/index.ts';
import type { TempUnit, ZoneResponse, ZoneSeries } from '../../core/types.ts';
import { importLog, openStore, type ImportResult, type Store } from '../../db/index.ts';
import { fitOptionsFor } from '../backend/fit-options.ts';
import { inputError, unitsOption, usageError } from './options.ts';

// The light helpers live in options.ts (commands that need no database import them from there).
export { CliError, deltaOption, describeError, inputError, numberOption, tempOption, unitsOption, usageError } from './options.ts';

/** Reads and validates a --columns mapping file (exit 2 with file, line and column on a bad one). */
export function readMappingFile(file: string): ColumnMapping {
  let text: string;
  try {
    text = fs.readFileSync(file, 'utf8');
  } catch {
    throw inputError(`${file}: cannot read the column mapping file.`);
  }
  return parseMappingJson(text, file);
}

export interface SourceOptions {
  db?: string;
  zone?: string;
  columns?: string;
  tz?: string;
  units?: string;
  logUnits?: string;
}

/** One zone's data, ready for the engine. */
export interface ZoneSource {
  store: Store;
  zoneId: number;
  /** "SITE/ZONE", or the log file's name. */
  label: string;
  /** Units for input and output: --units, else the log's own. */
  units: TempUnit;
  series: ZoneSeries;
  /** The import's summary when the source was a log file. */
  imported?: ImportResult;
  close(): void;
}

/** Splits "SITE/ZONE" at its first slash. */
export function parseZoneRef(ref: string): { site: string; zone: string } {
  const i = ref.indexOf('/');
  if (i <= 0 || i === ref.length - 1) throw usageError(`--zone must be SITE/ZONE, got '${ref}'.`);
  return { site: ref.slice(0, i), zone: ref.slice(i + 1) };
}

/** Opens an existing database file (never creates one by accident). */
export function openExistingStore(file: string): Store {
  if (!fs.existsSync(file)) throw inputError(`${file}: no such database file.`);
  return openStore(file);
}

/**
 * The zone a command works on: `<log.csv>` (imported into a temporary in-memory store) or
 * `--db FILE --zone SITE/ZONE`.
 */
export async function openSource(logFile: string | undefined, options: SourceOptions): Promise<ZoneSource> {
  const units = unitsOption(options.units, '--units');
  const logUnits = unitsOption(options.logUnits, '--log-units');
  if (logFile !== undefined) {
    if (options.db !== undefined || options.zone !== undefined) {
      throw usageError('Give either a log file or --db and --zone, not both.');
    }
    const mapping = options.columns !== undefined ? readMappingFile(options.columns) : undefined;
    const store = openStore(':memory:');
    try {
      const zone = store.getOrCreateZone('log', path.basename(logFile));
      const imported = await importLog(store, logFile, {
        zoneId: zone.id,
        mapping,
        timezone: options.tz,
        units: logUnits,
        onProgress: progressReporter(logFile),
        keepReadings: true,
      });
      // --tz names the building's zone: its local days group the fit (also for logs with UTC offsets).
      if (options.tz !== undefined) store.setSiteTimezone(zone.siteId, options.tz);
      return {
        store, zoneId: zone.id, label: path.basename(logFile), units: units ?? imported.units,
        // A new zone of a new store: its series is the file's readings (no read back).
        series: imported.readings ?? store.loadSeries(zone.id), imported, close: () => store.close(),
      };
    } catch (e) {
      store.close();
      throw e;
    }
  }
  if (options.db === undefined || options.zone === undefined) {
    throw usageError('Give a log file, or --db FILE and --zone SITE/ZONE.');
  }
  const { site, zone } = parseZoneRef(options.zone);
  const store = openExistingStore(options.db);
  try {
    const found = store.findZone(site, zone);
    if (!found) {
      const known = store.listZones().map((z) => `${z.site}/${z.name}`);
      throw inputError(`${options.db}: no zone '${options.zone}'.${known.length ? ` Zones: ${known.join(', ')}.` : ' The database has no zones yet.'}`);
    }
    return {
      store, zoneId: found.id, label: `${site}/${zone}`, units: units ?? store.zoneUnits(found.id),
      series: store.loadSeries(found.id), close: () => store.close(),
    };
  } catch (e) {
    store.close();
    throw e;
  }
}

/** A progress line on stderr while importing, only when stderr is a terminal. */
export function progressReporter(file: string): ((done: number, total: number) => void) | undefined {
  if (!process.stderr.isTTY) return undefined;
  let last = -1;
  const name = path.basename(file);
  return (done, total) => {
    const pct = total > 0 ? Math.floor((100 * done) / total) : 0;
    if (pct === last) return;
    last = pct;
    process.stderr.write(`\rImporting ${name}: ${pct} %${pct >= 100 ? '\n' : ''}`);
  };
}

/** Fits the source's zone; a refusal from the fitter names the log or zone it is about. */
export function fitSource(source: ZoneSource): ZoneResponse {
  try {
    return fitResponse(source.series, fitOptionsFor(source.store, source.zoneId));
  } catch (e) {
    if (e instanceof HeatlagError) throw inputError(`${source.label}: ${e.message}`);
    throw e;
  }
}
