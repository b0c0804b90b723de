#!/usr/bin/env node
// Entry of `npm run serve`: runs the TypeScript sources of the browser-mode server through tsx.
import { register } from 'tsx/esm/api';

register();
await import('./main.ts');
