// `node --import ./tests/cli/support/trace-imports.mjs …`: appends every module URL the process
// resolves to the file $HEATLAG_TRACE (one a line), for tests of what a command loads.
import { register } from 'node:module';

register('./trace-hooks.mjs', import.meta.url, { data: { file: process.env.HEATLAG_TRACE } });
