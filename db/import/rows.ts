/**
 * Reading the rows of a log into columns: streaming text in, typed arrays out (internal units), with
 * every row that cannot be read kept as a rejected row naming its line and column.
 *
 * Used by importLog: text chunks go in through feed(); finish() sorts by time, drops repeated times
 * (the first in the file is kept) and turns runtimes into fractions of each interval.
 */
import Papa from 'papaparse';
import type { RuntimeFormat } from '../../core/mapping.ts';
import type { TempUnit } from '../../core/types.ts';
import { ImportError } from '../errors.ts';
import type { RejectedRow } from '../types.ts';
import { countChar } from './detect.ts';
import { makeTimeReader, type Plan } from './plan.ts';
import { BAD, isEmptyCell, lastSuffix, readDuration, readNumber, readOnOff } from './text.ts';
import { formatWall, timeError, type ZoneResolver } from './timeparse.ts';

/** Plausible ranges, °C: readings outside are rejected as absurd (sensor faults, wrong column, wrong unit). */
export const INDOOR_RANGE_C: [number, number] = [-60, 70];
export const OUTDOOR_RANGE_C: [number, number] = [-80, 70];
/** Setpoints use the indoor range. */
export const SETPOINT_RANGE_C = INDOOR_RANGE_C;
/** Timestamps outside 1980–2100 are refused (a misread epoch or a clock never set). */
export const TIME_RANGE_MS: [number, number] = [Date.UTC(1980, 0, 1), Date.UTC(2100, 0, 1)];

const MAX_RAW = 1000;
/** A single row longer than this means a quoted field was never closed. */
const MAX_PARTIAL = 16 * 1024 * 1024;

export interface ReadColumns {
  count: number;
  time: Float64Array;
  indoor: Float64Array;
  outdoor: Float64Array;
  heatSetpoint: Float64Array;
  coolSetpoint: Float64Array;
  heat: Float64Array;
  cool: Float64Array;
  rejected: RejectedRow[];
  duplicatesInFile: number;
  /** Repeated times whose readings differed from the first one kept. */
  conflictingDuplicates: number;
  /** Median spacing of the readings, ms (NaN with fewer than two). */
  intervalMs: number;
  warnings: string[];
}

function fmtTemp(v: number, unit: TempUnit): string {
  return `${Number.isInteger(v) ? v : +v.toFixed(2)} °${unit}`;
}

function toC(v: number, unit: TempUnit): number {
  return unit === 'C' ? v : (v - 32) / 1.8;
}

/** The streaming row reader of one import. */
export class RowReader {
  private readonly plan: Plan;
  private readonly parser: Papa.Parser;
  private readonly nl: string;
  private readonly nf: number;
  private partial = '';
  private nextLine = 1;
  private cap: number;
  private n = 0;
  private t: Float64Array;
  private ti: Float64Array;
  private to: Float64Array;
  private ths: Float64Array;
  private tcs: Float64Array;
  private th: Float64Array;
  private tc: Float64Array;
  /** Rows that could not be read, in file order. */
  readonly rejected: RejectedRow[] = [];
  private readonly readTime: (f: string[]) => number;
  readonly zone: ZoneResolver | null;
  private rowsSeen = 0;
  private cutOff = false;
  private overfull = { heat: 0, cool: 0 };

  constructor(plan: Plan) {
    this.plan = plan;
    this.parser = new Papa.Parser({ delimiter: plan.delimiter, newline: plan.newline, quoteChar: '"' });
    this.nl = plan.newline === '\r' ? '\r' : '\n';
    this.nf = plan.header.length;
    this.cap = Math.max(1024, Math.ceil(plan.bytes / 24));
    this.t = new Float64Array(this.cap);
    this.ti = new Float64Array(this.cap);
    this.to = new Float64Array(this.cap);
    this.ths = new Float64Array(this.cap);
    this.tcs = new Float64Array(this.cap);
    this.th = new Float64Array(this.cap);
    this.tc = new Float64Array(this.cap);
    const tr = makeTimeReader(plan);
    this.readTime = tr.read;
    this.zone = tr.zone;
  }

