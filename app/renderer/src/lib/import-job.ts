/**
 * The Import screen's running import: started on the backend, its status asked every 150 ms until it
 * is done, failed or cancelled, and the rejected rows of a finished import fetched whole for export.
 * The API is passed in, so the loop is unit-tested with a fake backend.
 */
import type { HeatlagApi, ImportStatus, Mapping, RejectedRow } from '../../../api/contract.ts';

export type ImportApi = Pick<HeatlagApi, 'startImport' | 'importStatus'>;

/** How often the status is asked while an import runs, ms. */
export const POLL_MS = 150;

/**
 * Runs one import to its end: `onstart` gets the job id (for Cancel), `onprogress` each status's
 * done and total. Resolves with the last status (state 'done', 'failed' or 'cancelled'); rejects when
 * the backend cannot be reached.
 */
export async function runImport(
  api: ImportApi,
  input: { fileId: string; zoneId: number; mapping: Mapping },
  onstart: (jobId: string) => void,
  onprogress: (done: number, total: number) => void,
  wait: (ms: number) => Promise<void> = (ms) => new Promise((r) => setTimeout(r, ms)),
): Promise<ImportStatus> {
  const { jobId } = await api.startImport(input);
  onstart(jobId);
  for (;;) {
    const s = await api.importStatus({ jobId });
    onprogress(s.done, s.total);
    if ((s.state === 'done' && s.result) || s.state === 'failed' || s.state === 'cancelled') return s;
    await wait(POLL_MS);
  }
}

/** Every rejected row of a log, fetched 5,000 at a time (for the CSV export). */
export async function allRejectedRows(api: Pick<HeatlagApi, 'rejectedRows'>, logId: number, total: number): Promise<RejectedRow[]> {
  const rows: RejectedRow[] = [];
  for (let offset = 0; offset < total; offset += 5000) {
    const page = await api.rejectedRows({ logId, limit: 5000, offset });
    rows.push(...page.rows);
    if (page.rows.length === 0) break;
  }
  return rows;
}
