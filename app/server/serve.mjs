#!/usr/bin/env node
// Entry of `npm run serve`: the bundle dist/server/main.js while it is up to date, else the TypeScript
// sources of the browser-mode server through tsx (app/launch.mjs).
import { launch } from '../launch.mjs';

await launch('server', 'main', 'app/server/main.ts');