  private grow(): void {
    const cap = Math.ceil(this.cap * 1.5) + 1024;
    const g = (a: Float64Array) => {
      const b = new Float64Array(cap);
      b.set(a.subarray(0, this.n));
      return b;
    };
    this.t = g(this.t);
    this.ti = g(this.ti);
    this.to = g(this.to);
    this.ths = g(this.ths);
    this.tcs = g(this.tcs);
    this.th = g(this.th);
    this.tc = g(this.tc);
    this.cap = cap;
  }

  private reject(line: number, col: number, reason: string, f: string[]): void {
    const d = this.plan.delimiter;
    let raw = f.map((x) => (x.includes(d) || x.includes('"') || x.includes('\n') || x.includes('\r') ? `"${x.replaceAll('"', '""')}"` : x)).join(d);
    if (raw.length > MAX_RAW) raw = `${raw.slice(0, MAX_RAW - 1)}…`;
    const name = col >= 0 && col < this.nf ? this.plan.header[col] : null;
    this.rejected.push({ line, column: col >= 0 ? col + 1 : null, columnName: name, reason, raw });
  }

  /** Feeds decoded text; `final` = no more text follows. Throws ImportError for a quote never closed. */
  feed(text: string, final: boolean): void {
    const agg = this.partial.length === 0 ? text : this.partial + text;
    if (agg.length === 0) return;
    const res = this.parser.parse(agg, 0, !final) as {
      data: string[][];
      errors: { code: string; row?: number }[];
      meta: { cursor: number };
    };
    this.partial = final ? '' : agg.substring(res.meta.cursor);
    if (this.partial.length > MAX_PARTIAL) {
      throw new ImportError(this.plan.file, 'a quoted field is opened here and never closed (a stray " character?)', { line: this.nextLine });
    }
    let open: Set<number> | null = null;
    for (const e of res.errors) {
      if (e.code === 'MissingQuotes' && e.row !== undefined) (open ??= new Set()).add(e.row);
    }
    const rows = res.data;
    const quoted = agg.indexOf('"') >= 0;
    const nl = this.nl;
    const last = rows.length - 1;
    for (let r = 0; r < rows.length; r++) {
      const f = rows[r];
      const line = this.nextLine;
      let span = 1;
      if (quoted) for (let k = 0; k < f.length; k++) if (f[k].length > 0) span += countChar(f[k], nl);
      this.nextLine += span;
      if (line <= this.plan.headerLine) continue;
      if (open !== null && open.has(r)) {
        this.cutOff = final && r === last;
        this.reject(line, -1, `a quoted field is not closed${final && r === last ? ' (the file may be cut off)' : ''}`, f);
        continue;
      }
      this.row(f, line, final && r === last);
    }
  }

