// Worker-thread entry of the portfolio batch: loads the TypeScript worker through tsx.
import { register } from 'tsx/esm/api';

register();
await import('./fit-worker.ts');
