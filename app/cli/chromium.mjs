/**
 * Where Chromium is looked for, in one place: `heatlag report` (print-pdf.ts), the browser tests'
 * configuration (playwright.config.ts) and the test command's preflight (tests/preflight.mjs).
 * $CHROMIUM when set, else the usual places of the platform. Plain JavaScript, so the preflight runs
 * before anything is compiled.
 */
import { existsSync } from 'node:fs';

/** Where Chromium or Chrome usually lives, by platform. */
export const CHROMIUM_CANDIDATES = {
  linux: ['/usr/bin/chromium', '/usr/bin/chromium-browser', '/usr/bin/google-chrome', '/usr/bin/google-chrome-stable', '/snap/bin/chromium'],
  darwin: ['/Applications/Chromium.app/Contents/MacOS/Chromium', '/Applications/Google Chrome.app/Contents/MacOS/Google Chrome'],
  win32: [
    'C:\\Program Files\\Google\\Chrome\\Application\\chrome.exe',
    'C:\\Program Files (x86)\\Google\\Chrome\\Application\\chrome.exe',
    'C:\\Program Files (x86)\\Microsoft\\Edge\\Application\\msedge.exe',
  ],
};

/**
 * The Chromium to use: { path } when found, else { missing } with why (a $CHROMIUM that names no
 * file, or none of the usual places).
 */
export function locateChromium(env = process.env, platform = process.platform) {
  const given = env.CHROMIUM?.trim();
  if (given) return existsSync(given) ? { path: given } : { missing: `CHROMIUM is set to ${given}, but there is no such file.` };
  const found = (CHROMIUM_CANDIDATES[platform] ?? []).find((p) => existsSync(p));
  return found ? { path: found } : { missing: `Chromium was not found in ${(CHROMIUM_CANDIDATES[platform] ?? []).join(', ') || 'the usual places'}.` };
}
