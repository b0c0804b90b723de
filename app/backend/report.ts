/**
 * The zone report's backend: the log's span and quality as the store holds it (reading interval,
 * gaps by the import's rule, coverage, rejected rows of every log), and, on the desktop, the save
 * dialogs for exports and the PDF of the report page. Everything else the report shows comes from
 * the methods the screens use (latestResponse, fitZone, listLogs, listSchedules, planZone).
 */
import type { ExportKind, Gap, LogQuality, Paper, ReportRejectedRow } from '../api/report.ts';
import { medianSpacing } from '../../core/history.ts';
import type { ZoneSeries } from '../../core/types.ts';
import type { ServiceContext } from './context.ts';
import { ServiceError } from './errors.ts';
import { seriesCache } from './series-cache.ts';

const HOUR_MS = 3_600_000;
const MAX_GAPS = 50;
const MAX_REJECTED = 200;

/**
 * Gaps of a series: breaks between readings longer than 1 h or 6 median intervals, whichever is
 * longer (the rule the import uses for its gap note), longest first.
 */
export function seriesGaps(series: ZoneSeries): { thresholdMs: number; gaps: Gap[]; count: number; gapHours: number; coveragePercent: number | null } {
  const t = series.time;
  const step = medianSpacing(t);
  const thresholdMs = Math.max(HOUR_MS, Number.isFinite(step) ? 6 * step : 0);
  const gaps: Gap[] = [];
  let gapMs = 0;
  for (let i = 1; i < t.length; i++) {
    const d = t[i]! - t[i - 1]!;
    if (d > thresholdMs) {
      gaps.push({ from: t[i - 1]!, to: t[i]!, hours: d / HOUR_MS });
      gapMs += d;
    }
  }
  gaps.sort((a, b) => b.hours - a.hours || a.from - b.from);
  const span = t.length >= 2 ? t[t.length - 1]! - t[0]! : 0;
  return {
    thresholdMs,
    gaps: gaps.slice(0, MAX_GAPS),
    count: gaps.length,
    gapHours: gapMs / HOUR_MS,
    coveragePercent: span > 0 ? (100 * (span - gapMs)) / span : null,
  };
}

function countFinite(a: Float64Array): number {
  let n = 0;
  for (let i = 0; i < a.length; i++) if (Number.isFinite(a[i]!)) n++;
  return n;
}

export function reportService(ctx: ServiceContext) {
  const { store } = ctx;

  return {
    async zoneLogQuality({ zoneId }: { zoneId: number }): Promise<LogQuality> {
      if (!store.getZone(zoneId)) throw new ServiceError('not-found', 'That zone no longer exists.');
      const series = seriesCache(store).series(zoneId);
      const logs = store.listLogs(zoneId);
      const g = seriesGaps(series);
      const step = medianSpacing(series.time);
      const rejected: ReportRejectedRow[] = [];
      let rejectedTotal = 0;
      let duplicates = 0;
      for (const log of logs) {
        rejectedTotal += log.rowsRejected;
        duplicates += log.duplicates;
        if (rejected.length < MAX_REJECTED && log.rowsRejected > 0) {
          for (const r of store.rejectedRows(log.id, MAX_REJECTED - rejected.length, 0)) {
            rejected.push({ file: log.fileName, line: r.line, column: r.column, columnName: r.columnName, reason: r.reason });
          }
        }
      }
      const n = series.time.length;
      return {
        zoneId,
        readings: n,
        firstTime: n ? series.time[0]! : null,
        lastTime: n ? series.time[n - 1]! : null,
        intervalMinutes: Number.isFinite(step) ? step / 60_000 : null,
        gapThresholdMinutes: g.thresholdMs / 60_000,
        gapCount: g.count,
        gapHours: g.gapHours,
        gaps: g.gaps,
        coveragePercent: g.coveragePercent,
        withOutdoor: countFinite(series.outdoor),
        withHeating: countFinite(series.heat),
        withCooling: countFinite(series.cool),
        duplicates,
        rejectedTotal,
        rejected,
      };
    },

    async saveExportFile(input: { suggestedName: string; kind: ExportKind; text?: string | undefined; base64?: string | undefined }): Promise<boolean> {
      const save = ctx.dialogs?.saveExportFile;
      if (!save) throw new ServiceError('unsupported', 'In the browser, exports are downloaded by the page itself.');
      const bytes = input.kind === 'png' ? Buffer.from(input.base64 ?? '', 'base64') : Buffer.from(input.text ?? '', 'utf8');
      return save.call(ctx.dialogs, input.suggestedName, input.kind, bytes);
    },

    async saveReportPdf({ suggestedName, paper, title }: { suggestedName: string; paper: Paper; title: string }): Promise<boolean> {
      const save = ctx.dialogs?.saveReportPdf;
      if (!save) throw new ServiceError('unsupported', 'In the browser, use Print and choose “Save as PDF”, or `heatlag report` on the command line.');
      return save.call(ctx.dialogs, suggestedName, paper, title);
    },
  };
}
