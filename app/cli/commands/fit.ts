/**
 * `heatlag fit`: the fitted zone response of a log or of a stored zone. The store and the fitter
 * (common.ts) are imported only once the source has passed its checks (source.ts), so a
 * log that its first rows refuse is refused without loading them.
 */
import type { Command } from 'commander';
import { INTERVAL_NOTE, presentResponse, type PresentedResponse } from '../../../core/present.ts';
import { degreeLabel } from '../../../core/units.ts';
import { ESTIMATE_NOTE, num, table } from '../format.ts';
import { inputError, numberOption, unitsOption, usageError } from '../options.ts';
import { defaultWorkers, fitPortfolio } from '../portfolio.ts';
import { prepareSource, type SourceOptions } from '../source.ts';

interface FitOptions extends SourceOptions {
  json?: boolean;
  all?: boolean;
  workers?: string;
}

export function register(program: Command): void {
  program
    .command('fit')
    .description('fit the zone response (time constant, heating and cooling rates) of a log or a stored zone')
    .argument('[log.csv]', 'a thermostat export to fit directly (imported into a temporary in-memory database)')
    .option('--db <file>', 'a Heatlag database file')
    .option('--zone <site/zone>', 'the zone in the database')
    .option('--columns <map.json>', 'column mapping file for the log')
    .option('--tz <Area/City>', 'IANA time zone of local timestamps in the log')
    .option('--log-units <F|C>', 'temperature unit of the log, when its header and values do not make it clear')
    .option('--units <F|C>', 'units of the output (default: the log\'s)')
    .option('--all', 'fit every zone of the database (--db), spread over worker threads')
    .option('--workers <n>', 'worker threads for --all (default: one per core)')
    .option('--json', 'print one JSON object (with --all, one JSON array)')
    .action(async (logFile: string | undefined, options: FitOptions) => {
      if (options.all) {
        await fitAll(logFile, options);
        return;
      }
      const prepared = await prepareSource(logFile, options);
      const { fitSource, openPrepared } = await import('../common.ts');
      const source = await openPrepared(prepared);
      try {
        const response = fitSource(source);
        source.store.saveResponse(source.zoneId, response);
        const shown = presentResponse(response, source.units);
        process.stdout.write(options.json ? `${JSON.stringify(shown, null, 2)}\n` : formatResponse(source.label, shown));
      } finally {
        source.close();
      }
    });
}

const range = (p: [number, number] | null, decimals: number, unit: string): string =>
  p ? `${num(p[0], decimals)} – ${num(p[1], decimals)} ${unit}` : '';

/** The readable summary of a response, every number with its unit (differences in K or °F). */
export function formatResponse(label: string, r: PresentedResponse): string {
  const d = r.units === 'C' ? 'K' : degreeLabel(r.units);
  const two = r.twoNode;
  const rows: string[][] = [
    ['', 'estimate', '95 % interval'],
    [two ? 'Time constant τ (slow, building)' : 'Time constant τ', `${num(r.timeConstantHours, 1)} h`, range(r.timeConstantHoursCI, 1, 'h')],
  ];
  if (two) {
    rows.push(
      ['Air–mass time constant τam', `${num(two.airMassHours, 2)} h`, range(two.airMassHoursCI, 2, 'h')],
      ['Mass–outdoor time constant τmo', `${num(two.massOutdoorHours, 1)} h`, range(two.massOutdoorHoursCI, 1, 'h')],
      ['Mass coupling (share of heat capacity)', `${num(100 * two.massCoupling, 0)} %`, range([100 * two.massCouplingCI[0], 100 * two.massCouplingCI[1]], 0, '%')],
      ['Fast time constant (air)', `${num(two.fastHours, 2)} h`, ''],
    );
  }
  rows.push(
    ['Heating rate h', r.heatingRatePerHour === null ? 'no heating in log' : `${num(r.heatingRatePerHour, 2)} ${d}/h`, range(r.heatingRatePerHourCI, 2, `${d}/h`)],
    ['Cooling rate c', r.coolingRatePerHour === null ? 'no cooling in log' : `${num(r.coolingRatePerHour, 2)} ${d}/h`, range(r.coolingRatePerHourCI, 2, `${d}/h`)],
    ['Internal gain g', `${num(r.gainPerHour, 3)} ${d}/h`, r.gainPerHourCI ? range(r.gainPerHourCI, 3, `${d}/h`) : 'occupants, appliances, average sun'],
  );
  if (r.solarGainPerHour !== null) rows.push(['Solar gain s (per kW/m² clear sky)', `${num(r.solarGainPerHour, 2)} ${d}/h`, range(r.solarGainPerHourCI, 2, `${d}/h`)]);
  rows.push(
    ['Heating lift h·τ', r.heatingLift === null ? '—' : `${num(r.heatingLift, 1)} ${d}`, 'above outdoor, with heat fully on'],
    ['Fit error (RMSE)', `${num(r.rmse, 2)} ${d}`, r.heldOutRmse === null ? '' : `held-out days: ${num(r.heldOutRmse, 2)} ${d}`],
  );
  const b = r.recoveryBacktest;
  const lines = [
    `Zone response of ${label}`,
    `  ${r.samplesUsed.toLocaleString('en-US')} readings over ${r.daysUsed} days of ${r.timeZone} (${r.firstTime} to ${r.lastTime}), ${num(r.freeFloatHours, 0)} h free-floating (${num(100 * r.freeFloatShare, 0)} %), ${r.segments} segment${r.segments === 1 ? '' : 's'}`,
    `  Model: ${r.model === 'two-node' ? 'two nodes (air and building mass)' : 'one node'}. ${r.modelReason}`,
    '',
    table(rows),
    '',
    b
      ? `Recovery backtest: ${b.cases} morning recover${b.cases === 1 ? 'y' : 'ies'} of the log, each predicted by a fit without its day: median error ${num(b.medianErrorMinutes, 0)} min, 90 % within ${num(b.p90ErrorMinutes, 0)} min (median bias ${b.medianBiasMinutes >= 0 ? '+' : ''}${num(b.medianBiasMinutes, 0)} min).`
      : `Recovery backtest: none (${r.recoveryBacktestReason ?? 'not run'}).`,
  ];
  if (r.plausibility.length) {
    lines.push('', 'Check these figures:', ...r.plausibility.map((w) => `  - ${w}`));
  }
  if (r.warnings.length) {
    lines.push('', 'Warnings:', ...r.warnings.map((w) => `  - ${w}`));
  }
  lines.push('', INTERVAL_NOTE, ESTIMATE_NOTE, '');
  return lines.join('\n');
}

