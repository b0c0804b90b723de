/**
 * The setback plan of one zone: the schedule and the baseline simulated over the same week, the
 * recoveries with optimal start, runtime per day with and without the schedule, equipment figures and
 * the cautions. Pure: no I/O. All outputs are internal units (°C, K, hours, W, Wh); chart-ready arrays
 * are plain number arrays (null where a setpoint is off).
 */
import { InputError } from '../errors.ts';
import type { ZoneModel, ZoneResponse } from '../types.ts';
import { planCautions, type Caution } from './cautions.ts';
import { WEEKDAY_NAMES, type WeeklySchedule } from './schedule.ts';
import { balancePointC, envelopeFromCapacity, heatPumpFraction, heatPumpRatingC, type EquipmentReport } from './equipment.ts';
import type { PlanOutdoor, PlanOutdoorSource } from './outdoorSources.ts';
import { simulateTimeline, type RecoveryEvent, type SimulationRun } from './simulate.ts';
import { scheduleTimeline, type TimelineInterval } from './timeline.ts';

export interface PlanOptions {
  /** Outdoor °C at which the fitted heating rate applies (heat pump); default the rating point. */
  heatRateReferenceC?: number;
  /** Heating output (W) to use instead of the schedule's equipment.heatingCapacity. */
  heatingCapacityW?: number;
  /** Spacing of the chart curve, minutes (default 10; the simulation itself runs every minute). */
  curveMinutes?: number;
}

/** A recovery with labels for people and the auxiliary-heat verdict. */
export interface PlanRecovery extends RecoveryEvent {
  /** Calendar day of the occupancy (0 … 6) and its label. */
  dayIndex: number;
  dayLabel: string;
  /** "Mon 07:00"-style labels (weekday and local time). */
  occupancyLabel: string;
  optimalStartLabel: string | null;
  reachedLabel: string | null;
  /** Heat pump: whether auxiliary heat would likely run during this recovery, and why. */
  auxLikely: boolean;
  auxReasons: string[];
}

/** Runtime and energy over a span (a day or the week). */
export interface RuntimeSummary {
  heatHours: number;
  coolHours: number;
  baselineHeatHours: number;
  baselineCoolHours: number;
  /** Baseline − schedule, hours (positive = the schedule runs less). */
  savedHeatHours: number;
  savedCoolHours: number;
  savedHours: number;
  /** Saved as % of the baseline's runtime; null when the baseline did not run. */
  savedHeatPercent: number | null;
  savedCoolPercent: number | null;
  savedPercent: number | null;
  /** Heat (cool) delivered, Wh; null without a capacity. */
  heatEnergyWh: number | null;
  baselineHeatEnergyWh: number | null;
  coolEnergyWh: number | null;
  baselineCoolEnergyWh: number | null;
  savedHeatEnergyWh: number | null;
  savedCoolEnergyWh: number | null;
}

export interface PlanDay extends RuntimeSummary {
  index: number;
  label: string;
  weekday: number;
  /** Simulation hours of the day's local midnights (slice PlanCurve.hours with these). */
  startHours: number;
  endHours: number;
  /** Lowest (highest) indoor temperature while unoccupied that day, °C; null if the day has no unoccupied time. */
  lowestUnoccupiedC: number | null;
  highestUnoccupiedC: number | null;
  indoorMinC: number;
  indoorMaxC: number;
  outdoorMinC: number;
  outdoorMaxC: number;
  /** Recoveries whose occupancy is on this day. */
  recoveries: PlanRecovery[];
}

