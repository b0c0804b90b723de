/**
 * core/: the zone response engine, pure TypeScript (no I/O, no Node or DOM APIs). The explicit index of
 * what other layers may use. Internal units: °C, K, K/h, hours, epoch ms UTC (see types.ts).
 */
export type { TempUnit, ZoneSeries, ZoneModel, ZoneResponse } from './types.ts';
export { toCelsius, fromCelsius, deltaToKelvin, deltaFromKelvin, degreeLabel, BTUH_PER_W, BTUH_PER_F_PER_W_PER_K } from './units.ts';
export { HeatlagError, InputError, UnderdeterminedError } from './errors.ts';
export { stepExact, FixedStep, forcing } from './step.ts';
export { coolingTemperature, timeToReach, tauFromTwoReadings, lumpedTauSeconds, biotNumber, type ReachTime, type Reading } from './newton.ts';
export { outdoorProfile, constantOutdoor, checkOutdoorProfile, pieceIndex, outdoorAt, sampleOutdoor, type OutdoorProfile } from './outdoor.ts';
export { amplitudeRatio, phaseLagHours, sinusoidalOutdoor, type SinusoidOptions } from './sinusoid.ts';
export {
  equilibrium, recoveryTime, driftCurve, recoveryCurve, latestStart,
  type Outdoor, type EquipmentMode, type RecoveryResult, type DriftOptions, type Curve,
  type RecoveryCurveOptions, type RecoveryCurve, type LatestStartOptions, type LatestStartResult,
} from './recovery.ts';
export { fitMetrics, cvrmse, nmbe, rmse, GUIDELINE_14_LIMITS, type FitMetrics } from './metrics.ts';
export { fitResponse, simulateFit, prepareLog, type FitOptions, type PreparedLog, type PrepareOptions } from './fit/index.ts';
export { presentResponse, type PresentedResponse } from './present.ts';
export {
  ColumnMappingSchema, RuntimeColumnSchema, parseMapping, parseMappingJson, mappedColumns, isValidTimeZone,
  MappingError, RUNTIME_FORMATS, DELIMITERS, type ColumnMapping, type RuntimeColumn, type RuntimeFormat, type Delimiter,
} from './mapping.ts';
export { lineColumnAt } from './text.ts';
export { mulberry32 } from './random.ts';
export { solarPosition, clearSkyIrradiance, solarGainProxy, checkSiteLocation, type SolarPosition, type ClearSkyIrradiance } from './solar.ts';
export * from './plan/index.ts';
