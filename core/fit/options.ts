/** Options of fitResponse (fit.ts). */
export interface FitOptions {
  /** Hold out one day in this many for the check (0 = no held-out check). Default 5. */
  heldOutEvery?: number;
  /** IANA time zone whose local days group the readings (the site's); default UTC. */
  timeZone?: string | null;
  /**
   * The solar proxy (kW/m²) at given times, for a site with a location (core/solar.ts solarGainProxy);
   * omitted: no solar term.
   */
  solarProxy?: ((timeMs: Float64Array) => Float64Array) | null;
  /** Intervals (the sandwich covariance and the model-error components); default true. */
  intervals?: boolean;
  /** The recovery backtest (backtest.ts); default true (only with intervals). */
  backtest?: boolean;
  /** Which model: 'auto' (default: one or two nodes, chosen by the criterion of select.ts), 'one-node', 'two-node'. */
  models?: 'auto' | 'one-node' | 'two-node';
}
