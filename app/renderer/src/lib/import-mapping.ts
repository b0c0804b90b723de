/**
 * The Import screen's column mapping: what each column of the preview can hold (the labels the
 * screen offers) and the mapping (core/mapping.ts's format, the same JSON the command line reads)
 * built from the roles chosen, the units and the reading options. Pure, so it is unit-tested.
 */
import type { ColumnRole, Mapping } from '../../../api/contract.ts';
import type { TempUnit } from '../../../../core/types.ts';

export type RuntimeAs = 'seconds' | 'minutes' | 'fraction' | 'percent' | 'onoff';
export type Role = ColumnRole | 'ignore';

export const ROLE_LABELS: Array<[Role, string]> = [
  ['ignore', 'Not used'],
  ['time', 'Date + time'],
  ['date', 'Date'],
  ['clock', 'Time of day'],
  ['indoor', 'Indoor'],
  ['outdoor', 'Outdoor'],
  ['heatSetpoint', 'Heating setpoint'],
  ['coolSetpoint', 'Cooling setpoint'],
  ['heating', 'Heating runtime'],
  ['cooling', 'Cooling runtime'],
  ['heating+cooling', 'Heating/cooling state'],
];

export const RUNTIME_LABELS: Array<[RuntimeAs, string]> = [
  ['seconds', 'as seconds'],
  ['minutes', 'as minutes'],
  ['fraction', 'as 0–1'],
  ['percent', 'as %'],
  ['onoff', 'as on/off'],
];

export const DELIMITERS: Array<[string, string]> = [[',', 'comma ,'], [';', 'semicolon ;'], ['\t', 'tab'], ['|', 'bar |']];

export interface MappingOptions {
  units: TempUnit;
  delimiter: string;
  decimal: '.' | ',';
  runtimeInterval: 'ending' | 'starting';
  dateFormat: string;
  timezone: string;
}

/**
 * The mapping the roles say, or null with what is still missing (a time and an indoor column).
 * @example buildMapping(['t', 'in'], ['time', 'indoor'], ['onoff', 'onoff'], opts).mapping?.indoor // 'in'
 */
export function buildMapping(header: readonly string[], roles: readonly Role[], runtimeAs: readonly RuntimeAs[], o: MappingOptions): { mapping: Mapping | null; missing: string[] } {
  const col = (role: Role) => {
    const i = roles.indexOf(role);
    return i >= 0 ? header[i] : undefined;
  };
  const missing: string[] = [];
  const time = col('time');
  const dateCol = col('date');
  const clock = col('clock');
  const indoor = col('indoor');
  let timeSpec: Mapping['time'] | undefined;
  if (time) timeSpec = time;
  else if (dateCol && clock) timeSpec = [dateCol, clock];
  else missing.push(dateCol ? 'a time-of-day column' : 'a date-and-time column');
  if (!indoor) missing.push('an indoor temperature column');
  if (!timeSpec || !indoor) return { mapping: null, missing };
  const m: Mapping = { time: timeSpec, indoor, units: o.units, delimiter: o.delimiter as Mapping['delimiter'], decimal: o.decimal, runtimeInterval: o.runtimeInterval };
  const outdoor = col('outdoor');
  if (outdoor) m.outdoor = outdoor;
  const hs = col('heatSetpoint');
  if (hs) m.heatSetpoint = hs;
  const cs = col('coolSetpoint');
  if (cs) m.coolSetpoint = cs;
  const both = roles.indexOf('heating+cooling');
  if (both >= 0) {
    m.heating = { column: header[both]!, as: 'onoff' };
    m.cooling = { column: header[both]!, as: 'onoff' };
  }
  const h = roles.indexOf('heating');
  if (h >= 0) m.heating = { column: header[h]!, as: runtimeAs[h]! };
  const c = roles.indexOf('cooling');
  if (c >= 0) m.cooling = { column: header[c]!, as: runtimeAs[c]! };
  if (o.dateFormat.trim()) m.dateFormat = o.dateFormat.trim();
  if (o.timezone.trim()) m.timezone = o.timezone.trim();
  return { mapping: m, missing };
}
