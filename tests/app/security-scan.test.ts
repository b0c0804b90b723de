/**
 * The Electron security scan (tests/security/scan.mjs, Electronegativity): the desktop app has no
 * high-severity finding, and the scan does fail on an app that breaks the Electron security
 * recommendations (context isolation and the sandbox off, no navigation limits).
 */
import { execFile } from 'node:child_process';
import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';

const root = path.resolve(import.meta.dirname, '../..');
const SCAN = path.join(root, 'tests', 'security', 'scan.mjs');
const dirs: string[] = [];
afterAll(() => dirs.forEach((d) => rmSync(d, { recursive: true, force: true })));

interface Report {
  files: string[];
  high: number;
  issues: { id: string; severity: string; file: string }[];
}

function scan(...args: string[]): Promise<{ code: number; report: Report }> {
  return new Promise((resolve, reject) => {
    execFile(process.execPath, [SCAN, '--json', ...args], { cwd: root, maxBuffer: 8 * 1024 * 1024 }, (err, stdout, stderr) => {
      const code = err ? Number((err as { code?: unknown }).code) : 0;
      try {
        resolve({ code, report: JSON.parse(stdout) as Report });
      } catch {
        reject(new Error(`the scan printed no report (exit ${code}): ${stderr}`));
      }
    });
  });
}

describe('Electron security scan', () => {
  it('finds nothing of high severity in the desktop app (app/main, app/preload)', async () => {
    const { code, report } = await scan();
    expect(report.files).toEqual(expect.arrayContaining(['app/main/window.ts', 'app/main/main.ts', 'app/preload/preload.ts', 'app/renderer/index.html', 'package.json']));
    expect(report.issues.filter((i) => i.severity === 'HIGH')).toEqual([]);
    expect(code).toBe(0);
  }, 60_000);

  it('fails on a window that turns the recommendations off', async () => {
    const d = mkdtempSync(path.join(tmpdir(), 'heatlag-insecure-'));
    dirs.push(d);
    mkdirSync(path.join(d, 'app', 'main'), { recursive: true });
    mkdirSync(path.join(d, 'app', 'preload'), { recursive: true });
    writeFileSync(path.join(d, 'package.json'), JSON.stringify({ name: 'insecure', devDependencies: { electron: '41.7.1' } }));
    writeFileSync(
      path.join(d, 'app', 'main', 'window.ts'),
      "import { BrowserWindow } from 'electron';\n" +
        "export const win = new BrowserWindow({ webPreferences: { nodeIntegration: true, contextIsolation: false, sandbox: false, webSecurity: false } });\n" +
        "void win.loadURL('http://example.com/');\n",
    );
    writeFileSync(path.join(d, 'app', 'preload', 'preload.ts'), "import { ipcRenderer } from 'electron';\n(window as any).ipc = ipcRenderer;\n");
    const { code, report } = await scan('--root', d);
    expect(code).toBe(1);
    const high = report.issues.filter((i) => i.severity === 'HIGH').map((i) => i.id);
    expect(high).toEqual(expect.arrayContaining(['CONTEXT_ISOLATION_JS_CHECK', 'LIMIT_NAVIGATION_GLOBAL_CHECK']));
    expect(report.high).toBe(high.length);
  }, 60_000);
});
