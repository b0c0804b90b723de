/**
 * The importer's notes (written for the command line) as the Import screen shows them: command-line
 * advice pointed at the screen's own fields, times written in UTC shown in the zone's local time like
 * the rest of the screen, and counts with thousands separators.
 */
import { count, dateTime } from './format.ts';

/** One importer note for the screen; `timeZone` is the zone's (undefined: this computer's). */
export function importNoteForScreen(text: string, timeZone?: string): string {
  const zoneName = timeZone ?? Intl.DateTimeFormat().resolvedOptions().timeZone;
  return text
    .replace(/\s*with --tz \(e\.g\. --tz [^)]*\) or "timezone" in the mapping/g, ' in “Time zone” above')
    .replace(/\(use --tz or "timezone" in the mapping\)/g, '(set “Time zone” above)')
    .replace(/Give --units or "units" in a mapping if that is wrong\./g, 'Change “Temperature unit” above if that is wrong.')
    .replace(/;? ?[Gg]ive "dateFormat" in a mapping( \(e\.g\.[^)]*\))?/g, '; set “Date format” above')
    .replace(/Give "(heating|cooling)": \{"column", "as"\} in a mapping if that is wrong\./g, 'Change how the column is read in the table if that is wrong.')
    .replace(/Give a mapping to choose another\./g, 'Choose another in the table if that is wrong.')
    .replace(/ \(see the rejected rows of the log\)/g, ' (listed below)')
    .replace(/(\d{4}-\d{2}-\d{2})[ T](\d{2}:\d{2}) UTC/g, (_m, d: string, t: string) => `${dateTime(Date.parse(`${d}T${t}:00Z`), timeZone)} (${zoneName})`)
    .replace(/(?<![\d#.,:\-/])\d{4,}(?![\d.,:\-/])/g, (n) => count(Number(n)));
}
