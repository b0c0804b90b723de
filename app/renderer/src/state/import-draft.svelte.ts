/**
 * The Import screen's column mapping as it is being edited for the previewed file: what each column
 * holds, how runtime columns are written, the reading options, and the mapping they make
 * (lib/import-mapping.ts buildMapping), with the time-zone checks that hold the import back.
 */
import type { Preview } from '../../../api/contract.ts';
import { isValidTimeZone } from '../../../../core/mapping.ts';
import type { TempUnit } from '../../../../core/types.ts';
import { applySavedMapping, buildMapping, type Role, type RuntimeAs } from '../lib/import-mapping.ts';
import type { SavedMapping } from '../../../api/contract.ts';

export class ImportDraft {
  preview = $state.raw<Preview | null>(null);
  roles = $state<Role[]>([]);
  runtimeAs = $state<RuntimeAs[]>([]);
  delimiter = $state<string>(',');
  decimal = $state<'.' | ','>('.');
  units = $state<TempUnit>('C');
  timezone = $state('');
  dateFormat = $state('');
  runtimeInterval = $state<'ending' | 'starting'>('ending');

  /** The mapping as the roles, units and options now say, or null with what is still missing. */
  readonly mapping = $derived(
    this.preview
      ? buildMapping(this.preview.header, this.roles, this.runtimeAs, {
          units: this.units, delimiter: this.delimiter, decimal: this.decimal, runtimeInterval: this.runtimeInterval, dateFormat: this.dateFormat, timezone: this.timezone,
        })
      : { mapping: null, missing: [] },
  );
  /** A time zone typed that the platform's time-zone data does not know (as the Sites screen and the store check). */
  readonly tzInvalid = $derived(this.timezone.trim() !== '' && !isValidTimeZone(this.timezone.trim()));
  /** A log of local clock times with no time zone given: the import waits for one. */
  readonly tzMissing = $derived(this.preview?.needsTimezone === true && this.timezone.trim() === '');

  /**
   * Takes a preview's detection: delimiter, decimal mark, unit (else `fallbackUnits`), the time zone
   * it names (else `defaultTimeZone` for local clock times), and each column's role.
   */
  apply(p: Preview, fallbackUnits: TempUnit, defaultTimeZone: string): void {
    this.preview = p;
    this.delimiter = p.delimiter;
    this.decimal = p.decimal;
    this.units = p.units ?? p.mapping?.units ?? fallbackUnits;
    this.timezone = p.mapping?.timezone ?? (p.needsTimezone ? defaultTimeZone : '');
    this.dateFormat = p.mapping?.dateFormat ?? '';
    this.runtimeInterval = p.mapping?.runtimeInterval ?? 'ending';
    this.roles = p.header.map((_, i) => p.columns.find((c) => c.index === i + 1)?.role ?? 'ignore');
    this.runtimeAs = p.header.map((_, i) => p.columns.find((c) => c.index === i + 1)?.runtimeAs ?? 'onoff');
  }

  /** One column per role (except "not used"): a role given to column `i` is taken from any other. */
  setRole(i: number, role: Role): void {
    if (role !== 'ignore') this.roles = this.roles.map((r, j) => (j !== i && r === role ? 'ignore' : r));
    this.roles[i] = role;
  }

  /** Applies a saved mapping to the previewed file; returns the note to show (null: no such mapping). */
  applySaved(saved: SavedMapping | undefined): string | null {
    if (!saved || !this.preview) return null;
    const a = applySavedMapping(saved.name, saved.mapping, this.preview.header, this.runtimeAs, this.delimiter);
    this.roles = a.roles;
    this.runtimeAs = a.runtimeAs;
    if (a.units) this.units = a.units;
    if (a.decimal) this.decimal = a.decimal;
    if (a.timezone) this.timezone = a.timezone;
    this.dateFormat = a.dateFormat;
    if (a.runtimeInterval) this.runtimeInterval = a.runtimeInterval;
    return a.note;
  }
}
