import type { AssessmentInput } from '@/lib/arbitration';
import type { SchemeRules } from './schema';

/** The part of the scheme's rules that the decision module reads. */
export function assessmentRules(rules: SchemeRules): AssessmentInput['rules'] {
  return {
    precision: rules.precision,
    limits: rules.limits.lower === undefined ? { upper: rules.limits.upper } : { upper: rules.limits.upper, lower: rules.limits.lower },
    decisionRule: rules.decisionRule,
    onDisagreement: rules.onDisagreement,
    referenceFreezingPoint: rules.referenceFreezingPoint,
    adjustThresholdPercent: rules.adjustThresholdPercent,
    calibration: { tolerance: rules.calibration.tolerance, required: rules.calibration.required },
    sampleValidHours: rules.sample.validHours,
    storageRange: rules.sample.storageRange,
  };
}
