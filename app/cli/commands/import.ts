/** `heatlag import`: a thermostat export into a zone of a database file. */
import fs from 'node:fs';
import type { Command } from 'commander';
import { canonicalTimeZone, importLog, openStore } from '../../../db/index.ts';
import { numberOption, parseZoneRef, progressReporter, readMappingFile, unitsOption, usageError } from '../common.ts';
import { checkSiteLocation } from '../../../core/solar.ts';
import { isoTime, localTime, num, table } from '../format.ts';

interface ImportOptions {
  db?: string;
  site?: string;
  zone?: string;
  columns?: string;
  tz?: string;
  siteTz?: string;
  logUnits?: string;
  lat?: string;
  lon?: string;
  json?: boolean;
}

export function register(program: Command): void {
  program
    .command('import')
    .description('import a thermostat export into a zone of a database (created if missing); all rows or none')
    .argument('<log.csv>', 'the export (CSV or TSV)')
    .requiredOption('--db <file>', 'the database file')
    .option('--site <name>', 'site (building) name')
    .option('--zone <name>', 'zone name (or SITE/ZONE)')
    .option('--columns <map.json>', 'column mapping file')
    .option('--tz <Area/City>', 'IANA time zone of local timestamps')
    .option('--site-tz <Area/City>', 'set the site\'s IANA time zone: its zones\' times and plans use it, and logs of local times default to it')
    .option('--lat <degrees>', "set the site's latitude (decimal degrees, north positive): its zones' fits then carry a clear-sky solar term")
    .option('--lon <degrees>', "set the site's longitude (decimal degrees, east positive, west negative); give it with --lat")
    .option('--log-units <F|C>', 'temperature unit of the log, when its header and values do not make it clear')
    .option('--json', 'print one JSON object')
    .action(async (logFile: string, options: ImportOptions) => {
      let site = options.site;
      let zoneName = options.zone;
      if (zoneName !== undefined && site === undefined && zoneName.includes('/')) ({ site, zone: zoneName } = parseZoneRef(zoneName));
      if (site === undefined || zoneName === undefined) throw usageError('import needs --site NAME and --zone NAME.');
      const mapping = options.columns !== undefined ? await readMappingFile(options.columns) : undefined;
      const units = unitsOption(options.logUnits, '--log-units');
      const siteTz = options.siteTz === undefined ? undefined : canonicalTimeZone(options.siteTz);
      if (siteTz === null) throw usageError(`--site-tz: '${options.siteTz}' is not an IANA time zone (e.g. America/Denver).`);
      let location: { latDeg: number; lonDeg: number } | null = null;
      if (options.lat !== undefined || options.lon !== undefined) {
        if (options.lat === undefined || options.lon === undefined) throw usageError('--lat and --lon go together: give both.');
        location = { latDeg: numberOption(options.lat, '--lat'), lonDeg: numberOption(options.lon, '--lon') };
        try {
          checkSiteLocation(location.latDeg, location.lonDeg);
        } catch (e) {
          throw usageError(`${(e as Error).message.replace(/^The (latitude|longitude)/, (_, w: string) => `--${w === 'latitude' ? 'lat' : 'lon'}: the ${w}`)}`);
        }
      }
      if (!fs.existsSync(logFile)) throw Object.assign(new Error('no such file'), { code: 'ENOENT', path: logFile });
      const dbExisted = fs.existsSync(options.db!);
      const store = openStore(options.db!);
      let refused = false;
      try {
        const existing = store.findZone(site, zoneName);
        const siteExisted = existing !== null || store.findSite(site) !== null;
        const zone = existing ?? store.getOrCreateZone(site, zoneName);
        let r;
        try {
          // Local wall-clock times are read in --tz, else in the site's time zone (given now or set before).
          const timezone = options.tz ?? siteTz ?? store.getSite(zone.siteId)?.timezone ?? undefined;
          r = await importLog(store, logFile, { zoneId: zone.id, mapping, timezone, units, onProgress: progressReporter(logFile) });
        } catch (err) {
          // A refused import leaves the database as it was: no empty zone or site made for it.
          refused = true;
          if (existing === null) {
            store.deleteZone(zone.id);
            if (!siteExisted) store.deleteSite(zone.siteId);
          }
          throw err;
        }
        if (siteTz !== undefined) store.setSiteTimezone(zone.siteId, siteTz);
        if (location) store.setSiteLocation(zone.siteId, location.latDeg, location.lonDeg);
        const siteLocation = store.siteLocation(zone.siteId);
        const out = {
          site, siteTimezone: store.getSite(zone.siteId)?.timezone ?? null, siteLocation, zone: zoneName, file: r.file, units: r.units,
          logAdded: r.logAdded, rowsAccepted: r.rowsAccepted, rowsRejected: r.rowsRejected, duplicates: r.duplicates,
          rejected: r.rejected.slice(0, 20),
          firstTime: r.firstTime === null || r.firstTime === undefined ? null : isoTime(r.firstTime),
          lastTime: r.lastTime === null || r.lastTime === undefined ? null : isoTime(r.lastTime),
          intervalMinutes: r.intervalMinutes,
          warnings: r.warnings,
        };
        if (options.json) {
          process.stdout.write(`${JSON.stringify(out, null, 2)}\n`);
          return;
        }
        // A re-import that adds nothing keeps no log (db/): said first, with the earlier import's time
        // on the zone's clock (its time zone by the app's rule, else this computer's).
        const tz = store.zoneTimeZone(zone.id) ?? Intl.DateTimeFormat().resolvedOptions().timeZone;
        const when = r.alreadyImportedAt === null ? '' : ` (imported ${localTime(r.alreadyImportedAt, tz)} ${tz})`;
        const lines = [
          r.logAdded
            ? `Imported ${r.file} into ${site}/${zoneName} (${options.db})`
            : `${r.file} added no readings: every reading was already in ${site}/${zoneName}${when}, so no log was added.`,
          '',
          table([
            ['Rows accepted', r.rowsAccepted.toLocaleString('en-US')],
            ['Rows rejected', r.rowsRejected.toLocaleString('en-US')],
            ['Duplicates skipped', r.duplicates.toLocaleString('en-US')],
            ['Span', `${out.firstTime ?? '—'} to ${out.lastTime ?? '—'}`],
            ['Reading interval', `${num(r.intervalMinutes, 0)} min`],
            ['Temperature units', r.units === 'F' ? '°F' : '°C'],
            ...(out.siteTimezone ? [['Site time zone', out.siteTimezone]] : []),
            ...(siteLocation ? [['Site location', `${siteLocation.latDeg.toFixed(4)}°, ${siteLocation.lonDeg.toFixed(4)}° (the fits carry a solar term)`]] : []),
          ]),
        ];
        if (r.rejected.length) {
          lines.push('', `Rejected rows${r.rowsRejected > r.rejected.length ? ` (first ${r.rejected.length})` : ''}:`);
          lines.push(...r.rejected.slice(0, 20).map((x) => `  line ${x.line}${x.column === null ? '' : `, column ${x.column}${x.columnName ? ` (${x.columnName})` : ''}`}: ${x.reason}`));
        }
        if (r.warnings.length) lines.push('', 'Notes:', ...r.warnings.map((w) => `  - ${w}`));
        lines.push('');
        process.stdout.write(lines.join('\n'));
      } finally {
        store.close();
        // Nor a database file made for it.
        if (refused && !dbExisted) for (const f of [options.db!, `${options.db}-wal`, `${options.db}-shm`]) fs.rmSync(f, { force: true });
      }
    });
}
