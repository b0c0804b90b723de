/**
 * `heatlag plan` as a user runs it: the real bin in a child process, on the invented demo site
 * (assets/demo, assets/plans). Checks the exit codes, that the text carries units and cautions, that
 * --json is consistent with itself, and that bad input is reported by file, line and column without
 * a stack trace.
 */
import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';

const ROOT = path.resolve(import.meta.dirname, '../..');
const BIN = path.join(ROOT, 'app/cli/heatlag.mjs');
let dir = '';

function heatlag(...args: string[]): { code: number; stdout: string; stderr: string; json: any } {
  return heatlagIn({}, ...args);
}

/** The same with extra environment variables (TZ: the time zone of "this computer"). */
function heatlagIn(env: Record<string, string>, ...args: string[]): { code: number; stdout: string; stderr: string; json: any } {
  const r = spawnSync(process.execPath, [BIN, ...args], { encoding: 'utf8', cwd: ROOT, env: { ...process.env, ...env } });
  let json: unknown = undefined;
  try {
    json = JSON.parse(r.stdout);
  } catch {
    /* not JSON */
  }
  return { code: r.status ?? -1, stdout: r.stdout, stderr: r.stderr, json };
}

const OFFICE = ['assets/demo/office-annex.csv', '--columns', 'assets/demo/office-annex.mapping.json', '--tz', 'Europe/Berlin'];

beforeAll(() => {
  dir = fs.mkdtempSync(path.join(os.tmpdir(), 'heatlag-plan-'));
  fs.writeFileSync(path.join(dir, 'broken.json'), '{\n  "name": "x",\n  "units": "C",\n  "days": { "everyday": [] }\n  "unoccupied": {}\n}\n');
  fs.writeFileSync(
    path.join(dir, 'badkey.json'),
    JSON.stringify({ name: 'x', units: 'C', days: { everyday: [{ from: '07:00', to: '17:00', heat: 'warm' }] }, unoccupied: { heat: 16 } }, null, 2),
  );
});

afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