  private row(f: string[], line: number, lastOfFile: boolean): void {
    const nf = this.nf;
    if (f.length !== nf) {
      let blank = true;
      for (let k = 0; k < f.length; k++) if (f[k].trim() !== '') { blank = false; break; }
      if (blank) return; // an empty line
      let extraBlank = f.length > nf;
      for (let k = nf; k < f.length && extraBlank; k++) if (f[k].trim() !== '') extraBlank = false;
      if (!extraBlank) {
        const cut = lastOfFile && f.length < nf;
        if (cut) this.cutOff = true;
        this.reject(
          line,
          f.length < nf ? f.length : nf,
          `the row has ${f.length} field${f.length === 1 ? '' : 's'}, the header has ${nf}${cut ? ' (the file may be cut off)' : ''}`,
          f,
        );
        return;
      }
    }
    this.rowsSeen++;
    const p = this.plan;
    const c = p.col;
    const comma = p.decimal === ',';

    // Time.
    const tcol = c.time >= 0 ? c.time : c.date;
    if (c.time >= 0 ? isEmptyCell(f[c.time]) : isEmptyCell(f[c.date]) || isEmptyCell(f[c.clock])) {
      this.reject(line, c.time >= 0 || isEmptyCell(f[c.date]) ? tcol : c.clock, 'the time is blank', f);
      return;
    }
    const t = this.readTime(f);
    if (t !== t) {
      this.reject(line, tcol, timeError.reason, f);
      return;
    }
    if (t < TIME_RANGE_MS[0] || t > TIME_RANGE_MS[1]) {
      this.reject(line, tcol, `the time ${formatWall(t)} UTC is outside 1980–2100`, f);
      return;
    }

    // Indoor (required).
    const si = f[c.indoor];
    let v = readNumber(si, comma);
    if (v !== v) {
      this.reject(line, c.indoor, 'the indoor temperature is blank', f);
      return;
    }
    if (v === BAD) {
      this.reject(line, c.indoor, `'${si}' is not a number`, f);
      return;
    }
    let unit = lastSuffix === 'F' || lastSuffix === 'C' ? lastSuffix : p.units.indoor;
    const indoor = toC(v, unit);
    if (!(indoor >= INDOOR_RANGE_C[0] && indoor <= INDOOR_RANGE_C[1])) {
      this.reject(line, c.indoor, `indoor ${fmtTemp(v, unit)} is outside the plausible ${INDOOR_RANGE_C[0]}…${INDOOR_RANGE_C[1]} °C`, f);
      return;
    }

    // Outdoor and setpoints (blank = NaN).
    let outdoor = NaN;
    if (c.outdoor >= 0) {
      const s = f[c.outdoor];
      v = readNumber(s, comma);
      if (v === BAD) {
        this.reject(line, c.outdoor, `'${s}' is not a number`, f);
        return;
      }
      if (v === v) {
        unit = lastSuffix === 'F' || lastSuffix === 'C' ? lastSuffix : p.units.outdoor;
        outdoor = toC(v, unit);
        if (!(outdoor >= OUTDOOR_RANGE_C[0] && outdoor <= OUTDOOR_RANGE_C[1])) {
          this.reject(line, c.outdoor, `outdoor ${fmtTemp(v, unit)} is outside the plausible ${OUTDOOR_RANGE_C[0]}…${OUTDOOR_RANGE_C[1]} °C`, f);
          return;
        }
      }
    }
    let hs = NaN;
    if (c.heatSetpoint >= 0) {
      hs = this.setpoint(f, c.heatSetpoint, p.units.heatSetpoint, comma, line, 'heating');
      if (hs === BAD) return;
    }
    let cs = NaN;
    if (c.coolSetpoint >= 0) {
      cs = this.setpoint(f, c.coolSetpoint, p.units.coolSetpoint, comma, line, 'cooling');
      if (cs === BAD) return;
    }

    // Runtime (seconds for seconds/minutes, else the fraction).
    let h = NaN;
    if (c.heating >= 0) {
      h = this.runtime(f, c.heating, p.heatingAs!, 'heat', comma, line);
      if (h === BAD) return;
    }
    let k = NaN;
    if (c.cooling >= 0) {
      k = this.runtime(f, c.cooling, p.coolingAs!, 'cool', comma, line);
      if (k === BAD) return;
    }

    if (this.n === this.cap) this.grow();
    const n = this.n++;
    this.t[n] = t;
    this.ti[n] = indoor;
    this.to[n] = outdoor;
    this.ths[n] = hs;
    this.tcs[n] = cs;
    this.th[n] = h;
    this.tc[n] = k;
  }

