/**
 * The median reading interval of a log: the one function the history summary, the fit and the import
 * use, with one ties rule.
 *
 * Rule: the lower median of the n − 1 intervals between consecutive times (the interval at sorted index
 * ⌊(n − 2)/2⌋): with an even count of intervals the smaller of the middle two, so a log alternating
 * 5- and 10-minute readings counts as 5-minute. Logs repeat a handful of interval lengths, so they are
 * counted in a small table (the last one matched tried first); a log with many distinct intervals is
 * sorted instead. Same value either way.
 *
 * @param time sorted times (ms)
 * @param keep optional indices into time of the readings to use (in order); default all
 * @param count how many of time (or keep) to use; default all
 * @returns the median interval, ms; NaN with fewer than two readings
 * @example medianInterval([0, 5, 10, 20]) // 5 (intervals 5, 5, 10)
 */
const MAX_DISTINCT = 64;

export function medianInterval(time: ArrayLike<number>, keep: ArrayLike<number> | null = null, count?: number): number {
  const n = count ?? (keep ? keep.length : time.length);
  if (n < 2) return NaN;
  const at = keep ? (k: number) => time[keep[k]!]! : (k: number) => time[k]!;
  const values = new Float64Array(MAX_DISTINCT);
  const counts = new Float64Array(MAX_DISTINCT);
  let distinct = 0;
  let last = 0;
  let prev = at(0);
  for (let k = 1; k < n; k++) {
    const t = at(k);
    const d = t - prev;
    prev = t;
    if (distinct > 0 && values[last] === d) {
      counts[last]!++;
      continue;
    }
    let j = 0;
    while (j < distinct && values[j] !== d) j++;
    if (j === distinct) {
      if (distinct === MAX_DISTINCT || d !== d) return sortedMedian(at, n);
      values[j] = d;
      counts[j] = 0;
      distinct++;
    }
    counts[j]!++;
    last = j;
  }
  const target = (n - 2) >> 1;
  const order = Array.from({ length: distinct }, (_, j) => j).sort((x, y) => values[x]! - values[y]!);
  let seen = 0;
  for (const j of order) {
    seen += counts[j]!;
    if (seen > target) return values[j]!;
  }
  return values[order[order.length - 1]!]!;
}

function sortedMedian(at: (k: number) => number, n: number): number {
  const d = new Float64Array(n - 1);
  for (let k = 1; k < n; k++) d[k - 1] = at(k) - at(k - 1);
  d.sort();
  return d[(n - 2) >> 1]!;
}
