/**
 * Reading the rows of a log into columns: streaming text in, typed arrays out (internal units), with
 * every row that cannot be read kept as a rejected row naming its line and column.
 *
 * Used by importLog: text chunks go in through feed(); finish() sorts by time, drops repeated times
 * (the first in the file is kept) and turns runtimes into fractions of each interval.
 */
import { medianInterval } from '../../core/interval.ts';
import Papa from 'papaparse';
import type { RuntimeFormat } from '../../core/mapping.ts';
import type { TempUnit } from '../../core/types.ts';
import { ImportError } from '../errors.ts';
import type { RejectedRow } from '../types.ts';
import { countChar } from './detect.ts';
import { makeTimeReader, type Plan } from './plan.ts';
import { placeLeadingRepeat } from './repeat-start.ts';
import { BAD, isEmptyCell, lastSuffix, readDuration, readNumber, readNumberRange, readOnOff } from './text.ts';
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

/** Median of t[i] − t[i−1] over the first n of a sorted array (core/interval.ts's rule). */
export function medianStep(t: Float64Array, n: number): number {
  return medianInterval(t, null, n);
}

/**
 * The streaming row reader of one import.
 *
 * Chunks with a quote character anywhere go through papaparse's parser (quotes, delimiters and line
 * breaks inside fields). Chunks without one — nearly every chunk of a thermostat export — take a fast
 * path that finds the field boundaries with indexOf and reads numbers straight out of the chunk text,
 * without making a string per field; a row is cut into strings only when it has to be rejected or
 * holds something unusual. Both paths read a row through the same row() code, so they accept, convert
 * and reject alike.
 */
export class RowReader {
  private readonly plan: Plan;
  private readonly parser: Papa.Parser;
  private readonly nl: string;
  private readonly nf: number;
  private readonly delim: string;
  private readonly comma: boolean;
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
  private readonly readTime: (text: string) => number;
  private readonly readTimeRange: ((s: string, start: number, end: number) => number) | null;
  readonly zone: ZoneResolver | null;
  private rowsSeen = 0;
  private cutOff = false;
  private overfull = { heat: 0, cool: 0 };
  // The row being read: its fields as strings (papaparse), or as ranges of `text` (fast path).
  private fields: string[] | null = null;
  private text = '';
  private readonly fs: Int32Array;
  private readonly fe: Int32Array;

