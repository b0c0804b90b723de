/**
 * `heatlag report` without a browser and with bad options: a clear sentence and the documented exit
 * status (1 usage, 2 bad input or no Chromium). The PDF itself is made and read back in the
 * end-to-end test (tests/e2e/report.spec.ts), where Chromium runs anyway.
 */
import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { findChromium, NO_CHROMIUM } from '../../app/cli/print-pdf.ts';
import { CliError } from '../../app/cli/common.ts';

const BIN = path.resolve('app/cli/heatlag.mjs');
let dir = '';

function heatlag(env: Record<string, string>, ...args: string[]) {
  const r = spawnSync(process.execPath, [BIN, ...args], { encoding: 'utf8', cwd: dir, env: { ...process.env, ...env } });
  return { code: r.status ?? -1, stdout: r.stdout, stderr: r.stderr };
}

beforeAll(() => {
  dir = fs.mkdtempSync(path.join(os.tmpdir(), 'heatlag-cli-report-'));
});
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

describe('heatlag report', () => {
  it('exits 2 with one sentence on how to install Chromium when it cannot be found', () => {
    // A database and zone that exist, so the inputs pass and the missing browser is what is reported.
    const imp = heatlag({}, 'import', path.resolve('assets/demo/great-hall.csv'), '--db', 'x.db', '--site', 'A', '--zone', 'B');
    expect(imp.code, imp.stderr).toBe(0);
    const r = heatlag({ CHROMIUM: path.join(dir, 'no-such-browser') }, 'report', '--db', 'x.db', '--zone', 'A/B', '--out', 'r.pdf');
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('apt-get install chromium');
    expect(r.stderr).toContain('CHROMIUM');
    expect(r.stderr.trim().split('\n')).toHaveLength(1);
    expect(fs.existsSync(path.join(dir, 'r.pdf'))).toBe(false);
  });

  it('finds no Chromium on a platform with none of the usual places', () => {
    expect(() => findChromium({}, 'plan9')).toThrow(CliError);
    expect(() => findChromium({}, 'plan9')).toThrow(NO_CHROMIUM);
  });

  it('refuses a paper size, a half-given recovery and an --out that is not a PDF (exit 1)', () => {
    const paper = heatlag({}, 'report', '--db', 'x.db', '--zone', 'A/B', '--out', 'r.pdf', '--paper', 'legal');
    expect(paper.code).toBe(1);
    expect(paper.stderr).toContain('--paper must be letter or a4');
    const half = heatlag({}, 'report', '--db', 'x.db', '--zone', 'A/B', '--out', 'r.pdf', '--from', '60');
    expect(half.code).toBe(1);
    expect(half.stderr).toContain('--from, --to and --outdoor');
    const out = heatlag({}, 'report', '--db', 'x.db', '--zone', 'A/B', '--out', 'r.txt');
    expect(out.code).toBe(1);
  });

  it('names a database file that does not exist (exit 2) and creates none', () => {
    const r = heatlag({}, 'report', '--db', 'missing.db', '--zone', 'A/B', '--out', 'r.pdf');
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('missing.db: no such database file.');
    expect(fs.existsSync(path.join(dir, 'missing.db'))).toBe(false);
  });
});
