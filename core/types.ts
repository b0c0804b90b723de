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
 * The building-mass node of a two-node zone model (air node and mass node, heat into the air; the
 * grey-box form of Bacher & Madsen 2011, see core/fit/modes.ts):
 *   dTi/dt = (Tm − Ti)/τam + h·u_heat − c·u_cool + g + s·I
 *   dTm/dt = (Ti − Tm)·(1 − share)/(share·τam) + (T_out − Tm)/τmo
 */
export interface MassNode {
  /** τam = C_air·R_air–mass: how fast the air follows the mass, hours. */
  airMassHours: number;
  /** τmo = C_mass·R_mass–outdoor: how fast the mass follows outdoor, hours. */
  massOutdoorHours: number;
  /** Share of the zone's heat capacity in the mass node, 0 < share < 1 (the mass coupling). */
  massShare: number;
}

/**
 * The zone model, internal units. One node (one lumped thermal mass, first order):
 *   dT/dt = (T_out(t) − T)/τ + h·u_heat(t) − c·u_cool(t) + g + s·I(t)
 * with T in °C, t in hours, u the runtime fraction (0–1), I a clear-sky solar proxy (kW/m²).
 * Two nodes when `mass` is set: the air node above exchanges heat with a building-mass node instead of
 * the outdoor air directly (MassNode); τ is then the steady rise per K/h, C_air·R_total, so that
 * T_out + (h + g)·τ is still where full heat holds the zone.
 */
export interface ZoneModel {
  /** τ, the time constant, hours (two nodes: C_air·R_total, the steady rise per K/h of forcing). */
  tauHours: number;
  /** h, the heating rate at full heat, K/h (how fast heat alone would warm the zone). */
  heatRate: number;
  /** c, the cooling rate at full cooling, K/h; 0 when the zone has no cooling. */
  coolRate: number;
  /** g, the steady internal gain, K/h (occupants, appliances, and the average sun when no solar term is fitted). */
  gain: number;
  /** s, K/h per kW/m² of the clear-sky solar proxy (absent or 0 when the site has no location). */
  solarGain?: number;
  /** The building-mass node of a two-node model; absent or null for one node. */
  mass?: MassNode | null;
}

/** Which zone model a response is: one lumped node, or air and building mass. */
export type ModelKind = 'one-node' | 'two-node';

/** One candidate model's score in the selection. */
export interface CandidateScore {
  kind: ModelKind;
  /** Residual sum of squares, K². */
  rss: number;
  /** Parameters counted by the criterion (initial states of the segments included). */
  parameters: number;
  /** The criterion's value (lower is better). */
  score: number;
}

/** How the response's model was chosen. */
export interface ModelSelection {
  /** The criterion, named with its source. */
  criterion: string;
  candidates: CandidateScore[];
  /** Effective number of independent readings the criterion used. */
  effectiveReadings: number;
  /** One plain sentence: which model was chosen and why. */
  reason: string;
  /**
   * When the two-node search was skipped because rounded readings leave too little error for any model
   * to remove: the most a mass node could cut the squared error, %. Absent when the search ran.
   */
  roundingBoundPercent?: number;
}

/** The figures of a two-node response (internal units, hours). */
export interface TwoNodeFigures {
  mass: MassNode;
  airMassHoursCI: [number, number];
  massOutdoorHoursCI: [number, number];
  massShareCI: [number, number];
  /** The two modes' time constants, hours: slow (the building's, governs a long setback drift) and fast (the air's). */
  slowHours: number;
  slowHoursCI: [number, number];
  fastHours: number;
}

/** One morning recovery of the log, predicted by a fit that did not see its day. */
export interface BacktestMorning {
  /** When the setpoint stepped up, epoch ms. */
  startMs: number;
  /** Air temperature at the step and the new setpoint, °C. */
  fromC: number;
  toC: number;
  /** Outdoor temperature at the step, °C. */
  outdoorC: number;
  /** Minutes from the step until the readings reached the setpoint, and as predicted. */
  actualMinutes: number;
  predictedMinutes: number;
}

/** The recovery backtest: the log's own mornings against the model's predictions. */
export interface RecoveryBacktest {
  cases: number;
  /** Median and 90th percentile of |predicted − actual|, minutes. */
  medianErrorMinutes: number;
  p90ErrorMinutes: number;
  /** Median of predicted − actual, minutes (positive: the model predicts slow recoveries). */
  medianBiasMinutes: number;
  mornings: BacktestMorning[];
}

/** A fitted zone model with its uncertainty and fit quality (a "response"). */
export interface ZoneResponse extends ZoneModel {
  /** The model chosen for this zone (predictions everywhere use it). */
  model: ModelKind;
  /** Two-node figures with their intervals; null for one node. */
  twoNode: TwoNodeFigures | null;
  /** 95 % interval of the solar coefficient s; null when no solar term was fitted. */
  solarGainCI: [number, number] | null;
  /** How the model was chosen. */
  selection: ModelSelection;
  /** The recovery backtest; null with a reason when the log holds no recoveries to check. */
  recoveryBacktest: RecoveryBacktest | null;
  recoveryBacktestReason: string | null;
  /** Time zone whose local days grouped the readings (held-out days, the intervals' days). */
  timeZone: string;
  /** 95 % interval of g, K/h. */
  gainCI: [number, number];
  /** 95 % interval of τ, hours (two nodes: of C_air·R_total). */
  tauCI: [number, number];
  /** 95 % interval of h, K/h. */
  heatRateCI: [number, number];
  /** 95 % interval of c, K/h; null without cooling data. */
  coolRateCI: [number, number] | null;
  /** Whether the log held any heating runtime (heatRate is meaningful only then). */
  hasHeating: boolean;
  /** Whether the log held any cooling runtime (coolRate is meaningful only then). */
  hasCooling: boolean;
  /** Local days (epoch ms of their first and last reading) held out of the fit and used only to check it. */
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
