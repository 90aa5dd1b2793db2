// Public entry of alerts for the rest of the product. Pure parts (rules, thresholds, names, mail
// words) are safe anywhere; runner.server.ts and notify.ts touch the database and the mail server.
export * from './types';
export {
  defaultThresholds,
  defaultSeverity,
  resolveThresholds,
  thresholdFields,
  thresholdOverridesSchema,
} from './thresholds';
export type { Thresholds, ThresholdKey, ThresholdOverrides } from './thresholds';
export { evaluateReadings, evaluateClock, initialState } from './engine';
export type { EngineState, TankFacts, Transition } from './engine';
