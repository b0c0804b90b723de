#!/usr/bin/env node
// The `heatlag` command: the bundle dist/cli/heatlag.js while it is up to date with the sources, else
// the TypeScript sources through tsx (app/launch.mjs), so an edited source needs no build step.
import { launch } from '../launch.mjs';

await launch('cli', 'heatlag', 'app/cli/main.ts');
