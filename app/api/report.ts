/**
 * The zone report's part of the API contract, and what the report's printers share: the log's span
 * and quality (gaps, rejected rows) as the store holds it, the desktop's export and PDF save dialogs,
 * the paper sizes with their margins, and the page footer Chromium prints on every page (Electron's
 * printToPDF and the command line's headless Chromium use the same one).
 *
 * Imports only zod, like contract.ts.
 */
import { z } from 'zod';

const Id = z.number().int().positive();

export const PAPERS = ['letter', 'a4'] as const;
export const PaperSchema = z.enum(PAPERS);
export type Paper = z.infer<typeof PaperSchema>;

/**
 * Page margins, inches, the same in print.css (@page) and in every printToPDF call. The bottom one
 * leaves room for the footer.
 */
export const REPORT_MARGINS_IN = Object.freeze({ top: 0.6, right: 0.7, bottom: 0.75, left: 0.7 });

/** Paper sizes, inches (US Letter 8.5 × 11 in; ISO A4 210 × 297 mm). */
export const PAPER_SIZE_IN: Readonly<Record<Paper, { width: number; height: number }>> = Object.freeze({
  letter: { width: 8.5, height: 11 },
  a4: { width: 210 / 25.4, height: 297 / 25.4 },
});

/** The paper a report defaults to: Letter for a °F zone (US practice), A4 otherwise. */
export function defaultPaper(units: 'C' | 'F'): Paper {
  return units === 'F' ? 'letter' : 'a4';
}

export const GapSchema = z.object({
  /** Last reading before the gap and first after it, epoch ms. */
  from: z.number(),
  to: z.number(),
  hours: z.number(),
});
export type Gap = z.infer<typeof GapSchema>;

export const ReportRejectedRowSchema = z.object({
  file: z.string(),
  line: z.number().int(),
  column: z.number().int().nullable(),
  columnName: z.string().nullable(),
  reason: z.string(),
});
export type ReportRejectedRow = z.infer<typeof ReportRejectedRowSchema>;

/** What the zone's stored readings cover and where they fall short. */
export const LogQualitySchema = z.object({
  zoneId: Id,
  readings: z.number().int().nonnegative(),
  firstTime: z.number().nullable(),
  lastTime: z.number().nullable(),
  /** Median spacing of the readings, minutes; null with fewer than two. */
  intervalMinutes: z.number().nullable(),
  /** A break between readings longer than this is a gap (1 h, or 6 intervals if longer: the import's rule). */
  gapThresholdMinutes: z.number(),
  gapCount: z.number().int().nonnegative(),
  /** Hours inside gaps. */
  gapHours: z.number().nonnegative(),
  /** The longest gaps, longest first (at most 50). */
  gaps: z.array(GapSchema),
  /** Share of the span not inside a gap, %; null with fewer than two readings. */
  coveragePercent: z.number().nullable(),
  /** Readings with an outdoor temperature, with heating runtime and with cooling runtime. */
  withOutdoor: z.number().int().nonnegative(),
  withHeating: z.number().int().nonnegative(),
  withCooling: z.number().int().nonnegative(),
  duplicates: z.number().int().nonnegative(),
  /** Rejected rows of all the zone's logs: the total and the first ones (at most 200). */
  rejectedTotal: z.number().int().nonnegative(),
  rejected: z.array(ReportRejectedRowSchema),
});
export type LogQuality = z.infer<typeof LogQualitySchema>;

export const EXPORT_KINDS = ['csv', 'json', 'png'] as const;
export const ExportKindSchema = z.enum(EXPORT_KINDS);
export type ExportKind = z.infer<typeof ExportKindSchema>;

/** A file name the person is offered: no folders, no control characters. */
const SuggestedName = z
  .string()
  .min(1)
  .max(200)
  .refine((s) => !/[\u0000-\u001f\u007f/\\]/.test(s), 'A file name cannot contain folders or control characters.');

function method<I extends z.ZodType, O extends z.ZodType>(input: I, output: O) {
  return { input, output };
}

