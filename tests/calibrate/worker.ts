/** A worker of `npm run calibrate`: runs the cases it is sent (run.ts) and posts their summaries back. */
import { parentPort } from 'node:worker_threads';
import { analyse } from './analyse.ts';
import { scenarioById } from './scenarios.ts';

parentPort!.on('message', async (id: string | null) => {
  if (id === null) {
    process.exit(0);
  }
  try {
    parentPort!.postMessage({ id, result: await analyse(scenarioById(id)) });
  } catch (e) {
    parentPort!.postMessage({ id, error: e instanceof Error ? e.message : String(e) });
  }
});
parentPort!.postMessage('ready');
