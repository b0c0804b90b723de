// Electron's main entry: the bundle dist/main/main.js while it is up to date, else the TypeScript main
// process (main.ts) through tsx, as the CLI does (app/launch.mjs).
import { launch } from '../launch.mjs';

await launch('main', 'main', 'app/main/main.ts');
