/**
 * The command-line contract (issue: the headless pipeline, §4), run as a user runs it: the real
 * `heatlag` bin in a child process, on logs written by the independent RK4 reference simulator
 * (tests/support/zone-sim.ts; invented data with a known truth).
 */
import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import Database from 'better-sqlite3';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { ZoneModel } from '../../core/types.ts';
import { simulateZone, trueRecoveryTime } from '../support/zone-sim.ts';

const BIN = path.resolve('app/cli/heatlag.mjs');
let dir = '';

function heatlag(...args: string[]): { code: number; stdout: string; stderr: string; json: any } {
  const r = spawnSync(process.execPath, [BIN, ...args], { encoding: 'utf8', cwd: dir });
  let json: unknown = undefined;
  try {
    json = JSON.parse(r.stdout);
  } catch {
    /* not JSON */
  }
  return { code: r.status ?? -1, stdout: r.stdout, stderr: r.stderr, json };
}

const rel = (got: number, want: number) => Math.abs(got - want) / Math.abs(want);
const fToC = (f: number) => (f - 32) / 1.8;

// A realistic winter log: 10-minute rows, whole-°F readings, deadband thermostat, night setback,
// outdoor temperature moving through the day, runtime in seconds, a gap and duplicates.
const TRUTH: ZoneModel = { tauHours: 28, heatRate: 3.2, coolRate: 0, gain: 0.12 };
const OPTIONS = {
  model: TRUTH, days: 21, seed: 21, timezone: 'America/Chicago', start: '2026-01-05T00:00',
  weather: { meanC: -3, dailyRangeK: 8 },
} as const;

beforeAll(() => {
  dir = fs.mkdtempSync(path.join(os.tmpdir(), 'heatlag-cli-'));
  const seconds = simulateZone({ ...OPTIONS, log: { intervalMinutes: 10, units: 'F', indoorResolution: 1, runtime: 'seconds', gaps: [{ atHours: 100, hours: 6 }], duplicates: 30 } });
  fs.writeFileSync(path.join(dir, 'seconds.csv'), seconds.csv);
  const onoff = simulateZone({ ...OPTIONS, log: { intervalMinutes: 5, units: 'F', indoorResolution: 1, runtime: 'onoff' } });
  fs.writeFileSync(path.join(dir, 'onoff.csv'), onoff.csv);
  fs.writeFileSync(path.join(dir, 'onoff.map.json'), JSON.stringify(onoff.mapping));
  fs.writeFileSync(path.join(dir, 'bad.csv'), 'time,indoor_f,outdoor_f\n2026-01-05T00:00:00Z,abc,20\n');
});

afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

describe('heatlag fit', () => {
  it('recovers τ and h within 10 % from a log with runtime in seconds', () => {
    const r = heatlag('fit', 'seconds.csv', '--json');
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    const j = r.json;
    expect(j.units).toBe('F');
    expect(rel(j.timeConstantHours, TRUTH.tauHours)).toBeLessThan(0.1); // issue acceptance: 10 %
    expect(rel(j.heatingRatePerHour, TRUTH.heatRate * 1.8)).toBeLessThan(0.1); // K/h → °F/h: ×1.8 exactly
    expect(j.timeConstantHoursCI[0]).toBeLessThan(j.timeConstantHoursCI[1]);
    expect(j.heatingRatePerHourCI).toHaveLength(2);
    expect(j.coolingRatePerHour).toBeNull();
    expect(typeof j.gainPerHour).toBe('number');
    expect(j.rmse).toBeGreaterThan(0);
    expect(j.samplesUsed).toBeGreaterThan(2500);
    expect(j.daysUsed).toBeGreaterThanOrEqual(20);
    expect(Array.isArray(j.warnings)).toBe(true);
  });

  it('recovers τ and h within 15 % when heating is logged only as on/off at the end of each interval', () => {
    const r = heatlag('fit', 'onoff.csv', '--columns', 'onoff.map.json', '--json');
    expect(r.code).toBe(0);
    expect(rel(r.json.timeConstantHours, TRUTH.tauHours)).toBeLessThan(0.15); // issue acceptance: 15 %
    expect(rel(r.json.heatingRatePerHour, TRUTH.heatRate * 1.8)).toBeLessThan(0.15);
  });

  it('--units converts the output, not the reading of the log', () => {
    const r = heatlag('fit', 'seconds.csv', '--units', 'C', '--json');
    expect(r.code).toBe(0);
    expect(r.json.units).toBe('C');
    expect(rel(r.json.heatingRatePerHour, TRUTH.heatRate)).toBeLessThan(0.1); // K/h = °C/h
  });

  it('prints a readable summary with units on every number', () => {
    const r = heatlag('fit', 'seconds.csv', '--units', 'C');
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/Time constant τ\s+\d+\.\d h/);
    // A rate of change of temperature is a difference per hour: K/h in °C mode, as on the screens.
    expect(r.stdout).toMatch(/Heating rate h\s+\d+\.\d\d K\/h/);
    expect(r.stdout).toMatch(/Model: one node\./);
    expect(r.stdout).toMatch(/Recovery backtest: /);
    expect(r.stdout).toMatch(/estimates/);
  });

  it('refuses a file with no acceptable row: exit 2, file, line and column on stderr, no stack trace', () => {
    const r = heatlag('fit', 'bad.csv', '--json');
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/bad\.csv/);
    expect(r.stderr).toMatch(/line 2/);
    expect(r.stderr).toMatch(/column 2/);
    expect(r.stderr).not.toMatch(/\n\s+at /);
  });

  it('a missing file and a usage error get their exit codes', () => {
    expect(heatlag('fit', 'nope.csv').code).toBe(2);
    expect(heatlag('fit').code).toBe(1);
    expect(heatlag('fit', 'seconds.csv', '--units', 'K').code).toBe(1);
  });
});

