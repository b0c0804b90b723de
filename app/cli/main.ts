/**
 * The `heatlag` command line: the composition root. Each command lives in commands/<name>.ts.
 * Exit status: 0 success, 1 usage error, 2 bad input or data that cannot support the answer,
 * 3 an internal error (a bug).
 */
import { Command, CommanderError } from 'commander';
import { describeError } from './common.ts';
import * as estimate from './commands/estimate.ts';
import * as fit from './commands/fit.ts';
import * as importCmd from './commands/import.ts';
import * as plan from './commands/plan.ts';
import * as recovery from './commands/recovery.ts';
import * as report from './commands/report.ts';
import * as zones from './commands/zones.ts';

const program = new Command('heatlag')
  .description('Fit a zone\'s thermal response from thermostat logs; predict drift, recovery and optimal start.')
  .version('0.1.0')
  .showHelpAfterError(false)
  .exitOverride()
  .configureOutput({ writeErr: (s) => process.stderr.write(s) });

for (const command of [fit, recovery, estimate, importCmd, zones]) command.register(program);
plan.register(program);
report.register(program);

try {
  await program.parseAsync(process.argv);
} catch (e) {
  if (e instanceof CommanderError) {
    // Commander printed its message already; help and version exit 0.
    process.exitCode = e.exitCode === 0 ? 0 : 1;
  } else {
    const { code, message } = describeError(e);
    process.stderr.write(`heatlag: ${message}\n`);
    process.exitCode = code;
  }
}