/** Chart-ready series: points every curveMinutes; bins between consecutive points. */
export interface PlanCurve {
  stepMinutes: number;
  /** Hours from local midnight of day 0 (elapsed time). */
  hours: number[];
  indoorC: number[];
  baselineIndoorC: number[];
  outdoorC: number[];
  /** Setpoint in force from each point on; null = off. */
  heatSetpointC: Array<number | null>;
  coolSetpointC: Array<number | null>;
  occupied: boolean[];
  /** Runtime fraction 0–1 in the bin from hours[i] to hours[i+1] (length = points − 1). */
  heatFraction: number[];
  coolFraction: number[];
  baselineHeatFraction: number[];
  baselineCoolFraction: number[];
  /** 1 where the bin holds optimal-start or recovery full output. */
  recovering: number[];
}

export interface PlanResult {
  scheduleName: string;
  /** The unit the schedule was written in (results are °C; show them in this unit by default). */
  scheduleUnits: 'C' | 'F';
  outdoor: PlanOutdoorSource & { minC: number; maxC: number };
  model: ZoneModel;
  deadbandK: number;
  optimalStart: boolean;
  horizonHours: number;
  days: PlanDay[];
  week: RuntimeSummary;
  recoveries: PlanRecovery[];
  equipment: EquipmentReport | null;
  /** Outdoor °C above which no heating is needed to hold the occupied (unoccupied) heating setpoint. */
  balancePoint: { occupiedC: number | null; unoccupiedC: number | null };
  curve: PlanCurve;
  cautions: Caution[];
}

/** Longest off time that still counts as part of a thermostat cycle, minutes. */
const MAX_CYCLE_OFF_MINUTES = 180;

/**
 * Duty-cycle accounting of an on/off run: each thermostat cycle (an on-run and the off-run after it,
 * both inside the horizon, off-run at most MAX_CYCLE_OFF_MINUTES, not an optimal-start recovery) has
 * its runtime spread evenly over the cycle. Sums over whole cycles are unchanged; a cycle that spans
 * midnight counts on both days in proportion to its time, so per-day figures do not jump with the
 * cycle's phase. `values` are spread with the same cycles (e.g. runtime and energy).
 */
function spreadCycles(u: Float64Array, recovering: Uint8Array, values: Float64Array[]): Float64Array[] {
  const n = u.length;
  // The week repeats (the warm-up is the same week), so treat it as cyclic: start at the first switch-on.
  let r = -1;
  for (let k = 0; k < n; k++) {
    if (u[k]! > 0 && !recovering[k] && u[(k - 1 + n) % n] === 0) {
      r = k;
      break;
    }
  }
  if (r < 0) return values.map((v) => v.slice());
  const rot = (a: Float64Array | Uint8Array) => {
    const o = new (a.constructor as Float64ArrayConstructor)(n);
    for (let k = 0; k < n; k++) o[k] = a[(k + r) % n]!;
    return o;
  };
  const ur = rot(u);
  const rr = rot(recovering) as unknown as Uint8Array;
  const vr = values.map((v) => rot(v));
  const out = vr.map((v) => v.slice());
  let m = 0;
  while (m < n) {
    if (!(ur[m]! > 0) || rr[m]) {
      m++;
      continue;
    }
    const a = m;
    while (m < n && ur[m]! > 0 && !rr[m]) m++;
    const b = m;
    while (m < n && ur[m] === 0) m++;
    const c = m;
    // Complete cycle: followed by a switch-on (or, at the end, by the wrapped start).
    if (c > b && c - b <= MAX_CYCLE_OFF_MINUTES && (c === n || !rr[c])) {
      vr.forEach((v, i) => {
        const total = sum(v, a, c);
        const o = out[i]!;
        for (let k = a; k < c; k++) o[k] = total / (c - a);
      });
    }
  }
  return out.map((o) => {
    const back = new Float64Array(n);
    for (let k = 0; k < n; k++) back[(k + r) % n] = o[k]!;
    return back;
  });
}

function isResponse(m: ZoneModel | ZoneResponse): m is ZoneResponse {
  return 'hasCooling' in m;
}

const sum = (a: Float64Array, from: number, to: number) => {
  let s = 0;
  for (let i = from; i < to; i++) s += a[i]!;
  return s;
};

