/**
 * The Import screen's running import as the screen shows it: its job (for Cancel), whether Cancel was
 * pressed, the share read so far, and the note left by a cancelled import. The loop itself is
 * lib/import-job.ts runImport.
 */
import type { HeatlagApi, ImportStatus, Mapping } from '../../../api/contract.ts';
import { runImport } from '../lib/import-job.ts';

export class ImportRun {
  job = $state<string | null>(null);
  cancelling = $state(false);
  cancelledNote = $state<string | null>(null);
  progress = $state({ done: 0, total: 0 });
  /** Share of the file read, 0–100. */
  readonly percent = $derived(this.progress.total > 0 ? Math.min(100, (100 * this.progress.done) / this.progress.total) : 0);

  readonly #api: () => Pick<HeatlagApi, 'startImport' | 'importStatus' | 'cancelImport'>;
  constructor(api: () => Pick<HeatlagApi, 'startImport' | 'importStatus' | 'cancelImport'>) {
    this.#api = api;
  }

  /**
   * Imports `file` into the zone with the mapping, to its end (done, failed or cancelled, the last
   * status returned); a cancelled import leaves its note, naming the file and `zoneLabel`.
   */
  async run(file: { fileId: string; name: string; size: number }, zoneId: number, mapping: Mapping, zoneLabel: string): Promise<ImportStatus> {
    this.cancelledNote = null;
    this.cancelling = false;
    this.progress = { done: 0, total: file.size };
    const s = await runImport(this.#api(), { fileId: file.fileId, zoneId, mapping }, (id) => (this.job = id),
      (done, total) => (this.progress = { done, total: total || file.size }));
    this.job = null;
    if (s.state === 'cancelled') this.cancelledNote = `The import of ${file.name} was cancelled; nothing was added to ${zoneLabel}.`;
    return s;
  }

  /** Asks the backend to stop the running import (it stops before it commits); throws when it cannot be asked. */
  async cancel(): Promise<void> {
    if (!this.job) return;
    this.cancelling = true;
    await this.#api().cancelImport({ jobId: this.job });
  }
}
