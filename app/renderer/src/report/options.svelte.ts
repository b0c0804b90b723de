/**
 * What the zone report is made with, shared by the Recovery screen (its conditions and "what if")
 * and the Report screen: set on one, read on the other. Temperatures °C; null = the report's default.
 */
import type { Paper } from '../../../api/report.ts';
import type { WhatIf } from '../../../../core/what-if.ts';

export interface ReportConditions {
  fromC: number;
  toC: number;
  outdoorC: number;
}

class ReportOptions {
  /** The zone these conditions were chosen for (they are not carried to another zone). */
  zoneId = $state<number | null>(null);
  conditions = $state<ReportConditions | null>(null);
  whatIf = $state<WhatIf | null>(null);
  paper = $state<Paper | null>(null);

  /** Remembers the Recovery screen's conditions and comparison for the zone's report. */
  setFor(zoneId: number, conditions: ReportConditions | null, whatIf: WhatIf | null): void {
    this.zoneId = zoneId;
    this.conditions = conditions;
    this.whatIf = whatIf;
  }

  /** Remembers the Recovery screen's "what if" as it changes. */
  setWhatIf(zoneId: number, whatIf: WhatIf | null): void {
    if (this.zoneId !== zoneId) {
      this.zoneId = zoneId;
      this.conditions = null;
    }
    this.whatIf = whatIf;
  }

  conditionsFor(zoneId: number): ReportConditions | null {
    return this.zoneId === zoneId ? this.conditions : null;
  }

  whatIfFor(zoneId: number): WhatIf | null {
    return this.zoneId === zoneId ? this.whatIf : null;
  }
}

export const reportOptions = new ReportOptions();
