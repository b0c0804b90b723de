/**
 * One worker of the portfolio batch (app/cli/portfolio.ts): fits the batches of zone ids it is sent,
 * reading each zone's series and fit options from its own read-only connection, and posts one small
 * reply per zone. `exitAfter` / `exitOnZone` in workerData are test hooks that make it stop mid-batch.
 */
import { parentPort, workerData } from 'node:worker_threads';
import { HeatlagError } from '../../core/errors.ts';
import { fitResponse } from '../../core/fit/index.ts';
import { openStore } from '../../db/index.ts';
import { fitOptionsFor } from '../backend/fit-options.ts';
import type { WorkerReply } from './portfolio.ts';

const { dbFile, exitAfter, exitOnZone } = workerData as { dbFile: string; exitAfter?: number; exitOnZone?: number };
const store = openStore(dbFile, { readonly: true });
let sent = 0;
parentPort!.on('message', (batch: number[]) => {
  for (const zoneId of batch) {
    if (zoneId === exitOnZone || sent === exitAfter) process.exit(3);
    let reply: WorkerReply;
    try {
      reply = { zoneId, response: fitResponse(store.loadSeries(zoneId), fitOptionsFor(store, zoneId)) };
    } catch (e) {
      reply = { zoneId, error: e instanceof HeatlagError ? e.message : `internal error: ${e instanceof Error ? e.message : String(e)}` };
    }
    parentPort!.postMessage(reply);
    sent++;
  }
});
