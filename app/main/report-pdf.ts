/**
 * The desktop's side of the zone report: Electron's printToPDF of the window's page (the Report screen,
 * laid out by the renderer's print stylesheet, app chrome hidden) with the shared paper sizes, margins
 * and page footer of app/api/report.ts, and the save dialogs for the PDF and for exports (CSV, JSON,
 * PNG). Kept thin: the report itself is the renderer's; this only prints and writes the file the person
 * chose.
 */
import { writeFile } from 'node:fs/promises';
import path from 'node:path';
import { app, dialog, type BrowserWindow } from 'electron';
import { REPORT_HEADER_TEMPLATE, REPORT_MARGINS_IN, reportFooterTemplate, type ExportKind, type Paper } from '../api/report.ts';
import type { NativeDialogs } from '../backend/context.ts';

const FILTERS: Record<ExportKind | 'pdf', { name: string; extensions: string[] }> = {
  csv: { name: 'CSV table', extensions: ['csv'] },
  json: { name: 'JSON', extensions: ['json'] },
  png: { name: 'PNG image', extensions: ['png'] },
  pdf: { name: 'PDF document', extensions: ['pdf'] },
};

async function chooseTarget(win: BrowserWindow, suggestedName: string, kind: ExportKind | 'pdf'): Promise<string | null> {
  const r = await dialog.showSaveDialog(win, {
    title: kind === 'pdf' ? 'Save the zone report' : 'Export',
    defaultPath: path.join(app.getPath('documents'), path.basename(suggestedName)),
    filters: [FILTERS[kind]],
  });
  return r.canceled || !r.filePath ? null : r.filePath;
}

/** The report dialogs of NativeDialogs, for the window `getWindow` returns. */
export function reportDialogs(getWindow: () => BrowserWindow | null): Pick<Required<NativeDialogs>, 'saveExportFile' | 'saveReportPdf'> {
  return {
    async saveExportFile(suggestedName: string, kind: ExportKind, bytes: Uint8Array): Promise<boolean> {
      const win = getWindow();
      if (!win) return false;
      const file = await chooseTarget(win, suggestedName, kind);
      if (!file) return false;
      await writeFile(file, bytes);
      return true;
    },

    async saveReportPdf(suggestedName: string, paper: Paper, title: string): Promise<boolean> {
      const win = getWindow();
      if (!win) return false;
      const pdf = await win.webContents.printToPDF({
        pageSize: paper === 'a4' ? 'A4' : 'Letter',
        printBackground: true,
        margins: { ...REPORT_MARGINS_IN },
        displayHeaderFooter: true,
        headerTemplate: REPORT_HEADER_TEMPLATE,
        footerTemplate: reportFooterTemplate(title),
        generateDocumentOutline: true,
        generateTaggedPDF: true,
      });
      const file = await chooseTarget(win, suggestedName, 'pdf');
      if (!file) return false;
      await writeFile(file, pdf);
      return true;
    },
  };
}
