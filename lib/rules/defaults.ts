import type { SchemeRules } from './schema';

/**
 * The rules a fresh installation starts with. The limits are an example of one regional scheme
 * (see the method page); every scheme sets its own through the Rules screen.
 */
export const defaultSchemeRules: SchemeRules = {
  name: 'Larch Valley raw milk scheme',
  currency: 'EUR',
  display: { scale: 'celsius', hortvetConversion: 'sucrose_line' },
  limits: { upper: -0.515, lower: -0.56 },
  precision: { r: 0.004, R: 0.006 },
  decisionRule: 'guarded_rejection',
  onDisagreement: 'third_laboratory',
  referenceFreezingPoint: -0.52,
  adjustThresholdPercent: 1,
  rejectionAddedWaterPercent: 3,
  calibration: { nominal: -0.512, readings: 5, tolerance: 0.004, required: 3, validHours: 24, allowUnfitWithWarning: false },
  sample: { validHours: 48, storageRange: { min: 0, max: 6 } },
  deadlines: { contestHours: 24, dispatchHours: 4, decisionWorkingDays: 5 },
  money: { milkPricePerLitre: 0.46, deduction: 'added_water_share', refereeFee: 180, feeBorneBy: 'losing_party' },
};
