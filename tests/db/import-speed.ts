/**
 * Import speed benchmark (prints figures; not a test): one year of 5-minute readings (105,120 rows,
 * invented values) written as a CSV, imported with importLog into a fresh store file, against the
 * sqlite3 shell's own `.import --csv` of the same file into a fresh database (when sqlite3 is on PATH).
 *
 *   npx tsx tests/db/import-speed.ts [rows] [repeats]
 *
 * Reports the best of `repeats` runs (default 3) of each, wall-clock and CPU time, rows per second, the
 * ratio to the sqlite3 shell, and the process's peak resident memory. Then the same rows written as a
 * US-style local-time export ("M/d/yyyy h:mm a", America/Chicago, DST changes included) and imported
 * with a time zone, to show the cost of local times.
 */
import { execFileSync } from 'node:child_process';
import { closeSync, mkdtempSync, openSync, rmSync, statSync, writeSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { importLog, openStore } from '../../db/index.ts';

const rows = Number(process.argv[2] ?? 105_120);
const repeats = Number(process.argv[3] ?? 3);
const dir = mkdtempSync(join(tmpdir(), 'heatlag-bench-'));
const csv = join(dir, 'year.csv');

// Invented data: a zone around 20 °C, a daily outdoor swing, 5-minute heating cycles in seconds.
// Written in pieces, so that the peak memory below is the import's, not the generator's.
{
  const fd = openSync(csv, 'w');
  writeSync(fd, 'time,indoor_c,outdoor_c,heat_setpoint_c,cool_setpoint_c,heat_runtime_s,cool_runtime_s\n');
  const t0 = Date.UTC(2025, 0, 1);
  let part: string[] = [];
  for (let i = 0; i < rows; i++) {
    const t = new Date(t0 + i * 300_000).toISOString().slice(0, 19) + 'Z';
    const day = (i % 288) / 288;
    const indoor = (20 + 0.8 * Math.sin(i / 37)).toFixed(2);
    const outdoor = (4 + 6 * Math.sin(2 * Math.PI * (day - 0.3)) + 8 * Math.sin((2 * Math.PI * i) / 105_120)).toFixed(1);
    const heat = i % 4 === 0 ? 300 : i % 4 === 1 ? 120 : 0;
    part.push(`${t},${indoor},${outdoor},20.0,25.0,${heat},0\n`);
    if (part.length === 10_000) {
      writeSync(fd, part.join(''));
      part = [];
    }
  }
  writeSync(fd, part.join(''));
  closeSync(fd);
}
const rssBefore = process.memoryUsage().rss;
const bytes = statSync(csv).size;

function cpuMs(u: NodeJS.CpuUsage): number {
  return (u.user + u.system) / 1000;
}

const ours: { wall: number; cpu: number }[] = [];
const shell: { wall: number; cpu: number }[] = [];
let hasShell = true;
for (let r = 0; r < repeats; r++) {
  const dbFile = join(dir, `store-${r}.heatlag`);
  const store = openStore(dbFile);
  const zone = store.getOrCreateZone('Bench Site (invented)', 'Zone 1');
  const c0 = process.cpuUsage();
  const w0 = performance.now();
  const res = await importLog(store, csv, { zoneId: zone.id });
  const wall = performance.now() - w0;
  const cpu = cpuMs(process.cpuUsage(c0));
  store.close();
  if (res.rowsAccepted !== rows) throw new Error(`expected ${rows} rows, imported ${res.rowsAccepted}`);
  ours.push({ wall, cpu });

  if (hasShell) {
    const target = join(dir, `shell-${r}.db`);
    try {
      const w1 = performance.now();
      // `time -f` would need GNU time; the shell's wall time includes its start-up (a few ms).
      execFileSync('sqlite3', [target, '.import --csv ' + csv + ' samples'], { stdio: 'pipe' });
      const wall1 = performance.now() - w1;
      shell.push({ wall: wall1, cpu: NaN });
    } catch {
      hasShell = false;
    }
  }
}

const best = (list: { wall: number; cpu: number }[]) => list.reduce((a, b) => (b.wall < a.wall ? b : a));
const b = best(ours);
const rate = (ms: number) => Math.round((rows / ms) * 1000).toLocaleString('en-US');
console.log(`file: ${rows.toLocaleString('en-US')} rows, ${(bytes / 1e6).toFixed(1)} MB`);
console.log(`importLog: best of ${repeats}: ${b.wall.toFixed(0)} ms wall (${rate(b.wall)} rows/s), ${b.cpu.toFixed(0)} ms CPU; all: ${ours.map((o) => o.wall.toFixed(0)).join(', ')} ms`);
if (shell.length > 0) {
  const s = best(shell);
  console.log(`sqlite3 .import: best of ${repeats}: ${s.wall.toFixed(0)} ms wall (${rate(s.wall)} rows/s); all: ${shell.map((o) => o.wall.toFixed(0)).join(', ')} ms`);
  console.log(`ratio importLog / sqlite3 .import (wall): ${(b.wall / s.wall).toFixed(2)}`);
} else console.log('sqlite3 shell not found: no comparison');
console.log(
  `memory: resident ${(rssBefore / 1e6).toFixed(0)} MB before the imports, peak ${(process.resourceUsage().maxRSS / 1024).toFixed(0)} MB ` +
    `(file ${(bytes / 1e6).toFixed(1)} MB)`,
);

// The same readings as local wall-clock times (America/Chicago), converted back by the import.
{
  const local = join(dir, 'year-local.csv');
  const fmt = new Intl.DateTimeFormat('en-US', {
    timeZone: 'America/Chicago', year: 'numeric', month: 'numeric', day: 'numeric', hour: 'numeric', minute: '2-digit', hour12: true,
  });
  const fd = openSync(local, 'w');
  writeSync(fd, 'time,indoor_c,outdoor_c,heat_runtime_s\n');
  const t0 = Date.UTC(2025, 0, 1);
  let part: string[] = [];
  for (let i = 0; i < rows; i++) {
    part.push(`${fmt.format(new Date(t0 + i * 300_000)).replace(',', '').replace('\u202f', ' ')},${(20 + 0.8 * Math.sin(i / 37)).toFixed(2)},${(4 + 6 * Math.sin(i / 288)).toFixed(1)},${i % 4 === 0 ? 300 : 0}\n`);
    if (part.length === 10_000) {
      writeSync(fd, part.join(''));
      part = [];
    }
  }
  writeSync(fd, part.join(''));
  closeSync(fd);
  const times: number[] = [];
  let accepted = 0;
  for (let r = 0; r < repeats; r++) {
    const store = openStore(join(dir, `local-${r}.heatlag`));
    const zone = store.getOrCreateZone('Bench Site (invented)', 'Local');
    const w0 = performance.now();
    const res = await importLog(store, local, { zoneId: zone.id, timezone: 'America/Chicago' });
    times.push(performance.now() - w0);
    accepted = res.rowsAccepted;
    store.close();
  }
  const w = Math.min(...times);
  console.log(`importLog, local "M/d/yyyy h:mm a" times in America/Chicago: best of ${repeats}: ${w.toFixed(0)} ms (${rate(w)} rows/s), ${accepted.toLocaleString('en-US')} readings`);
}
rmSync(dir, { recursive: true, force: true });
