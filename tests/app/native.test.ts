/**
 * The desktop app's Electron build of better-sqlite3 is verified before it is used: the Node build
 * (the one the CLI and the tests load) must be refused as "built for Node", so a rebuild that quietly
 * compiled for Node instead of Electron is caught.
 */
import { createRequire } from 'node:module';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { checkElectronBinding, electronBindingPath, electronInfo } from '../../app/main/native.ts';

const root = path.resolve(import.meta.dirname, '../..');
const require = createRequire(import.meta.url);

describe('Electron build of better-sqlite3', () => {
  it('knows the installed Electron version and its module ABI', () => {
    const info = electronInfo(root);
    expect(info?.version).toBe('41.7.1');
    expect(info?.abi).toBeGreaterThan(Number(process.versions.modules));
  });

  it('keeps the Electron build in its own folder, apart from node_modules', () => {
    const file = electronBindingPath(root, '41.7.1', 'linux', 'x64');
    expect(file).toBe(path.join(root, 'dist', 'native', 'electron-41.7.1-linux-x64', 'better_sqlite3.node'));
  });

  it('refuses the Node build of better-sqlite3 as built for Node', () => {
    const nodeBuild = path.join(path.dirname(require.resolve('better-sqlite3/package.json')), 'build', 'Release', 'better_sqlite3.node');
    const check = checkElectronBinding(nodeBuild, 145);
    expect(check.ok).toBe(false);
    if (!check.ok) expect(check.reason).toMatch(/built for Node, not for Electron \(NODE_MODULE_VERSION 145\)/);
  });

  it('refuses a missing file and a file that is not a native module', () => {
    expect(checkElectronBinding(path.join(root, 'no-such.node'), 145).ok).toBe(false);
    const notModule = checkElectronBinding(path.join(root, 'package.json'), 145);
    expect(notModule.ok).toBe(false);
  });
});