  private setpoint(f: string[], col: number, colUnit: TempUnit, comma: boolean, line: number, what: string): number {
    const s = f[col];
    const v = readNumber(s, comma);
    if (v === BAD) {
      this.reject(line, col, `'${s}' is not a number`, f);
      return BAD;
    }
    if (v !== v) return NaN;
    const unit = lastSuffix === 'F' || lastSuffix === 'C' ? lastSuffix : colUnit;
    const c = toC(v, unit);
    if (!(c >= SETPOINT_RANGE_C[0] && c <= SETPOINT_RANGE_C[1])) {
      this.reject(line, col, `${what} setpoint ${fmtTemp(v, unit)} is outside the plausible ${SETPOINT_RANGE_C[0]}…${SETPOINT_RANGE_C[1]} °C`, f);
      return BAD;
    }
    return c;
  }

  private runtime(f: string[], col: number, as: RuntimeFormat, side: 'heat' | 'cool', comma: boolean, line: number): number {
    const s = f[col];
    if (as === 'onoff') {
      const v = readOnOff(s, side);
      if (v === BAD) {
        this.reject(line, col, `'${s}' is not an on/off state (expected 1/0, on/off, true/false, heat/cool/idle)`, f);
        return BAD;
      }
      return v;
    }
    let v = readNumber(s, comma);
    if (v === BAD && (as === 'seconds' || as === 'minutes') && s.includes(':')) v = readDuration(s);
    if (v === BAD) {
      this.reject(line, col, `'${s}' is not a number`, f);
      return BAD;
    }
    if (v !== v) return NaN;
    if (v < 0) {
      this.reject(line, col, `runtime ${s} is negative`, f);
      return BAD;
    }
    switch (as) {
      case 'seconds':
        return v;
      case 'minutes':
        return v * 60;
      case 'percent':
        if (v > 100.5) {
          this.reject(line, col, `runtime ${s} % is more than 100 %`, f);
          return BAD;
        }
        return Math.min(1, v / 100);
      case 'fraction':
        if (v > 1.005) {
          this.reject(line, col, `runtime ${s} is outside 0–1 (if the column is in percent, give "as": "percent" in the mapping)`, f);
          return BAD;
        }
        return Math.min(1, v);
    }
  }

