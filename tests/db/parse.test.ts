/**
 * The small readers under the import, checked against general-purpose references: Number() for
 * numbers, Date.parse for ISO 8601, luxon's DateTime.fromFormat for LDML patterns and Intl (the IANA tz
 * database of the platform) for zone offsets.
 */
import fc from 'fast-check';
import { DateTime } from 'luxon';
import { describe, expect, it } from 'vitest';
import { classifyHeader, detectDelimiter, headerUnit } from '../../db/import/detect.ts';
import { medianStep } from '../../db/import/rows.ts';
import { BAD, readNumber, readNumberRange, readOnOff } from '../../db/import/text.ts';
import { compilePattern, isoOut, parseEpoch, parseIso, ZoneResolver } from '../../db/import/timeparse.ts';

describe('numbers', () => {
  it('reads decimal text exactly as Number() does', () => {
    fc.assert(
      fc.property(fc.double({ min: -1000, max: 1000, noNaN: true }), fc.integer({ min: 0, max: 6 }), (x, d) => {
        const s = x.toFixed(d);
        expect(readNumber(s, false)).toBe(Number(s) === 0 ? 0 : Number(s));
        expect(readNumber(s.replace('.', ','), true)).toBe(Number(s) === 0 ? 0 : Number(s));
        const padded = `;${s};`;
        expect(readNumberRange(padded, 1, padded.length - 1, false)).toBe(Number(s) === 0 ? 0 : Number(s));
      }),
    );
  });

  it('tells blank from bad and reads units and percent after the number', () => {
    expect(readNumber('', false)).toBeNaN();
    expect(readNumber('N/A', false)).toBeNaN();
    expect(readNumber('--', false)).toBeNaN();
    expect(readNumber('abc', false)).toBe(BAD);
    expect(readNumber('0x1F', false)).toBe(BAD);
    expect(readNumber('1.2.3', false)).toBe(BAD);
    expect(readNumber('72°F', false)).toBe(72);
    expect(readNumber('−3,5 °C', true)).toBe(-3.5);
    expect(readNumber('45 %', false)).toBe(45);
    expect(readOnOff('Heating', 'heat')).toBe(1);
    expect(readOnOff('Heating', 'cool')).toBe(0);
    expect(readOnOff('idle', 'heat')).toBe(0);
    expect(readOnOff('1', 'cool')).toBe(1);
    expect(readOnOff('2', 'cool')).toBe(BAD);
  });

  it('takes the median step between sorted times', () => {
    expect(medianStep(Float64Array.from([0, 5, 10, 20]), 4)).toBe(5);
    expect(medianStep(Float64Array.from([0, 10, 20, 25, 30, 35, 40]), 7)).toBe(5);
    const many = new Float64Array(10_000);
    for (let i = 1; i < many.length; i++) many[i] = many[i - 1] + 1 + (i % 5000);
    const steps = Array.from(many.slice(1), (v, i) => v - many[i]).sort((a, b) => a - b);
    expect(medianStep(many, many.length)).toBe(steps[(steps.length - 1) >> 1]);
  });
});

describe('timestamps', () => {
  it('parses ISO 8601 with offsets exactly as Date.parse', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: Date.UTC(1990, 0, 1), max: Date.UTC(2090, 0, 1) }),
        fc.integer({ min: -12 * 4, max: 14 * 4 }),
        (ms, q) => {
          const off = q * 15;
          const local = new Date(ms + off * 60_000).toISOString().slice(0, 19);
          const sign = off < 0 ? '-' : '+';
          const a = Math.abs(off);
          const text = `${local}${sign}${String(Math.floor(a / 60)).padStart(2, '0')}:${String(a % 60).padStart(2, '0')}`;
          expect(parseIso(text)).toBe(true);
          expect(isoOut.wall - isoOut.offsetMin * 60_000).toBe(Date.parse(text));
        },
      ),
    );
    expect(parseIso('2026-01-05 06:00')).toBe(true);
    expect(isoOut.offsetMin).toBeNaN();
    expect(parseIso('2026-01-05T06:00:00.250Z') && isoOut.wall).toBe(Date.UTC(2026, 0, 5, 6, 0, 0, 250));
    expect(parseIso('2026-02-29T06:00:00Z')).toBe(false);
    expect(parseIso('2026-01-05T24:00:00Z')).toBe(false);
    expect(parseIso('2026-01-05T06:00:00+25:00')).toBe(false);
  });

  it('reads epoch numbers by magnitude', () => {
    const ms = Date.UTC(2026, 0, 5, 6, 0);
    expect(parseEpoch(String(ms / 1000))).toBe(ms);
    expect(parseEpoch(String(ms))).toBe(ms);
    expect(parseEpoch(String(ms * 1000))).toBe(ms);
    expect(parseEpoch(`${ms}000000`)).toBe(ms);
    expect(parseEpoch('12')).toBeNaN();
  });

  it('compiled numeric patterns agree with luxon fromFormat', () => {
    const patterns = ['dd.MM.yyyy HH:mm', 'M/d/yyyy h:mm a', 'yyyy/MM/dd HH:mm:ss', 'd-M-yy H:mm', "yyyy-MM-dd'T'HH:mm:ss.SSS", 'yyyyMMddHHmm'];
    fc.assert(
      fc.property(fc.integer({ min: Date.UTC(2001, 0, 1), max: Date.UTC(2098, 11, 31) }), fc.constantFrom(...patterns), (ms, pattern) => {
        const text = DateTime.fromMillis(ms, { zone: 'UTC' }).toFormat(pattern);
        const want = DateTime.fromFormat(text, pattern, { zone: 'UTC' }).toMillis();
        expect(compilePattern(pattern).parse(text)).toBe(want);
      }),
    );
    expect(compilePattern('dd.MM.yyyy HH:mm').parse('31.04.2026 10:00')).toBeNaN();
  });
});

