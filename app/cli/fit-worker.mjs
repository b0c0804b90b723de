// Worker-thread entry of the portfolio batch (app/cli/portfolio.ts): the bundled worker
// dist/cli/fit-worker.js while the CLI bundle is up to date with its sources, else the TypeScript
// worker through tsx (app/launch.mjs, the launchers' one rule; HEATLAG_FROM_SOURCE=1 forces tsx).
import { launch } from '../launch.mjs';

await launch('cli', 'fit-worker', 'app/cli/fit-worker.ts');
