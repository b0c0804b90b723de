/**
 * Unit conversion at the edges. Internal: °C for temperatures, K for differences and K/h for rates.
 * 1 K = 1.8 °F (exact, by definition of the Fahrenheit scale).
 */
import type { TempUnit } from './types.ts';

/** Converts a temperature in `unit` to °C. */
export function toCelsius(value: number, unit: TempUnit): number {
  return unit === 'C' ? value : (value - 32) / 1.8;
}

/** Converts a temperature in °C to `unit`. */
export function fromCelsius(celsius: number, unit: TempUnit): number {
  return unit === 'C' ? celsius : celsius * 1.8 + 32;
}

/** Converts a temperature difference (or a rate in degrees per hour) in `unit` to K. */
export function deltaToKelvin(delta: number, unit: TempUnit): number {
  return unit === 'C' ? delta : delta / 1.8;
}

/** Converts a temperature difference (or a rate) in K to `unit`. */
export function deltaFromKelvin(kelvin: number, unit: TempUnit): number {
  return unit === 'C' ? kelvin : kelvin * 1.8;
}

/** The degree sign and letter for a unit, e.g. "°F". */
export function degreeLabel(unit: TempUnit): string {
  return unit === 'C' ? '°C' : '°F';
}

/** Watts per kelvin to Btu per hour per °F: 1 W = 3.412142 Btu/h, 1 K = 1.8 °F. */
export const BTUH_PER_F_PER_W_PER_K = 3.412142 / 1.8;
/** Watts to Btu per hour (International Table Btu). */
export const BTUH_PER_W = 3.412142;