describe('ZoneResolver', () => {
  const zones = ['America/New_York', 'America/Chicago', 'America/Denver', 'America/Los_Angeles', 'Europe/Berlin', 'Europe/London', 'Australia/Sydney', 'Australia/Lord_Howe', 'Asia/Kolkata', 'America/St_Johns'];

  it('puts unambiguous local times at the instant Intl shows that wall time', () => {
    for (const zone of zones) {
      const fmt = new Intl.DateTimeFormat('en-CA', {
        timeZone: zone,
        hourCycle: 'h23',
        year: 'numeric',
        month: '2-digit',
        day: '2-digit',
        hour: '2-digit',
        minute: '2-digit',
        second: '2-digit',
      });
      const resolver = new ZoneResolver(zone);
      fc.assert(
        fc.property(fc.integer({ min: Date.UTC(2020, 0, 1), max: Date.UTC(2030, 0, 1) }), (u0) => {
          const u = Math.floor(u0 / 60_000) * 60_000;
          const p = Object.fromEntries(fmt.formatToParts(new Date(u)).map((x) => [x.type, x.value]));
          const wall = Date.UTC(+p.year, +p.month - 1, +p.day, +p.hour, +p.minute, +p.second);
          // Skip the repeated hours (two instants show this wall time): those depend on row order.
          const other = [u - 3_600_000, u + 3_600_000, u - 1_800_000, u + 1_800_000];
          const ambiguous = other.some((v) => {
            const q = Object.fromEntries(fmt.formatToParts(new Date(v)).map((x) => [x.type, x.value]));
            return Date.UTC(+q.year, +q.month - 1, +q.day, +q.hour, +q.minute, +q.second) === wall;
          });
          if (!ambiguous) expect(resolver.toUtc(wall)).toBe(u);
        }),
        { numRuns: 300 },
      );
    }
  });

  it('handles the 30-minute change of Australia/Lord_Howe (IANA tz database: +10:30 ↔ +11:00)', () => {
    // 2026-04-05 02:00 LHDT (+11) → 01:30 LHST (+10:30): 01:30–02:00 repeats.
    const z = new ZoneResolver('Australia/Lord_Howe');
    expect(z.toUtc(Date.UTC(2026, 3, 5, 1, 45))).toBe(Date.UTC(2026, 3, 4, 14, 45));
    expect(z.toUtc(Date.UTC(2026, 3, 5, 1, 45))).toBe(Date.UTC(2026, 3, 4, 15, 15));
    expect(z.warnings()[0]).toMatch(/repeated 30 minutes of 2026-04-05 01:30–02:00 Australia\/Lord_Howe/);
  });
});

describe('detection helpers', () => {
  it('finds the delimiter that splits lines consistently', () => {
    expect(detectDelimiter('a;b;c\n1,5;2,5;3\n1,0;2,0;4\n', '\n')).toBe(';');
    expect(detectDelimiter('a,b,c\n1.5,2.5,3\n', '\n')).toBe(',');
    expect(detectDelimiter('a\tb\n1\t2\n', '\n')).toBe('\t');
    expect(detectDelimiter('just text\nmore text\n', '\n')).toBeNull();
  });

  it('reads units and roles from header words', () => {
    expect(headerUnit('Indoor Temp (°F)')).toBe('F');
    expect(headerUnit('indoor_c')).toBe('C');
    expect(headerUnit('Temperatur [C]')).toBe('C');
    expect(headerUnit('Zone C')).toBeNull();
    expect(headerUnit('Outside deg F')).toBe('F');
    expect(classifyHeader('Outdoor Humidity').role).toBeNull();
    expect(classifyHeader('Fan Runtime').role).toBeNull();
    expect(classifyHeader('Current (A)').role).toBeNull();
    expect(classifyHeader('Heat Run Time (min)')).toMatchObject({ role: 'heating', runtimeAs: 'minutes' });
    expect(classifyHeader('Cool Setpoint')).toMatchObject({ role: 'coolSetpoint' });
    expect(classifyHeader('Setpoint')).toMatchObject({ role: 'heatSetpoint', score: 1 });
    expect(classifyHeader('Time (UTC)')).toMatchObject({ role: 'time', utc: true });
  });
});