/** `fit --db FILE --all`: every zone of the database, in parallel, as a table or a JSON array. */
async function fitAll(logFile: string | undefined, options: FitOptions): Promise<void> {
  if (logFile !== undefined || options.db === undefined || options.zone !== undefined) {
    throw usageError('--all fits every zone of a database: give --db FILE and no log file or --zone.');
  }
  const workers = options.workers !== undefined ? Math.round(numberOption(options.workers, '--workers')) : defaultWorkers();
  if (!(workers >= 1)) throw usageError('--workers must be at least 1.');
  const units = unitsOption(options.units);
  const { openExistingStore } = await import('../common.ts');
  const store = openExistingStore(options.db);
  try {
    // Only ids and names here: the workers read the readings themselves, and each batch is saved
    // (one transaction) by fitPortfolio as it comes back.
    const zones = store.listZoneIds().map((id) => store.getZone(id)!);
    if (zones.length === 0) throw inputError(`${options.db} has no zones to fit.`);
    const progress = process.stderr.isTTY
      ? (done: number, total: number) => process.stderr.write(`\rFitting zones: ${done}/${total}${done === total ? '\n' : ''}`)
      : undefined;
    const items = await fitPortfolio(options.db, zones.map((z) => z.id), {
      workers, store, onDone: progress,
      onWorkerLost: (reason, requeued) =>
        process.stderr.write(`A fitting worker stopped (${reason}); ${requeued.length} zone${requeued.length === 1 ? '' : 's'} went back to the queue.\n`),
    });
    const rows = items.map((item, i) => {
      const z = zones[i];
      const u = units ?? z.units ?? 'C';
      return { site: z.site, zone: z.name, ...(item.response ? presentResponse(item.response, u) : { units: u }), error: item.error };
    });
    if (options.json) {
      process.stdout.write(`${JSON.stringify(rows, null, 2)}\n`);
    } else {
      const table_ = [['Site', 'Zone', 'τ', 'τ 95 % interval', 'Heating rate', 'Cooling rate', 'RMSE', 'Days', 'Note']];
      for (const r of rows) {
        const deg = degreeLabel(r.units);
        if ('timeConstantHours' in r) {
          table_.push([
            r.site, r.zone, `${num(r.timeConstantHours, 1)} h`, `${num(r.timeConstantHoursCI[0], 1)} – ${num(r.timeConstantHoursCI[1], 1)} h`,
            r.heatingRatePerHour === null ? '—' : `${num(r.heatingRatePerHour, 2)} ${deg}/h`,
            r.coolingRatePerHour === null ? '—' : `${num(r.coolingRatePerHour, 2)} ${deg}/h`,
            `${num(r.rmse, 2)} ${deg}`, String(r.daysUsed), r.warnings.length ? `${r.warnings.length} warning${r.warnings.length > 1 ? 's' : ''}` : '',
          ]);
        } else {
          table_.push([r.site, r.zone, '—', '', '', '', '', '', r.error ?? '']);
        }
      }
      const fitted = rows.filter((r) => r.error === null).length;
      process.stdout.write(`Zone responses of ${options.db}: ${fitted} of ${rows.length} zones fitted with ${Math.min(workers, rows.length)} worker${workers > 1 ? 's' : ''}\n\n${table(table_)}\n\n${INTERVAL_NOTE}\n${ESTIMATE_NOTE}\n`);
    }
    if (rows.every((r) => r.error !== null)) process.exitCode = 2;
  } finally {
    store.close();
  }
}
