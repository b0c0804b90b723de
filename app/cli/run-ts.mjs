#!/usr/bin/env node
// Runs a TypeScript file of the project (benchmarks, the demo generator) through tsx.
import { register } from 'tsx/esm/api';
import { pathToFileURL } from 'node:url';
import path from 'node:path';

register();
const [file, ...rest] = process.argv.slice(2);
if (!file) {
  console.error('usage: node app/cli/run-ts.mjs FILE.ts [args]');
  process.exit(1);
}
process.argv = [process.argv[0], file, ...rest];
await import(pathToFileURL(path.resolve(file)).href);
