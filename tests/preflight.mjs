#!/usr/bin/env node
/**
 * The first step of `npm test`: checks for what the tests need from outside npm, and when something
 * is missing stops (exit 1) with one message naming each missing tool and the command that installs it.
 *
 *   Chromium      the browser tests and `heatlag report` ($CHROMIUM, else the usual places: app/cli/chromium.mjs)
 *   pdftoppm, pdftotext   the report tests read the PDF back (poppler-utils)
 *   sqlite3       the sqlite3 shell, the benchmarks' native import baseline
 *
 * Tools are looked for on $PATH (and Chromium as above), so a test can hide them with PATH and CHROMIUM.
 */
import { accessSync, constants } from 'node:fs';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import { locateChromium } from '../app/cli/chromium.mjs';

/** The tools on PATH: name → the Debian/Ubuntu package that has it. */
export const TOOLS = [
  { name: 'pdftoppm', pkg: 'poppler-utils', why: 'the report tests render PDF pages' },
  { name: 'pdftotext', pkg: 'poppler-utils', why: 'the report tests read PDF text' },
  { name: 'sqlite3', pkg: 'sqlite3', why: 'the benchmarks\' native import baseline' },
];

function onPath(name, env) {
  const exts = process.platform === 'win32' ? (env.PATHEXT ?? '.EXE;.CMD').split(';') : [''];
  for (const dir of (env.PATH ?? '').split(path.delimiter)) {
    if (!dir) continue;
    for (const ext of exts) {
      try {
        accessSync(path.join(dir, name + ext), constants.X_OK);
        return true;
      } catch {
        // not here
      }
    }
  }
  return false;
}

/** What is missing: an empty list when everything is there. */
export function missingTools(env = process.env, platform = process.platform) {
  const missing = [];
  const chromium = locateChromium(env, platform);
  if (chromium.missing) missing.push({ name: 'Chromium', pkg: 'chromium', why: `the browser tests and heatlag report; ${chromium.missing}` });
  for (const t of TOOLS) if (!onPath(t.name, env)) missing.push(t);
  return missing;
}

/** The one message for a list of missing tools. */
export function preflightMessage(missing) {
  const pkgs = [...new Set(missing.map((m) => m.pkg))];
  return [
    `npm test needs ${missing.length === 1 ? 'a tool that is' : 'tools that are'} not installed:`,
    ...missing.map((m) => `  - ${m.name} (${m.why})`),
    `Install ${pkgs.length === 1 ? 'it' : 'them'} on Debian or Ubuntu with: sudo apt-get install -y ${pkgs.join(' ')}`,
    '(All of them: sudo apt-get install -y chromium poppler-utils sqlite3.) Another Chromium or Chrome can be used by',
    'setting CHROMIUM to its path, e.g. CHROMIUM=/opt/chrome/chrome npm test.',
  ].join('\n');
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) {
  const missing = missingTools();
  if (missing.length > 0) {
    process.stderr.write(`${preflightMessage(missing)}\n`);
    process.exitCode = 1;
  }
}