describe('heatlag recovery', () => {
  it('predicts recovery within 10 % of the true model, with negative temperatures as written', () => {
    // From 60 °F to 70 °F at −5 °F outdoor.
    const r = heatlag('recovery', 'seconds.csv', '--from', '60', '--to', '70', '--outdoor', '-5', '--json');
    expect(r.code).toBe(0);
    const truth = trueRecoveryTime(TRUTH, fToC(60), fToC(70), fToC(-5))!;
    expect(truth).toBeGreaterThan(0);
    expect(rel(r.json.recoveryHours, truth)).toBeLessThan(0.1); // issue acceptance: 10 %
    expect(r.json.units).toBe('F');
    // Equilibrium T_out + (h + g)·τ of the true model, in °F, within 10 % of the lift.
    const eqTrue = -5 + (TRUTH.heatRate + TRUTH.gain) * TRUTH.tauHours * 1.8;
    expect(Math.abs(r.json.equilibrium - eqTrue)).toBeLessThan(0.1 * (eqTrue + 5));
  });

  it('says never, with a reason, when the equilibrium stays below the target', () => {
    const r = heatlag('recovery', 'seconds.csv', '--units', 'C', '--from', '-2', '--to', '150', '--outdoor', '-30', '--json');
    expect(r.code).toBe(0);
    expect(r.json.recoveryHours).toBeNull();
    expect(typeof r.json.reason).toBe('string');
  });
});

describe('heatlag estimate', () => {
  it('τ from two readings: Δt / ln((T0 − Ta)/(T1 − Ta)) (REFERENCES: derived from the closed-form cooling curve)', () => {
    const r = heatlag('estimate', '--start', '70', '--later', '60', '--hours', '5', '--ambient', '30', '--json');
    expect(r.code).toBe(0);
    expect(r.json.timeConstantHours).toBeCloseTo(5 / Math.log(40 / 30), 9);
  });

  it('negative temperatures work as written', () => {
    const r = heatlag('estimate', '--units', 'C', '--start', '-2', '--later', '-6', '--hours', '3', '--ambient', '-10', '--json');
    expect(r.code).toBe(0);
    expect(r.json.timeConstantHours).toBeCloseTo(3 / Math.log(8 / 4), 9);
  });

  it('readings that do not move toward the ambient are bad input', () => {
    expect(heatlag('estimate', '--start', '60', '--later', '65', '--hours', '2', '--ambient', '30').code).toBe(2);
  });
});

