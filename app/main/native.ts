/**
 * The Electron build of better-sqlite3, kept apart from the Node build.
 *
 * The command line and the tests run under Node and load node_modules/better-sqlite3 as installed.
 * The desktop app runs under Electron, whose V8 has its own module ABI (NODE_MODULE_VERSION), so it
 * needs the same addon compiled against Electron's headers. That build lives in its own folder,
 * dist/native/electron-<version>-<platform>-<arch>/better_sqlite3.node, and main passes it to
 * better-sqlite3 through its `nativeBinding` option; the Node build is never touched, so starting
 * the desktop app cannot break the command line.
 *
 * A rebuild that cannot reach Electron's headers may quietly compile for the running Node instead
 * and still report success; checkElectronBinding catches that by loading the file in Node: a module
 * built for Electron must be refused by Node with Electron's NODE_MODULE_VERSION in the message.
 */
import { spawnSync } from 'node:child_process';
import { copyFileSync, cpSync, existsSync, mkdirSync, readFileSync, rmSync } from 'node:fs';
import { createRequire } from 'node:module';
import path from 'node:path';

const require = createRequire(import.meta.url);

export interface ElectronInfo {
  version: string;
  /** Electron's NODE_MODULE_VERSION (node_modules/electron/abi_version). */
  abi: number;
  /** The Electron executable, or null when the runtime was not downloaded. */
  executable: string | null;
}

/** What npm installed of Electron: its version, ABI, and whether the runtime binary is there. */
export function electronInfo(root: string): ElectronInfo | null {
  const dir = path.join(root, 'node_modules', 'electron');
  if (!existsSync(path.join(dir, 'package.json'))) return null;
  const version = (JSON.parse(readFileSync(path.join(dir, 'package.json'), 'utf8')) as { version: string }).version;
  const abiFile = path.join(dir, 'abi_version');
  const abi = existsSync(abiFile) ? Number(readFileSync(abiFile, 'utf8').trim()) : NaN;
  let executable: string | null = null;
  const pathFile = path.join(dir, 'path.txt');
  if (existsSync(pathFile)) {
    const exe = path.join(dir, 'dist', readFileSync(pathFile, 'utf8').trim());
    if (existsSync(exe)) executable = exe;
  }
  return { version, abi, executable };
}

/** Where the Electron build of better-sqlite3 is kept for this Electron version and machine. */
export function electronBindingPath(root: string, version: string, platform = process.platform, arch = process.arch): string {
  return path.join(root, 'dist', 'native', `electron-${version}-${platform}-${arch}`, 'better_sqlite3.node');
}

export type BindingCheck = { ok: true } | { ok: false; reason: string };

/**
 * Checks that `file` is a better-sqlite3 addon built for Electron's ABI `abi`, by loading it in a
 * separate Node process (so nothing stays loaded here).
 */
export function checkElectronBinding(file: string, abi: number, nodeExecutable = process.execPath): BindingCheck {
  if (!existsSync(file)) return { ok: false, reason: `${file} does not exist.` };
  const probe = spawnSync(nodeExecutable, ['-e', 'process.dlopen({ exports: {} }, process.argv[1]); console.log(process.versions.modules)', file], {
    encoding: 'utf8',
    timeout: 30_000,
  });
  if (probe.status === 0) {
    return {
      ok: false,
      reason: `${path.basename(file)} loads in Node ${process.versions.node} (NODE_MODULE_VERSION ${probe.stdout.trim()}), so it was built for Node, not for Electron (NODE_MODULE_VERSION ${abi}).`,
    };
  }
  const text = `${probe.stderr}\n${probe.stdout}`;
  const m = /compiled against a different Node\.js version using\s+NODE_MODULE_VERSION (\d+)/.exec(text);
  if (m && Number(m[1]) === abi) return { ok: true };
  if (m) return { ok: false, reason: `${path.basename(file)} was built for NODE_MODULE_VERSION ${m[1]}, but this Electron needs ${abi}.` };
  const first = text.split('\n').find((l) => /Error/.test(l)) ?? text.trim().split('\n')[0] ?? 'unknown error';
  return { ok: false, reason: `${path.basename(file)} is not a loadable native module: ${first.trim()}` };
}

export type BuildOutcome = { ok: true; file: string } | { ok: false; reason: string };

function run(cmd: string, args: string[], cwd: string, env: NodeJS.ProcessEnv): { ok: boolean; output: string } {
  const r = spawnSync(cmd, args, { cwd, env, encoding: 'utf8', timeout: 15 * 60_000 });
  return { ok: r.status === 0, output: `${r.stdout ?? ''}${r.stderr ?? ''}${r.error ? String(r.error) : ''}` };
}

/**
 * Fetches or builds better-sqlite3 for Electron into its own folder: first a prebuilt binary
 * (prebuild-install --runtime electron), then a compile against Electron's headers (node-gyp
 * --runtime=electron). Both need the internet. The result is verified with checkElectronBinding
 * before it is kept; a build for the wrong runtime is refused.
 */
export function buildElectronBinding(root: string, electron: ElectronInfo, log: (m: string) => void = () => {}): BuildOutcome {
  const target = electronBindingPath(root, electron.version);
  const work = path.join(root, 'dist', 'native', 'work');
  rmSync(work, { recursive: true, force: true });
  mkdirSync(work, { recursive: true });
  const src = path.join(root, 'node_modules', 'better-sqlite3');
  const copy = path.join(work, 'better-sqlite3');
  cpSync(src, copy, { recursive: true, filter: (p) => !p.includes(`${path.sep}build${path.sep}`) && !p.endsWith(`${path.sep}build`) });
  const env = { ...process.env, npm_config_runtime: 'electron', npm_config_target: electron.version, npm_config_disturl: 'https://electronjs.org/headers' };
  const built = path.join(copy, 'build', 'Release', 'better_sqlite3.node');
  const attempts: string[] = [];

  const prebuild = require.resolve('prebuild-install/bin.js', { paths: [src, root] });
  log(`Fetching a prebuilt better-sqlite3 for Electron ${electron.version}…`);
  const a = run(process.execPath, [prebuild, '--runtime', 'electron', '--target', electron.version, '--arch', process.arch], copy, env);
  if (!a.ok) attempts.push(`prebuilt download failed: ${lastLine(a.output)}`);
  if (!a.ok || !existsSync(built)) {
    const gyp = require.resolve('node-gyp/bin/node-gyp.js', { paths: [root] });
    log(`Compiling better-sqlite3 against Electron ${electron.version}'s headers…`);
    const b = run(process.execPath, [gyp, 'rebuild', '--release', `--target=${electron.version}`, '--runtime=electron', '--dist-url=https://electronjs.org/headers', `--arch=${process.arch}`], copy, env);
    if (!b.ok) attempts.push(`compile failed: ${lastLine(b.output)}`);
  }
  try {
    if (!existsSync(built)) {
      return { ok: false, reason: attempts.join('; ') || 'no module was produced.' };
    }
    const check = checkElectronBinding(built, electron.abi);
    if (!check.ok) return { ok: false, reason: `the build was refused: ${check.reason}` };
    mkdirSync(path.dirname(target), { recursive: true });
    copyFileSync(built, target);
    return { ok: true, file: target };
  } finally {
    rmSync(work, { recursive: true, force: true });
  }
}

function lastLine(text: string): string {
  const lines = text.trim().split('\n').filter((l) => l.trim() && !/^gyp info/.test(l));
  return (lines[lines.length - 1] ?? 'no output').trim().slice(0, 300);
}