describe('heatlag plan', () => {
  it('prints a readable plan with units and cautions (daily low and high)', () => {
    const r = heatlag('plan', ...OFFICE, '--schedule', 'assets/plans/office-annex.json', '--low', '-6', '--high', '3');
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    const out = r.stdout;
    expect(out).toMatch(/^Setback plan "Office Annex, nights and weekends at 15 °C"/);
    for (const day of ['Mon', 'Tue', 'Wed', 'Thu', 'Fri', 'Sat', 'Sun', 'Week']) expect(out).toMatch(new RegExp(`^  ${day}\\s+\\d+\\.\\d\\d h`, 'm'));
    expect(out).toMatch(/start \d\d:\d\d, lead/);
    expect(out).toMatch(/Envelope UA\s+\d+ W\/K \(\d+ Btu\/\(h·°F\)\)/);
    expect(out).toMatch(/Heat capacity C\s+[\d.]+ MJ\/K/);
    expect(out).toMatch(/Balance point: no heating needed above -?[\d.]+ °C/);
    expect(out).toMatch(/not a design\s+load calculation/);
    expect(out).toMatch(/Vulnerable\s+occupants/);
    expect(out).toMatch(/Commercial\s+spaces/);
    // Aligned table: the runtime columns start at the same place on every day row.
    const rows = out.split('\n').filter((l) => /^  (Mon|Tue|Wed|Thu|Fri|Sat|Sun|Week) /.test(l));
    const col = rows.map((l) => l.search(/\d+\.\d\d h/));
    expect(new Set(col).size).toBe(1);
  });

  it('--json is one object whose savings add up', () => {
    const r = heatlag('plan', ...OFFICE, '--schedule', 'assets/plans/office-annex.json', '--design-db', '-2C', '--daily-range', '8C', '--json');
    expect(r.code).toBe(0);
    const j = r.json;
    expect(j.zone).toBe('office-annex.csv');
    expect(j.valueUnits.temperature).toBe('°C');
    expect(j.days).toHaveLength(7);
    expect(j.outdoor.kind).toBe('design');
    expect(j.week.savedHeatHours).toBeCloseTo(j.week.baselineHeatHours - j.week.heatHours, 9);
    const daySum = j.days.reduce((s: number, d: any) => s + d.heatHours, 0);
    expect(daySum).toBeCloseTo(j.week.heatHours, 9);
    expect(j.recoveries.filter((x: any) => x.status === 'met')).toHaveLength(5); // Mon–Fri mornings
    expect(j.curve.hours.length).toBe(j.curve.indoorC.length);
    expect(j.cautions.some((c: any) => c.topic === 'estimate')).toBe(true);
  });

  it('uses the log\'s own week, and a stored zone of a database', () => {
    const db = path.join(dir, 'site.db');
    const imp = heatlag('import', 'assets/demo/office-annex.csv', '--columns', 'assets/demo/office-annex.mapping.json', '--tz', 'Europe/Berlin', '--db', db, '--zone', 'Kestelbrück Community House/Office Annex');
    expect(imp.code).toBe(0);
    const r = heatlag('plan', '--db', db, '--zone', 'Kestelbrück Community House/Office Annex', '--schedule', 'assets/plans/office-annex.json', '--week', '2025-03-17', '--tz', 'Europe/Berlin', '--json');
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    expect(r.json.outdoor.kind).toBe('history');
    expect(r.json.days[0].label).toBe('Mon 2025-03-17');
    const missing = heatlag('plan', '--db', db, '--zone', 'Kestelbrück Community House/Attic', '--schedule', 'assets/plans/office-annex.json');
    expect(missing.code).toBe(2);
    expect(missing.stderr).toMatch(/no zone/);
  });

  it('without --schedule, a zone of a database uses the schedule saved for it in the app', async () => {
    const db = path.join(dir, 'saved.db');
    const zone = 'Kestelbrück Community House/Office Annex';
    expect(heatlag('import', ...OFFICE, '--db', db, '--zone', zone).code).toBe(0);
    const args = ['plan', '--db', db, '--zone', zone, '--week', '2025-03-17', '--tz', 'Europe/Berlin', '--json'];
    const none = heatlag(...args);
    expect(none.code).toBe(2);
    expect(none.stderr).toMatch(/no schedule is saved for this zone; give one with --schedule/);
    // Save the schedule as the app does (the store's schedules table).
    const { openStore } = await import('../../db/index.ts');
    const store = openStore(db);
    try {
      const [site, name] = zone.split('/') as [string, string];
      store.saveSchedules([{ zoneId: store.findZone(site, name)!.id, schedule: JSON.parse(fs.readFileSync(path.join(ROOT, 'assets/plans/office-annex.json'), 'utf8')) }]);
    } finally {
      store.close();
    }
    const saved = heatlag(...args);
    const file = heatlag(...args, '--schedule', 'assets/plans/office-annex.json');
    expect(saved.stderr).toBe('');
    expect(saved.code).toBe(0);
    expect(saved.json.scheduleSaved).toBe(true);
    expect(file.json.scheduleSaved).toBe(false);
    expect(saved.json.days).toEqual(file.json.days);
    // A log file has no saved schedule: --schedule is needed (usage error).
    const bare = heatlag('plan', ...OFFICE);
    expect(bare.code).toBe(1);
    expect(bare.stderr).toMatch(/--schedule <file.json> is needed/);
  });

  it("a zone of a database is planned in its site's time zone, else its log's, else this computer's; zones shows which", async () => {
    const db = path.join(dir, 'tz.db');
    const computer = { TZ: 'Asia/Tokyo' };
    // The Great Hall's log has ISO-8601 offsets: it names no time zone of its own.
    expect(heatlag('import', 'assets/demo/great-hall.csv', '--db', db, '--zone', 'Front Range Office/Hall').code).toBe(0);
    const args = ['plan', '--db', db, '--zone', 'Front Range Office/Hall', '--schedule', 'assets/plans/great-hall.json', '--outdoor', 'history', '--week', '2025-03-17', '--json'];
    const zonesJson = () => heatlagIn(computer, 'zones', '--db', db, '--json').json as Array<{ name: string; timezone: string | null }>;
    expect(zonesJson()).toMatchObject([{ name: 'Hall', timezone: null }]);
    expect(heatlagIn(computer, 'zones', '--db', db).stdout).toMatch(/^ *Site\s+Zone\s+Readings\s+First\s+Last\s+Units\s+Time zone\n.*Hall\s.*\sthis computer's \(Asia\/Tokyo\)$/m);
    const before = heatlagIn(computer, ...args);
    expect(before.stderr).toBe('');
    expect(before.json.outdoor).toMatchObject({ kind: 'history', weekStart: '2025-03-17', timeZone: 'Asia/Tokyo' });

    const { openStore } = await import('../../db/index.ts');
    const store = openStore(db);
    try {
      store.setSiteTimezone(store.findSite('Front Range Office')!.id, 'America/Denver');
    } finally {
      store.close();
    }
    expect(zonesJson()).toMatchObject([{ name: 'Hall', timezone: 'America/Denver' }]);
    expect(heatlagIn(computer, 'zones', '--db', db).stdout).toMatch(/Hall\s.*\sAmerica\/Denver$/m);
    const after = heatlagIn(computer, ...args);
    expect(after.stderr).toBe('');
    expect(after.json.outdoor.timeZone).toBe('America/Denver');
    expect(after.json.days[0].label).toBe('Mon 2025-03-17');
    // The readings of that week are taken in Denver's days, not Tokyo's: another outdoor, another runtime.
    expect(after.json.week.heatHours).not.toBe(before.json.week.heatHours);
    // --tz still wins.
    expect(heatlagIn(computer, ...args, '--tz', 'Europe/Berlin').json.outdoor.timeZone).toBe('Europe/Berlin');
  });

  it('reports a week whose outdoor readings have a long gap (exit 2)', () => {
    // The office log has a 20-hour gap from 2025-03-26 15:00 (assets/demo/truth.json).
    const r = heatlag('plan', ...OFFICE, '--schedule', 'assets/plans/office-annex.json', '--week', '2025-03-24');
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/gap of \d+\.\d h from 2025-03-26/);
  });

  it('bad schedule files name file, line and column; usage errors exit 1; never a stack trace', () => {
    const broken = heatlag('plan', ...OFFICE, '--schedule', path.join(dir, 'broken.json'), '--low', '0', '--high', '5');
    expect(broken.code).toBe(2);
    expect(broken.stderr).toMatch(/broken\.json:5:3: not valid JSON: expected ","/);
    const badkey = heatlag('plan', ...OFFICE, '--schedule', path.join(dir, 'badkey.json'), '--low', '0', '--high', '5');
    expect(badkey.code).toBe(2);
    expect(badkey.stderr).toMatch(/badkey\.json:\d+:\d+: days\.everyday\[0\]\.heat: expected a temperature \(a number\) or "off"/);
    const noFile = heatlag('plan', ...OFFICE, '--schedule', path.join(dir, 'nope.json'));
    expect(noFile.code).toBe(2);
    expect(noFile.stderr).toMatch(/nope\.json: cannot read the schedule file/);
    expect(heatlag('plan', ...OFFICE).code).toBe(1); // --schedule missing
    const design = heatlag('plan', ...OFFICE, '--schedule', 'assets/plans/office-annex.json', '--outdoor', 'design', '--design-db', '30');
    expect(design.code).toBe(1);
    expect(design.stderr).toMatch(/--daily-range/);
    const cap = heatlag('plan', ...OFFICE, '--schedule', 'assets/plans/office-annex.json', '--low', '0', '--high', '5', '--capacity', 'big');
    expect(cap.code).toBe(1);
    expect(cap.stderr).toMatch(/--capacity must be an output such as 60000btuh/);
    for (const r of [broken, badkey, noFile, design, cap]) expect(r.stderr).not.toMatch(/\n\s+at /);
  });
});