  constructor(plan: Plan) {
    this.plan = plan;
    this.parser = new Papa.Parser({ delimiter: plan.delimiter, newline: plan.newline, quoteChar: '"' });
    this.nl = plan.newline === '\r' ? '\r' : '\n';
    this.nf = plan.header.length;
    this.delim = plan.delimiter;
    this.comma = plan.decimal === ',';
    this.fs = new Int32Array(this.nf);
    this.fe = new Int32Array(this.nf);
    this.cap = Math.max(1024, plan.expectedRows);
    this.t = new Float64Array(this.cap);
    this.ti = new Float64Array(this.cap);
    this.to = new Float64Array(this.cap);
    this.ths = new Float64Array(this.cap);
    this.tcs = new Float64Array(this.cap);
    this.th = new Float64Array(this.cap);
    this.tc = new Float64Array(this.cap);
    const tr = makeTimeReader(plan);
    this.readTime = tr.read;
    this.readTimeRange = plan.col.time >= 0 ? tr.readRange : null;
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

  // ── field access for the row being read ──

  private cell(k: number): string {
    return this.fields !== null ? this.fields[k] : this.text.substring(this.fs[k], this.fe[k]);
  }

  private num(k: number): number {
    return this.fields !== null ? readNumber(this.fields[k], this.comma) : readNumberRange(this.text, this.fs[k], this.fe[k], this.comma);
  }

  private empty(k: number): boolean {
    if (this.fields !== null) return isEmptyCell(this.fields[k]);
    const a = this.fs[k];
    const b = this.fe[k];
    return a >= b || (this.text.charCodeAt(a) <= 32 && this.text.substring(a, b).trim() === '');
  }

  private raw(): string {
    let raw: string;
    if (this.fields !== null) {
      const d = this.delim;
      raw = this.fields.map((x) => (x.includes(d) || x.includes('"') || x.includes('\n') || x.includes('\r') ? `"${x.replaceAll('"', '""')}"` : x)).join(d);
    } else raw = this.text.substring(this.fs[0], this.fe[this.nf - 1]);
    return raw.length > MAX_RAW ? `${raw.slice(0, MAX_RAW - 1)}…` : raw;
  }

  private reject(line: number, col: number, reason: string): void {
    const name = col >= 0 && col < this.nf ? this.plan.header[col] : null;
    this.rejected.push({ line, column: col >= 0 ? col + 1 : null, columnName: name, reason, raw: this.raw() });
  }

  /** Feeds decoded text; `final` = no more text follows. Throws ImportError for a quote never closed. */
  feed(text: string, final: boolean): void {
    const agg = this.partial.length === 0 ? text : this.partial + text;
    this.partial = '';
    if (agg.length === 0) return;
    if (agg.indexOf('"') < 0) this.feedFast(agg, final);
    else this.feedParsed(agg, final);
  }

  private feedParsed(agg: string, final: boolean): void {
    const res = this.parser.parse(agg, 0, !final) as {
      data: string[][];
      errors: { code: string; row?: number }[];
      meta: { cursor: number };
    };
    this.partial = final ? '' : agg.substring(res.meta.cursor);
    if (this.partial.length > MAX_PARTIAL) {
      throw new ImportError(this.plan.file, 'a quoted field opened on this line runs on for more than 16 MB without its closing " (a stray " character?); this is not a log export', { line: this.nextLine });
    }
    let open: Set<number> | null = null;
    for (const e of res.errors) {
      if (e.code === 'MissingQuotes' && e.row !== undefined) (open ??= new Set()).add(e.row);
    }
    const rows = res.data;
    const nl = this.nl;
    const last = rows.length - 1;
    for (let r = 0; r < rows.length; r++) {
      const f = rows[r];
      const line = this.nextLine;
      let span = 1;
      for (let k = 0; k < f.length; k++) if (f[k].length > 0) span += countChar(f[k], nl);
      this.nextLine += span;
      if (line <= this.plan.headerLine) continue;
      this.fields = f;
      if (open !== null && open.has(r)) {
        this.cutOff = final && r === last;
        this.reject(line, f.length - 1, `a quoted field is not closed${final && r === last ? ' (the file may be cut off)' : ''}`);
        continue;
      }
      this.row(line, final && r === last, f.length);
    }
    this.fields = null;
  }

  private feedFast(s: string, final: boolean): void {
    const crlf = this.plan.newline === '\r\n';
    const d = this.delim;
    const nf = this.nf;
    const fs = this.fs;
    const fe = this.fe;
    const header = this.plan.headerLine;
    const n = s.length;
    this.text = s;
    this.fields = null;
    let pos = 0;
    while (pos < n) {
      let end = s.indexOf(this.nl, pos);
      if (end < 0) {
        if (!final) break;
        end = n;
      }
      let stop = end;
      if (crlf && stop > pos && s.charCodeAt(stop - 1) === 13) stop--;
      const line = this.nextLine++;
      if (line > header && stop > pos) {
        // Field boundaries within [pos, stop).
        let k = 0;
        let p = pos;
        for (;;) {
          const q = s.indexOf(d, p);
          if (q < 0 || q >= stop) {
            if (k < nf) {
              fs[k] = p;
              fe[k] = stop;
            }
            k++;
            break;
          }
          if (k < nf) {
            fs[k] = p;
            fe[k] = q;
          }
          k++;
          p = q + 1;
        }
        if (k === nf) this.row(line, final && end === n, nf);
        else {
          // Too few or too many fields: read it as strings (blank lines, trailing delimiters, rejects).
          this.fields = s.substring(pos, stop).split(d);
          this.row(line, final && end === n, this.fields.length);
          this.fields = null;
        }
      }
      if (end === n) {
        pos = n;
        break;
      }
      pos = end + 1;
    }
    this.partial = final ? '' : s.substring(pos);
    this.text = '';
    if (this.partial.length > MAX_PARTIAL) {
      throw new ImportError(this.plan.file, 'a line is longer than 16 MB; this is not a log export', { line: this.nextLine });
    }
  }

  /** Reads the current row (this.fields, or ranges of this.text); `count` = its number of fields. */
  private row(line: number, lastOfFile: boolean, count: number): void {
    const nf = this.nf;
    if (count !== nf) {
      const f = this.fields!;
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
        );
        return;
      }
    } else {
      // A line of delimiters only is a blank line.
      let blank = true;
      for (let k = 0; k < nf; k++) if (!this.empty(k)) { blank = false; break; }
      if (blank) return;
    }
    this.rowsSeen++;
    const p = this.plan;
    const c = p.col;

    // Time.
    const tcol = c.time >= 0 ? c.time : c.date;
    if (c.time >= 0 ? this.empty(c.time) : this.empty(c.date) || this.empty(c.clock)) {
      this.reject(line, c.time >= 0 || this.empty(c.date) ? tcol : c.clock, 'the time is blank');
      return;
    }
    const t =
      this.fields === null && this.readTimeRange !== null
        ? this.readTimeRange(this.text, this.fs[c.time], this.fe[c.time])
        : this.readTime(c.time >= 0 ? this.cell(c.time) : `${this.cell(c.date).trim()} ${this.cell(c.clock).trim()}`);
    if (t !== t) {
      this.reject(line, tcol, timeError.reason);
      return;
    }
    if (t < TIME_RANGE_MS[0] || t > TIME_RANGE_MS[1]) {
      this.reject(line, tcol, `the time ${formatWall(t)} UTC is outside 1980–2100`);
      return;
    }