describe('heatlag import, fit --db and zones', () => {
  it('--site-tz sets the site time zone, and a log of local times is then read in it', () => {
    const db = path.join(dir, 'tz.db');
    // Invented local wall-clock readings (no offset): 1 March 2025, when Denver is on MST (UTC−7, IANA tzdb).
    const local = ['time,indoor_c,outdoor_c', ...Array.from({ length: 12 }, (_, i) => `2025-03-01 0${Math.floor(i / 6)}:${String((i % 6) * 10).padStart(2, '0')},20.${i},3.0`)].join('\n');
    fs.writeFileSync(path.join(dir, 'local.csv'), local + '\n');
    const refused = heatlag('import', 'local.csv', '--db', db, '--site', 'Front Range Office', '--zone', 'Hall');
    expect(refused.code).toBe(2);
    expect(refused.stderr).toMatch(/time zone/);
    const bad = heatlag('import', 'local.csv', '--db', db, '--site', 'Front Range Office', '--zone', 'Hall', '--site-tz', 'Mars/Base');
    expect(bad.code).toBe(1);
    expect(bad.stderr).toMatch(/--site-tz: 'Mars\/Base' is not an IANA time zone/);
    const ok = heatlag('import', 'local.csv', '--db', db, '--site', 'Front Range Office', '--zone', 'Hall', '--site-tz', 'america/denver', '--json');
    expect(ok.code).toBe(0);
    expect(ok.json.siteTimezone).toBe('America/Denver');
    expect(ok.json.firstTime).toBe('2025-03-01T07:00:00Z');
    // The next zone of the site reads its local times in the site's zone without being told.
    const next = heatlag('import', 'local.csv', '--db', db, '--site', 'Front Range Office', '--zone', 'Annex', '--json');
    expect(next.code).toBe(0);
    expect(next.json.firstTime).toBe('2025-03-01T07:00:00Z');
    const zones = heatlag('zones', '--db', db, '--json');
    expect(zones.json.map((z: { timezone: string }) => z.timezone)).toEqual(['America/Denver', 'America/Denver']);
  });

  it('a re-import of the same file adds no log, counts nothing twice and says so, with the first import\'s time in the zone\'s', () => {
    const db = path.join(dir, 'again.db');
    // Invented 10-minute readings with UTC offsets; the site's time zone is Europe/Berlin.
    const rows = ['time,indoor_c,outdoor_c', ...Array.from({ length: 30 }, (_, i) => `${new Date(Date.UTC(2026, 1, 2) + i * 600_000).toISOString()},${(20 + i / 100).toFixed(2)},4.0`)];
    fs.writeFileSync(path.join(dir, 'again.csv'), `${rows.join('\n')}\n`);
    const args = ['import', 'again.csv', '--db', db, '--site', 'Lakeside', '--zone', 'Hall', '--site-tz', 'Europe/Berlin'];
    const first = heatlag(...args, '--json');
    expect(first.code, first.stderr).toBe(0);
    expect(first.json).toMatchObject({ rowsAccepted: 30, logAdded: true });
    const counts = () => {
      const d = new Database(db, { readonly: true });
      try {
        return {
          logs: d.prepare('SELECT id, imported_at AS importedAt, rows_accepted AS rows FROM logs').all() as { id: number; importedAt: number; rows: number }[],
          samples: d.prepare('SELECT count(*) FROM samples').pluck().get(),
        };
      } finally {
        d.close();
      }
    };
    const before = counts();
    expect(before.logs.map((l) => l.rows)).toEqual([30]);
    const again = heatlag(...args);
    expect(again.code, again.stderr).toBe(0);
    // The first import's time as the zone's wall clock (Intl with the IANA zone, independent of the CLI's formatting).
    const parts = Object.fromEntries(
      new Intl.DateTimeFormat('en-US', { timeZone: 'Europe/Berlin', year: 'numeric', month: '2-digit', day: '2-digit', hour: '2-digit', minute: '2-digit', hourCycle: 'h23' })
        .formatToParts(before.logs[0]!.importedAt).map((p) => [p.type, p.value]),
    );
    const local = `${parts.year}-${parts.month}-${parts.day} ${parts.hour}:${parts.minute}`;
    expect(again.stdout.split('\n')[0]).toBe(`again.csv added no readings: every reading was already in Lakeside/Hall (imported ${local} Europe/Berlin), so no log was added.`);
    expect(counts()).toEqual(before);
    const json = heatlag(...args, '--json');
    expect(json.json).toMatchObject({ rowsAccepted: 0, duplicates: 30, logAdded: false });
    expect(counts()).toEqual(before);
    const zones = heatlag('zones', '--db', db, '--json');
    expect(zones.json[0]).toMatchObject({ samples: 30 });
  });

  it('imports into a database, refits from it, lists the zone, and a re-import adds nothing', () => {
    const db = path.join(dir, 'site.db');
    const a = heatlag('import', 'seconds.csv', '--db', db, '--site', 'Test Site', '--zone', 'North', '--json');
    expect(a.code).toBe(0);
    expect(a.json.rowsAccepted).toBeGreaterThan(2500);
    expect(a.json.duplicates).toBe(30);
    expect(a.json.intervalMinutes).toBe(10);
    expect(a.json.firstTime).toMatch(/^2026-01-0[45]T/);
    const again = heatlag('import', 'seconds.csv', '--db', db, '--site', 'Test Site', '--zone', 'North', '--json');
    expect(again.code).toBe(0);
    expect(again.json.rowsAccepted).toBe(0);
    const zones = heatlag('zones', '--db', db, '--json');
    expect(zones.code).toBe(0);
    expect(zones.json).toHaveLength(1);
    expect(zones.json[0]).toMatchObject({ site: 'Test Site', name: 'North', units: 'F', samples: a.json.rowsAccepted });
    const fromDb = heatlag('fit', '--db', db, '--zone', 'Test Site/North', '--json');
    const fromFile = heatlag('fit', 'seconds.csv', '--json');
    expect(fromDb.code).toBe(0);
    // One path: the same rows give the same numbers whether from the file or the database.
    expect(fromDb.json.timeConstantHours).toBeCloseTo(fromFile.json.timeConstantHours, 9);
    expect(heatlag('fit', '--db', db, '--zone', 'Test Site/South').code).toBe(2);

    // The portfolio batch over worker threads gives each zone the same response as a single fit.
    expect(heatlag('import', 'onoff.csv', '--columns', 'onoff.map.json', '--db', db, '--site', 'Test Site', '--zone', 'South').code).toBe(0);
    const all = heatlag('fit', '--db', db, '--all', '--workers', '2', '--json');
    expect(all.code).toBe(0);
    expect(all.json).toHaveLength(2);
    const north = all.json.find((z: any) => z.zone === 'North');
    expect(north.timeConstantHours).toBeCloseTo(fromDb.json.timeConstantHours, 9);
    expect(all.json.every((z: any) => z.error === null)).toBe(true);
  });
});
