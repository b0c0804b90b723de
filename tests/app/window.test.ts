/**
 * Every desktop window is made by app/main/window.ts with Electron's security recommendations on
 * (electronjs.org "Security" checklist: context isolation, sandbox, no Node integration anywhere,
 * web security, no insecure content, no webview) and locked down: no navigation or redirect away from
 * the app's own origin, no new windows (https links go to the system browser), no webviews, every
 * permission refused. Electron itself is replaced by a recorder here (it cannot start on this
 * machine); the static scanner in tests/app/security-scan.test.ts checks the same file's source.
 */
import { describe, expect, it, vi } from 'vitest';

type Listener = (event: { preventDefault: () => void }, ...args: unknown[]) => void;
const made: Array<{ options: Record<string, unknown>; listeners: Map<string, Listener>; openHandler?: (d: { url: string }) => unknown; permission?: (...a: unknown[]) => void; check?: () => boolean }> = [];
const opened: string[] = [];

vi.mock('electron', () => {
  class BrowserWindow {
    webContents: unknown;
    constructor(options: Record<string, unknown>) {
      const rec: (typeof made)[number] = { options, listeners: new Map() };
      made.push(rec);
      this.webContents = {
        on: (name: string, fn: Listener) => rec.listeners.set(name, fn),
        setWindowOpenHandler: (fn: (d: { url: string }) => unknown) => (rec.openHandler = fn),
        session: {
          setPermissionRequestHandler: (fn: (...a: unknown[]) => void) => (rec.permission = fn),
          setPermissionCheckHandler: (fn: () => boolean) => (rec.check = fn),
        },
      };
    }
    once(): void {}
  }
  return {
    BrowserWindow,
    shell: { openExternal: (url: string) => opened.push(url) },
    protocol: { registerSchemesAsPrivileged: vi.fn(), handle: vi.fn() },
  };
});

const { createWindow } = await import('../../app/main/window.ts');
const { APP_ORIGIN } = await import('../../app/main/protocol.ts');

function fire(rec: (typeof made)[number], name: string, url: string): boolean {
  let prevented = false;
  rec.listeners.get(name)!({ preventDefault: () => (prevented = true) }, url);
  return prevented;
}

describe('the desktop window', () => {
  it('is made with every security recommendation on', () => {
    createWindow({ preload: '/x/preload.cjs' });
    const prefs = made[0]!.options.webPreferences as Record<string, unknown>;
    expect(prefs).toMatchObject({
      preload: '/x/preload.cjs',
      contextIsolation: true,
      sandbox: true,
      nodeIntegration: false,
      nodeIntegrationInWorker: false,
      nodeIntegrationInSubFrames: false,
      webSecurity: true,
      allowRunningInsecureContent: false,
      webviewTag: false,
    });
    expect(prefs).not.toHaveProperty('enableRemoteModule');
    expect(prefs).not.toHaveProperty('experimentalFeatures');
  });

  it('stays on the app origin, opens no windows, attaches no webview and grants no permission', () => {
    const rec = made[0]!;
    expect(fire(rec, 'will-navigate', `${APP_ORIGIN}/index.html`)).toBe(false);
    expect(fire(rec, 'will-navigate', 'https://example.com/')).toBe(true);
    expect(fire(rec, 'will-navigate', `${APP_ORIGIN}.evil.com/`)).toBe(true);
    expect(fire(rec, 'will-redirect', 'file:///etc/passwd')).toBe(true);
    let webview = false;
    rec.listeners.get('will-attach-webview')!({ preventDefault: () => (webview = true) });
    expect(webview).toBe(true);
    expect(rec.openHandler!({ url: 'https://example.com/help' })).toEqual({ action: 'deny' });
    expect(rec.openHandler!({ url: 'file:///etc/passwd' })).toEqual({ action: 'deny' });
    expect(opened).toEqual(['https://example.com/help']);
    let granted: boolean | null = null;
    rec.permission!(null, 'geolocation', (ok: boolean) => (granted = ok));
    expect(granted).toBe(false);
    expect(rec.check!()).toBe(false);
  });
});
