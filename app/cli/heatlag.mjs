#!/usr/bin/env node
// The `heatlag` command: runs the TypeScript sources through tsx, so no build step is needed.
import { register } from 'tsx/esm/api';

register();
await import('./main.ts');