/**
 * Plans one zone: simulates the schedule and the baseline (the schedule's baseline setpoints held all
 * week, same outdoor and thermostat) and reports per day and for the week.
 *
 * Method: simulate.ts (exact steps, deadband thermostat, optimal start by the meeting of the backward
 * full-output curve and the setback curve). Runtime saved = baseline − schedule; % of the baseline.
 * Energy = runtime × output at each minute (heat pump: derated).
 *
 * @param model a fitted response (its hasHeating / hasCooling decide what can run) or a bare ZoneModel
 * @param schedule a validated schedule (parseSchedule)
 * @param outdoor profile and clock (historyOutdoor, designDayOutdoor, lowHighOutdoor)
 * @throws InputError for an invalid model, a capacity without the matching rate, or bad options
 * @example planZone(response, parseSchedule(json), designDayOutdoor(-12, 8)).week.savedHeatPercent
 */
export function planZone(model: ZoneModel | ZoneResponse, schedule: WeeklySchedule, outdoor: PlanOutdoor, options: PlanOptions = {}): PlanResult {
  const hasHeating = isResponse(model) ? model.hasHeating !== false && model.heatRate > 0 : model.heatRate > 0;
  const hasCooling = isResponse(model) ? model.hasCooling && model.coolRate > 0 : model.coolRate > 0;
  const m: ZoneModel = {
    tauHours: model.tauHours,
    heatRate: hasHeating ? model.heatRate : 0,
    coolRate: hasCooling ? model.coolRate : 0,
    gain: model.gain,
  };
  const curveMinutes = options.curveMinutes ?? 10;
  if (!Number.isInteger(curveMinutes) || curveMinutes < 1 || curveMinutes > 240) throw new InputError('The curve spacing must be 1 to 240 whole minutes.');
  const { clock } = outdoor;
  const timeline = scheduleTimeline(schedule, clock, 'schedule');
  const baseTimeline = scheduleTimeline(schedule, clock, 'baseline');
  const Hm = timeline[timeline.length - 1]!.endMinute;

  const eq = schedule.equipment;
  const heatingCapacityW = options.heatingCapacityW ?? eq?.heatingCapacityW ?? null;
  if (heatingCapacityW !== null && !(heatingCapacityW > 0)) throw new InputError('The heating capacity must be more than 0 W.');
  const hp = eq?.heatPump ?? null;
  const refC = hp ? (options.heatRateReferenceC ?? heatPumpRatingC(hp)) : null;
  const refFraction = hp ? heatPumpFraction(hp, refC!) : 1;
  if (hp && !(refFraction > 0)) throw new InputError('The heat pump has no output at the reference outdoor temperature of the fit; check the capacity points.');
  const heatRateAt = hp ? (a: number) => (m.heatRate * heatPumpFraction(hp, a)) / refFraction : undefined;

  const setup = { model: m, outdoor: outdoor.profile, horizonMinutes: Hm, deadbandK: schedule.deadbandK, optimalStart: schedule.optimalStart, heatRateAt };
  const run = simulateTimeline(setup, timeline);
  const base = simulateTimeline(setup, baseTimeline);

  const equipment =
    heatingCapacityW !== null || eq?.coolingCapacityW
      ? envelopeFromCapacity(m, { heatingCapacityW, coolingCapacityW: eq?.coolingCapacityW ?? null, heatPump: hp }, refC ?? undefined)
      : null;
  const C_WhPerK = equipment?.heatCapacityJPerK != null && heatingCapacityW !== null ? equipment.heatCapacityJPerK / 3600 : null;
  const coolW = eq?.coolingCapacityW ?? null;

  // Minute → interval lookups.
  const setpointAtMinute = (tl: TimelineInterval[]) => {
    const occ = new Uint8Array(Hm);
    const h = new Float64Array(Hm);
    const c = new Float64Array(Hm);
    for (const iv of tl) {
      for (let k = iv.startMinute; k < iv.endMinute; k++) {
        occ[k] = iv.occupied ? 1 : 0;
        h[k] = iv.heatC ?? NaN;
        c[k] = iv.coolC ?? NaN;
      }
    }
    return { occ, h, c };
  };
  const sp = setpointAtMinute(timeline);

  // Per-minute runtime and energy for the summaries (duty-cycle accounting with an on/off thermostat).
  const accounts = (r: SimulationRun) => {
    const heatWh = new Float64Array(Hm);
    if (C_WhPerK !== null) for (let k = 0; k < Hm; k++) heatWh[k] = r.heat[k]! * r.heatRate[k]! * C_WhPerK;
    if (schedule.deadbandK === 0) return { heat: r.heat, cool: r.cool, heatWh };
    const [heat, hWh] = spreadCycles(r.heat, r.recovering, [r.heat, heatWh]) as [Float64Array, Float64Array];
    const [cool] = spreadCycles(r.cool, r.recovering, [r.cool]) as [Float64Array];
    return { heat, cool, heatWh: hWh };
  };
  const accRun = accounts(run);
  const accBase = accounts(base);
  const energy = (acc: { cool: Float64Array; heatWh: Float64Array }, from: number, to: number) => ({
    heatWh: C_WhPerK === null ? null : sum(acc.heatWh, from, to),
    coolWh: coolW === null ? null : sum(acc.cool, from, to) * coolW,
  });
  const pct = (saved: number, baseline: number) => (baseline > 1e-12 ? (100 * saved) / baseline : null);
  const summary = (from: number, to: number): RuntimeSummary => {
    const heatHours = sum(accRun.heat, from, to);
    const coolHours = sum(accRun.cool, from, to);
    const baselineHeatHours = sum(accBase.heat, from, to);
    const baselineCoolHours = sum(accBase.cool, from, to);
    const e = energy(accRun, from, to);
    const eb = energy(accBase, from, to);
    return {
      heatHours,
      coolHours,
      baselineHeatHours,
      baselineCoolHours,
      savedHeatHours: baselineHeatHours - heatHours,
      savedCoolHours: baselineCoolHours - coolHours,
      savedHours: baselineHeatHours + baselineCoolHours - heatHours - coolHours,
      savedHeatPercent: pct(baselineHeatHours - heatHours, baselineHeatHours),
      savedCoolPercent: pct(baselineCoolHours - coolHours, baselineCoolHours),
      savedPercent: pct(baselineHeatHours + baselineCoolHours - heatHours - coolHours, baselineHeatHours + baselineCoolHours),
      heatEnergyWh: e.heatWh,
      baselineHeatEnergyWh: eb.heatWh,
      coolEnergyWh: e.coolWh,
      baselineCoolEnergyWh: eb.coolWh,
      savedHeatEnergyWh: e.heatWh === null ? null : eb.heatWh! - e.heatWh,
      savedCoolEnergyWh: e.coolWh === null ? null : eb.coolWh! - e.coolWh,
    };
  };

  const labelAt = (t: number) => `${WEEKDAY_NAMES[clock.weekday(clock.dayOf(t))]} ${clock.timeLabel(t)}`;
  const auxBelow = hp?.auxBelowC ?? null;
  const recoveries: PlanRecovery[] = run.recoveries.map((ev) => {
    const dayIndex = clock.dayOf(ev.occupancyHours);
    const reasons: string[] = [];
    if (hp && ev.mode === 'heat' && ev.status !== 'not-needed') {
      if (auxBelow !== null && ev.recoveryOutdoorMinC !== null && ev.recoveryOutdoorMinC < auxBelow) reasons.push('outdoor-below-threshold');
      if (ev.cannotRecoverInTime || ev.status === 'late' || ev.status === 'not-reached') reasons.push('heat-pump-too-slow');
    }
    return {
      ...ev,
      dayIndex,
      dayLabel: clock.dayLabel(dayIndex),
      occupancyLabel: labelAt(ev.occupancyHours),
      optimalStartLabel: ev.optimalStartHours === null ? null : labelAt(ev.optimalStartHours),
      reachedLabel: ev.reachedHours === null ? null : labelAt(ev.reachedHours),
      auxLikely: reasons.length > 0,
      auxReasons: reasons,
    };
  });

  // Days.
  const dayStart = (d: number) => Math.round(clock.hoursAt(d, 0) * 60);
  const days: PlanDay[] = [];
  let unoccMin = Infinity;
  let unoccMax = -Infinity;
  for (let d = 0; d < clock.days; d++) {
    const a = dayStart(d);
    const b = dayStart(d + 1);
    let lo = Infinity;
    let hi = -Infinity;
    let imin = Infinity;
    let imax = -Infinity;
    let omin = Infinity;
    let omax = -Infinity;
    for (let k = a; k < b; k++) {
      const T0 = run.indoor[k]!;
      const T1 = run.indoor[k + 1]!;
      if (!sp.occ[k]) {
        lo = Math.min(lo, T0, T1);
        hi = Math.max(hi, T0, T1);
      }
      imin = Math.min(imin, T1);
      imax = Math.max(imax, T1);
      omin = Math.min(omin, run.outdoor[k]!, run.outdoor[k + 1]!);
      omax = Math.max(omax, run.outdoor[k]!, run.outdoor[k + 1]!);
    }
    unoccMin = Math.min(unoccMin, lo);
    unoccMax = Math.max(unoccMax, hi);
    days.push({
      index: d,
      label: clock.dayLabel(d),
      weekday: clock.weekday(d),
      startHours: a / 60,
      endHours: b / 60,
      ...summary(a, b),
      lowestUnoccupiedC: Number.isFinite(lo) ? lo : null,
      highestUnoccupiedC: Number.isFinite(hi) ? hi : null,
      indoorMinC: imin,
      indoorMaxC: imax,
      outdoorMinC: omin,
      outdoorMaxC: omax,
      recoveries: recoveries.filter((r) => r.dayIndex === d),
    });
  }

  // Chart curve.
  const curve: PlanCurve = {
    stepMinutes: curveMinutes,
    hours: [],
    indoorC: [],
    baselineIndoorC: [],
    outdoorC: [],
    heatSetpointC: [],
    coolSetpointC: [],
    occupied: [],
    heatFraction: [],
    coolFraction: [],
    baselineHeatFraction: [],
    baselineCoolFraction: [],
    recovering: [],
  };
  const nanToNull = (v: number) => (Number.isNaN(v) ? null : v);
  for (let k = 0; k <= Hm; k += curveMinutes) {
    const at = Math.min(k, Hm - 1);
    curve.hours.push(k / 60);
    curve.indoorC.push(run.indoor[k]!);
    curve.baselineIndoorC.push(base.indoor[k]!);
    curve.outdoorC.push(run.outdoor[k]!);
    curve.heatSetpointC.push(nanToNull(sp.h[at]!));
    curve.coolSetpointC.push(nanToNull(sp.c[at]!));
    curve.occupied.push(sp.occ[at] === 1);
    if (k < Hm) {
      const e = Math.min(Hm, k + curveMinutes);
      const len = (e - k) / 60;
      curve.heatFraction.push(sum(run.heat, k, e) / len);
      curve.coolFraction.push(sum(run.cool, k, e) / len);
      curve.baselineHeatFraction.push(sum(base.heat, k, e) / len);
      curve.baselineCoolFraction.push(sum(base.cool, k, e) / len);
      let rec = 0;
      for (let j = k; j < e; j++) rec = Math.max(rec, run.recovering[j]!);
      curve.recovering.push(rec);
    }
  }
  if (curve.hours[curve.hours.length - 1] !== Hm / 60) {
    curve.hours.push(Hm / 60);
    curve.indoorC.push(run.indoor[Hm]!);
    curve.baselineIndoorC.push(base.indoor[Hm]!);
    curve.outdoorC.push(run.outdoor[Hm]!);
    curve.heatSetpointC.push(nanToNull(sp.h[Hm - 1]!));
    curve.coolSetpointC.push(nanToNull(sp.c[Hm - 1]!));
    curve.occupied.push(sp.occ[Hm - 1] === 1);
  }

  // Cautions.
  const occHeats = schedule.days.flat().map((p) => p.heatC).filter((v): v is number => v !== null);
  const occCools = schedule.days.flat().map((p) => p.coolC).filter((v): v is number => v !== null);
  let outdoorMin = Infinity;
  let outdoorMax = -Infinity;
  for (const v of run.outdoor) {
    outdoorMin = Math.min(outdoorMin, v);
    outdoorMax = Math.max(outdoorMax, v);
  }
  const D = schedule.units;
  const degree = D === 'F' ? '°F' : '°C';
  const show = (c: number) => (D === 'F' ? c * 1.8 + 32 : c).toFixed(1);
  const auxRecoveries = recoveries
    .filter((r) => r.auxLikely)
    .map((r) => ({
      when: r.optimalStartLabel ?? r.occupancyLabel,
      reason: r.auxReasons
        .map((x) =>
          x === 'outdoor-below-threshold'
            ? `outdoor ${show(r.recoveryOutdoorMinC!)} ${degree} is below the ${show(auxBelow!)} ${degree} auxiliary-heat threshold`
            : 'the heat pump alone cannot recover in time',
        )
        .join('; '),
    }));
  const lateRecoveries = recoveries
    .filter((r) => r.cannotRecoverInTime || r.status === 'late' || r.status === 'not-reached')
    .filter((r) => r.cannotRecoverInTime || schedule.optimalStart)
    .map((r) => ({ when: r.occupancyLabel, mode: r.mode, shortfallK: r.shortfallK, reachable: r.reachable }));
  const cautions = planCautions({
    units: schedule.units,
    tauHours: m.tauHours,
    gainKPerH: m.gain,
    setbackFloorC: schedule.setbackFloorC,
    occupiedHeatC: occHeats.length ? Math.max(...occHeats) : null,
    occupiedCoolC: occCools.length ? Math.min(...occCools) : null,
    unoccupiedHeatC: schedule.unoccupied.heatC,
    unoccupiedCoolC: schedule.unoccupied.coolC,
    hasHeatingSetpoints: occHeats.length > 0,
    hasCoolingSetpoints: occCools.length > 0,
    outdoorMinC: outdoorMin,
    indoorMinUnoccupiedC: Number.isFinite(unoccMin) ? unoccMin : null,
    indoorMaxUnoccupiedC: Number.isFinite(unoccMax) ? unoccMax : null,
    heatPump: hp ? { auxBelowC: hp.auxBelowC } : null,
    auxRecoveries,
    lateRecoveries,
    capacityKnown: C_WhPerK !== null || coolW !== null,
    coolingRan: sum(base.cool, 0, Hm) > 0 || sum(run.cool, 0, Hm) > 0,
    outdoorNotes: outdoor.notes ?? [],
    modelHasHeating: hasHeating,
    modelHasCooling: hasCooling,
  });

  return {
    scheduleName: schedule.name,
    scheduleUnits: schedule.units,
    outdoor: { ...outdoor.source, minC: outdoorMin, maxC: outdoorMax },
    model: m,
    deadbandK: schedule.deadbandK,
    optimalStart: schedule.optimalStart,
    horizonHours: Hm / 60,
    days,
    week: summary(0, Hm),
    recoveries,
    equipment,
    balancePoint: {
      occupiedC: occHeats.length ? balancePointC(m, Math.max(...occHeats)) : null,
      unoccupiedC: schedule.unoccupied.heatC === null ? null : balancePointC(m, schedule.unoccupied.heatC),
    },
    curve,
    cautions,
  };
}
