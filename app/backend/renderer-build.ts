/**
 * Builds what the desktop app and the browser mode load: the renderer (vite.config.ts →
 * dist/renderer) and the sandboxed preload as one CommonJS file (dist/electron/preload.cjs; a
 * sandboxed preload cannot load other files, so the contract is bundled into it).
 *
 *   node app/main/build.mjs            (npm run build)
 */
import { existsSync } from 'node:fs';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import { build } from 'vite';

export function rendererIsBuilt(root: string): boolean {
  return existsSync(path.join(root, 'dist', 'renderer', 'index.html'));
}

export async function buildRenderer(root: string): Promise<void> {
  await build({ configFile: path.join(root, 'vite.config.ts'), logLevel: 'warn' });
}

/** The preload bundle, by esbuild (app/bundle.mjs, loaded from `root` so it is never bundled itself). */
export async function buildPreload(root: string): Promise<void> {
  const bundler = (await import(pathToFileURL(path.join(root, 'app', 'bundle.mjs')).href)) as typeof import('../bundle.mjs');
  await bundler.bundlePreload(root);
}
