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

/** What applying a saved mapping to the previewed file sets: the roles, the options it names, and a note. */
export interface SavedMappingApplied {
  roles: Role[];
  runtimeAs: RuntimeAs[];
  units?: TempUnit;
  decimal?: '.' | ',';
  timezone?: string;
  /** Always set: a saved mapping without one goes back to the detected format (''). */
  dateFormat: string;
  runtimeInterval?: 'ending' | 'starting';
  /** The sentence the screen shows: applied, columns missing, or another delimiter to choose first. */
  note: string;
}

/**
 * A saved mapping applied to a previewed file: each column it names gets its role (columns matched by
 * header, case and spaces around ignored), every other column is "not used", and the options it gives
 * replace the screen's. A column it names that the file lacks, or another delimiter, is said in the note.
 * @example applySavedMapping('BMS', { time: 'Zeit', indoor: 'Innen' }, ['Zeit', 'Innen'], ['onoff', 'onoff'], ',').roles // ['time', 'indoor']
 */
export function applySavedMapping(name: string, m: Mapping, header: readonly string[], runtimeAs: readonly RuntimeAs[], delimiter: string): SavedMappingApplied {
  const idx = (c: string | undefined) => (c === undefined ? -1 : header.findIndex((h) => h.trim().toLowerCase() === c.trim().toLowerCase()));
  const roles: Role[] = header.map(() => 'ignore');
  const as = [...runtimeAs];
  const put = (c: string | undefined, role: Role) => {
    const i = idx(c);
    if (i >= 0) roles[i] = role;
    return i;
  };
  const notFound: string[] = [];
  if (Array.isArray(m.time)) {
    if (put(m.time[0], 'date') < 0) notFound.push(m.time[0]);
    if (put(m.time[1], 'clock') < 0) notFound.push(m.time[1]);
  } else if (put(m.time, 'time') < 0) notFound.push(m.time);
  if (put(m.indoor, 'indoor') < 0) notFound.push(m.indoor);
  put(m.outdoor, 'outdoor');
  put(m.heatSetpoint, 'heatSetpoint');
  put(m.coolSetpoint, 'coolSetpoint');
  if (m.heating && m.cooling && m.heating.column === m.cooling.column) put(m.heating.column, 'heating+cooling');
  else {
    const h = put(m.heating?.column, 'heating');
    if (h >= 0 && m.heating) as[h] = m.heating.as;
    const c = put(m.cooling?.column, 'cooling');
    if (c >= 0 && m.cooling) as[c] = m.cooling.as;
  }
  let note = notFound.length ? `The saved mapping “${name}” names columns this file does not have: ${notFound.join(', ')}.` : `Applied the saved mapping “${name}”.`;
  if (m.delimiter && m.delimiter !== delimiter) {
    note = `The saved mapping “${name}” splits columns with a different delimiter: choose that delimiter first, then apply the mapping again.`;
  }
  return {
    roles,
    runtimeAs: as,
    ...(m.units ? { units: m.units } : {}),
    ...(m.decimal ? { decimal: m.decimal } : {}),
    ...(m.timezone ? { timezone: m.timezone } : {}),
    dateFormat: m.dateFormat ?? '',
    ...(m.runtimeInterval ? { runtimeInterval: m.runtimeInterval } : {}),
    note,
  };
}
