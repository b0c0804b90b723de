export { fitResponse, simulateFit, type FitOptions } from './fit.ts';
export { prepareLog, type PreparedLog, type PrepareOptions } from './prepare.ts';
