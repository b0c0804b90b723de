// Electron's main entry: runs the TypeScript main process (main.ts) through tsx, as the CLI does.
import { register } from 'tsx/esm/api';

register();
await import('./main.ts');
