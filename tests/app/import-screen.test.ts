/**
 * The Import screen's pure parts (app/renderer/src/lib): a saved mapping applied to a previewed file,
 * the rejected rows' CSV export, and the loop that runs an import to its end against a fake backend.
 */
import { describe, expect, it } from 'vitest';
import type { ImportStatus, Mapping } from '../../app/api/contract.ts';
import { allRejectedRows, runImport } from '../../app/renderer/src/lib/import-job.ts';
import { applySavedMapping, buildMapping } from '../../app/renderer/src/lib/import-mapping.ts';
import { rejectedRowsCsv } from '../../app/renderer/src/lib/rejected-csv.ts';

describe('applySavedMapping', () => {
  const header = ['Datum', 'Uhrzeit', ' Raum ', 'Aussen', 'Heizung', 'Sollwert'];
  const saved: Mapping = {
    time: ['datum', 'UHRZEIT'],
    indoor: 'Raum',
    outdoor: 'Aussen',
    heatSetpoint: 'Sollwert',
    heating: { column: 'Heizung', as: 'percent' },
    units: 'C',
    delimiter: ';',
    decimal: ',',
    timezone: 'Europe/Berlin',
    runtimeInterval: 'starting',
  };

  it('gives each named column its role (header matched without case or spaces) and takes the options', () => {
    const a = applySavedMapping('BMS', saved, header, header.map(() => 'onoff'), ';');
    expect(a.roles).toEqual(['date', 'clock', 'indoor', 'outdoor', 'heating', 'heatSetpoint']);
    expect(a.runtimeAs[4]).toBe('percent');
    expect(a).toMatchObject({ units: 'C', decimal: ',', timezone: 'Europe/Berlin', dateFormat: '', runtimeInterval: 'starting' });
    expect(a.note).toBe('Applied the saved mapping “BMS”.');
    // Built back into a mapping, the file's own header spellings, the same columns and options.
    const rebuilt = buildMapping(header, a.roles, a.runtimeAs, { units: 'C', delimiter: ';', decimal: ',', runtimeInterval: 'starting', dateFormat: '', timezone: 'Europe/Berlin' });
    expect(rebuilt.mapping).toMatchObject({ time: ['Datum', 'Uhrzeit'], indoor: ' Raum ', heating: { column: 'Heizung', as: 'percent' } });
  });

  it('names the columns the file lacks, and a different delimiter before anything else', () => {
    const other = ['Zeit', 'Innen'];
    const a = applySavedMapping('BMS', { time: 'Zeit', indoor: 'Raum' }, other, ['onoff', 'onoff'], ',');
    expect(a.roles).toEqual(['time', 'ignore']);
    expect(a.note).toBe('The saved mapping “BMS” names columns this file does not have: Raum.');
    const b = applySavedMapping('BMS', saved, header, header.map(() => 'onoff'), ',');
    expect(b.note).toBe('The saved mapping “BMS” splits columns with a different delimiter: choose that delimiter first, then apply the mapping again.');
  });

  it('maps one heating/cooling state column to both, and leaves options it does not give alone', () => {
    const a = applySavedMapping('Stat', { time: 't', indoor: 'in', heating: { column: 'mode', as: 'onoff' }, cooling: { column: 'mode', as: 'onoff' } }, ['t', 'in', 'mode'], ['onoff', 'onoff', 'onoff'], ',');
    expect(a.roles).toEqual(['time', 'indoor', 'heating+cooling']);
    expect(a).not.toHaveProperty('units');
    expect(a).not.toHaveProperty('timezone');
    expect(a.dateFormat).toBe('');
  });
});

describe('rejectedRowsCsv', () => {
  it('writes RFC 4180 CSV: a header row, CRLF line ends, cells with quotes, commas or line breaks quoted', () => {
    const csv = rejectedRowsCsv([
      { line: 10, column: 2, columnName: 'Indoor', reason: 'not a number: "n/a"', raw: '2025-03-10,n/a,4' },
      { line: 12, column: null, columnName: null, reason: 'too few columns' },
    ]);
    expect(csv).toBe(
      'line,column,column_name,reason,row\r\n' +
        '10,2,Indoor,"not a number: ""n/a""","2025-03-10,n/a,4"\r\n' +
        '12,,,too few columns,\r\n',
    );
  });
});

describe('runImport', () => {
  const status = (state: ImportStatus['state'], done: number, extra: Partial<ImportStatus> = {}): ImportStatus => ({ jobId: 'job-1', state, done, total: 100, result: null, error: null, ...extra });
  const fakeApi = (answers: ImportStatus[]) => {
    const asked: string[] = [];
    return {
      asked,
      api: {
        startImport: async (input: { fileId: string }) => {
          asked.push(`start ${input.fileId}`);
          return { jobId: 'job-1' };
        },
        importStatus: async ({ jobId }: { jobId: string }) => {
          asked.push(`status ${jobId}`);
          return answers.shift()!;
        },
      },
    };
  };
  const mapping: Mapping = { time: 't', indoor: 'in' };

  it('asks the status until the import is done, reporting the job and each step of progress', async () => {
    const result = { logId: 3, file: 'a.csv', rowsAccepted: 10, rowsRejected: 0, duplicates: 0 } as unknown as ImportStatus['result'];
    const { api, asked } = fakeApi([status('running', 10), status('running', 60), status('done', 100, { result })]);
    const seen: Array<[number, number]> = [];
    let job = '';
    let waits = 0;
    const end = await runImport(api as never, { fileId: 'file-0001', zoneId: 1, mapping }, (id) => (job = id), (d, t) => seen.push([d, t]), async () => void waits++);
    expect(end.state).toBe('done');
    expect(end.result).toBe(result);
    expect(job).toBe('job-1');
    expect(seen).toEqual([[10, 100], [60, 100], [100, 100]]);
    expect(waits).toBe(2);
    expect(asked).toEqual(['start file-0001', 'status job-1', 'status job-1', 'status job-1']);
  });

  it('stops at a failure or a cancellation and returns it', async () => {
    const failed = await runImport(fakeApi([status('failed', 5, { error: { code: 'bad', message: 'line 3: no time' } })]).api as never, { fileId: 'file-0001', zoneId: 1, mapping }, () => {}, () => {}, async () => {});
    expect(failed).toMatchObject({ state: 'failed', error: { message: 'line 3: no time' } });
    const cancelled = await runImport(fakeApi([status('running', 5), status('cancelled', 5)]).api as never, { fileId: 'file-0001', zoneId: 1, mapping }, () => {}, () => {}, async () => {});
    expect(cancelled.state).toBe('cancelled');
  });
});

describe('allRejectedRows', () => {
  it('fetches every rejected row, 5,000 at a time', async () => {
    const offsets: number[] = [];
    const api = {
      rejectedRows: async ({ limit, offset }: { logId: number; limit: number; offset: number }) => {
        offsets.push(offset);
        const n = Math.max(0, Math.min(limit, 12_345 - offset));
        return { total: 12_345, rows: Array.from({ length: n }, (_, i) => ({ line: offset + i + 2, column: null, columnName: null, reason: 'bad' })) };
      },
    };
    const rows = await allRejectedRows(api as never, 7, 12_345);
    expect(offsets).toEqual([0, 5000, 10000]);
    expect(rows).toHaveLength(12_345);
    expect(rows[12_344]!.line).toBe(12_346);
  });
});
