/**
 * The Electron main process: a thin composition root. It opens the backend (database in the user's
 * app-data folder, settings, uploads, demo on first launch), registers the IPC handlers, serves the
 * renderer over app://, and opens the one window through createWindow.
 */
import { writeFile } from 'node:fs/promises';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { app, BrowserWindow, dialog, Menu } from 'electron';
import { openStore, type Store } from '../../db/index.ts';
import { registerIpc } from './ipc.ts';
import { reportDialogs } from './report-pdf.ts';
import { buildMenu } from './menu.ts';
import { APP_ORIGIN, registerScheme, serveRenderer } from './protocol.ts';
import { openBackend, type OpenBackend } from '../backend/backend.ts';
import type { NativeDialogs } from '../backend/context.ts';
import { createWindow, lockDown } from './window.ts';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../..');
let win: BrowserWindow | null = null;
let backend: OpenBackend | null = null;

app.setName('Heatlag');
app.enableSandbox();
registerScheme();

if (!app.requestSingleInstanceLock()) app.quit();
app.on('second-instance', () => {
  if (win) {
    if (win.isMinimized()) win.restore();
    win.focus();
  }
});

// Every web contents, present and future, gets the same lock-down.
app.on('web-contents-created', (_event, contents) => lockDown(contents));

/**
 * better-sqlite3 built for Electron (see native.ts), passed through better-sqlite3's nativeBinding
 * option; the packaged app carries its own copy rebuilt by the packager.
 */
function openForElectron(file: string): Store {
  const nativeBinding = app.isPackaged ? undefined : process.env.HEATLAG_NATIVE_BINDING;
  if (!app.isPackaged && !nativeBinding) {
    throw new Error('Start the desktop app with `npm start`: it prepares the Electron build of the database module.');
  }
  return openStore(file, nativeBinding ? { nativeBinding } : {});
}

const dialogs: NativeDialogs = {
  async chooseLogFile() {
    const r = await dialog.showOpenDialog(win!, {
      title: 'Import a log',
      properties: ['openFile'],
      filters: [
        { name: 'Thermostat logs', extensions: ['csv', 'tsv', 'txt'] },
        { name: 'All files', extensions: ['*'] },
      ],
    });
    return r.canceled ? null : (r.filePaths[0] ?? null);
  },
  async saveTextFile(suggestedName, content) {
    const r = await dialog.showSaveDialog(win!, {
      title: 'Export',
      defaultPath: path.join(app.getPath('documents'), path.basename(suggestedName)),
      // A schedule exports as JSON, everything else as CSV.
      filters: path.extname(suggestedName).toLowerCase() === '.json' ? [{ name: 'JSON', extensions: ['json'] }] : [{ name: 'CSV', extensions: ['csv'] }],
    });
    if (r.canceled || !r.filePath) return false;
    await writeFile(r.filePath, content, 'utf8');
    return true;
  },
  ...reportDialogs(() => win),
};

app.whenReady().then(async () => {
  try {
    backend = await openBackend({
      dataDir: app.getPath('userData'),
      mode: 'desktop',
      version: app.getVersion(),
      demoDir: path.join(root, 'assets', 'demo'),
      dialogs,
      open: openForElectron,
    });
  } catch (err) {
    dialog.showErrorBox('Heatlag cannot open its database', (err as Error).message);
    app.quit();
    return;
  }
  serveRenderer(path.join(root, 'dist', 'renderer'));
  registerIpc(backend.handlers, backend.ctx.uploads, (m) => console.error(m));
  win = createWindow({ preload: path.join(root, 'dist', 'electron', 'preload.cjs') });
  Menu.setApplicationMenu(buildMenu(win));
  await win.loadURL(`${APP_ORIGIN}/index.html`);
});

app.on('window-all-closed', () => app.quit());
app.on('will-quit', () => {
  backend?.close();
  backend = null;
});
