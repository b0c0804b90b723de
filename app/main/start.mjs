#!/usr/bin/env node
// Entry of `npm start` (see start.ts): desktop window when Electron is installed, browser mode otherwise.
import { register } from 'tsx/esm/api';

register();
await import('./start.ts');
