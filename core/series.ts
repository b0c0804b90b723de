/** A log's readings picked by index: the same columns, only the rows asked for (in the order given). */
import type { ZoneSeries } from './types.ts';

/** The readings of `series` at the indices `rows`. */
export function seriesRows(series: ZoneSeries, rows: ArrayLike<number>): ZoneSeries {
  const pick = (a: Float64Array) => {
    const out = new Float64Array(rows.length);
    for (let k = 0; k < rows.length; k++) out[k] = a[rows[k]!]!;
    return out;
  };
  return {
    time: pick(series.time),
    indoor: pick(series.indoor),
    outdoor: pick(series.outdoor),
    heatSetpoint: pick(series.heatSetpoint),
    coolSetpoint: pick(series.coolSetpoint),
    heat: pick(series.heat),
    cool: pick(series.cool),
  };
}
