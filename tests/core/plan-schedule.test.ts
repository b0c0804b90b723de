/** The schedule file format: conversion to internal units and messages that name the key, line and column. */
import fs from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { parseSchedule, parseScheduleText, ScheduleError, setpointsAt, scheduleTimeline, designClock, zonedClock } from '../../core/plan/index.ts';

const base = {
  name: 'Test',
  units: 'F',
  days: { weekdays: [{ from: '07:00', to: '18:00', heat: 70, cool: 76 }], weekend: [] },
  unoccupied: { heat: 60, cool: 82 },
};

const err = (json: unknown): ScheduleError => {
  try {
    parseSchedule(json);
  } catch (e) {
    if (e instanceof ScheduleError) return e;
    throw e;
  }
  throw new Error('expected a ScheduleError');
};

describe('schedule format', () => {
  it('converts to °C and K (1 K = 1.8 °F, exact)', () => {
    const s = parseSchedule({ ...base, deadband: 1.8, setbackFloor: 50 });
    expect(s.days[0]![0]!.heatC).toBeCloseTo((70 - 32) / 1.8, 12);
    expect(s.days[0]![0]!.fromMinute).toBe(420);
    expect(s.days[0]![0]!.toMinute).toBe(1080);
    expect(s.days[5]).toEqual([]);
    expect(s.deadbandK).toBeCloseTo(1, 12);
    expect(s.setbackFloorC).toBeCloseTo(10, 12);
    expect(s.optimalStart).toBe(true);
    expect(s.baseline.heatC).toBeCloseTo((70 - 32) / 1.8, 12); // default: the occupied setpoints
    expect(s.baseline.coolC).toBeCloseTo((76 - 32) / 1.8, 12);
  });

  it('defaults the freeze floor to 55 °F or 13 °C (common guidance)', () => {
    expect(parseSchedule(base).setbackFloorC).toBeCloseTo((55 - 32) / 1.8, 12);
    expect(parseSchedule({ ...base, units: 'C', unoccupied: { heat: 16 }, days: { everyday: [{ from: '08:00', to: '17:00', heat: 21 }] } }).setbackFloorC).toBe(13);
  });

  it('a specific day overrides "weekdays"/"weekend", which override "everyday"', () => {
    const s = parseSchedule({
      ...base,
      days: { everyday: [{ from: '08:00', to: '12:00', heat: 68 }], weekdays: [{ from: '07:00', to: '18:00', heat: 70 }], fri: [{ from: '07:00', to: '13:00', heat: 70 }] },
    });
    expect(s.days[0]![0]!.toMinute).toBe(18 * 60);
    expect(s.days[4]![0]!.toMinute).toBe(13 * 60);
    expect(s.days[6]![0]!.toMinute).toBe(12 * 60);
    expect(setpointsAt(s, 4, 12 * 60 + 59).occupied).toBe(true);
    expect(setpointsAt(s, 4, 13 * 60).occupied).toBe(false);
  });

  it('accepts "off" and 24:00', () => {
    const s = parseSchedule({ ...base, days: { everyday: [{ from: '00:00', to: '24:00', heat: 70, cool: 'off' }] }, unoccupied: { heat: 'off' } });
    expect(s.days[2]![0]!.coolC).toBeNull();
    expect(s.unoccupied.heatC).toBeNull();
    expect(s.days[2]![0]!.toMinute).toBe(1440);
  });

  it('names the key in every message', () => {
    expect(err({ ...base, days: { ...base.days, mon: [{ from: '07:00', to: '25:00', heat: 70 }] } }).message).toMatch(/^days\.mon\[0\]\.to: expected a time "HH:MM"/);
    expect(err({ ...base, days: { weekdays: [{ from: '18:00', to: '07:00', heat: 70 }], weekend: [] } }).message).toMatch(/^days\.weekdays\[0\]\.to: .*split a period that runs past midnight/);
    expect(err({ ...base, units: 'K' }).key).toBe('units');
    expect(err({ ...base, unoccupied: { heat: 'low' } }).message).toMatch(/^unoccupied\.heat: expected a temperature/);
    expect(err({ ...base, colour: 'red' }).message).toMatch(/^colour: unknown key "colour"/);
    expect(err({ name: 'x', units: 'F', unoccupied: {} }).message).toMatch(/^days: this key is required/);
    expect(err({ ...base, days: { weekdays: [] } }).message).toMatch(/^days: no entry for sat/);
    expect(err({ ...base, days: { everyday: [{ from: '07:00', to: '12:00', heat: 70 }, { from: '11:00', to: '14:00', heat: 70 }] } }).message).toMatch(/^days\.everyday: occupied periods overlap/);
    expect(err({ ...base, days: { everyday: [{ from: '07:00', to: '12:00', heat: 75, cool: 74 }] } }).message).toMatch(/^days\.everyday\[0\]: the cooling setpoint must be at least the deadband above/);
    expect(err({ ...base, days: { everyday: [{ from: '07:00', to: '12:00' }] } }).message).toMatch(/needs a "heat" or a "cool" setpoint/);
    expect(err({ ...base, equipment: { heatingCapacity: { value: -1, unit: 'kW' } } }).message).toMatch(/^equipment\.heatingCapacity\.value: a capacity must be greater than 0/);
    expect(err({ ...base, equipment: { heatPump: { capacityAt: [{ outdoor: 47, percent: 100 }, { outdoor: 47, percent: 60 }] } } }).message).toMatch(/^equipment\.heatPump\.capacityAt: the two points/);
  });

  it('reports JSON syntax errors and schema errors with file, line and column', () => {
    const bad = '{\n  "name": "x",\n  "units": "F"\n  "days": {}\n}';
    const e1 = (() => {
      try {
        parseScheduleText(bad, 'week.json');
      } catch (e) {
        return e as ScheduleError;
      }
    })()!;
    expect(e1).toBeInstanceOf(ScheduleError);
    expect([e1.line, e1.column]).toEqual([4, 3]); // the "days" key where a comma was expected
    expect(e1.message).toMatch(/^week\.json:4:3: not valid JSON: expected ","/);

    const text = JSON.stringify({ ...base, days: { weekdays: [{ from: '07:00', to: '18:00', heat: 70 }], weekend: [{ from: '9', to: '12:00', heat: 70 }] } }, null, 2);
    const e2 = (() => {
      try {
        parseScheduleText(text, 'week.json');
      } catch (e) {
        return e as ScheduleError;
      }
    })()!;
    const lineOfValue = text.split('\n').findIndex((l) => l.includes('"from": "9"')) + 1;
    expect(e2.key).toBe('days.weekend[0].from');
    expect(e2.line).toBe(lineOfValue);
    expect(e2.column).toBe(text.split('\n')[lineOfValue - 1]!.indexOf('"9"') + 1);
    expect(e2.message).toMatch(new RegExp(`^week\\.json:${lineOfValue}:\\d+: days\\.weekend\\[0\\]\\.from: `));
  });

  it('lays the schedule on the clock, merging periods across midnight', () => {
    const s = parseSchedule({ ...base, units: 'C', unoccupied: { heat: 16 }, days: { everyday: [{ from: '00:00', to: '06:00', heat: 20 }, { from: '22:00', to: '24:00', heat: 20 }] } });
    const tl = scheduleTimeline(s, designClock(7));
    expect(tl[0]).toMatchObject({ startMinute: 0, endMinute: 360, occupied: true });
    expect(tl[2]).toMatchObject({ startMinute: 22 * 60, endMinute: 30 * 60, occupied: true }); // Mon 22:00 – Tue 06:00 as one
    expect(tl[tl.length - 1]!.endMinute).toBe(7 * 1440);
  });

  it('honours a daylight-saving change (a 23-hour day)', () => {
    // Europe/Berlin changed to summer time on 2025-03-30 (clocks 02:00 → 03:00) [memory; EU rule: last Sunday of March].
    const clock = zonedClock('2025-03-24', 'Europe/Berlin', 7);
    expect(clock.hoursAt(7, 0)).toBe(167);
    const s = parseSchedule({ ...base, units: 'C', unoccupied: { heat: 16 }, days: { everyday: [{ from: '07:00', to: '18:00', heat: 20 }] } });
    const tl = scheduleTimeline(s, clock);
    const sunday = tl.find((iv) => iv.occupied && iv.startMinute >= 6 * 1440)!;
    expect(sunday.startMinute).toBe(6 * 1440 + 6 * 60); // 07:00 local on the short day = 6 h after midnight
    expect(clock.dayLabel(6)).toBe('Sun 2025-03-30');
  });

  it('the example schedules in assets/plans are valid', () => {
    const dir = path.resolve(import.meta.dirname, '../../assets/plans');
    const files = fs.readdirSync(dir).filter((f) => f.endsWith('.json'));
    expect(files.length).toBeGreaterThanOrEqual(3);
    for (const f of files) expect(() => parseScheduleText(fs.readFileSync(path.join(dir, f), 'utf8'), f)).not.toThrow();
  });
});
