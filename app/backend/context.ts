/**
 * What every service handler works with: the open store, the settings file, the uploaded files, and
 * (desktop only) the native dialogs. Built once by the composition root (Electron main or the
 * browser-mode server).
 */
import type { ExportKind, Paper } from '../api/report.ts';
import type { Store } from '../../db/store.ts';
import type { SettingsFile } from './settings.ts';
import type { UploadRegistry } from './uploads.ts';

export interface NativeDialogs {
  /** The open dialog for a log; the chosen path, or null when cancelled. */
  chooseLogFile(): Promise<string | null>;
  /** The save dialog; writes the text and returns true, or false when cancelled. */
  saveTextFile(suggestedName: string, content: string): Promise<boolean>;
  /** The save dialog for an export (CSV, JSON, PNG); writes the bytes, false when cancelled. */
  saveExportFile?(suggestedName: string, kind: ExportKind, bytes: Uint8Array): Promise<boolean>;
  /** Prints the window's page to PDF (Electron's printToPDF) and saves it; false when cancelled. */
  saveReportPdf?(suggestedName: string, paper: Paper, title: string): Promise<boolean>;
}

export interface ServiceContext {
  store: Store;
  settings: SettingsFile;
  uploads: UploadRegistry;
  mode: 'desktop' | 'browser';
  version: string;
  databasePath: string;
  /** Folder of the demo logs (assets/demo). */
  demoDir: string;
  dialogs?: NativeDialogs;
  log: (msg: string) => void;
}
