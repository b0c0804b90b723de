/** One worker of the portfolio batch: fits the zones it is sent, from its own read-only connection. */
import { parentPort, workerData } from 'node:worker_threads';
import { HeatlagError } from '../../core/errors.ts';
import { fitResponse } from '../../core/fit/index.ts';
import { openStore } from '../../db/index.ts';
import { fitOptionsFor } from '../backend/fit-options.ts';

const store = openStore(workerData.dbFile as string);
parentPort!.on('message', (zoneId: number) => {
  try {
    const response = fitResponse(store.loadSeries(zoneId), fitOptionsFor(store, zoneId));
    parentPort!.postMessage({ zoneId, response });
  } catch (e) {
    const message = e instanceof HeatlagError ? e.message : `internal error: ${e instanceof Error ? e.message : String(e)}`;
    parentPort!.postMessage({ zoneId, error: message });
  }
});
parentPort!.postMessage('ready');
