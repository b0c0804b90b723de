/**
 * Shared data shapes of the zone response engine.
 *
 * Internal units everywhere in core/, db/ and app/: temperatures in °C, temperature differences in K,
 * model time in hours, timestamps as epoch milliseconds (UTC). Convert to °F only at the edges
 * (see units.ts).
 */

/** Temperature unit shown to a person or found in a log. */
export type TempUnit = 'C' | 'F';

/**
 * One zone's log as columns, in internal units. Index i is one reading.
 * - time: epoch milliseconds, UTC, strictly increasing.
 * - indoor, outdoor, heatSetpoint, coolSetpoint: °C; NaN where the log had no value.
 * - heat, cool: runtime fraction 0–1 of the interval that ends at time[i] (the interval from
 *   time[i-1] to time[i]); NaN where unknown.
 */
export interface ZoneSeries {
  time: Float64Array;
  indoor: Float64Array;
  outdoor: Float64Array;
  heatSetpoint: Float64Array;
  coolSetpoint: Float64Array;
  heat: Float64Array;
  cool: Float64Array;
}

/**
 * The lumped zone model (one thermal mass, first order), internal units:
 *   dT/dt = (T_out(t) − T)/τ + h·u_heat(t) − c·u_cool(t) + g
 * with T in °C, t in hours, u the runtime fraction (0–1).
 */
export interface ZoneModel {
  /** τ, the time constant, hours. */
  tauHours: number;
  /** h, the heating rate at full heat, K/h (how fast heat alone would warm the zone). */
  heatRate: number;
  /** c, the cooling rate at full cooling, K/h; 0 when the zone has no cooling. */
  coolRate: number;
  /** g, the steady internal gain, K/h (occupants, appliances, average sun). */
  gain: number;
}

/** A fitted zone model with its uncertainty and fit quality (a "response"). */
export interface ZoneResponse extends ZoneModel {
  /** 95 % interval of τ, hours. */
  tauCI: [number, number];
  /** 95 % interval of h, K/h. */
  heatRateCI: [number, number];
  /** 95 % interval of c, K/h; null without cooling data. */
  coolRateCI: [number, number] | null;
  /** Whether the log held any heating runtime (heatRate is meaningful only then). */
  hasHeating: boolean;
  /** Whether the log held any cooling runtime (coolRate is meaningful only then). */
  hasCooling: boolean;
  /** Days (UTC epoch ms ranges) held out of the fit and used only to check it. */
  heldOut: Array<{ from: number; to: number }>;
  /** Root-mean-square error of the simulated against the measured indoor temperature, K. */
  rmse: number;
  /** RMSE on held-out days simulated with a model fitted without them, K; null if too few days. */
  heldOutRmse: number | null;
  /** ASHRAE Guideline 14 CV(RMSE) of the indoor temperature, %. */
  cvrmse: number;
  /** ASHRAE Guideline 14 NMBE of the indoor temperature, % (error taken as measured − simulated). */
  nmbe: number;
  samplesUsed: number;
  daysUsed: number;
  segments: number;
  /** Hours of free-floating data (no heating or cooling running) used. */
  freeFloatHours: number;
  firstTime: number;
  lastTime: number;
  /** Plain sentences a person should read before trusting the numbers. */
  warnings: string[];
}
