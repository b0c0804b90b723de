// Worker entry of `npm run calibrate`: registers tsx, then loads the TypeScript worker.
import { register } from 'tsx/esm/api';

register();
await import('./worker.ts');
