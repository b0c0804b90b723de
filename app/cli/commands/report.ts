/** `heatlag report`: the zone report printed to PDF through headless Chromium (see ../print-pdf.ts). */
import fs from 'node:fs';
import path from 'node:path';
import type { Command } from 'commander';
import { PAPERS, type Paper } from '../../api/report.ts';
import { inputError, numberOption, openExistingStore, parseZoneRef, tempOption, unitsOption, usageError } from '../common.ts';
import { findChromium, printReport } from '../print-pdf.ts';

interface ReportOptions {
  db?: string;
  zone?: string;
  out?: string;
  paper?: string;
  units?: string;
  from?: string;
  to?: string;
  outdoor?: string;
  whatIfOutput?: string;
  whatIfHeatLoss?: string;
  json?: boolean;
}

function percentOption(value: string | undefined, option: string): number | undefined {
  if (value === undefined) return undefined;
  const v = numberOption(value.replace(/%$/, ''), option);
  if (!(v > 0 && v <= 2000)) throw usageError(`${option} must be a percentage above 0 and at most 2000, got '${value}'.`);
  return v / 100;
}

export function register(program: Command): void {
  program
    .command('report')
    .description('print the zone report (log, fitted response, recovery, plan, cautions, method) to PDF with headless Chromium')
    .requiredOption('--db <file>', 'a Heatlag database file')
    .requiredOption('--zone <site/zone>', 'the zone in the database')
    .requiredOption('--out <report.pdf>', 'the PDF to write')
    .option('--paper <letter|a4>', 'paper size (default: letter for a °F zone, A4 otherwise)')
    .option('--units <F|C>', 'units of the report and of --from, --to, --outdoor (default: the log\'s)')
    .option('--from <T>', 'recovery start (setback) temperature (default: the saved schedule\'s setback, else the Recovery screen\'s)')
    .option('--to <T>', 'recovery target (occupied) temperature')
    .option('--outdoor <T>', 'outdoor temperature during the recovery')
    .option('--what-if-output <percent>', 'compare with this heating output, % of today\'s (e.g. 150)')
    .option('--what-if-heat-loss <percent>', 'compare with this envelope heat loss (UA), % of today\'s (e.g. 75)')
    .option('--json', 'print one JSON object about the file written')
    .action(async (options: ReportOptions) => {
      const { site, zone } = parseZoneRef(options.zone!);
      const paperText = options.paper?.trim().toLowerCase();
      if (paperText !== undefined && !(PAPERS as readonly string[]).includes(paperText)) {
        throw usageError(`--paper must be letter or a4, got '${options.paper}'.`);
      }
      const units = unitsOption(options.units);
      const given = [options.from, options.to, options.outdoor].filter((v) => v !== undefined).length;
      if (given !== 0 && given !== 3) throw usageError('Give all three of --from, --to and --outdoor, or none.');
      // In the report's units (the log's unless --units), converted once the zone is known.
      const conditions =
        given === 3
          ? (u: 'C' | 'F') => ({ fromC: tempOption(options.from, '--from', u), toC: tempOption(options.to, '--to', u), outdoorC: tempOption(options.outdoor, '--outdoor', u) })
          : undefined;
      const output = percentOption(options.whatIfOutput, '--what-if-output');
      const heatLoss = percentOption(options.whatIfHeatLoss, '--what-if-heat-loss');
      const whatIf = output !== undefined || heatLoss !== undefined ? { capacityFactor: output ?? 1, heatLossFactor: heatLoss ?? 1 } : undefined;
      const out = path.resolve(options.out!);
      if (!out.toLowerCase().endsWith('.pdf')) throw usageError(`--out must name a .pdf file, got '${options.out}'.`);

      // The user's inputs first, the tools after: the database, its zone and the output folder are
      // checked before Chromium is looked for, so a message is about what was typed wrong.
      const store = openExistingStore(options.db!);
      try {
        if (!store.findZone(site, zone)) {
          const known = store.listZones().map((z) => `${z.site}/${z.name}`);
          throw inputError(`${options.db}: no zone '${site}/${zone}'.${known.length ? ` Zones: ${known.join(', ')}.` : ' The database has no zones yet.'}`);
        }
      } finally {
        store.close();
      }
      if (!fs.statSync(path.dirname(out), { throwIfNoEntry: false })?.isDirectory()) {
        throw inputError(`${options.out}: the folder ${path.dirname(out)} does not exist.`);
      }
      const chromium = findChromium();
      const result = await printReport({
        db: options.db!,
        site,
        zone,
        out,
        ...(paperText ? { paper: paperText as Paper } : {}),
        ...(units ? { units } : {}),
        ...(conditions ? { conditions } : {}),
        ...(whatIf ? { whatIf } : {}),
        chromium,
      });
      if (options.json) {
        process.stdout.write(`${JSON.stringify({ zone: `${site}/${zone}`, ...result })}\n`);
      } else {
        process.stdout.write(`Wrote ${result.file}: the zone report of ${site}/${zone}, ${result.pages} pages, ${result.paper === 'a4' ? 'A4' : 'Letter'}, °${result.units}.\n`);
      }
    });
}
