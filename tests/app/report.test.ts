/**
 * The zone report's backend and tables: the log's gaps and rejected rows as the store holds them (an
 * invented log with a known gap and bad rows), the contract of the export methods, the desktop-only
 * dialogs refused in browser mode, the print route's address, and the CSV tables (papaparse
 * round-trip: each exported table reads back as the same cells).
 */
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import Papa from 'papaparse';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { contract } from '../../app/api/contract.ts';
import { defaultPaper, parseReportSearch, reportFooterTemplate, reportSearch } from '../../app/api/report.ts';
import { openBackend, type OpenBackend } from '../../app/backend/backend.ts';
import { dispatch } from '../../app/backend/dispatch.ts';
import { seriesGaps } from '../../app/backend/report.ts';
import { recoveryTableRows, responseRows, toCsv, comparisonRows } from '../../app/renderer/src/report/tables.ts';
import { presentResponse } from '../../core/present.ts';
import { recoveryTable } from '../../core/recovery-table.ts';
import type { ZoneResponse, ZoneSeries } from '../../core/types.ts';
import { compareWhatIf } from '../../core/what-if.ts';
import { importLog } from '../../db/index.ts';
import { ONE_NODE_FIELDS } from '../support/response-fields.ts';

const root = path.resolve(import.meta.dirname, '../..');
let dir: string;
let backend: OpenBackend;
let zoneId: number;

beforeAll(async () => {
  dir = mkdtempSync(path.join(tmpdir(), 'heatlag-report-'));
  // 10-minute rows for a day, a 3-hour hole after 06:00, two unreadable rows (invented values).
  const lines = ['time,indoor_c,outdoor_c'];
  for (let m = 0; m < 24 * 60; m += 10) {
    if (m > 6 * 60 && m < 9 * 60) continue;
    const t = new Date(Date.UTC(2026, 0, 5, 0, m)).toISOString();
    lines.push(`${t},${(20 - m / 600).toFixed(2)},${(-2 + m / 720).toFixed(2)}`);
    if (m === 600) lines.push(`${t.replace('10:00', '10:05')},warm,3`);
    if (m === 700) lines.push('not a time,20,3');
  }
  writeFileSync(path.join(dir, 'hall.csv'), lines.join('\n') + '\n');
  backend = await openBackend({ dataDir: path.join(dir, 'data'), mode: 'browser', version: 'test', demoDir: path.join(root, 'assets', 'demo'), demo: false, log: () => {} });
  const site = backend.ctx.store.createSite('Elm Road Library');
  zoneId = backend.ctx.store.createZone(site.id, 'Reading Room').id;
  await importLog(backend.ctx.store, path.join(dir, 'hall.csv'), { zoneId });
});

afterAll(() => {
  backend.close();
  rmSync(dir, { recursive: true, force: true });
});

describe('zoneLogQuality', () => {
  it('reports the span, the interval, the gap and the rejected rows of the stored log', async () => {
    const r = await dispatch(backend.handlers, 'zoneLogQuality', { zoneId }, { checkOutput: true });
    expect(r.ok).toBe(true);
    const q = (r as { ok: true; value: Awaited<ReturnType<typeof backend.handlers.zoneLogQuality>> }).value;
    // 144 ten-minute slots, 17 inside the hole (06:10 … 08:50): 127 readings.
    expect(q.readings).toBe(127);
    expect(q.intervalMinutes).toBe(10);
    expect(q.gapThresholdMinutes).toBe(60); // max(1 h, 6 × 10 min): the import's rule
    expect(q.gapCount).toBe(1);
    expect(q.gaps[0]).toMatchObject({ from: Date.UTC(2026, 0, 5, 6, 0), to: Date.UTC(2026, 0, 5, 9, 0), hours: 3 });
    expect(q.coveragePercent).toBeCloseTo((100 * (23 + 50 / 60 - 3)) / (23 + 50 / 60), 10);
    expect(q.withOutdoor).toBe(127);
    expect(q.withHeating).toBe(0);
    expect(q.rejectedTotal).toBe(2);
    expect(q.rejected.map((x) => x.file)).toEqual(['hall.csv', 'hall.csv']);
    expect(q.rejected.every((x) => x.reason.length > 0 && x.line > 1)).toBe(true);
  });

  it('answers not-found for a zone that does not exist', async () => {
    const r = await dispatch(backend.handlers, 'zoneLogQuality', { zoneId: 999 });
    expect(r).toMatchObject({ ok: false, error: { code: 'not-found' } });
  });

  it('splits gaps by the longer of 1 h and six intervals', () => {
    const h = 3_600_000;
    const time = Float64Array.from([0, 2, 4, 6, 8, 30, 32].map((x) => x * h)); // 2 h steps, one 22 h hole
    const nan = new Float64Array(time.length).fill(Number.NaN);
    const s: ZoneSeries = { time, indoor: nan, outdoor: nan, heatSetpoint: nan, coolSetpoint: nan, heat: nan, cool: nan };
    const g = seriesGaps(s);
    expect(g.thresholdMs).toBe(12 * h); // 6 × 2 h
    expect(g.count).toBe(1);
    expect(g.gaps[0]!.hours).toBe(22);
  });
});

