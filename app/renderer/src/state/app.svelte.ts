/**
 * The application's shared state: the unit, the sites and zones, the selected zone and screen.
 * Screens read it and call its methods; only this class and the screens talk to the backend.
 */
import type { AppInfo, SiteInfo, ZoneInfo } from '../../../api/contract.ts';
import type { TempUnit } from '../../../../core/types.ts';
import type { Backend } from '../lib/backend.ts';
import { sortSites } from '../lib/site-order.ts';

export type Screen = 'sites' | 'import' | 'history' | 'response' | 'recovery' | 'plan' | 'site-plan' | 'report' | 'estimate' | 'about';

export const SCREENS: Array<{ id: Screen; label: string; needsZone: boolean }> = [
  { id: 'sites', label: 'Sites and zones', needsZone: false },
  { id: 'import', label: 'Import a log', needsZone: true },
  { id: 'history', label: 'Zone history', needsZone: true },
  { id: 'response', label: 'Response', needsZone: true },
  { id: 'recovery', label: 'Recovery', needsZone: true },
  { id: 'plan', label: 'Setback plan', needsZone: true },
  { id: 'report', label: 'Zone report', needsZone: true },
  { id: 'site-plan', label: 'Site timeline', needsZone: false },
  { id: 'estimate', label: 'Quick estimate', needsZone: false },
];

export class AppState {
  readonly backend: Backend;
  units = $state<TempUnit>('C');
  screen = $state<Screen>('sites');
  sites = $state<SiteInfo[]>([]);
  zoneId = $state<number | null>(null);
  info = $state<AppInfo | null>(null);
  ready = $state(false);
  /** A problem to show at the top of the window (cleared by the person). */
  problem = $state<string | null>(null);

  site = $derived<SiteInfo | null>(this.sites.find((s) => s.zones.some((z) => z.id === this.zoneId)) ?? null);
  zone = $derived<ZoneInfo | null>(this.site?.zones.find((z) => z.id === this.zoneId) ?? null);

  constructor(backend: Backend) {
    this.backend = backend;
  }

  get api() {
    return this.backend.api;
  }

  async init(): Promise<void> {
    try {
      const [info, settings] = await Promise.all([this.api.appInfo({}), this.api.getSettings({})]);
      this.info = info;
      this.units = settings.units;
      await this.refreshSites();
      const demo = this.sites.find((s) => s.id === info.demoSiteId && s.zones.length > 0);
      const first = demo ?? this.sites.find((s) => s.zones.length > 0);
      if (first) {
        this.zoneId = first.zones[0]!.id;
        this.screen = 'history';
      } else {
        this.screen = 'sites';
      }
      this.backend.onMenu((command) => this.onMenu(command));
    } catch (err) {
      this.problem = (err as Error).message;
    } finally {
      this.ready = true;
    }
  }

  private onMenu(command: string) {
    const screen = SCREENS.find((s) => s.id === command)?.id ?? (command === 'about' ? 'about' : null);
    if (screen) this.go(screen);
  }

  async refreshSites(): Promise<void> {
    this.sites = sortSites(await this.api.listSites({}));
    if (this.zoneId !== null && !this.sites.some((s) => s.zones.some((z) => z.id === this.zoneId))) {
      this.zoneId = null;
    }
  }

  async setUnits(unit: TempUnit): Promise<void> {
    if (unit === this.units) return;
    this.units = unit;
    try {
      await this.api.setSettings({ units: unit });
    } catch (err) {
      this.problem = `The unit could not be remembered: ${(err as Error).message}`;
    }
  }

  go(screen: Screen): void {
    this.screen = screen;
  }

  selectZone(zoneId: number, screen?: Screen): void {
    this.zoneId = zoneId;
    if (screen) this.screen = screen;
  }

  isDemo(siteId: number | null | undefined): boolean {
    return siteId !== null && siteId !== undefined && this.sites.some((s) => s.id === siteId && s.isDemo);
  }
}
