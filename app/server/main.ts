/**
 * `npm run serve`: Heatlag in the browser. Serves the built renderer and the API on 127.0.0.1 only,
 * with a per-launch token, and prints the address to open.
 *
 *   node app/server/serve.mjs [--port N] [--data-dir DIR] [--db FILE] [--no-demo] [--json]
 *
 * --json prints one line {"url","origin","token","port","databasePath"} (for the end-to-end tests).
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { parseArgs } from 'node:util';
import { openBackend, type OpenBackend } from '../backend/backend.ts';
import { defaultDataDir } from '../backend/paths.ts';
import { buildRenderer, rendererIsBuilt } from '../backend/renderer-build.ts';
import { startServer } from './server.ts';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../..');

function fail(message: string): never {
  console.error(`heatlag serve: ${message}`);
  process.exit(1);
}

let args;
try {
  args = parseArgs({
    options: {
      port: { type: 'string', default: '0' },
      'data-dir': { type: 'string' },
      db: { type: 'string' },
      'no-demo': { type: 'boolean', default: false },
      json: { type: 'boolean', default: false },
      help: { type: 'boolean', short: 'h', default: false },
    },
    strict: true,
  }).values;
} catch (err) {
  fail(`${(err as Error).message}. Try --help.`);
}

if (args.help) {
  console.log(`Usage: npm run serve -- [--port N] [--data-dir DIR] [--db FILE] [--no-demo]

Serves Heatlag on http://127.0.0.1 (this computer only) and prints the address to open.
  --port N        port to listen on (default: a free one)
  --data-dir DIR  folder of the database and settings (default: ${defaultDataDir()})
  --db FILE       database file (default: heatlag.db in the data folder)
  --no-demo       do not create the invented demo site in a new database`);
  process.exit(0);
}

const port = Number(args.port);
if (!Number.isInteger(port) || port < 0 || port > 65535) fail(`--port must be a whole number from 0 to 65535, got ${args.port}.`);

const pkg = JSON.parse(readFileSync(path.join(root, 'package.json'), 'utf8')) as { version: string };
const dataDir = path.resolve(args['data-dir'] ?? (args.db ? path.dirname(path.resolve(args.db)) : defaultDataDir()));

let backend: OpenBackend;
try {
  backend = await openBackend({
    dataDir,
    ...(args.db ? { databaseFile: args.db } : {}),
    mode: 'browser',
    version: pkg.version,
    demoDir: path.join(root, 'assets', 'demo'),
    demo: !args['no-demo'],
  });
} catch (err) {
  fail(`the database could not be opened: ${(err as Error).message}`);
}

if (!rendererIsBuilt(root)) {
  console.error('Building the user interface first (one moment)…');
  await buildRenderer(root);
}

const server = await startServer({
  handlers: backend.handlers,
  uploads: backend.ctx.uploads,
  staticDir: path.join(root, 'dist', 'renderer'),
  port,
  checkOutput: process.env.HEATLAG_CHECK_OUTPUT === '1',
}).catch((err: Error) => fail(`cannot listen on 127.0.0.1:${port}: ${err.message}`));

if (args.json) {
  console.log(JSON.stringify({ url: server.url, origin: server.origin, token: server.token, port: server.port, databasePath: backend.ctx.databasePath }));
} else {
  console.log(`Heatlag is running in browser mode, on this computer only.
Open this address in your browser (it holds this session's key; do not share it):

  ${server.url}

Database: ${backend.ctx.databasePath}
Press Ctrl+C to stop.`);
}

let stopping = false;
async function stop() {
  if (stopping) return;
  stopping = true;
  await server.close();
  backend.close();
  process.exit(0);
}
process.on('SIGINT', stop);
process.on('SIGTERM', stop);