describe('export and PDF methods', () => {
  it('are refused in browser mode with a plain sentence', async () => {
    const a = await dispatch(backend.handlers, 'saveExportFile', { suggestedName: 'a.csv', kind: 'csv', text: 'x\r\n' });
    expect(a).toMatchObject({ ok: false, error: { code: 'unsupported' } });
    const b = await dispatch(backend.handlers, 'saveReportPdf', { suggestedName: 'a.pdf', paper: 'letter', title: 'T' });
    expect(b).toMatchObject({ ok: false, error: { code: 'unsupported' } });
    expect((b as { error: { message: string } }).error.message).toMatch(/heatlag report/);
  });

  it('validate their payloads at the boundary', () => {
    const input = contract.saveExportFile.input;
    expect(input.safeParse({ suggestedName: 'chart.png', kind: 'png', base64: 'iVBORw0KGgo=' }).success).toBe(true);
    expect(input.safeParse({ suggestedName: 'chart.png', kind: 'png', text: 'not bytes' }).success).toBe(false);
    expect(input.safeParse({ suggestedName: '../etc/passwd', kind: 'csv', text: 'x' }).success).toBe(false);
    expect(input.safeParse({ suggestedName: 'a.csv', kind: 'exe', text: 'x' }).success).toBe(false);
    expect(contract.saveReportPdf.input.safeParse({ suggestedName: 'r.pdf', paper: 'legal', title: '' }).success).toBe(false);
  });
});

describe('print route and footer', () => {
  it('round-trips the report address', () => {
    const route = { zoneId: 7, units: 'F' as const, paper: 'a4' as const, fromC: 14.4444, toC: 20, outdoorC: -6.5, capacityFactor: 1.5, heatLossFactor: 0.8 };
    expect(parseReportSearch(reportSearch(route))).toEqual(route);
    expect(parseReportSearch('?view=history&zone=7')).toBeNull();
    expect(parseReportSearch('?view=report&zone=abc')).toBeNull();
  });

  it('chooses Letter for °F and A4 for °C (US and ISO practice) and escapes the footer title', () => {
    expect(defaultPaper('F')).toBe('letter');
    expect(defaultPaper('C')).toBe('a4');
    const footer = reportFooterTemplate('Hall <script>&');
    expect(footer).toContain('Hall &lt;script&gt;&amp;');
    expect(footer).toContain('class="pageNumber"');
    expect(footer).toContain('class="totalPages"');
  });
});

describe('CSV tables', () => {
  const response: ZoneResponse = {
    tauHours: 30, heatRate: 1.5, coolRate: 0, gain: 0.1, tauCI: [28, 32], heatRateCI: [1.4, 1.6], coolRateCI: null,
    hasHeating: true, hasCooling: false, heldOut: [], rmse: 0.2, heldOutRmse: 0.25, cvrmse: 1, nmbe: 0.1,
    samplesUsed: 1000, daysUsed: 10, segments: 1, freeFloatHours: 50, firstTime: 0, lastTime: 864e6, warnings: [],
    ...ONE_NODE_FIELDS,
  };
  const read = (csv: string) => Papa.parse<string[]>(csv.trim(), { skipEmptyLines: true }).data;

  it('put the unit of every column in the header and read back as the same cells', () => {
    const rows = responseRows(presentResponse(response, 'F'));
    const back = read(toCsv(rows));
    expect(back[0]).toEqual(['Quantity', 'Estimate', '95 % interval low', '95 % interval high', 'Unit']);
    const h = back.find((r) => r[0] === 'Heating rate h')!;
    // 1.5 K/h = 2.7 °F/h (1 K = 1.8 °F, core/units.ts)
    expect(h).toEqual(['Heating rate h', '2.7', '2.52', '2.88', '°F/h']);
    expect(toCsv(rows).endsWith('\r\n')).toBe(true);
  });

  it('write the recovery table as the screen computes it, blank where never reached', () => {
    const t = recoveryTable(response, 21, 'C');
    const back = read(toCsv(recoveryTableRows(t)));
    expect(back[0]![0]).toBe('Outdoor (°C)');
    expect(back[0]![1]).toBe('1 K setback from 20 °C to 21 °C: recovery (h)');
    expect(back).toHaveLength(1 + t.rows.length);
    t.rows.forEach((row, i) => {
      expect(Number(back[i + 1]![0])).toBe(row.outdoorShown);
      row.cells.forEach((cell, j) => {
        const text = back[i + 1]![j + 1]!;
        if (cell.hours === null) expect(text).toBe('');
        else expect(Number(text)).toBeCloseTo(cell.hours, 4);
      });
    });
  });

  it('quote cells that hold commas and quotes', () => {
    const csv = toCsv([['a', 'b'], ['x, "y"', 2]]);
    expect(csv).toBe('a,b\r\n"x, ""y""",2\r\n');
    const c = compareWhatIf(response, { capacityFactor: 2, heatLossFactor: 1 }, { fromC: 16, toC: 21, outdoorC: -5 });
    const back = read(toCsv(comparisonRows(c, 'C')));
    expect(back[0]).toEqual(['Quantity', 'Today', 'What if']);
    expect(Number(back.find((r) => r[0] === 'Heating rate h (K/h)')![2])).toBeCloseTo(3, 10);
  });
});
