/**
 * Starts a program of the project from its bundle in dist/ (app/bundle.mjs) when the bundle is up to
 * date, else from its TypeScript sources through tsx, so an edited source just works without a build.
 *
 * Up to date: the bundle's manifest.json lists every source it was built from with its modification
 * time, and each still has that time (one stat per source, about a millisecond in all).
 * HEATLAG_FROM_SOURCE=1 always runs the sources.
 */
import { readFileSync, statSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';

const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');

/** True when dist/<name>/ holds a bundle built from the sources as they are now. */
export function bundleIsFresh(name, root = ROOT) {
  let manifest;
  try {
    manifest = JSON.parse(readFileSync(path.join(root, 'dist', name, 'manifest.json'), 'utf8'));
  } catch {
    return false;
  }
  const inputs = Object.entries(manifest.inputs ?? {});
  if (inputs.length === 0) return false;
  for (const [file, mtimeMs] of inputs) {
    try {
      if (statSync(path.join(root, file)).mtimeMs !== mtimeMs) return false;
    } catch {
      return false;
    }
  }
  return true;
}

/**
 * Imports dist/<name>/<entry>.js when fresh, else `source` (a path from the project root) through tsx.
 * Source maps are switched on either way, so a stack trace names the .ts file and line.
 */
export async function launch(name, entry, source) {
  process.setSourceMapsEnabled(true);
  if (!process.env.HEATLAG_FROM_SOURCE && bundleIsFresh(name)) {
    return import(pathToFileURL(path.join(ROOT, 'dist', name, `${entry}.js`)).href);
  }
  const { register } = await import('tsx/esm/api');
  register();
  return import(pathToFileURL(path.join(ROOT, source)).href);
}
