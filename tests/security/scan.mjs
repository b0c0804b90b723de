#!/usr/bin/env node
/**
 * `npm run security`: the Electron security scan of the desktop app, with Doyensec's Electronegativity
 * (static checks of the Electron security recommendations: context isolation, sandbox, node
 * integration, navigation limits, permission handlers, CSP, openExternal, preload …).
 *
 *   node tests/security/scan.mjs [--root DIR] [--json]
 *
 * Scans the desktop app as one application: app/main, app/preload, the API contract the preload
 * imports (app/api), the renderer's index.html (its CSP) and package.json (the Electron version).
 * Exit 0 when no finding is of HIGH severity, 1 when one is (each is listed), 2 when the scan itself
 * could not run (a file the scanner cannot parse counts: a check that cannot see a file cannot pass it).
 *
 * Two adjustments keep it offline and on our files, both through the scanner's own modules:
 * - its command-line entry is not used: it expects the `commander` of its day (undeclared, so Node finds
 *   the project's newer one and the entry fails); its documented programmatic entry (the package's
 *   main, runner.js) is called instead;
 * - it downloads translations and, for one check (AVAILABLE_SECURITY_FIXES_GLOBAL_CHECK), the list of
 *   Electron releases with `got`: `got` is answered with a refusal, so it uses its bundled English texts,
 *   and that one check, which needs the network and compares against the newest Electron release, is
 *   left out (Electron is pinned on purpose; DEVELOPERS.md says how it is upgraded).
 */
import { createRequire } from 'node:module';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

const here = path.dirname(fileURLToPath(import.meta.url));
const args = process.argv.slice(2);
const rootArg = args.indexOf('--root');
const project = path.resolve(here, '..', '..');
const root = path.resolve(rootArg >= 0 ? args[rootArg + 1] : project);
const json = args.includes('--json');

/** The desktop app's files, relative to the root (directories end with '/'). */
const SCOPE = ['app/main/', 'app/preload/', 'app/api/', 'app/renderer/index.html', 'package.json'];
const OFFLINE_ONLY_EXCLUDED = ['AvailableSecurityFixesGlobalCheck'];

/** Findings of lower severity that were reviewed, and why they are acceptable (printed beside them). */
const REVIEWED = {
  OPEN_EXTERNAL_JS_CHECK: 'only https:// links from the window-open handler reach shell.openExternal (app/main/window.ts)',
  PRELOAD_JS_CHECK: 'the preload exposes one frozen object of contract calls through contextBridge, never ipcRenderer',
  AUXCLICK_JS_CHECK: 'middle-click cannot open anything: every new window is denied by setWindowOpenHandler',
  CSP_GLOBAL_CHECK: "the CSP evaluator's only note is script-src 'self' (risky where a site hosts JSONP or user uploads); the app serves only its own built files, uploads never become URLs",
};

const require = createRequire(import.meta.url);
let base;
try {
  base = path.dirname(require.resolve('@doyensec/electronegativity/package.json', { paths: [root, here] }));
} catch {
  console.error('security scan: @doyensec/electronegativity is not installed (npm install).');
  process.exit(2);
}
const fromScanner = createRequire(path.join(base, 'package.json'));

// Offline: the scanner's HTTP client refuses at once.
const gotPath = fromScanner.resolve('got');
const refuse = () => Promise.reject(new Error('no network in the security scan'));
fromScanner.cache[gotPath] = { id: gotPath, filename: gotPath, loaded: true, exports: Object.assign(refuse, { default: refuse }) };

// Only the desktop app's files.
const util = fromScanner('./dist/util');
const listAll = util.list_files;
const inScope = (file) => {
  const rel = path.relative(root, file).split(path.sep).join('/');
  return SCOPE.some((s) => (s.endsWith('/') ? rel.startsWith(s) : rel === s));
};
util.list_files = async (dir) => ((await listAll(dir)) ?? []).filter(inScope);

const runner = fromScanner('./dist/runner.js');
const run = runner.default ?? runner;
const quietLog = console.log;
console.log = () => {}; // the scanner's own notices ("could not retrieve translations")
let result;
try {
  result = await run(
    { input: root, customScan: [], excludeFromScan: OFFLINE_ONLY_EXCLUDED.map((c) => c.toLowerCase()), isRelative: true, isVerbose: true, parserPlugins: [] },
    false,
  );
} catch (err) {
  console.log = quietLog;
  console.error(`security scan: the scanner failed: ${err.message}`);
  process.exit(2);
}
console.log = quietLog;

const scanned = (await listAll(root) ?? []).filter(inScope).map((f) => path.relative(root, f));
const issues = result.issues.map((i) => ({
  id: i.id,
  severity: i.severity.name,
  confidence: i.confidence.name,
  file: i.file === 'N/A' ? 'N/A' : path.relative(root, i.file),
  line: i.location?.line ?? 0,
  description: i.description,
  reviewed: root === project ? (REVIEWED[i.id] ?? null) : null, // the notes are about this project's code
}));
const high = issues.filter((i) => i.severity === 'HIGH');
const broken = result.errors.filter((e) => !e.tolerable);

if (json) {
  console.log(JSON.stringify({ files: scanned, checks: result.globalChecks + result.atomicChecks, high: high.length, issues, errors: result.errors }, null, 2));
} else {
  console.log(`Electronegativity: ${result.globalChecks + result.atomicChecks} checks on ${scanned.length} files of the desktop app (${SCOPE.join(', ')})`);
  for (const i of issues) {
    console.log(`  ${i.severity.padEnd(6)} ${i.confidence.padEnd(9)} ${i.id}  ${i.file}${i.line ? `:${i.line}` : ''}`);
    console.log(`         ${i.description}${i.reviewed ? `\n         reviewed: ${i.reviewed}` : ''}`);
  }
  for (const e of result.errors) console.log(`  ${e.tolerable ? 'warning' : 'ERROR'}  ${path.relative(root, e.file)}: ${e.message}`);
  console.log(`${high.length} high-severity finding${high.length === 1 ? '' : 's'}, ${issues.length - high.length} other${broken.length ? `, ${broken.length} file(s) the scanner could not read` : ''}.`);
}
if (scanned.length === 0 || broken.length > 0) process.exit(2);
process.exit(high.length > 0 ? 1 : 0);
