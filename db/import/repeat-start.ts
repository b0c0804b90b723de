/**
 * A log whose first rows fall inside a repeated hour (clocks went back) and never come back to it.
 *
 * Local wall-clock times in a repeated interval name two instants. The ZoneResolver places them by
 * row order: in a file that runs oldest first, the rows are the first pass until the times step back
 * (or the file has moved past the change), the second pass after that. A log that *starts* inside the
 * repeated hour gives row order nothing to go on: "01:30, 01:45, 02:00, 02:15" on the fall-back night
 * is either the first pass followed by a missing hour, or the second pass running on without a gap.
 * A logger writes at a steady interval, so the reading that fits the log's own spacing is taken: when
 * putting the leading rows in the other pass turns the step to the next reading into the log's usual
 * step (instead of that step plus an hour), they are moved, and a warning says so. A file that runs
 * newest first is handled the same way from its other end.
 *
 * Works on the reader's sorted, de-duplicated times in place (the moved block stays in order: the
 * other pass holds no readings, or row order would have placed some there).
 */
import { formatOffset, formatWall, type ZoneResolver } from './timeparse.ts';

/**
 * Moves the leading block of readings inside a repeated interval to the other pass when that is what
 * the log's spacing says; returns a warning sentence when it did, else null.
 *
 * @param t sorted epoch ms UTC (changed in place), n of them used
 * @param firstInFile epoch ms of the first accepted row in file order (the leading row)
 * @param zone the resolver that placed the times (for its changes and row direction)
 * @param medianStep the log's usual step, ms, of sorted times (rows.ts medianStep; computed only when needed)
 */
export function placeLeadingRepeat(
  t: Float64Array,
  n: number,
  firstInFile: number,
  zone: ZoneResolver,
  medianStep: (t: Float64Array, n: number) => number,
): string | null {
  if (n < 2 || firstInFile !== firstInFile) return null;
  for (const c of zone.repeatedChanges()) {
    if (c.second) continue; // row order found both passes: nothing is ambiguous
    const len = c.before - c.after;
    // Oldest first: the leading rows were put in the first pass [at − len, at) and sit at the start.
    // Newest first: they were put in the second pass [at, at + len) and sit at the end.
    const lo = zone.descending ? c.at : c.at - len;
    const hi = lo + len;
    if (!(firstInFile >= lo && firstInFile < hi)) continue;
    let a = 0;
    let b = 0; // the block is t[a, b)
    if (!zone.descending) {
      if (!(t[0] >= lo && t[0] < hi)) continue;
      while (b < n && t[b] < hi) b++;
      if (b === n) continue; // the whole log is inside the repeated hour: nothing to tell by
    } else {
      if (!(t[n - 1] >= lo && t[n - 1] < hi)) continue;
      b = n;
      a = n;
      while (a > 0 && t[a - 1] >= lo) a--;
      if (a === 0) continue;
    }
    const step = medianStep(t, n);
    // The step between the block and its neighbour now, and after moving the block by one pass.
    const now = zone.descending ? t[a] - t[a - 1] : t[b] - t[b - 1];
    const moved = now - len;
    if (!(step > 0) || moved <= 0 || Math.abs(moved - step) >= Math.abs(now - step)) continue;
    const shift = zone.descending ? -len : len;
    for (let i = a; i < b; i++) t[i] += shift;
    const count = b - a;
    const pass = zone.descending ? `first pass (${formatOffset(c.before)})` : `second pass (${formatOffset(c.after)})`;
    const where = zone.descending ? 'ends' : 'starts';
    const start = formatWall(c.at + c.after);
    const end = formatWall(c.at + c.before).slice(11);
    return (
      `The log ${where} inside the repeated hour of ${start}–${end} ${zone.zone} (clocks went back): ` +
      `its ${count} reading${count === 1 ? '' : 's'} there ${count === 1 ? 'was' : 'were'} placed in the ${pass}, ` +
      `where ${count === 1 ? 'it joins' : 'they join'} the next reading at the log's usual step instead of leaving an hour's gap.`
    );
  }
  return null;
}
