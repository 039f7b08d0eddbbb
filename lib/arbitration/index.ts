// The decision module's public contract. Pure functions only: no framework, no I/O, so the same
// code makes the proposals on the server and runs the live readings helper in the browser.

export { addedWater, type AddedWaterInput } from './added-water';
export { assess } from './assess';
export { calibrationCheck, type CalibrationCheckInput, type CalibrationCheckResult } from './calibration';
export {
  conformity,
  GUARD_BAND_COVERAGE,
  standardUncertainty,
  type ConformityInput,
  type LimitSide,
} from './conformity';
export { criticalRangeOfFour, finalResult, medianOfFour } from './final-result';
export { celsiusToHortvet, HORTVET_FACTOR, hortvetToCelsius, SUCROSE_LINE, type HortvetConversion } from './hortvet';
export { normalCdf } from './normal';
export { criticalDifference, criticalRangeFactor } from './precision';
export {
  addedWaterSchema,
  assessmentInputSchema,
  assessmentSchema,
  CHECK_IDS,
  checkSchema,
  conformityResultSchema,
  decisionRuleSchema,
  finalResultSchema,
  OUTCOMES,
  precisionSchema,
  type AddedWater,
  type Assessment,
  type AssessmentInput,
  type AssessmentRules,
  type Check,
  type CheckId,
  type CheckStatus,
  type ConformityResult,
  type DecisionRule,
  type FinalResult,
  type OnDisagreement,
  type Outcome,
  type Precision,
} from './schema';
export { SODIUM_CHLORIDE_TABLE, sodiumChlorideFor } from './sodium-chloride';
export { PRACTICE, SOURCES } from './sources';
