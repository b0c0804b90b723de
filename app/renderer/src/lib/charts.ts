/**
 * chart.js set up once for the app: the pieces we use, the zoom/pan plugin, the luxon date adapter
 * (so time axes follow the zone's time zone), and the app's colours. Long series are decimated by
 * decimate.ts (min–max with explicit gaps) rather than chart.js's own decimation, which cannot mark gaps.
 */
import {
  Chart,
  Filler,
  LineController,
  LineElement,
  LinearScale,
  PointElement,
  ScatterController,
  TimeScale,
  Tooltip,
  type ChartDataset,
} from 'chart.js';
import zoomPlugin from 'chartjs-plugin-zoom';
import 'chartjs-adapter-luxon';

Chart.register(LineController, ScatterController, LineElement, PointElement, LinearScale, TimeScale, Tooltip, Filler, zoomPlugin);
Chart.defaults.font.family = getComputedStyle(document.documentElement).fontFamily || 'system-ui, sans-serif';
Chart.defaults.color = '#3d4a57';
// Chart text follows the page's type size (which grows on large screens).
Chart.defaults.font.size = Math.round(0.82 * (parseFloat(getComputedStyle(document.documentElement).fontSize) || 15));
Chart.defaults.animation = false;

export { Chart };

/** Series colours (our own palette; see styles.css). */
export const COLORS = {
  indoor: '#1d4a62',
  heatSetpoint: '#c97a3d',
  coolSetpoint: '#5e9bc8',
  outdoor: '#6a7a35',
  heat: 'rgba(184, 80, 43, 0.55)',
  heatFill: 'rgba(184, 80, 43, 0.28)',
  cool: 'rgba(47, 115, 168, 0.6)',
  coolFill: 'rgba(47, 115, 168, 0.25)',
  simulated: '#b8502b',
  grid: '#e6eaee',
  target: '#2f6b45',
};

export type Point = { x: number; y: number };

/** Points of a column where it has a value (chart.js then joins only points closer than spanGaps). */
export function points(time: ArrayLike<number>, values: ArrayLike<number | null>, map: (v: number) => number = (v) => v): Point[] {
  const out: Point[] = [];
  for (let i = 0; i < time.length; i++) {
    const v = values[i];
    if (v !== null && v !== undefined && Number.isFinite(v)) out.push({ x: time[i]!, y: map(v) });
  }
  return out;
}

/** Median spacing of the readings, ms (for spanGaps: readings further apart than a few of these are not joined). */
export function medianStep(time: ArrayLike<number>): number {
  const n = Math.min(time.length - 1, 2000);
  if (n < 1) return 3_600_000;
  const d: number[] = [];
  const stride = Math.max(1, Math.floor((time.length - 1) / n));
  for (let i = stride; i < time.length; i += stride) d.push(time[i]! - time[i - stride]!);
  d.sort((a, b) => a - b);
  return d[Math.floor(d.length / 2)]! / stride;
}

/**
 * Runtime (fraction of each reading's interval) averaged over clock hours, as % of the hour, one point
 * at the start of each hour (drawn as steps). Hours without runtime data are left out.
 */
export function hourlyRuntime(time: ArrayLike<number>, frac: ArrayLike<number | null>): Point[] {
  const out: Point[] = [];
  let hour = NaN;
  let sum = 0;
  let n = 0;
  const flush = () => {
    if (n > 0) out.push({ x: hour, y: (100 * sum) / n });
  };
  for (let i = 0; i < time.length; i++) {
    const v = frac[i];
    if (v === null || v === undefined || !Number.isFinite(v)) continue;
    // The runtime covers the interval ending at time[i]: attribute it to the hour that interval lies in.
    const h = Math.floor((time[i]! - 1) / 3_600_000) * 3_600_000;
    if (h !== hour) {
      flush();
      hour = h;
      sum = 0;
      n = 0;
    }
    sum += v;
    n++;
  }
  flush();
  return out;
}

export type LineDataset = ChartDataset<'line', Point[]>;