  /** Sorts, drops repeated times, converts runtimes to fractions of the interval ending at each reading. */
  finish(): ReadColumns {
    const warnings: string[] = [];
    let n = this.n;
    let t = this.t, ti = this.ti, to = this.to, ths = this.ths, tcs = this.tcs, th = this.th, tc = this.tc;

    // Time order (stable: among equal times the first in the file comes first).
    let sorted = true;
    for (let i = 1; i < n; i++) if (t[i] < t[i - 1]) { sorted = false; break; }
    if (!sorted) {
      const order = new Uint32Array(n);
      for (let i = 0; i < n; i++) order[i] = i;
      const tt = t;
      order.sort((a, b) => tt[a] - tt[b] || a - b);
      const permute = (a: Float64Array) => {
        const b = new Float64Array(n);
        for (let i = 0; i < n; i++) b[i] = a[order[i]];
        return b;
      };
      t = permute(t); ti = permute(ti); to = permute(to); ths = permute(ths); tcs = permute(tcs); th = permute(th); tc = permute(tc);
      let moved = 0;
      for (let i = 0; i < n; i++) if (order[i] !== i) moved++;
      if (!this.plan.descending) warnings.push(`${moved} reading${moved === 1 ? ' was' : 's were'} out of time order in the file; all are stored in time order.`);
    }

    // Repeated times: keep the first (in place).
    let dup = 0;
    let conflicting = 0;
    let m = n > 0 ? 1 : 0;
    const same = (a: number, b: number) => a === b || (a !== a && b !== b);
    for (let i = 1; i < n; i++) {
      if (t[i] === t[m - 1]) {
        dup++;
        const j = m - 1;
        if (!same(ti[i], ti[j]) || !same(to[i], to[j]) || !same(th[i], th[j]) || !same(tc[i], tc[j])) conflicting++;
        continue;
      }
      if (m !== i) {
        t[m] = t[i]; ti[m] = ti[i]; to[m] = to[i]; ths[m] = ths[i]; tcs[m] = tcs[i]; th[m] = th[i]; tc[m] = tc[i];
      }
      m++;
    }
    n = m;
    if (dup > 0) {
      warnings.push(
        `${dup} row${dup === 1 ? '' : 's'} repeated a time already in the file and ${dup === 1 ? 'was' : 'were'} counted as duplicate${dup === 1 ? '' : 's'}` +
          (conflicting > 0 ? ` (${conflicting} with different readings; the first row of each time was kept).` : '.'),
      );
    }

    // Typical interval and gaps.
    let intervalMs = NaN;
    if (n >= 2) {
      const d = new Float64Array(n - 1);
      for (let i = 1; i < n; i++) d[i - 1] = t[i] - t[i - 1];
      d.sort();
      intervalMs = d[(n - 1) >> 1];
      const gapMs = Math.max(3_600_000, 6 * intervalMs);
      let gaps = 0;
      let longest = 0;
      let longestAt = 0;
      for (let i = 1; i < n; i++) {
        const g = t[i] - t[i - 1];
        if (g > gapMs) {
          gaps++;
          if (g > longest) {
            longest = g;
            longestAt = t[i - 1];
          }
        }
      }
      if (gaps > 0) {
        const hours = longest / 3_600_000;
        warnings.push(
          `The log has ${gaps} gap${gaps === 1 ? '' : 's'} longer than ${Math.round(gapMs / 60_000)} min; the longest is ${hours >= 48 ? `${(hours / 24).toFixed(1)} days` : `${hours.toFixed(1)} h`} after ${formatWall(longestAt)} UTC.`,
        );
      }
    } else if (this.plan.sampleIntervalMs === this.plan.sampleIntervalMs) intervalMs = this.plan.sampleIntervalMs;

    // Runtime to fractions of (t[i-1], t[i]].
    const p = this.plan;
    const starting = p.runtimeInterval === 'starting';
    const convert = (u: Float64Array, as: RuntimeFormat | null, side: 'heat' | 'cool') => {
      if (as === null) return;
      const seconds = as === 'seconds' || as === 'minutes';
      if (starting) {
        for (let i = n - 1; i >= 1; i--) u[i] = u[i - 1];
        if (n > 0) u[0] = NaN;
      }
      if (!seconds) return;
      let over = 0;
      for (let i = 0; i < n; i++) {
        const s = u[i];
        if (s !== s) continue;
        const len = i > 0 ? t[i] - t[i - 1] : intervalMs;
        let fr = len > 0 ? (s * 1000) / len : NaN;
        if (fr > 1) {
          if (fr > 1.05) over++;
          fr = 1;
        }
        u[i] = fr;
      }
      if (over > 0) this.overfull[side] = over;
    };
    convert(th, p.heatingAs, 'heat');
    convert(tc, p.coolingAs, 'cool');
    for (const side of ['heat', 'cool'] as const) {
      const over = this.overfull[side];
      if (over > 0) {
        warnings.push(
          `${over} reading${over === 1 ? '' : 's'} reported more ${side === 'heat' ? 'heating' : 'cooling'} runtime than the time since the previous reading; capped at 100 % of the interval.`,
        );
      }
    }
    if (starting && n > 0) warnings.push('Runtime was read as belonging to the interval that starts at each row (moved to the next reading).');
    if (this.cutOff) warnings.push('The last row of the file is incomplete (the file may be cut off); it was rejected.');
    if (this.zone) warnings.push(...this.zone.warnings());

    return {
      count: n,
      time: t,
      indoor: ti,
      outdoor: to,
      heatSetpoint: ths,
      coolSetpoint: tcs,
      heat: th,
      cool: tc,
      rejected: this.rejected,
      duplicatesInFile: dup,
      conflictingDuplicates: conflicting,
      intervalMs,
      warnings,
    };
  }

  /** Data rows seen (accepted or rejected for their values, not counting blank lines). */
  get rows(): number {
    return this.rowsSeen;
  }
}
