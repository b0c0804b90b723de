/**
 * A portfolio batch: fits many zones of one database file, spreading the work over worker threads.
 * Each worker opens its own read-only connection (WAL lets it read while this thread writes), loads
 * the series and fit options of the zones it is sent and posts back one small reply per zone; this
 * thread only hands out zone ids, in batches, and saves each finished batch in one transaction while
 * the workers go on fitting (every worker holds a second batch, so it never waits for a save).
 *
 * A worker that dies mid-batch loses nothing: the replies it already sent are saved, the zone it was
 * fitting is tried once more by another worker (a second stop reports it as failed with the reason),
 * and its other zones go back to the queue. Every zone thus ends with exactly one saved response or
 * one error message.
 */
import os from 'node:os';
import { Worker } from 'node:worker_threads';
import type { ZoneResponse } from '../../core/types.ts';
import type { Store } from '../../db/index.ts';

export interface PortfolioItem {
  zoneId: number;
  response: ZoneResponse | null;
  /** Plain message when the zone could not be fitted (e.g. too little data) or saved. */
  error: string | null;
}

/** A worker's reply for one zone. */
export interface WorkerReply {
  zoneId: number;
  response?: ZoneResponse;
  error?: string;
}

/** Test hooks passed to workers (see fit-worker.ts); never set by the command line. */
export interface WorkerFaults {
  /** The first worker started exits (code 3) after sending this many replies. */
  firstExitsAfter?: number;
  /** Every worker exits (code 3) when it is about to fit this zone. */
  exitOnZone?: number;
}

export interface PortfolioOptions {
  /** Worker threads (default: one per core). */
  workers?: number;
  /** Where each finished batch is saved, in one transaction (the calling thread is the only writer). */
  store?: Store;
  /** Zones per batch (default: shrinking from 8 to 1 as the queue empties, so workers finish together). */
  batchSize?: number;
  /** Called after each zone (for progress). */
  onDone?: (done: number, total: number) => void;
  /** Called when a worker stops before finishing its batches, with the zones that go back to the queue. */
  onWorkerLost?: (reason: string, requeued: number[]) => void;
  faults?: WorkerFaults;
}

/** Default number of workers: every core the machine offers. */
export function defaultWorkers(): number {
  return Math.max(1, typeof os.availableParallelism === 'function' ? os.availableParallelism() : os.cpus().length);
}

interface Batch {
  ids: number[];
  replies: WorkerReply[];
}

interface Slot {
  worker: Worker;
  batches: Batch[];
  stopping: boolean;
  failure: string | null;
}

/**
 * Fits (and, with `options.store`, saves) every zone in `zoneIds` of the database `dbFile`; results
 * come back in the order of `zoneIds`. Never rejects: a zone no worker could fit gets its reason.
 */
export async function fitPortfolio(dbFile: string, zoneIds: number[], options: PortfolioOptions = {}): Promise<PortfolioItem[]> {
  const total = zoneIds.length;
  const results = new Map<number, PortfolioItem>();
  if (total === 0) return [];
  const count = Math.max(1, Math.min(options.workers ?? defaultWorkers(), total));
  const queue = zoneIds.slice();
  const attempts = new Map<number, number>();
  const entry = new URL('./fit-worker.mjs', import.meta.url);
  const slots = new Set<Slot>();
  let started = 0;
  let done = 0;
  let lastFailure = 'no worker started';

  return new Promise<PortfolioItem[]>((resolve) => {
    const finish = (item: PortfolioItem): void => {
      if (results.has(item.zoneId)) return;
      results.set(item.zoneId, item);
      options.onDone?.(++done, total);
    };

    /** Saves the replies of one batch in one transaction; a refused save is reported per zone. */
    const settle = (replies: WorkerReply[]): void => {
      const fitted = replies.filter((r) => r.response !== undefined) as Array<{ zoneId: number; response: ZoneResponse }>;
      let saveError: string | null = null;
      if (options.store && fitted.length) {
        try {
          options.store.saveResponses(fitted);
        } catch (e) {
          saveError = `fitted but not saved: ${e instanceof Error ? e.message : String(e)}`;
        }
      }
      for (const r of replies) {
        finish(r.response !== undefined && saveError === null
          ? { zoneId: r.zoneId, response: r.response, error: null }
          : { zoneId: r.zoneId, response: null, error: r.error ?? saveError ?? 'not fitted' });
      }
    };

    const nextBatch = (): Batch | null => {
      if (queue.length === 0) return null;
      const size = options.batchSize ?? Math.min(8, Math.max(1, Math.ceil(queue.length / (4 * count))));
      return { ids: queue.splice(0, size), replies: [] };
    };

    const pump = (): void => {
      // Round robin: every worker gets a batch before any gets its second.
      for (const depth of [1, 2]) {
        for (const slot of slots) {
          if (slot.stopping || slot.batches.length >= depth) continue;
          const batch = nextBatch();
          if (!batch) break;
          slot.batches.push(batch);
          slot.worker.postMessage(batch.ids);
        }
      }
      for (const slot of slots) {
        if (!slot.stopping && slot.batches.length === 0 && queue.length === 0) {
          slot.stopping = true;
          void slot.worker.terminate();
        }
      }
      // Replace workers that died while zones are still waiting (bounded, so a broken setup ends).
      if (queue.length > 0 && [...slots].filter((s) => !s.stopping).length < count) {
        if (started < count + total) {
          spawn();
          pump();
        } else if (slots.size === 0) {
          for (const id of queue.splice(0)) finish({ zoneId: id, response: null, error: `no worker could fit it (${lastFailure}).` });
        }
      }
      if (results.size === total && slots.size === 0) {
        resolve(zoneIds.map((id) => results.get(id)!));
      }
    };

    const spawn = (): void => {
      const faults = options.faults;
      const worker = new Worker(entry, {
        workerData: {
          dbFile,
          exitAfter: started === 0 ? faults?.firstExitsAfter : undefined,
          exitOnZone: faults?.exitOnZone,
        },
      });
      started++;
      const slot: Slot = { worker, batches: [], stopping: false, failure: null };
      slots.add(slot);
      worker.on('message', (reply: WorkerReply) => {
        const batch = slot.batches[0];
        batch.replies.push(reply);
        if (batch.replies.length === batch.ids.length) {
          slot.batches.shift();
          settle(batch.replies);
          pump();
        }
      });
      worker.on('error', (e) => {
        slot.failure = e instanceof Error ? e.message : String(e);
      });
      worker.on('exit', (code) => {
        slots.delete(slot);
        if (slot.batches.length > 0) {
          const reason = slot.failure ?? `exit code ${code}`;
          lastFailure = reason;
          const unfinished = slot.batches.flatMap((b) => b.ids.filter((id) => !b.replies.some((r) => r.zoneId === id)));
          settle(slot.batches.flatMap((b) => b.replies));
          slot.batches = [];
          // The first unfinished zone is the one the worker was fitting when it stopped.
          const [current, ...rest] = unfinished;
          const tries = (attempts.get(current) ?? 0) + 1;
          attempts.set(current, tries);
          const requeued = tries >= 2 ? rest : unfinished;
          if (tries >= 2) {
            finish({ zoneId: current, response: null, error: `the worker fitting this zone stopped twice (${reason}); it was not fitted.` });
          }
          queue.unshift(...requeued);
          options.onWorkerLost?.(reason, requeued);
        }
        pump();
      });
    };

    for (let i = 0; i < count; i++) spawn();
    pump();
  });
}