/** The report's methods (merged into the contract). */
export const reportMethods = {
  /** The zone's readings as the report describes them: span, interval, gaps, rejected rows. */
  zoneLogQuality: method(z.object({ zoneId: Id }).strict(), LogQualitySchema),
  /**
   * Desktop only: a save dialog for an export (CSV or JSON as text, PNG as base64); false when cancelled.
   * In browser mode the page downloads the file itself.
   */
  saveExportFile: method(
    z
      .object({
        suggestedName: SuggestedName,
        kind: ExportKindSchema,
        text: z.string().max(50_000_000).optional(),
        base64: z.string().max(60_000_000).regex(/^[A-Za-z0-9+/]*={0,2}$/).optional(),
      })
      .strict()
      .refine((v) => (v.kind === 'png' ? v.base64 !== undefined && v.text === undefined : v.text !== undefined && v.base64 === undefined), {
        message: 'A PNG travels as base64, CSV and JSON as text.',
      }),
    z.boolean(),
  ),
  /**
   * Desktop only: prints the window's page (the report screen, through the print stylesheet) with
   * Electron's printToPDF and saves it where the person chooses; false when cancelled.
   */
  saveReportPdf: method(
    z.object({ suggestedName: SuggestedName, paper: PaperSchema, title: z.string().max(300) }).strict(),
    z.boolean(),
  ),
} as const;

const escapeHtml = (s: string): string =>
  s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);

/**
 * The footer Chromium prints at the bottom of every page: the report's title on the left, "page X of
 * Y" on the right (Chromium fills the pageNumber and totalPages spans). Inline styles only: the
 * footer is drawn outside the page's own stylesheet.
 */
export function reportFooterTemplate(title: string): string {
  const side = REPORT_MARGINS_IN.left;
  return (
    `<div style="width:100%;font-family:'Liberation Sans','Noto Sans',Arial,sans-serif;font-size:7.5pt;color:#5d6975;` +
    `display:flex;justify-content:space-between;padding:0 ${side}in;margin-bottom:0.12in;">` +
    `<span>${escapeHtml(title)}</span>` +
    `<span>Page <span class="pageNumber"></span> of <span class="totalPages"></span></span></div>`
  );
}

/** An empty header (Chromium prints the date and title by default otherwise). */
export const REPORT_HEADER_TEMPLATE = '<span></span>';

/** The query of the report's print route (no app chrome): /?view=report&zone=ID&… */
export interface ReportRoute {
  zoneId: number;
  units?: 'C' | 'F';
  paper?: Paper;
  /** Recovery conditions, °C. */
  fromC?: number;
  toC?: number;
  outdoorC?: number;
  /** What-if factors (heating output ×, heat loss ×). */
  capacityFactor?: number;
  heatLossFactor?: number;
}

/** The search part of the print route's address. */
export function reportSearch(r: ReportRoute): string {
  const q = new URLSearchParams({ view: 'report', zone: String(r.zoneId) });
  if (r.units) q.set('units', r.units);
  if (r.paper) q.set('paper', r.paper);
  const put = (k: string, v: number | undefined) => {
    if (v !== undefined && Number.isFinite(v)) q.set(k, String(v));
  };
  put('from', r.fromC);
  put('to', r.toC);
  put('outdoor', r.outdoorC);
  put('capacity', r.capacityFactor);
  put('heatloss', r.heatLossFactor);
  return `?${q.toString()}`;
}

/** Reads the print route back; null when the address is not the report's. */
export function parseReportSearch(search: string): ReportRoute | null {
  const q = new URLSearchParams(search);
  if (q.get('view') !== 'report') return null;
  const zoneId = Number(q.get('zone'));
  if (!Number.isInteger(zoneId) || zoneId <= 0) return null;
  const n = (k: string): number | undefined => {
    const v = q.get(k);
    if (v === null || v.trim() === '') return undefined;
    const x = Number(v);
    return Number.isFinite(x) ? x : undefined;
  };
  const units = q.get('units');
  const paper = q.get('paper');
  const out: ReportRoute = { zoneId };
  if (units === 'C' || units === 'F') out.units = units;
  if (paper === 'letter' || paper === 'a4') out.paper = paper;
  const set = (key: 'fromC' | 'toC' | 'outdoorC' | 'capacityFactor' | 'heatLossFactor', v: number | undefined) => {
    if (v !== undefined) out[key] = v;
  };
  set('fromC', n('from'));
  set('toC', n('to'));
  set('outdoorC', n('outdoor'));
  set('capacityFactor', n('capacity'));
  set('heatLossFactor', n('heatloss'));
  return out;
}
