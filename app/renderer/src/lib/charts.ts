/**
 * chart.js set up once for the app: the pieces we use, the zoom/pan plugin, the luxon date adapter
 * (so time axes follow the zone's time zone), and the app's colours. Long series come decimated from
 * the backend (core/history.ts: min–max with explicit gaps) rather than through chart.js's own
 * decimation, which cannot mark gaps and needs every reading in the page first.
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

export type LineDataset = ChartDataset<'line', Point[]>;
