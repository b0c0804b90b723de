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
  type ChartOptions,
  type TimeScaleOptions,
  type TooltipItem,
} from 'chart.js';
import zoomPlugin from 'chartjs-plugin-zoom';
import 'chartjs-adapter-luxon';
import type { TempUnit } from '../../../../core/types.ts';
import { fromCelsius } from '../../../../core/units.ts';
import { degreeLabel, duration, hoursClock, num } from './format.ts';

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
  heatSetpoint: '#a8467f',
  coolSetpoint: '#2a9d84',
  outdoor: '#6a7a35',
  heat: 'rgba(168, 70, 127, 0.55)',
  heatFill: 'rgba(168, 70, 127, 0.28)',
  cool: 'rgba(0, 135, 106, 0.6)',
  coolFill: 'rgba(0, 135, 106, 0.25)',
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

/** A curve's points (hours across, °C turned into `unit`), e.g. a recovery or a drift. */
export function curvePoints(c: { t: ArrayLike<number>; temp: ArrayLike<number> }, unit: TempUnit): Point[] {
  return Array.from(c.t, (t, i) => ({ x: t, y: fromCelsius(c.temp[i]!, unit) }));
}

// ---- Options of the charts on the screens (the report's printed charts have their own: report/charts.ts)

type LineOptions = ChartOptions<'line'>;
type Scales = NonNullable<LineOptions['scales']>;
type Item = TooltipItem<'line'>;

/**
 * What every chart on the screens shares: points given as {x, y} (no parsing), sized by its box, the
 * tooltip on the nearest points along x, and no chart.js legend (each screen has its own beside the
 * chart). `title` heads the tooltip from the x under the pointer, `label` writes each line's row;
 * `normalized` says the points come sorted by x; `plugins` adds other plugins' options (zoom).
 */
export function screenChartOptions(o: {
  title: (x: number) => string;
  label: (item: Item) => string;
  scales: Scales;
  normalized?: boolean;
  plugins?: LineOptions['plugins'];
}): LineOptions {
  return {
    parsing: false,
    ...(o.normalized ? { normalized: true } : {}),
    responsive: true,
    maintainAspectRatio: false,
    interaction: { mode: 'nearest', axis: 'x', intersect: false },
    plugins: {
      legend: { display: false },
      tooltip: {
        callbacks: {
          title: (items) => (items[0] ? o.title(items[0].parsed.x!) : ''),
          label: o.label,
        },
      },
      ...o.plugins,
    },
    scales: o.scales,
  };
}

/** A tooltip row of a temperature line, e.g. "Outdoor: 4.5 °C". */
export function temperatureRow(item: Item, unit: TempUnit): string {
  return `${item.dataset.label}: ${num(item.parsed.y, 1)} ${degreeLabel(unit)}`;
}

/** A tooltip row of a chart with a runtime panel: runtime lines as "% of `runtimeOf`", the others as temperatures. */
export function panelRow(item: Item, unit: TempUnit, runtimeOf: string): string {
  return item.dataset.yAxisID === 'run' ? `${item.dataset.label}: ${num(item.parsed.y, 0)} % of ${runtimeOf}` : temperatureRow(item, unit);
}

const grid = () => ({ color: COLORS.grid });

/** The temperature axis's title, in the unit shown. */
export function temperatureTitle(unit: TempUnit) {
  return { display: true, text: `Temperature (${degreeLabel(unit)})` };
}

/** The y axis of a chart of temperatures only. */
export function temperatureAxis(unit: TempUnit) {
  return { title: temperatureTitle(unit), grid: grid() };
}

/** A time axis in the zone's time zone (the system's when the zone has none); `time` says how ticks read. */
export function timeAxis(tz: string | undefined, time: Partial<TimeScaleOptions['time']>) {
  return {
    type: 'time' as const,
    adapters: { date: { zone: tz ?? 'system' } },
    time,
    ticks: { maxRotation: 0, autoSkipPadding: 18 },
    grid: grid(),
  };
}

/**
 * Temperatures above and runtime (0–100 %) in a slim panel below, on one x axis: the scales `temp`
 * and `run` the datasets name as their yAxisID. `runtime.display` can hide the runtime panel.
 */
export function panelScales(unit: TempUnit, runtime: { display?: boolean } = {}) {
  return {
    temp: { type: 'linear' as const, position: 'left' as const, stack: 'panels', stackWeight: 3, title: temperatureTitle(unit), grid: grid() },
    run: {
      type: 'linear' as const,
      position: 'left' as const,
      stack: 'panels',
      stackWeight: 1,
      offset: true,
      min: 0,
      max: 100,
      ...runtime,
      title: { display: true, text: 'Equipment on-time (%)' },
      ticks: { stepSize: 50 },
      grid: grid(),
    },
  };
}

export type CurveChart = Chart<'line', Point[]>;

/**
 * A chart of recovery curves (Recovery screen, its what-if): hours after the heating starts across,
 * temperature up. Made on the first call; later calls put in the new lines and the unit's axis title.
 * `unit` is read again whenever the tooltip shows.
 */
export function drawCurves(chart: CurveChart | null, canvas: HTMLCanvasElement, datasets: LineDataset[], unit: () => TempUnit): CurveChart {
  if (chart) {
    chart.data.datasets = datasets;
    chart.options.scales!.y!.title = temperatureTitle(unit());
    chart.update('none');
    return chart;
  }
  return new Chart<'line', Point[]>(canvas, {
    type: 'line',
    data: { datasets },
    options: screenChartOptions({
      title: (x) => `${duration(x)} after the start`,
      label: (item) => temperatureRow(item, unit()),
      scales: {
        // h:mm ticks, the way the recovery time itself is written (h min).
        x: { type: 'linear', min: 0, title: { display: true, text: 'Time after the heating starts (h:mm)' }, ticks: { callback: (v) => hoursClock(Number(v)) }, grid: grid() },
        y: temperatureAxis(unit()),
      },
    }),
  });
}
