/**
 * Invented outdoor weather for the reference simulator: a continuous function of time, so that the
 * Runge–Kutta stages of the zone simulation can evaluate it anywhere.
 *
 *   T_out(t) = mean + trend·days + (range/2)·s(solar hour) + wander(t) + spells(t)
 *
 * - s(hour) is a daily shape from −1 at `minHour` (default 06:00) to +1 at `maxHour` (default 15:00):
 *   a rising half cosine over the morning and a falling half cosine over the rest of the day, so the
 *   curve and its slope are continuous and the afternoon maximum sits where weather records put it
 *   (common practice: daily minimum near sunrise, maximum in mid-afternoon).
 * - wander(t) is a day-to-day anomaly: an AR(1) sequence of daily knots (seeded) joined by cosine
 *   interpolation, so it is continuous with a slope that vanishes at each knot.
 * - spells are cold snaps and warm spells: a step of `depthK`/`riseK` with raised-cosine edges.
 *
 * Units: °C, K, hours; time as epoch milliseconds. Nothing here is real weather.
 */
import { Prng } from './prng.ts';

const HOUR_MS = 3_600_000;

/** A cold snap: `depthK` colder for `hours`, starting `startHours` after the weather origin. */
export interface ColdSnap {
  startHours: number;
  hours: number;
  /** How much colder at the bottom of the snap, K (positive). */
  depthK: number;
  /** Length of each smooth edge, hours (default: a quarter of the snap, at most 12 h). */
  edgeHours?: number;
}

/** A warm spell: `riseK` warmer for `hours`, starting `startHours` after the weather origin. */
export interface WarmSpell {
  startHours: number;
  hours: number;
  /** How much warmer at the height of the spell, K (positive). */
  riseK: number;
  edgeHours?: number;
}

export interface WeatherOptions {
  /** Seed of the day-to-day wander (default 1). */
  seed?: number;
  /** Time zero of the weather, epoch ms (the simulator fills in its own start when absent). */
  originMs?: number;
  /** Offset of local solar time from UTC, hours (the simulator uses its time zone's offset at the start). */
  solarOffsetHours?: number;
  /** Mean outdoor temperature at the origin, °C (default 3). */
  meanC?: number;
  /** Linear drift of the mean, K per day (default 0; positive for a warming spring). */
  trendKPerDay?: number;
  /** Full daily range, minimum to maximum, K (default 8). */
  dailyRangeK?: number;
  /** Local solar hour of the daily minimum (default 6). */
  minHour?: number;
  /** Local solar hour of the daily maximum (default 15). */
  maxHour?: number;
  /** Standard deviation of the day-to-day wander, K (default 2.5; 0 turns it off). */
  wanderK?: number;
  /** Day-to-day correlation of the wander, 0–1 (default 0.7). */
  wanderMemory?: number;
  coldSnaps?: ColdSnap[];
  warmSpells?: WarmSpell[];
}

/** Outdoor temperature, °C, as a function of epoch milliseconds. */
export type OutdoorFn = (ms: number) => number;

/**
 * Builds a continuous invented outdoor temperature.
 * Throws RangeError when minHour/maxHour are not in [0, 24) with minHour < maxHour, or wanderMemory ∉ [0, 1).
 *
 * @example const out = makeWeather({ originMs: Date.UTC(2025, 0, 6), meanC: 2 }); out(Date.UTC(2025, 0, 6, 15));
 */
export function makeWeather(options: WeatherOptions = {}): OutdoorFn {
  const originMs = options.originMs ?? 0;
  const solarOffset = options.solarOffsetHours ?? 0;
  const mean = options.meanC ?? 3;
  const trend = options.trendKPerDay ?? 0;
  const half = (options.dailyRangeK ?? 8) / 2;
  const minHour = options.minHour ?? 6;
  const maxHour = options.maxHour ?? 15;
  const wanderK = options.wanderK ?? 2.5;
  const phi = options.wanderMemory ?? 0.7;
  if (!(minHour >= 0 && maxHour < 24 && minHour < maxHour)) {
    throw new RangeError(`weather: need 0 ≤ minHour < maxHour < 24, got ${minHour} and ${maxHour}`);
  }
  if (!(phi >= 0 && phi < 1)) throw new RangeError(`weather: wanderMemory must be in [0, 1), got ${phi}`);
  const rise = maxHour - minHour;
  const fall = 24 - rise;

  // Daily knots of the wander, generated in order on demand (deterministic for a seed).
  const rnd = new Prng(options.seed ?? 1);
  const knots: number[] = [wanderK * rnd.normal()];
  const innovation = wanderK * Math.sqrt(1 - phi * phi);
  const knot = (d: number): number => {
    while (knots.length <= d) knots.push(phi * knots[knots.length - 1] + innovation * rnd.normal());
    return knots[d];
  };

  const spells: { start: number; end: number; edge: number; delta: number }[] = [];
  for (const s of options.coldSnaps ?? []) spells.push(spell(s.startHours, s.hours, -s.depthK, s.edgeHours));
  for (const s of options.warmSpells ?? []) spells.push(spell(s.startHours, s.hours, s.riseK, s.edgeHours));

  return (ms: number): number => {
    const tH = (ms - originMs) / HOUR_MS;
    const solarHour = mod(ms / HOUR_MS + solarOffset, 24);
    let shape: number;
    if (solarHour >= minHour && solarHour <= maxHour) {
      shape = -Math.cos((Math.PI * (solarHour - minHour)) / rise);
    } else {
      shape = Math.cos((Math.PI * mod(solarHour - maxHour, 24)) / fall);
    }
    let wander = 0;
    if (wanderK > 0) {
      const days = Math.max(0, tH / 24);
      const d = Math.floor(days);
      const f = days - d;
      const a = knot(d);
      const b = knot(d + 1);
      wander = a + ((b - a) * (1 - Math.cos(Math.PI * f))) / 2;
    }
    let extra = 0;
    for (const s of spells) extra += s.delta * bump(tH, s.start, s.end, s.edge);
    return mean + (trend * tH) / 24 + half * shape + wander + extra;
  };
}

function spell(startHours: number, hours: number, delta: number, edgeHours?: number) {
  if (!(hours > 0)) throw new RangeError(`weather: a spell needs hours > 0, got ${hours}`);
  const edge = Math.min(edgeHours ?? Math.min(hours / 4, 12), hours / 2);
  return { start: startHours, end: startHours + hours, edge, delta };
}

/** 0 outside [start, end], 1 inside, with raised-cosine edges of length `edge`. */
function bump(t: number, start: number, end: number, edge: number): number {
  if (t <= start || t >= end) return 0;
  if (edge <= 0) return 1;
  if (t < start + edge) return (1 - Math.cos((Math.PI * (t - start)) / edge)) / 2;
  if (t > end - edge) return (1 - Math.cos((Math.PI * (end - t)) / edge)) / 2;
  return 1;
}

function mod(x: number, m: number): number {
  return ((x % m) + m) % m;
}
