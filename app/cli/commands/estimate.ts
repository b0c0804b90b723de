/**
 * `heatlag estimate`: the quick estimate for a person with a thermometer: τ from two readings at a
 * known ambient (Newton's law of cooling), and optionally the temperature at a time or the time to
 * reach a temperature.
 */
import type { Command } from 'commander';
import { coolingTemperature, tauFromTwoReadings, timeToReach } from '../../../core/newton.ts';
import { degreeLabel, fromCelsius } from '../../../core/units.ts';
import { numberOption, tempOption, unitsOption } from '../options.ts';
import { hours, num, table } from '../format.ts';

interface EstimateOptions {
  start?: string;
  later?: string;
  hours?: string;
  ambient?: string;
  at?: string;
  target?: string;
  units?: string;
  json?: boolean;
}

export function register(program: Command): void {
  program
    .command('estimate')
    .description('time constant from two readings taken while the zone free-floats at a steady outdoor temperature')
    .requiredOption('--start <T0>', 'first reading')
    .requiredOption('--later <T1>', 'second reading')
    .requiredOption('--hours <H>', 'hours between the two readings')
    .requiredOption('--ambient <TA>', 'temperature the zone drifts toward (outdoor)')
    .option('--at <H>', 'also predict the temperature this many hours after the first reading')
    .option('--target <T>', 'also predict when the zone reaches this temperature')
    .option('--units <F|C>', 'units of the temperatures (default F)')
    .option('--json', 'print one JSON object')
    .action((options: EstimateOptions) => {
      const u = unitsOption(options.units) ?? 'F';
      const t0 = tempOption(options.start, '--start', u);
      const t1 = tempOption(options.later, '--later', u);
      const ta = tempOption(options.ambient, '--ambient', u);
      const dt = numberOption(options.hours, '--hours');
      const tau = tauFromTwoReadings({ hours: 0, tempC: t0 }, { hours: dt, tempC: t1 }, ta);
      const at = options.at !== undefined ? numberOption(options.at, '--at') : undefined;
      const target = options.target !== undefined ? tempOption(options.target, '--target', u) : undefined;
      const tempAt = at !== undefined ? fromCelsius(coolingTemperature(t0, ta, tau, at), u) : undefined;
      const reach = target !== undefined ? timeToReach(t0, ta, tau, target) : undefined;
      const out = {
        units: u,
        timeConstantHours: tau,
        coolingConstantPerHour: 1 / tau,
        ...(at !== undefined ? { atHours: at, temperatureAt: tempAt } : {}),
        ...(reach !== undefined ? { target: fromCelsius(target!, u), hoursToTarget: reach.hours, reason: reach.reason ?? null } : {}),
      };
      if (options.json) {
        process.stdout.write(`${JSON.stringify(out, null, 2)}\n`);
        return;
      }
      const deg = degreeLabel(u);
      const rows = [
        ['Time constant τ', `${num(tau, 2)} h`],
        ['Cooling constant k = 1/τ', `${num(1 / tau, 4)} per hour`],
      ];
      if (at !== undefined) rows.push([`Temperature after ${num(at, 2)} h`, `${num(tempAt!, 1)} ${deg}`]);
      if (reach !== undefined) {
        rows.push([`Time to reach ${num(out.target!, 1)} ${deg}`, reach.hours === null ? `never (${reach.reason})` : `${hours(reach.hours)} after the first reading`]);
      }
      process.stdout.write(
        [`Quick estimate (Newton's law of cooling at a steady ambient of ${num(fromCelsius(ta, u), 1)} ${deg})`, '', table(rows), '',
          'Valid while the equipment stays off and the outdoor temperature holds steady; an estimate, not a measurement.', ''].join('\n'),
      );
    });
}
