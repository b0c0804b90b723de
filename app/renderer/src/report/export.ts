/**
 * Exports a person can hand over: charts as PNG at print resolution, tables as CSV, the zone's
 * response as JSON. In the browser the page downloads the file; on the desktop the main process shows
 * a save dialog (saveExportFile) and writes it.
 */
import type { Chart } from 'chart.js';
import type { ExportKind } from '../../../api/report.ts';
import type { Backend } from '../lib/backend.ts';
import { downloadBlob } from '../lib/download.ts';
import { toCsv, type Rows } from './tables.ts';

/**
 * Runs an export started by a button; when it fails, the window's problem line says
 * "<what> could not be saved: <reason>" (a cancelled save dialog is not a failure).
 */
export async function exportOrTell(app: { problem: string | null }, what: string, job: () => Promise<boolean>): Promise<void> {
  try {
    await job();
  } catch (err) {
    app.problem = `${what} could not be saved: ${(err as Error).message}`;
  }
}

/** Device pixels per CSS pixel of an exported chart: 3 gives about 290 dpi at the chart's printed size. */
export const PRINT_PIXEL_RATIO = 3;

const MIME: Record<ExportKind, string> = { csv: 'text/csv;charset=utf-8', json: 'application/json;charset=utf-8', png: 'image/png' };

/** A file name from a person's words: letters, digits, dashes; never empty. */
export function fileSlug(...parts: string[]): string {
  const s = parts
    .join('-')
    .normalize('NFKD')
    .replace(/[\u0300-\u036f]/g, '')
    .replace(/[^A-Za-z0-9]+/g, '-')
    .replace(/^-+|-+$/g, '')
    .toLowerCase();
  return s.slice(0, 120) || 'heatlag';
}

async function saveText(backend: Backend, name: string, kind: 'csv' | 'json', text: string): Promise<boolean> {
  if (backend.kind === 'desktop') return backend.api.saveExportFile({ suggestedName: name, kind, text });
  // A byte-order mark lets spreadsheet programs read the CSV's °, τ and · as UTF-8.
  downloadBlob(name, new Blob([kind === 'csv' ? '\ufeff' : '', text], { type: MIME[kind] }));
  return true;
}

/** Saves a table (header row first) as CSV. */
export function exportCsv(backend: Backend, name: string, rows: Rows): Promise<boolean> {
  return saveText(backend, name, 'csv', toCsv(rows));
}

/** Saves a value as pretty-printed JSON. */
export function exportJson(backend: Backend, name: string, value: unknown): Promise<boolean> {
  return saveText(backend, name, 'json', `${JSON.stringify(value, null, 2)}\n`);
}

/**
 * A chart as a PNG data URL at `ratio` device pixels per CSS pixel, on white (a chart's canvas is
 * transparent; a handed-over image should not be). The chart is redrawn at that ratio for the copy
 * and put back as it was.
 */
export function chartPng(chart: Chart, ratio = PRINT_PIXEL_RATIO): string {
  const before = chart.options.devicePixelRatio;
  const { width, height } = chart;
  const needsRedraw = chart.currentDevicePixelRatio !== ratio;
  if (needsRedraw) {
    chart.options.devicePixelRatio = ratio;
    chart.resize(width, height);
  }
  try {
    const src = chart.canvas;
    const out = document.createElement('canvas');
    out.width = src.width;
    out.height = src.height;
    const g = out.getContext('2d')!;
    g.fillStyle = '#ffffff';
    g.fillRect(0, 0, out.width, out.height);
    g.drawImage(src, 0, 0);
    return out.toDataURL('image/png');
  } finally {
    if (needsRedraw) {
      chart.options.devicePixelRatio = before;
      chart.resize(width, height);
    }
  }
}

/** Saves a chart as a print-resolution PNG. */
export async function exportChartPng(backend: Backend, name: string, chart: Chart): Promise<boolean> {
  const url = chartPng(chart);
  const base64 = url.slice(url.indexOf(',') + 1);
  if (backend.kind === 'desktop') return backend.api.saveExportFile({ suggestedName: name, kind: 'png', base64 });
  const bytes = Uint8Array.from(atob(base64), (c) => c.charCodeAt(0));
  downloadBlob(name, new Blob([bytes], { type: MIME.png }));
  return true;
}
