/**
 * Import of logs: preview of an uploaded file (detected delimiter, decimal mark, columns, units),
 * the import itself as a background job with progress, rejected rows, saved mappings and the list of
 * a zone's logs. The file is named by the opaque id of its upload; paths never cross the API.
 */
import { randomBytes } from 'node:crypto';
import type {
  FileRef,
  ImportResult,
  ImportStatus,
  LogInfo,
  Mapping,
  Preview,
  ReadOptions,
  RejectedRow,
  SavedMapping,
} from '../api/contract.ts';
import { importLog, previewLog } from '../../db/index.ts';
import type { ServiceContext } from './context.ts';
import { ServiceError, toApiError } from './errors.ts';

interface Job {
  status: ImportStatus;
  fileId: string;
  /** Aborts the import (db/ importLog checks it between chunks and before the commit). */
  controller: AbortController;
  finishedAt: number | null;
}

/** Finished jobs are forgotten after this long (ms). */
const JOB_TTL = 30 * 60_000;

export function importService(ctx: ServiceContext) {
  const { store, uploads } = ctx;
  const jobs = new Map<string, Job>();

  function sweep() {
    const now = Date.now();
    for (const [id, job] of jobs) if (job.finishedAt !== null && now - job.finishedAt > JOB_TTL) jobs.delete(id);
  }

  function logInfo(zoneId: number): LogInfo[] {
    return store.listLogs(zoneId).map((l) => ({
      id: l.id,
      file: l.fileName,
      importedAt: l.importedAt,
      units: l.units,
      rowsAccepted: l.rowsAccepted,
      rowsRejected: l.rowsRejected,
      duplicates: l.duplicates,
      samples: l.samples,
      firstTime: l.firstTime,
      lastTime: l.lastTime,
      intervalMinutes: l.intervalMinutes,
      timezone: l.mapping.timezone ?? null,
      warnings: l.warnings,
    }));
  }

  return {
    async chooseLogFile(): Promise<FileRef | null> {
      if (!ctx.dialogs) {
        throw new ServiceError('unsupported', 'In the browser, drop the file on the page or use “Choose a file”.');
      }
      const file = await ctx.dialogs.chooseLogFile();
      return file ? uploads.registerExisting(file) : null;
    },

    async saveTextFile({ suggestedName, content }: { suggestedName: string; content: string }): Promise<boolean> {
      if (!ctx.dialogs) throw new ServiceError('unsupported', 'The browser saves exports through its own download.');
      return ctx.dialogs.saveTextFile(suggestedName, content);
    },

    async discardFile({ fileId }: { fileId: string }): Promise<boolean> {
      return uploads.discard(fileId);
    },

    async previewLog({ fileId, options, mapping }: { fileId: string; options?: ReadOptions | undefined; mapping?: Mapping | undefined }): Promise<Preview> {
      const { path, ref } = uploads.resolve(fileId);
      const base = {
        ...(options?.units ? { units: options.units } : {}),
        ...(options?.timezone ? { timezone: options.timezone } : {}),
      };
      const override = {
        ...(options?.delimiter ? { delimiter: options.delimiter } : {}),
        ...(options?.decimal ? { decimal: options.decimal } : {}),
      };
      let p;
      if (mapping) {
        p = await previewLog(path, { ...base, mapping: { ...mapping, ...override } });
      } else if (override.delimiter || override.decimal) {
        // The reader takes the delimiter and decimal mark from a mapping only. Without one, a mapping
        // naming no real column splits the file as asked; its two "not in the header" problems are ours,
        // not the file's, and are left out: the person then picks the time and indoor columns.
        const placeholder = '\u0000heatlag-unset';
        p = await previewLog(path, { ...base, mapping: { time: placeholder, indoor: placeholder, ...override } });
        p = { ...p, problems: p.problems.filter((x) => !x.includes(placeholder)) };
      } else {
        p = await previewLog(path, base);
      }
      return {
        file: ref.name,
        encoding: p.encoding,
        delimiter: p.delimiter,
        decimal: p.decimal,
        headerLine: p.headerLine,
        header: p.header,
        rows: p.rows,
        mapping: p.mapping,
        columns: p.columns.map((c) => ({
          index: c.index,
          name: c.name,
          role: c.role,
          unit: c.unit,
          ...(c.runtimeAs ? { runtimeAs: c.runtimeAs } : {}),
        })),
        units: p.units,
        timeFormat: p.timeFormat,
        needsTimezone: p.needsTimezone,
        warnings: p.warnings,
        problems: p.problems,
      };
    },

    async startImport({ fileId, zoneId, mapping }: { fileId: string; zoneId: number; mapping: Mapping }): Promise<{ jobId: string }> {
      sweep();
      const { path } = uploads.resolve(fileId);
      if (!store.getZone(zoneId)) throw new ServiceError('not-found', 'That zone no longer exists.');
      for (const job of jobs.values()) {
        if (job.fileId === fileId && job.status.state === 'running') {
          throw new ServiceError('conflict', 'This file is being imported already.');
        }
      }
      const jobId = randomBytes(12).toString('base64url');
      const job: Job = {
        fileId,
        controller: new AbortController(),
        finishedAt: null,
        status: { jobId, state: 'running', done: 0, total: 0, result: null, error: null },
      };
      jobs.set(jobId, job);
      importLog(store, path, {
        zoneId,
        mapping,
        signal: job.controller.signal,
        onProgress: (done, total) => {
          job.status = { ...job.status, done, total };
        },
      }).then(
        (r) => {
          // A re-import that adds no reading keeps no log (db/store/import-commit.ts, in the import's
          // own transaction): logAdded is false and the notes say so.
          const result: ImportResult = {
            logAdded: r.logAdded,
            logId: r.logId,
            file: r.file,
            rowsAccepted: r.rowsAccepted,
            rowsRejected: r.rowsRejected,
            duplicates: r.duplicates,
            rejected: r.rejected.slice(0, 200).map((x) => ({ line: x.line, column: x.column, columnName: x.columnName, reason: x.reason })),
            firstTime: Number.isFinite(r.firstTime) ? r.firstTime : null,
            lastTime: Number.isFinite(r.lastTime) ? r.lastTime : null,
            intervalMinutes: Number.isFinite(r.intervalMinutes) ? r.intervalMinutes : null,
            units: r.units,
            mapping: r.mapping,
            encoding: r.encoding,
            warnings: r.warnings,
          };
          const total = job.status.total || r.bytes;
          job.status = { ...job.status, state: 'done', done: total, total, result };
          job.finishedAt = Date.now();
          uploads.discard(fileId);
        },
        (err: unknown) => {
          const state = job.controller.signal.aborted ? 'cancelled' : 'failed';
          job.status = { ...job.status, state, error: toApiError(err, ctx.log) };
          job.finishedAt = Date.now();
        },
      );
      return { jobId };
    },

    async importStatus({ jobId }: { jobId: string }): Promise<ImportStatus> {
      const job = jobs.get(jobId);
      if (!job) throw new ServiceError('not-found', 'That import is no longer known: it finished long ago, or Heatlag was restarted.');
      return job.status;
    },

    async cancelImport({ jobId }: { jobId: string }): Promise<ImportStatus> {
      const job = jobs.get(jobId);
      if (!job) throw new ServiceError('not-found', 'That import is no longer known: it finished long ago, or Heatlag was restarted.');
      // Only a running import can stop; one that has committed (or failed) is reported as it is.
      if (job.status.state === 'running') job.controller.abort();
      return job.status;
    },

    async rejectedRows({ logId, limit, offset }: { logId: number; limit?: number | undefined; offset?: number | undefined }): Promise<{ total: number; rows: RejectedRow[] }> {
      const log = store.getLog(logId);
      if (!log) throw new ServiceError('not-found', 'That log no longer exists.');
      const rows = store.rejectedRows(logId, limit ?? 200, offset ?? 0);
      return {
        total: log.rowsRejected,
        rows: rows.map((r) => ({ line: r.line, column: r.column, columnName: r.columnName, reason: r.reason, raw: r.raw })),
      };
    },

    async listLogs({ zoneId }: { zoneId: number }): Promise<LogInfo[]> {
      if (!store.getZone(zoneId)) throw new ServiceError('not-found', 'That zone no longer exists.');
      return logInfo(zoneId);
    },

    async listMappings(): Promise<SavedMapping[]> {
      return store.listMappings().map((m) => ({ name: m.name, mapping: m.mapping }));
    },

    async saveMapping({ name, mapping }: { name: string; mapping: Mapping }): Promise<SavedMapping[]> {
      store.saveMapping(name, mapping);
      return store.listMappings().map((m) => ({ name: m.name, mapping: m.mapping }));
    },
  };
}
