export { fitResponse, simulateFit, type FitOptions } from './fit.ts';
export { prepareLog, type PreparedLog, type PrepareOptions } from './prepare.ts';
export { modesOf, effectiveTau, type Modes } from '../modes.ts';
