/**
 * Time zone names for the screens' inputs: the IANA zones this browser knows (for a `<datalist>`),
 * this computer's zone, and the check the backend applies (core/mapping.ts isValidTimeZone).
 */
import { isValidTimeZone } from '../../../../core/mapping.ts';

export { isValidTimeZone };

/** Every IANA zone name of Intl.supportedValuesOf('timeZone'), with "UTC" (some engines leave it out). */
export const TIME_ZONES: readonly string[] = (() => {
  try {
    const all = (Intl as unknown as { supportedValuesOf(k: string): string[] }).supportedValuesOf('timeZone');
    return all.includes('UTC') ? all : [...all, 'UTC'];
  } catch {
    return ['UTC'];
  }
})();

/** This computer's time zone (what times are shown in when neither the site nor the log names one). */
export const LOCAL_TIME_ZONE = Intl.DateTimeFormat().resolvedOptions().timeZone;
