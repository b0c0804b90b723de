#!/usr/bin/env node
// `npm run build`: the renderer (see app/backend/renderer-build.ts), then the esbuild bundles of the
// command line, the browser-mode server, the Electron main and the preload (app/bundle.mjs).
import { register } from 'tsx/esm/api';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { bundleAll } from '../bundle.mjs';

register();
const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../..');
const { buildRenderer } = await import('../backend/renderer-build.ts');
await buildRenderer(root);
await bundleAll(root);
console.log('Built dist/renderer, dist/cli, dist/server, dist/main and dist/electron/preload.cjs.');
