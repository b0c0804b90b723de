/**
 * A portfolio batch: fits many zones of one database file, spreading the work over worker threads
 * (one SQLite connection each, read-only), and saves every response from the calling thread (the
 * single writer).
 */
import os from 'node:os';
import { Worker } from 'node:worker_threads';
import type { ZoneResponse } from '../../core/types.ts';

export interface PortfolioItem {
  zoneId: number;
  response: ZoneResponse | null;
  /** Plain message when the zone could not be fitted (e.g. too little data). */
  error: string | null;
}

interface WorkerReply {
  zoneId: number;
  response?: ZoneResponse;
  error?: string;
}

/** Default number of workers: every core the machine offers. */
export function defaultWorkers(): number {
  return Math.max(1, typeof os.availableParallelism === 'function' ? os.availableParallelism() : os.cpus().length);
}

/**
 * Fits every zone in `zoneIds` of the database `dbFile` with `workers` threads; results come back in
 * the order of `zoneIds`. `onDone` is called after each zone (for progress).
 */
export async function fitPortfolio(
  dbFile: string,
  zoneIds: number[],
  workers = defaultWorkers(),
  onDone?: (done: number, total: number) => void,
): Promise<PortfolioItem[]> {
  const results = new Map<number, PortfolioItem>();
  const queue = zoneIds.slice();
  const count = Math.max(1, Math.min(workers, queue.length));
  let done = 0;
  const entry = new URL('./fit-worker.mjs', import.meta.url);
  await Promise.all(
    Array.from({ length: count }, () =>
      new Promise<void>((resolve, reject) => {
        const worker = new Worker(entry, { workerData: { dbFile } });
        const next = (): void => {
          const zoneId = queue.shift();
          if (zoneId === undefined) {
            void worker.terminate().then(() => resolve());
            return;
          }
          worker.postMessage(zoneId);
        };
        worker.on('message', (reply: WorkerReply | 'ready') => {
          if (reply !== 'ready') {
            results.set(reply.zoneId, { zoneId: reply.zoneId, response: reply.response ?? null, error: reply.error ?? null });
            onDone?.(++done, zoneIds.length);
          }
          next();
        });
        worker.on('error', reject);
      }),
    ),
  );
  return zoneIds.map((id) => results.get(id) ?? { zoneId: id, response: null, error: 'not fitted' });
}
