import { z } from 'zod';

/** A freezing point in °C, at the 0.0001 °C resolution the product stores. */
const freezingPoint = z
  .number({ error: 'must be a number in °C' })
  .min(-1, 'must be at least −1.000 °C')
  .max(0, 'must be at most 0.000 °C');

const positiveCelsius = z.number({ error: 'must be a number in °C' }).positive('must be greater than zero').max(0.1, 'must be at most 0.100 °C');

/** The scheme's rules: the limits, method precision, decision rule, deadlines and money, as one versioned document. */
export const schemeRulesSchema = z
  .object({
    name: z.string().trim().min(3, 'give the scheme a name').max(120),
    currency: z.string().regex(/^[A-Z]{3}$/, 'a three-letter currency code such as EUR'),
    display: z.object({
      scale: z.enum(['celsius', 'hortvet']),
      hortvetConversion: z.enum(['factor', 'sucrose_line']),
    }),
    limits: z.object({ upper: freezingPoint, lower: freezingPoint.optional() }),
    precision: z.object({ r: positiveCelsius, R: positiveCelsius }),
    decisionRule: z.enum(['simple', 'guarded_rejection', 'guarded_acceptance']),
    onDisagreement: z.enum(['third_laboratory', 'referee_decides']),
    referenceFreezingPoint: freezingPoint.refine((v) => v < 0, 'must be below 0.000 °C'),
    adjustThresholdPercent: z.number().min(0).max(100),
    // Beyond the upper limit, loads whose added water reaches this share are rejected; below it, deducted.
    rejectionAddedWaterPercent: z.number().min(0).max(100),
    calibration: z.object({
      nominal: freezingPoint,
      readings: z.number().int().min(1).max(20),
      tolerance: positiveCelsius,
      required: z.number().int().min(1).max(20),
      validHours: z.number().int().min(1).max(24 * 31),
      allowUnfitWithWarning: z.boolean(),
    }),
    sample: z.object({
      validHours: z.number().int().min(1).max(24 * 30),
      storageRange: z.object({ min: z.number().min(-5).max(20), max: z.number().min(-5).max(20) }),
    }),
    deadlines: z.object({
      contestHours: z.number().int().min(1).max(24 * 30),
      dispatchHours: z.number().int().min(1).max(24 * 7),
      decisionWorkingDays: z.number().int().min(1).max(60),
    }),
    money: z.object({
      milkPricePerLitre: z.number().positive().max(100),
      deduction: z.enum(['added_water_share']),
      refereeFee: z.number().min(0).max(100000),
      feeBorneBy: z.enum(['losing_party', 'plant', 'supplier']),
    }),
  })
  .superRefine((rules, ctx) => {
    if (rules.precision.r > rules.precision.R) {
      ctx.addIssue({ code: 'custom', path: ['precision', 'r'], message: 'the repeatability limit r cannot exceed the reproducibility limit R' });
    }
    if (rules.limits.lower !== undefined && rules.limits.lower >= rules.limits.upper) {
      ctx.addIssue({ code: 'custom', path: ['limits', 'lower'], message: 'the lower limit must be colder than the upper limit' });
    }
    if (rules.calibration.required > rules.calibration.readings) {
      ctx.addIssue({ code: 'custom', path: ['calibration', 'required'], message: 'cannot require more readings within tolerance than are taken' });
    }
    if (rules.sample.storageRange.min > rules.sample.storageRange.max) {
      ctx.addIssue({ code: 'custom', path: ['sample', 'storageRange', 'min'], message: 'the minimum must not exceed the maximum' });
    }
  });

export type SchemeRules = z.infer<typeof schemeRulesSchema>;
