/**
 * The ZoneResponse fields a hand-written one-node test response rarely cares about (the model choice,
 * the backtest, the time zone), filled in so test fixtures state only what they check. Invented values.
 */
import type { ZoneResponse } from '../../core/types.ts';

export const ONE_NODE_FIELDS: Pick<ZoneResponse, 'model' | 'twoNode' | 'solarGainCI' | 'gainCI' | 'selection' | 'recoveryBacktest' | 'recoveryBacktestReason' | 'timeZone'> = {
  model: 'one-node',
  twoNode: null,
  solarGainCI: null,
  gainCI: [0.08, 0.12],
  selection: { criterion: 'BIC (Schwarz 1978)', candidates: [], effectiveReadings: 1000, reason: 'Invented for a test.' },
  recoveryBacktest: null,
  recoveryBacktestReason: 'Invented for a test.',
  timeZone: 'UTC',
};
