#!/usr/bin/env node
// `npm run build`: the renderer and the preload bundle (see app/backend/renderer-build.ts).
import { register } from 'tsx/esm/api';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

register();
const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../..');
const { buildRenderer, buildPreload } = await import('../backend/renderer-build.ts');
await buildRenderer(root);
await buildPreload(root);
console.log('Built dist/renderer and dist/electron/preload.cjs.');