    // Indoor (required).
    let v = this.num(c.indoor);
    if (v !== v) {
      this.reject(line, c.indoor, 'the indoor temperature is blank');
      return;
    }
    if (v === BAD) {
      this.reject(line, c.indoor, `'${this.cell(c.indoor)}' is not a number`);
      return;
    }
    let unit = lastSuffix === 'F' || lastSuffix === 'C' ? lastSuffix : p.units.indoor;
    const indoor = toC(v, unit);
    if (!(indoor >= INDOOR_RANGE_C[0] && indoor <= INDOOR_RANGE_C[1])) {
      this.reject(line, c.indoor, `indoor ${fmtTemp(v, unit)} is outside the plausible ${INDOOR_RANGE_C[0]}…${INDOOR_RANGE_C[1]} °C`);
      return;
    }

    // Outdoor and setpoints (blank = NaN).
    let outdoor = NaN;
    if (c.outdoor >= 0) {
      v = this.num(c.outdoor);
      if (v === BAD) {
        this.reject(line, c.outdoor, `'${this.cell(c.outdoor)}' is not a number`);
        return;
      }
      if (v === v) {
        unit = lastSuffix === 'F' || lastSuffix === 'C' ? lastSuffix : p.units.outdoor;
        outdoor = toC(v, unit);
        if (!(outdoor >= OUTDOOR_RANGE_C[0] && outdoor <= OUTDOOR_RANGE_C[1])) {
          this.reject(line, c.outdoor, `outdoor ${fmtTemp(v, unit)} is outside the plausible ${OUTDOOR_RANGE_C[0]}…${OUTDOOR_RANGE_C[1]} °C`);
          return;
        }
      }
    }
    let hs = NaN;
    if (c.heatSetpoint >= 0) {
      hs = this.setpoint(c.heatSetpoint, p.units.heatSetpoint, line, 'heating');
      if (hs === BAD) return;
    }
    let cs = NaN;
    if (c.coolSetpoint >= 0) {
      cs = this.setpoint(c.coolSetpoint, p.units.coolSetpoint, line, 'cooling');
      if (cs === BAD) return;
    }

    // Runtime (seconds for seconds/minutes, else the fraction).
    let h = NaN;
    if (c.heating >= 0) {
      h = this.runtime(c.heating, p.heatingAs!, 'heat', line);
      if (h === BAD) return;
    }
    let k = NaN;
    if (c.cooling >= 0) {
      k = this.runtime(c.cooling, p.coolingAs!, 'cool', line);
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

  private setpoint(col: number, colUnit: TempUnit, line: number, what: string): number {
    const v = this.num(col);
    if (v === BAD) {
      this.reject(line, col, `'${this.cell(col)}' is not a number`);
      return BAD;
    }
    if (v !== v) return NaN;
    const unit = lastSuffix === 'F' || lastSuffix === 'C' ? lastSuffix : colUnit;
    const c = toC(v, unit);
    if (!(c >= SETPOINT_RANGE_C[0] && c <= SETPOINT_RANGE_C[1])) {
      this.reject(line, col, `${what} setpoint ${fmtTemp(v, unit)} is outside the plausible ${SETPOINT_RANGE_C[0]}…${SETPOINT_RANGE_C[1]} °C`);
      return BAD;
    }
    return c;
  }

  private runtime(col: number, as: RuntimeFormat, side: 'heat' | 'cool', line: number): number {
    if (as === 'onoff') {
      const s = this.cell(col);
      const v = readOnOff(s, side);
      if (v === BAD) {
        this.reject(line, col, `'${s}' is not an on/off state (expected 1/0, on/off, true/false, heat/cool/idle)`);
        return BAD;
      }
      return v;
    }
    let v = this.num(col);
    if (v === BAD && (as === 'seconds' || as === 'minutes')) {
      const s = this.cell(col);
      if (s.includes(':')) v = readDuration(s);
    }
    if (v === BAD) {
      this.reject(line, col, `'${this.cell(col)}' is not a number`);
      return BAD;
    }
    if (v !== v) return NaN;
    if (v < 0) {
      this.reject(line, col, `runtime ${this.cell(col).trim()} is negative`);
      return BAD;
    }
    switch (as) {
      case 'seconds':
        return v;
      case 'minutes':
        return v * 60;
      case 'percent':
        if (v > 100.5) {
          this.reject(line, col, `runtime ${this.cell(col).trim()} % is more than 100 %`);
          return BAD;
        }
        return Math.min(1, v / 100);
      case 'fraction':
        if (v > 1.005) {
          this.reject(line, col, `runtime ${this.cell(col).trim()} is outside 0–1 (if the column is in percent, give "as": "percent" in the mapping)`);
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
    const firstInFile = n > 0 ? t[0] : NaN;

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

    // A log that starts inside a repeated hour (clocks went back): its spacing decides the pass.
    if (this.zone) {
      const moved = placeLeadingRepeat(t, n, firstInFile, this.zone, medianStep);
      if (moved !== null) warnings.push(moved);
    }

    // Typical interval and gaps.
    let intervalMs = NaN;
    if (n >= 2) {
      intervalMs = medianStep(t, n);
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
