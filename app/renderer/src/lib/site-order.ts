/**
 * The order sites are listed in (sidebar, Sites screen, pickers): by name, as a person reads them
 * (locale-aware, numbers in numeric order), with the invented demo site last so a new site is never
 * listed above it by accident.
 */
export function sortSites<T extends { name: string; isDemo: boolean }>(sites: readonly T[]): T[] {
  const byName = new Intl.Collator(undefined, { sensitivity: 'base', numeric: true });
  return [...sites].sort((a, b) => Number(a.isDemo) - Number(b.isDemo) || byName.compare(a.name, b.name));
}
