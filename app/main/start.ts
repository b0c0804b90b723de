/**
 * `npm start`: opens the desktop app when the Electron runtime is installed, and the browser mode
 * when it is not. The steps, each with a plain message when it cannot be done:
 *
 *   1. Electron runtime: node_modules/electron's binary (npm downloads it on an ordinary machine;
 *      `npm start -- --install-electron` runs that download explicitly).
 *   2. better-sqlite3 for Electron: kept in dist/native/… (see native.ts), fetched or compiled once,
 *      verified to be built for Electron's ABI; the Node build used by the CLI stays as it is.
 *   3. The renderer (vite build → dist/renderer) and the preload bundle (dist/electron/preload.cjs).
 *   4. Launch Electron on app/main/entry.mjs.
 *
 * Flags: --browser (skip Electron), --install-electron (download the runtime first),
 *        --rebuild-native (rebuild the Electron build of better-sqlite3). Other flags go to serve.
 */
import { spawn, spawnSync } from 'node:child_process';
import { existsSync, statSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { buildRenderer, buildPreload, rendererIsBuilt } from '../backend/renderer-build.ts';
import { buildElectronBinding, checkElectronBinding, electronBindingPath, electronInfo } from './native.ts';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../..');
const argv = process.argv.slice(2);
const has = (flag: string) => argv.includes(flag);
const rest = argv.filter((a) => !['--browser', '--install-electron', '--rebuild-native'].includes(a));

function say(message: string) {
  console.log(message);
}

async function browserMode(reason: string | null): Promise<never> {
  if (reason) say(reason);
  if (!rendererIsBuilt(root)) {
    say('Building the user interface (one moment)…');
    await buildRenderer(root);
  }
  const child = spawn(process.execPath, [path.join(root, 'app', 'server', 'serve.mjs'), ...rest], { stdio: 'inherit' });
  const forward = (sig: NodeJS.Signals) => child.kill(sig);
  process.on('SIGINT', forward);
  process.on('SIGTERM', forward);
  return new Promise<never>(() => child.on('exit', (code) => process.exit(code ?? 0)));
}

async function main() {
  if (has('--browser')) await browserMode(null);

  let electron = electronInfo(root);
  if (!electron) {
    await browserMode('The Electron package is not installed (run `npm install`), so Heatlag opens in browser mode instead.');
    return;
  }
  if (!electron.executable && has('--install-electron')) {
    say(`Downloading the Electron ${electron.version} runtime…`);
    const r = spawnSync(process.execPath, [path.join(root, 'node_modules', 'electron', 'install.js')], { encoding: 'utf8', timeout: 10 * 60_000 });
    electron = electronInfo(root)!;
    if (r.status !== 0 || !electron.executable) {
      const why = `${r.stderr ?? ''}${r.error ? String(r.error) : ''}`.split('\n').find((l) => l.trim()) ?? 'no reason given';
      await browserMode(`The Electron runtime could not be downloaded (${why.trim().slice(0, 160)}), so Heatlag opens in browser mode instead.`);
      return;
    }
  }
  if (!electron.executable) {
    await browserMode(
      'The Electron runtime is not installed, so Heatlag opens in browser mode instead (run `npm start -- --install-electron` with internet access to get the desktop app).',
    );
    return;
  }

  const binding = electronBindingPath(root, electron.version);
  let check = existsSync(binding) && !has('--rebuild-native') ? checkElectronBinding(binding, electron.abi) : { ok: false as const, reason: 'not built yet' };
  if (!check.ok) {
    say(`Preparing the database module for Electron ${electron.version} (a one-time step; needs internet access)…`);
    const built = buildElectronBinding(root, electron, say);
    if (!built.ok) {
      await browserMode(
        `The database module could not be built for Electron ${electron.version} (${built.reason}), so Heatlag opens in browser mode instead; the command line is unaffected.`,
      );
      return;
    }
    check = { ok: true };
  }

  if (!rendererIsBuilt(root) || has('--rebuild')) {
    say('Building the user interface…');
    await buildRenderer(root);
  }
  const preload = path.join(root, 'dist', 'electron', 'preload.cjs');
  const preloadSource = path.join(root, 'app', 'preload', 'preload.ts');
  if (!existsSync(preload) || statSync(preload).mtimeMs < statSync(preloadSource).mtimeMs) await buildPreload(root);

  const child = spawn(electron.executable, [path.join(root, 'app', 'main', 'entry.mjs')], {
    stdio: 'inherit',
    env: { ...process.env, HEATLAG_NATIVE_BINDING: binding, ELECTRON_RUN_AS_NODE: undefined },
  });
  child.on('exit', (code) => process.exit(code ?? 0));
}

await main();
