/**
 * The recovery backtest as a chart.js configuration (Response screen and zone report): each morning of
 * the log as a point, the actual recovery minutes across and the minutes the model predicted up, with
 * the 1:1 line where a perfect prediction would sit. Both axes share one range from 0, so a point's
 * distance from the line reads the same either way. Pure (no chart.js import), so it is unit-tested.
 */
import type { ChartConfiguration } from 'chart.js';
import type { RecoveryBacktest } from '../../../../core/types.ts';

export type BacktestChartConfig = ChartConfiguration<'line', { x: number; y: number }[]>;

/** Minutes as h:mm, e.g. 135 → "2:15". */
export function minutesClock(minutes: number): string {
  const m = Math.round(minutes);
  return `${m < 0 ? '−' : ''}${Math.floor(Math.abs(m) / 60)}:${String(Math.abs(m) % 60).padStart(2, '0')}`;
}

/** The axis range and tick step (minutes) that hold every morning, from 0. */
export function backtestRange(bt: RecoveryBacktest): { max: number; step: number } {
  const top = Math.max(30, ...bt.mornings.map((m) => Math.max(m.actualMinutes, m.predictedMinutes)));
  const step = top <= 90 ? 15 : top <= 180 ? 30 : top <= 360 ? 60 : 120;
  return { max: Math.ceil((top * 1.05) / step) * step, step };
}

const FONT = { size: 10 };
const GRID = { color: '#e3e7eb' };
const title = (text: string) => ({ display: true, text, font: { size: 10, weight: 600 as const } });

/** The scatter of predicted against actual recovery minutes, with the 1:1 line. */
export function backtestChart(bt: RecoveryBacktest, pointColor = '#1d4a62'): BacktestChartConfig {
  const { max, step } = backtestRange(bt);
  const tick = (v: number | string) => minutesClock(Number(v));
  const axis = (text: string) => ({ type: 'linear' as const, min: 0, max, title: title(text), ticks: { font: FONT, stepSize: step, maxRotation: 0, callback: tick }, grid: GRID });
  return {
    type: 'line',
    data: {
      datasets: [
        { label: 'Mornings', data: bt.mornings.map((m) => ({ x: m.actualMinutes, y: m.predictedMinutes })), showLine: false, pointRadius: 3.5, pointBackgroundColor: pointColor, borderColor: pointColor, order: 0 },
        { label: 'Predicted = actual', data: [{ x: 0, y: 0 }, { x: max, y: max }], borderColor: '#8a96a3', borderWidth: 1.2, borderDash: [5, 3], pointRadius: 0, order: 1 },
      ],
    },
    options: {
      parsing: false,
      responsive: false,
      animation: false,
      events: [],
      plugins: { legend: { display: false }, tooltip: { enabled: false } },
      layout: { padding: { top: 4, right: 8 } },
      scales: { x: axis('Actual recovery (h:mm)'), y: axis('Predicted recovery (h:mm)') },
    },
  };
}
