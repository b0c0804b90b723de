/** Setback planning: weekly schedules, design days, schedule simulation, optimal start, savings, heat pumps. */
export {
  parseSchedule,
  setpointsAt,
  capacityToWatts,
  defaultSetbackFloor,
  ScheduleError,
  ScheduleFileSchema,
  SCHEDULE_FORMAT,
  WEEKDAY_KEYS,
  WEEKDAY_NAMES,
  type Weekday,
  type Setpoints,
  type OccupiedPeriod,
  type HeatPumpSpec,
  type EquipmentSpec,
  type WeeklySchedule,
  type ScheduleFile,
} from './schedule.ts';
export { parseScheduleText } from './scheduleFile.ts';
export { ASHRAE_DAILY_RANGE_FRACTIONS, rangeFractionAt, designDayHourly, designDayProfile, lowHighProfile } from './designDay.ts';
export { designClock, zonedClock, type PlanClock } from './clock.ts';
export { scheduleTimeline, mergeIntervals, type TimelineInterval } from './timeline.ts';
export { simulateTimeline, CONTROL_STEP_MINUTES, type SimulationSetup, type SimulationRun, type RecoveryEvent } from './simulate.ts';
export {
  designDayOutdoor,
  lowHighOutdoor,
  historyOutdoor,
  latestHistoryWeek,
  MAX_OUTDOOR_GAP_HOURS,
  type PlanOutdoor,
  type PlanOutdoorSource,
} from './outdoorSources.ts';
export { envelopeFromCapacity, balancePointC, heatPumpFraction, heatPumpRatingC, heatingOutdoorMean, J_PER_K_PER_BTU_PER_F, type EquipmentReport } from './equipment.ts';
export { planCautions, DEEP_SETBACK_K, DEEP_SETUP_K, type Caution, type CautionLevel, type CautionFacts } from './cautions.ts';
export { planZone, type PlanOptions, type PlanResult, type PlanDay, type PlanRecovery, type PlanCurve, type RuntimeSummary } from './plan.ts';
