/**
 * previewLog: what the UI shows before an import.
 */
import { describe, expect, it } from 'vitest';
import { previewLog } from '../../db/index.ts';
import { lines, tempDir, writeLog } from './helpers.ts';

describe('previewLog', () => {
  it('shows delimiter, decimal, header, the first 20 rows, the detected mapping, units and warnings', async () => {
    const dir = tempDir();
    const rows: string[] = [];
    for (let i = 0; i < 30; i++) rows.push(`2026-01-05T${String(6 + Math.floor(i / 12)).padStart(2, '0')}:${String((i % 12) * 5).padStart(2, '0')}:00-05:00;70;28,5;68;${i % 2 ? 'on' : 'off'};42`);
    const p = writeLog(dir, 'export.csv', lines('Time;Thermostat Temp;Outdoor;Heat Set Point;Heat State;Humidity (%)', ...rows));
    const pv = await previewLog(p);
    expect(pv).toMatchObject({
      file: 'export.csv',
      encoding: 'utf-8',
      delimiter: ';',
      decimal: ',',
      headerLine: 1,
      header: ['Time', 'Thermostat Temp', 'Outdoor', 'Heat Set Point', 'Heat State', 'Humidity (%)'],
      units: 'F',
      timeFormat: 'ISO 8601 with UTC offset',
      needsTimezone: false,
      problems: [],
    });
    expect(pv.rows).toHaveLength(20);
    expect(pv.rows[0]).toEqual(['2026-01-05T06:00:00-05:00', '70', '28,5', '68', 'off', '42']);
    expect(pv.mapping).toEqual({
      time: 'Time',
      indoor: 'Thermostat Temp',
      outdoor: 'Outdoor',
      heatSetpoint: 'Heat Set Point',
      heating: { column: 'Heat State', as: 'onoff' },
      units: 'F',
      delimiter: ';',
      decimal: ',',
      runtimeInterval: 'ending',
    });
    expect(pv.columns.map((c) => [c.name, c.role])).toEqual([
      ['Time', 'time'],
      ['Thermostat Temp', 'indoor'],
      ['Outdoor', 'outdoor'],
      ['Heat Set Point', 'heatSetpoint'],
      ['Heat State', 'heating'],
      ['Humidity (%)', null],
    ]);
    expect(pv.warnings.join(' ')).toMatch(/indoor readings around 70 were taken as °F/);
    expect(pv.warnings.join(' ')).toMatch(/Columns not used: "Humidity \(%\)"/);
  });

  it('lists what would stop an import and returns a null mapping when the indoor column is unknown', async () => {
    const dir = tempDir();
    const p = writeLog(dir, 'odd.csv', lines('stamp,a,b', '2026-01-05T06:00:00Z,1,2', '2026-01-05T06:05:00Z,1,2'));
    const pv = await previewLog(p);
    expect(pv.mapping).toBeNull();
    expect(pv.problems[0]).toMatch(/could not tell which column holds the indoor temperature/);
    const withMapping = await previewLog(p, { mapping: { time: 'stamp', indoor: 'a' } });
    expect(withMapping.problems).toEqual([]);
    expect(withMapping.mapping).toMatchObject({ time: 'stamp', indoor: 'a' });
  });

  it('recognises common header variants', async () => {
    const dir = tempDir();
    const cases: [string, Record<string, unknown>][] = [
      ['Timestamp,T_in,T_out,SP Heat,SP Cool,Heating (%),Cooling (%)', { time: 'Timestamp', indoor: 'T_in', outdoor: 'T_out', heatSetpoint: 'SP Heat', coolSetpoint: 'SP Cool', heating: { column: 'Heating (%)', as: 'percent' }, cooling: { column: 'Cooling (%)', as: 'percent' } }],
      ['DateTime,Room Temp [C],Outside Temp [C],Heat Setpoint,Cool Setpoint,Heat Stage 1 (sec),Compressor Cool (sec)', { indoor: 'Room Temp [C]', outdoor: 'Outside Temp [C]', heating: { column: 'Heat Stage 1 (sec)', as: 'seconds' }, cooling: { column: 'Compressor Cool (sec)', as: 'seconds' }, units: 'C' }],
      ['time,indoorTempF,outdoorTempF,heatRuntimeMin', { indoor: 'indoorTempF', outdoor: 'outdoorTempF', heating: { column: 'heatRuntimeMin', as: 'minutes' }, units: 'F' }],
      ['Zeitstempel,Innentemperatur,Außentemperatur,Brenner', { time: 'Zeitstempel', indoor: 'Innentemperatur', outdoor: 'Außentemperatur', heating: { column: 'Brenner' } }],
      ['Horodatage,Température intérieure (°C),Température extérieure (°C),Consigne chauffage (°C)', { indoor: 'Température intérieure (°C)', outdoor: 'Température extérieure (°C)', heatSetpoint: 'Consigne chauffage (°C)', units: 'C' }],
    ];
    for (const [header, expected] of cases) {
      const n = header.split(',').length;
      const row = (t: string) => [t, '20', '5', '21', '25', '1', '0'].slice(0, n).join(',');
      const p = writeLog(dir, 'h.csv', lines(header, row('2026-01-05T06:00:00Z'), row('2026-01-05T06:05:00Z')));
      const pv = await previewLog(p);
      expect(pv.problems, header).toEqual([]);
      expect(pv.mapping, header).toMatchObject(expected);
    }
  });
});
