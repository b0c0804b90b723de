/**
 * The reading resolution of a log's indoor temperature (thermostats report whole °F, half °C, tenths …),
 * found from the readings themselves, and readings rounded the same way.
 *
 * Method: the candidate grids are tried from the coarsest (1 °C, 1 °F, 0.5 °C, 0.5 °F, 0.2 °C, 0.2 °F,
 * 0.1 °C, 0.1 °F); the first on which at least 99.5 % of the readings lie (to 1e-4 of a step, after
 * conversion from °C) is the log's resolution. Finer than 0.1 °F no grid is reported (the rounding is
 * then too small to matter).
 */
import type { TempUnit } from '../types.ts';

export interface Resolution {
  unit: TempUnit;
  /** Step in that unit. */
  step: number;
}

const GRIDS: Resolution[] = [
  { unit: 'C', step: 1 },
  { unit: 'F', step: 1 },
  { unit: 'C', step: 0.5 },
  { unit: 'F', step: 0.5 },
  { unit: 'C', step: 0.2 },
  { unit: 'F', step: 0.2 },
  { unit: 'C', step: 0.1 },
  { unit: 'F', step: 0.1 },
];

const inUnit = (c: number, u: TempUnit) => (u === 'C' ? c : c * 1.8 + 32);

/** The log's reading resolution, or null when the readings are finer than every grid (or too few). */
export function readingResolution(y: Float64Array): Resolution | null {
  if (y.length < 12) return null;
  // Checking a sample is enough: a grid either holds nearly all readings or nearly none.
  const stride = Math.max(1, Math.floor(y.length / 2000));
  for (const g of GRIDS) {
    let on = 0, total = 0;
    for (let i = 0; i < y.length; i += stride) {
      const v = inUnit(y[i], g.unit) / g.step;
      total++;
      if (Math.abs(v - Math.round(v)) < 1e-4) on++;
    }
    if (on >= 0.995 * total) return g;
  }
  return null;
}

/** Readings in °C rounded to the resolution, returned in °C. */
export function requantise(y: Float64Array, r: Resolution, out = new Float64Array(y.length)): Float64Array {
  // °C or °F, written out: this runs over every reading of a year-long log.
  const scale = r.unit === 'C' ? 1 : 1.8, offset = r.unit === 'C' ? 0 : 32, step = r.step;
  for (let i = 0; i < y.length; i++) out[i] = (Math.round((y[i] * scale + offset) / step) * step - offset) / scale;
  return out;
}

/** "1 °F", "0.5 °C". */
export function resolutionLabel(r: Resolution): string {
  return `${r.step} °${r.unit}`;
}
