/**
 * The `heatlag` command line: the composition root (the commands are in program.ts).
 * Exit status: 0 success, 1 usage error, 2 bad input or data that cannot support the answer,
 * 3 an internal error (a bug).
 */
import { CommanderError } from 'commander';
import { describeError } from './options.ts';
import { buildProgram } from './program.ts';

try {
  const program = await buildProgram(process.argv);
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
