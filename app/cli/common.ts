/**
 * Shared plumbing of the command line: where a zone's data comes from (a log file imported into a
 * temporary in-memory store, or a zone of a database file), typed exits, and option parsing helpers.
 * One path for both sources: a `<log.csv>` argument is imported into ':memory:' and then read back
 * exactly like a stored zone. This module loads the store (better-sqlite3) and the fitter: the commands
 * that take a log check it first with source.ts prepareSource and import this module only after that.
 */
import fs from 'node:fs';
import path from 'node:path';
import { HeatlagError } from '../../core/errors.ts';
import { fitResponse } from '../../core/fit/index.ts';
import type { TempUnit, ZoneResponse, ZoneSeries } from '../../core/types.ts';
import { importLog, openStore, type ImportResult, type Store } from '../../db/index.ts';
import { fitOptionsFor } from '../backend/fit-options.ts';
import { inputError } from './options.ts';
import { prepareSource, type PreparedSource, type SourceOptions } from './source.ts';

// The light helpers live in options.ts and source.ts (what a command needs before it loads the store).
export { CliError, deltaOption, describeError, inputError, numberOption, tempOption, unitsOption, usageError } from './options.ts';
export { parseZoneRef, prepareSource, readMappingFile, type PreparedSource, type SourceOptions } from './source.ts';

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

/** Opens an existing database file (never creates one by accident). */
export function openExistingStore(file: string): Store {
  if (!fs.existsSync(file)) throw inputError(`${file}: no such database file.`);
  return openStore(file);
}

/**
 * The zone a command works on: `<log.csv>` (imported into a temporary in-memory store) or
 * `--db FILE --zone SITE/ZONE`. The commands call prepareSource (source.ts) first and openPrepared
 * after it; this does both.
 */
export async function openSource(logFile: string | undefined, options: SourceOptions): Promise<ZoneSource> {
  return openPrepared(await prepareSource(logFile, options));
}

/** The zone of a prepared source: the checked log imported into ':memory:', or the database's zone. */
export async function openPrepared(source: PreparedSource): Promise<ZoneSource> {
  const units = source.units;
  if (source.kind === 'log') {
    const { logFile } = source;
    const store = openStore(':memory:');
    try {
      const zone = store.getOrCreateZone('log', path.basename(logFile));
      const imported = await importLog(store, logFile, {
        zoneId: zone.id,
        mapping: source.mapping,
        timezone: source.tz,
        units: source.logUnits,
        checked: source.checked,
        onProgress: progressReporter(logFile),
        keepReadings: true,
      });
      // --tz names the building's zone: its local days group the fit (also for logs with UTC offsets).
      if (source.tz !== undefined) store.setSiteTimezone(zone.siteId, source.tz);
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
  const { db, site, zone } = source;
  const store = openExistingStore(db);
  try {
    const found = store.findZone(site, zone);
    if (!found) {
      const known = store.listZones().map((z) => `${z.site}/${z.name}`);
      throw inputError(`${db}: no zone '${source.ref}'.${known.length ? ` Zones: ${known.join(', ')}.` : ' The database has no zones yet.'}`);
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
