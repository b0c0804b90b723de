/** `heatlag zones`: every zone of a database with its data span and the time zone its times are shown in. */
import type { Command } from 'commander';
import { openExistingStore } from '../common.ts';
import { isoTime, table } from '../format.ts';

export function register(program: Command): void {
  program
    .command('zones')
    .description('list the zones of a database with their sample counts, spans and time zones')
    .requiredOption('--db <file>', 'the database file')
    .option('--json', 'print one JSON array')
    .action((options: { db: string; json?: boolean }) => {
      const store = openExistingStore(options.db);
      try {
        const zones = store.listZones().map((z) => ({
          site: z.site,
          name: z.name,
          samples: z.samples,
          firstTime: z.firstTime === null ? null : isoTime(z.firstTime),
          lastTime: z.lastTime === null ? null : isoTime(z.lastTime),
          units: z.units,
          // The site's time zone, else the newest log's; null: this computer's (db/timezone.ts).
          timezone: store.zoneTimeZone(z.id),
        }));
        if (options.json) {
          process.stdout.write(`${JSON.stringify(zones, null, 2)}\n`);
          return;
        }
        if (zones.length === 0) {
          process.stdout.write(`${options.db} has no zones yet: add one with heatlag import.\n`);
          return;
        }
        const local = Intl.DateTimeFormat().resolvedOptions().timeZone;
        const rows = [['Site', 'Zone', 'Readings', 'First', 'Last', 'Units', 'Time zone']];
        for (const z of zones) {
          rows.push([z.site, z.name, z.samples.toLocaleString('en-US'), z.firstTime ?? '—', z.lastTime ?? '—', z.units === 'F' ? '°F' : '°C', z.timezone ?? `this computer's (${local})`]);
        }
        process.stdout.write(`${table(rows)}\n`);
      } finally {
        store.close();
      }
    });
}
