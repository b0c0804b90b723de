/**
 * The one helper every Heatlag window is made with, so that none can miss a security setting:
 * context isolation, the sandbox, no Node in the page, web security on, only the app's own
 * protocol, navigation and new windows denied.
 */
import { BrowserWindow, shell, type WebContents } from 'electron';
import { APP_ORIGIN } from './protocol.ts';

export interface WindowOptions {
  preload: string;
  title?: string;
  width?: number;
  height?: number;
}

/** Denies navigation away from the app and every new window; opens https links in the browser. */
export function lockDown(contents: WebContents): void {
  contents.on('will-navigate', (event, url) => {
    if (!url.startsWith(APP_ORIGIN + '/')) event.preventDefault();
  });
  contents.on('will-redirect', (event, url) => {
    if (!url.startsWith(APP_ORIGIN + '/')) event.preventDefault();
  });
  contents.setWindowOpenHandler(({ url }) => {
    if (/^https:\/\//.test(url)) void shell.openExternal(url);
    return { action: 'deny' };
  });
  contents.on('will-attach-webview', (event) => event.preventDefault());
  contents.session.setPermissionRequestHandler((_wc, _permission, callback) => callback(false));
  contents.session.setPermissionCheckHandler(() => false);
}

export function createWindow(options: WindowOptions): BrowserWindow {
  const win = new BrowserWindow({
    title: options.title ?? 'Heatlag',
    width: options.width ?? 1280,
    height: options.height ?? 820,
    minWidth: 960,
    minHeight: 600,
    show: false,
    backgroundColor: '#f2f4f6',
    webPreferences: {
      preload: options.preload,
      contextIsolation: true,
      sandbox: true,
      nodeIntegration: false,
      nodeIntegrationInWorker: false,
      nodeIntegrationInSubFrames: false,
      webSecurity: true,
      allowRunningInsecureContent: false,
      webviewTag: false,
      spellcheck: false,
      devTools: true,
    },
  });
  lockDown(win.webContents);
  win.once('ready-to-show', () => win.show());
  return win;
}
