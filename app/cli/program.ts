/**
 * The commands of `heatlag` and the program that parses them. Each command lives in
 * commands/<name>.ts and is imported only when it runs (`heatlag --help` and `heatlag estimate` load no
 * CSV, date or database library); the root help lists the others from COMMANDS below
 * (tests/cli/startup.test.ts checks that each entry matches its module).
 */
import { Command } from 'commander';

interface CommandModule {
  register(program: Command): void;
}

/** Every command: its arguments and one-line description (for the root help) and its module. */
export const COMMANDS: Record<string, { args: string[]; description: string; load: () => Promise<CommandModule> }> = {
  fit: {
    args: ['[log.csv]'],
    description: 'fit the zone response (time constant, heating and cooling rates) of a log or a stored zone',
    load: () => import('./commands/fit.ts'),
  },
  recovery: {
    args: ['[log.csv]'],
    description: 'time to recover from one indoor temperature to another at a given outdoor temperature, from the fitted response',
    load: () => import('./commands/recovery.ts'),
  },
  estimate: {
    args: [],
    description: 'time constant from two readings taken while the zone free-floats at a steady outdoor temperature',
    load: () => import('./commands/estimate.ts'),
  },
  import: {
    args: ['<log.csv>'],
    description: 'import a thermostat export into a zone of a database (created if missing); all rows or none',
    load: () => import('./commands/import.ts'),
  },
  zones: {
    args: [],
    description: 'list the zones of a database with their sample counts, spans and time zones',
    load: () => import('./commands/zones.ts'),
  },
  plan: {
    args: ['[log.csv]'],
    description: 'simulate a weekly setback schedule on the fitted zone: optimal start, lowest setback temperature, runtime saved',
    load: () => import('./commands/plan.ts'),
  },
  report: {
    args: [],
    description: 'print the zone report (log, fitted response, recovery, plan, cautions, method) to PDF with headless Chromium',
    load: () => import('./commands/report.ts'),
  },
};

/** The program for `argv`: the named command's module registered, every other command as a help entry. */
export async function buildProgram(argv: string[]): Promise<Command> {
  const program = new Command('heatlag')
    .description('Fit a zone\'s thermal response from thermostat logs; predict drift, recovery and optimal start.')
    .version('0.1.0')
    .showHelpAfterError(false)
    .exitOverride()
    .configureOutput({ writeErr: (s) => process.stderr.write(s) });
  const words = argv.slice(2);
  const named = words[0] === 'help' ? words[1] : words[0];
  for (const [name, c] of Object.entries(COMMANDS)) {
    if (name === named) {
      (await c.load()).register(program);
    } else {
      // Listed in the root help only; every command has --json, so the entry reads "name [options] …".
      const entry = program.command(name).description(c.description).option('--json', 'print JSON');
      for (const a of c.args) entry.argument(a);
    }
  }
  return program;
}
