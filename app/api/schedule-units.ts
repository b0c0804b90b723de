/**
 * A schedule file (assets/plans/README.md) rewritten in the other temperature unit: every
 * temperature converted (°F ↔ °C), the deadband as a difference (1 K = 1.8 °F), and the two defaults
 * that depend on the file's unit (deadband, setback floor) written out as the values they stood for,
 * so the rewritten file plans exactly the same. Pure; used by the renderer and the plan service.
 */
import { defaultSetbackFloor, type ScheduleFile } from '../../core/plan/schedule.ts';
import type { TempUnit } from '../../core/types.ts';
import { deltaFromKelvin, deltaToKelvin, fromCelsius, toCelsius } from '../../core/units.ts';

type Setpoint = number | 'off' | undefined;

/** Rounds away the floating-point noise of a conversion (1e-9 of a degree), for files a person reads. */
export function tidy(v: number): number {
  return Math.round(v * 1e9) / 1e9;
}

/**
 * Conversions are exact (no rounding), so the rewritten file plans exactly the same.
 * @param file a schedule file (shape of ScheduleFileSchema)
 * @param unit the unit to write it in
 * @returns the same file when it is already in `unit`, else a converted copy
 * @example scheduleInUnit({ name: 'A', units: 'F', days: { everyday: [] }, unoccupied: { heat: 59 } }, 'C').unoccupied.heat // 15
 */
export function scheduleInUnit(file: ScheduleFile, unit: TempUnit): ScheduleFile {
  const from = file.units;
  if (from === unit) return file;
  const t = (v: number) => fromCelsius(toCelsius(v, from), unit);
  const sp = (v: Setpoint): Setpoint => (typeof v === 'number' ? t(v) : v);
  const pair = (p: { heat?: Setpoint; cool?: Setpoint }) => {
    const out: { heat?: number | 'off'; cool?: number | 'off' } = {};
    if (p.heat !== undefined) out.heat = sp(p.heat)!;
    if (p.cool !== undefined) out.cool = sp(p.cool)!;
    return out;
  };
  const days: ScheduleFile['days'] = {};
  for (const [key, list] of Object.entries(file.days) as Array<[keyof ScheduleFile['days'], ScheduleFile['days']['mon']]>) {
    if (list === undefined) continue;
    days[key] = list.map((p) => ({ from: p.from, to: p.to, ...pair(p) }));
  }
  const out: ScheduleFile = {
    name: file.name,
    units: unit,
    days,
    unoccupied: pair(file.unoccupied),
    deadband: deltaFromKelvin(deltaToKelvin(file.deadband ?? (from === 'F' ? 1 : 0.5), from), unit),
    optimalStart: file.optimalStart ?? true,
    setbackFloor: t(file.setbackFloor ?? defaultSetbackFloor(from)),
  };
  if (file.baseline) out.baseline = pair(file.baseline);
  if (file.equipment) {
    const e = file.equipment;
    out.equipment = {};
    if (e.heatingCapacity) out.equipment.heatingCapacity = { ...e.heatingCapacity };
    if (e.coolingCapacity) out.equipment.coolingCapacity = { ...e.coolingCapacity };
    if (e.heatPump) {
      out.equipment.heatPump = {
        capacityAt: e.heatPump.capacityAt.map((p) => ({ outdoor: t(p.outdoor), percent: p.percent })),
        ...(e.heatPump.auxBelow !== undefined ? { auxBelow: t(e.heatPump.auxBelow) } : {}),
      };
    }
  }
  return out;
}
