/** `heatlag recovery`: how long heating (or cooling) takes from one temperature to another. */
import type { Command } from 'commander';
import { recoveryTime } from '../../../core/recovery.ts';
import { degreeLabel, deltaFromKelvin, fromCelsius } from '../../../core/units.ts';
import { ESTIMATE_NOTE, hours, num, table } from '../format.ts';
import { inputError, tempOption } from '../options.ts';
import { prepareSource, type SourceOptions } from '../source.ts';

interface RecoveryOptions extends SourceOptions {
  from?: string;
  to?: string;
  outdoor?: string;
  json?: boolean;
}

/** Why a target is never reached, in the person's units (core's own reason is in °C). */
function neverReason(cooling: boolean, equilibriumC: number, toC: number, u: 'F' | 'C'): string {
  const deg = degreeLabel(u);
  const eq = num(fromCelsius(equilibriumC, u), 1);
  const to = num(fromCelsius(toC, u), 1);
  return cooling
    ? `with cooling fully on the zone levels off at ${eq} ${deg}, above the target of ${to} ${deg}: the cooling is too small for this outdoor temperature.`
    : `with heating fully on the zone levels off at ${eq} ${deg}, below the target of ${to} ${deg}: the heating is too small for this outdoor temperature.`;
}

export function register(program: Command): void {
  program
    .command('recovery')
    .description('time to recover from one indoor temperature to another at a given outdoor temperature, from the fitted response')
    .argument('[log.csv]', 'a thermostat export (imported into a temporary in-memory database)')
    .requiredOption('--from <T>', 'indoor temperature at the start (e.g. the setback temperature)')
    .requiredOption('--to <T>', 'indoor temperature to reach (e.g. the occupied setpoint)')
    .requiredOption('--outdoor <T>', 'outdoor temperature during recovery')
    .option('--db <file>', 'a Heatlag database file')
    .option('--zone <site/zone>', 'the zone in the database')
    .option('--columns <map.json>', 'column mapping file for the log')
    .option('--tz <Area/City>', 'IANA time zone of local timestamps in the log')
    .option('--log-units <F|C>', 'temperature unit of the log, when its header and values do not make it clear')
    .option('--units <F|C>', 'units of --from, --to, --outdoor and the output (default: the log\'s)')
    .option('--json', 'print one JSON object')
    .action(async (logFile: string | undefined, options: RecoveryOptions) => {
      // The log's first rows checked before the store and the fitter load (common.ts).
      const prepared = await prepareSource(logFile, options);
      const { fitSource, openPrepared } = await import('../common.ts');
      const source = await openPrepared(prepared);
      try {
        const u = source.units;
        const fromC = tempOption(options.from, '--from', u);
        const toC = tempOption(options.to, '--to', u);
        const outdoorC = tempOption(options.outdoor, '--outdoor', u);
        const response = fitSource(source);
        const cooling = toC < fromC;
        if (cooling && !response.hasCooling) {
          throw inputError(`${source.label}: the target is below the start, but the log has no cooling runtime, so the cooling rate is unknown.`);
        }
        if (!cooling && !response.hasHeating) {
          throw inputError(`${source.label}: the log has no heating runtime, so the heating rate is unknown.`);
        }
        const result = recoveryTime(response, fromC, toC, outdoorC);
        const out = {
          units: u,
          mode: cooling ? 'cooling' : 'heating',
          from: fromCelsius(fromC, u),
          to: fromCelsius(toC, u),
          outdoor: fromCelsius(outdoorC, u),
          recoveryHours: result.hours,
          reason: result.hours === null ? neverReason(cooling, result.equilibriumC, toC, u) : null,
          equilibrium: fromCelsius(result.equilibriumC, u),
          timeConstantHours: response.tauHours,
          heatingRatePerHour: response.hasHeating ? deltaFromKelvin(response.heatRate, u) : null,
          coolingRatePerHour: response.hasCooling ? deltaFromKelvin(response.coolRate, u) : null,
          gainPerHour: deltaFromKelvin(response.gain, u),
        };
        if (options.json) {
          process.stdout.write(`${JSON.stringify(out, null, 2)}\n`);
          return;
        }
        const deg = degreeLabel(u);
        const lines = [
          `Recovery of ${source.label} with ${out.mode} fully on, outdoor ${num(out.outdoor, 1)} ${deg}`,
          '',
          table([
            ['From', `${num(out.from, 1)} ${deg}`],
            ['To', `${num(out.to, 1)} ${deg}`],
            ['Recovery time', result.hours === null ? 'never reached' : hours(result.hours)],
            [cooling ? 'Full-cooling level' : 'Full-heat level', `${num(out.equilibrium, 1)} ${deg} (where the zone would level off with the equipment running continuously)`],
            ['Zone response', `τ ${num(out.timeConstantHours, 1)} h, ${cooling ? `c ${num(out.coolingRatePerHour, 2)}` : `h ${num(out.heatingRatePerHour, 2)}`} ${deg}/h, g ${num(out.gainPerHour, 2)} ${deg}/h`],
          ]),
        ];
        if (result.hours === null) lines.push('', `The target is never reached: ${out.reason}`);
        lines.push('', ESTIMATE_NOTE, '');
        process.stdout.write(lines.join('\n'));
      } finally {
        source.close();
      }
    });
}
