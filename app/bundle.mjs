#!/usr/bin/env node
/**
 * The built programs: the command line, the browser-mode server, the Electron main process and the
 * sandboxed preload, bundled by esbuild from the TypeScript sources into dist/ (source maps beside
 * them, so stack traces name the .ts files). Run by `npm install` (the root package's `prepare`
 * script) and by `npm run build`; `node app/bundle.mjs` on its own rebuilds them.
 *
 *   dist/cli/heatlag.js     app/cli/main.ts (one chunk per command, loaded when the command runs)
 *   dist/cli/fit-worker.js  app/cli/fit-worker.ts (the portfolio batch's worker thread; chunks shared)
 *   dist/server/main.js     app/server/main.ts
 *   dist/main/main.js       app/main/main.ts (Electron main, ES module)
 *   dist/electron/preload.cjs  app/preload/preload.ts (CommonJS: a sandboxed preload loads one file)
 *
 * Pure-JavaScript npm packages are bundled in; better-sqlite3 (native), playwright-core, electron and the
 * build tools stay in node_modules (EXTERNAL). A changed package is bundled again by the next
 * `npm install` (its prepare step) or `npm run build`. Every output folder
 * is two levels below the project, like the sources' app/<shell>/ folders, and `import.meta.url` in a
 * source is rewritten to that source's own URL, so paths worked out from it (the project root, the
 * migrations folder, the worker entry) mean the same in the bundle as in the sources.
 *
 * Each bundle writes manifest.json: its input files with their modification times. The launchers
 * (app/launch.mjs) use a bundle only while every input still has that time, and fall back to the
 * TypeScript sources through tsx otherwise, so an edited source just works.
 */
import { mkdirSync, readFileSync, rmSync, statSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';

const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');

/** The bundles: output folder (under dist/) → entry points (output name → source). */
export const BUNDLES = {
  cli: { entries: { heatlag: 'app/cli/main.ts', 'fit-worker': 'app/cli/fit-worker.ts' }, splitting: true },
  server: { entries: { main: 'app/server/main.ts' }, splitting: false },
  main: { entries: { main: 'app/main/main.ts' }, splitting: false },
};

/** Packages left outside the bundles (imported from node_modules when they run). */
const EXTERNAL = ['better-sqlite3', 'playwright-core', 'electron', 'vite', 'esbuild', 'tsx', 'tsx/*', 'svelte', 'svelte/*', '@sveltejs/*', 'fsevents'];

/** esbuild plugin: `import.meta.url` of a source becomes that source's URL, relative to the output. */
function sourceUrlPlugin(outdir) {
  return {
    name: 'source-import-meta-url',
    setup(build) {
      build.onLoad({ filter: /\.(ts|mts|mjs)$/ }, (args) => {
        if (args.path.includes(`${path.sep}node_modules${path.sep}`)) return undefined;
        const text = readFileSync(args.path, 'utf8');
        if (!text.includes('import.meta.url')) return undefined;
        const rel = path.relative(outdir, args.path).split(path.sep).join('/');
        const contents = text.replaceAll('import.meta.url', `new URL(${JSON.stringify(rel)}, import.meta.url).href`);
        return { contents, loader: args.path.endsWith('.ts') || args.path.endsWith('.mts') ? 'ts' : 'js' };
      });
    },
  };
}

function writeManifest(outdir, metafile) {
  const inputs = {};
  for (const input of Object.keys(metafile.inputs)) {
    if (input.includes('node_modules/') || input.startsWith('<')) continue;
    inputs[input] = statSync(path.join(ROOT, input)).mtimeMs;
  }
  writeFileSync(path.join(outdir, 'manifest.json'), `${JSON.stringify({ builtAt: Date.now(), inputs }, null, 1)}\n`);
}

/** Bundles one of BUNDLES into dist/<name>/. */
export async function bundle(name, root = ROOT) {
  const { build } = await import('esbuild');
  const spec = BUNDLES[name];
  const outdir = path.join(root, 'dist', name);
  // A fresh folder: chunks of an earlier build never linger (the manifest goes first, so a program
  // started meanwhile runs from the sources).
  rmSync(outdir, { recursive: true, force: true });
  mkdirSync(outdir, { recursive: true });
  const result = await build({
    absWorkingDir: root,
    entryPoints: Object.fromEntries(Object.entries(spec.entries).map(([out, src]) => [out, path.join(root, src)])),
    outdir,
    bundle: true,
    splitting: spec.splitting,
    format: 'esm',
    platform: 'node',
    target: 'node20',
    // Pure-JavaScript packages are bundled in (one file instead of hundreds: @stdlib's t quantile alone
    // is some 300 small CommonJS files); native, very large or build-time packages stay in node_modules.
    external: EXTERNAL,
    // ES module builds first (jsonc-parser's "main" is a UMD file that requires its parts by path).
    mainFields: ['module', 'main'],
    // CommonJS packages inside an ES module bundle get a real `require` for Node's built-ins.
    banner: { js: "import { createRequire as __heatlagCreateRequire } from 'node:module'; const require = __heatlagCreateRequire(import.meta.url);" },
    sourcemap: true,
    sourcesContent: false,
    metafile: true,
    logLevel: 'warning',
    chunkNames: '[name]-[hash]',
    plugins: [sourceUrlPlugin(outdir)],
  });
  writeManifest(outdir, result.metafile);
}

/** The preload as one CommonJS file (a sandboxed preload cannot load other files). */
export async function bundlePreload(root = ROOT) {
  const { build } = await import('esbuild');
  await build({
    absWorkingDir: root,
    entryPoints: [path.join(root, 'app', 'preload', 'preload.ts')],
    outfile: path.join(root, 'dist', 'electron', 'preload.cjs'),
    bundle: true,
    format: 'cjs',
    platform: 'node',
    target: 'node20',
    external: ['electron'],
    sourcemap: true,
    sourcesContent: false,
    logLevel: 'warning',
  });
}

/** Every bundle (what `npm install` and `npm run build` run). */
export async function bundleAll(root = ROOT) {
  for (const name of Object.keys(BUNDLES)) await bundle(name, root);
  await bundlePreload(root);
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) {
  const t0 = performance.now();
  try {
    await bundleAll();
    console.log(`Bundled dist/cli, dist/server, dist/main and dist/electron/preload.cjs in ${Math.round(performance.now() - t0)} ms.`);
  } catch (err) {
    // Never fail `npm install` over the bundles: the launchers fall back to the sources through tsx.
    console.error(`heatlag: the bundles could not be built (${err instanceof Error ? err.message.split('\n')[0] : err}); the commands run from the TypeScript sources instead.`);
    if (process.env.HEATLAG_BUNDLE_STRICT) process.exitCode = 1;
  }
}
