/** `heatlag fit`: the fitted zone response of a log or of a stored zone. */
import type { Command } from 'commander';
import { fitResponse } from '../../../core/fit/index.ts';
import { presentResponse, type PresentedResponse } from '../../../core/present.ts';
import { degreeLabel } from '../../../core/units.ts';
import { openSource, type SourceOptions } from '../common.ts';
import { ESTIMATE_NOTE, num, table } from '../format.ts';

interface FitOptions extends SourceOptions {
  json?: boolean;
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
    .option('--json', 'print one JSON object')
    .action(async (logFile: string | undefined, options: FitOptions) => {
      const source = await openSource(logFile, options);
      try {
        const response = fitResponse(source.series);
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

/** The readable summary of a response, every number with its unit. */
export function formatResponse(label: string, r: PresentedResponse): string {
  const deg = degreeLabel(r.units);
  const rows: string[][] = [
    ['', 'estimate', '95 % interval'],
    ['Time constant τ', `${num(r.timeConstantHours, 1)} h`, range(r.timeConstantHoursCI, 1, 'h')],
    ['Heating rate h', r.heatingRatePerHour === null ? 'no heating in log' : `${num(r.heatingRatePerHour, 2)} ${deg}/h`, range(r.heatingRatePerHourCI, 2, `${deg}/h`)],
    ['Cooling rate c', r.coolingRatePerHour === null ? 'no cooling in log' : `${num(r.coolingRatePerHour, 2)} ${deg}/h`, range(r.coolingRatePerHourCI, 2, `${deg}/h`)],
    ['Internal gain g', `${num(r.gainPerHour, 2)} ${deg}/h`, 'occupants, appliances, average sun'],
    ['Heating lift h·τ', r.heatingLift === null ? '—' : `${num(r.heatingLift, 1)} ${deg}`, 'above outdoor, with heat fully on'],
    ['Fit error (RMSE)', `${num(r.rmse, 2)} ${deg}`, r.heldOutRmse === null ? '' : `held-out days: ${num(r.heldOutRmse, 2)} ${deg}`],
    ['CV(RMSE), NMBE', `${num(r.cvrmsePercent, 2)} %, ${num(r.nmbePercent, 2)} %`, 'ASHRAE Guideline 14 statistics'],
  ];
  const lines = [
    `Zone response of ${label}`,
    `  ${r.samplesUsed.toLocaleString('en-US')} readings over ${r.daysUsed} days (${r.firstTime} to ${r.lastTime}), ${num(r.freeFloatHours, 0)} h free-floating, ${r.segments} segment${r.segments === 1 ? '' : 's'}`,
    '',
    table(rows),
  ];
  if (r.warnings.length) {
    lines.push('', 'Warnings:', ...r.warnings.map((w) => `  - ${w}`));
  }
  lines.push('', ESTIMATE_NOTE, '');
  return lines.join('\n');
}
