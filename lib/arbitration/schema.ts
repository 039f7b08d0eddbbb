import { z } from 'zod';

// The input schema is also the body of the public assessments endpoint, so every message names
// what is expected and in which unit: the endpoint turns each issue into one named bad field.

const READING_RESOLUTION = 0.0001;
const MAX_READINGS = 20;
const MAX_STORAGE_LOG = 1000;

/** An object that names unknown fields instead of silently dropping them: a typo must not pass as "absent". */
function strictObject<Shape extends z.core.$ZodLooseShape>(shape: Shape) {
  return z.strictObject(shape, {
    error: (issue) => {
      if (issue.code === 'unrecognized_keys') {
        return (issue.keys.length === 1 ? 'unknown field: ' : 'unknown fields: ') + issue.keys.join(', ');
      }
      return issue.input === undefined ? 'required: an object' : 'must be an object';
    },
  });
}

/**
 * Cross-field rules run only once the fields themselves are valid, so a reading out of range is
 * reported once, for itself, and not again as a broken relation with its neighbour.
 */
function fieldsValid(payload: z.core.ParsePayload): boolean {
  return payload.issues.length === 0;
}

function numberIn(unit: string) {
  return z.number({
    error: (issue) => (issue.input === undefined ? `required: a number in ${unit}` : `must be a number in ${unit}`),
  });
}

/** A cryoscope reading or standard: a freezing point from −1 to 0 °C with at most 4 decimals. */
function freezingPoint() {
  return numberIn('°C')
    .gte(-1, { error: 'must be between −1 and 0 °C' })
    .lte(0, { error: 'must be between −1 and 0 °C' })
    .multipleOf(READING_RESOLUTION, { error: 'must have at most 4 decimals (0.0001 °C resolution)' });
}

/** A limit in °C that a freezing point is compared with. */
function limitCelsius() {
  return numberIn('°C')
    .gte(-1, { error: 'must be between −1 and 0 °C' })
    .lte(0, { error: 'must be between −1 and 0 °C' });
}

function positiveCelsius(max: number) {
  return numberIn('°C')
    .gt(0, { error: 'must be greater than 0 °C' })
    .lte(max, { error: `must be at most ${max} °C` });
}

function readingList(min: number) {
  return z
    .array(freezingPoint(), { error: 'must be a list of readings in °C' })
    .min(min, { error: min === 1 ? 'needs at least one reading' : `needs at least ${min} readings` })
    .max(MAX_READINGS, { error: `must hold at most ${MAX_READINGS} readings` });
}

function isoDateTime() {
  return z.iso.datetime({
    offset: true,
    error: (issue) =>
      issue.input === undefined
        ? 'required: an ISO 8601 date and time, e.g. 2025-03-14T09:30:00Z'
        : 'must be an ISO 8601 date and time with Z or an offset, e.g. 2025-03-14T09:30:00+01:00',
  });
}

function flag(meaning: string) {
  return z.boolean({
    error: (issue) =>
      issue.input === undefined ? `required: true or false (${meaning})` : `must be true or false (${meaning})`,
  });
}

export const decisionRuleSchema = z.enum(['simple', 'guarded_rejection', 'guarded_acceptance'], {
  error: 'must be one of simple, guarded_rejection, guarded_acceptance',
});

export const onDisagreementSchema = z.enum(['third_laboratory', 'referee_decides'], {
  error: 'must be one of third_laboratory, referee_decides',
});

export const precisionSchema = strictObject({
  r: positiveCelsius(0.1).describe('Repeatability limit r, °C (ISO 5764: 0.004)'),
  R: positiveCelsius(0.1).describe('Reproducibility limit R, °C (ISO 5764: 0.006)'),
}).refine((p) => p.r <= p.R, { error: 'must not be below r', path: ['R'], when: fieldsValid });

export const calibrationRuleSchema = strictObject({
  tolerance: positiveCelsius(0.05).describe('Largest allowed |reading − standard|, °C'),
  required: z
    .number({ error: 'must be a whole number of readings' })
    .int({ error: 'must be a whole number of readings' })
    .min(1, { error: 'must be at least 1' })
    .max(MAX_READINGS, { error: `must be at most ${MAX_READINGS}` })
    .describe('Readings that must lie within the tolerance'),
});

export const rulesSchema = strictObject({
  precision: precisionSchema,
  limits: strictObject({
    upper: limitCelsius().describe('Upper freezing-point limit, °C; above it added water is suspected'),
    lower: limitCelsius().optional().describe('Lower freezing-point limit, °C; below it added solutes are suspected'),
  }).refine((l) => l.lower === undefined || l.lower < l.upper, {
    error: 'must be below the upper limit',
    path: ['lower'],
    when: fieldsValid,
  }),
  decisionRule: decisionRuleSchema,
  onDisagreement: onDisagreementSchema,
  referenceFreezingPoint: numberIn('°C')
    .gte(-1, { error: 'must be between −1 and 0 °C' })
    .lt(0, { error: 'must be below 0 °C' })
    .describe('Authentic baseline freezing point for added water, °C'),
  adjustThresholdPercent: numberIn('%')
    .gte(0, { error: 'must be 0 % or more' })
    .lte(100, { error: 'must be at most 100 %' }),
  calibration: calibrationRuleSchema,
  sampleValidHours: numberIn('hours')
    .gt(0, { error: 'must be more than 0 hours' })
    .lte(720, { error: 'must be at most 720 hours' }),
  storageRange: strictObject({
    min: numberIn('°C').gte(-50, { error: 'must be −50 °C or more' }).lte(50, { error: 'must be at most 50 °C' }),
    max: numberIn('°C').gte(-50, { error: 'must be −50 °C or more' }).lte(50, { error: 'must be at most 50 °C' }),
  }).refine((s) => s.min <= s.max, { error: 'must not be below min', path: ['max'], when: fieldsValid }),
});

export const calibrationCheckSchema = strictObject({
  nominal: freezingPoint().describe('Freezing point of the standard, °C, e.g. −0.512'),
  readings: readingList(1),
});

export const retainedSampleSchema = strictObject({
  sampledAt: isoDateTime(),
  sealIntact: flag('the seal was intact on receipt'),
  frozen: flag('the sample had been frozen'),
  custodyComplete: flag('every hand-over is recorded'),
  storageTemperatures: z
    .array(numberIn('°C').gte(-50, { error: 'must be −50 °C or more' }).lte(50, { error: 'must be at most 50 °C' }), {
      error: 'must be a list of temperatures in °C',
    })
    .min(1, { error: 'needs at least one recorded storage temperature' })
    .max(MAX_STORAGE_LOG, { error: `must hold at most ${MAX_STORAGE_LOG} temperatures` }),
});

export const assessmentInputSchema = strictObject({
  rules: rulesSchema,
  original: strictObject({
    readings: readingList(1),
    testedAt: isoDateTime(),
    calibration: calibrationCheckSchema.optional(),
  }),
  retest: strictObject({
    readings: readingList(0),
    testedAt: isoDateTime(),
    calibration: calibrationCheckSchema.optional(),
    sample: retainedSampleSchema,
  })
    .refine((t) => Date.parse(t.testedAt) >= Date.parse(t.sample.sampledAt), {
      error: 'must not be before retest.sample.sampledAt',
      path: ['testedAt'],
      when: fieldsValid,
    })
    .optional(),
  intake: strictObject({
    addedWaterPercent: numberIn('%')
      .gte(0, { error: 'must be 0 % or more' })
      .lte(100, { error: 'must be at most 100 %' })
      .optional()
      .describe('Added water the intake result charged, %'),
  }).optional(),
}).describe('A disputed intake result, its retest on the retained sample, and the scheme rules');

export type Precision = z.infer<typeof precisionSchema>;
export type DecisionRule = z.infer<typeof decisionRuleSchema>;
export type OnDisagreement = z.infer<typeof onDisagreementSchema>;
export type AssessmentRules = z.infer<typeof rulesSchema>;
export type CalibrationCheckRecord = z.infer<typeof calibrationCheckSchema>;
export type RetainedSample = z.infer<typeof retainedSampleSchema>;
export type AssessmentInput = z.infer<typeof assessmentInputSchema>;

// ---- The proposal ----

export const finalResultSchema = z.discriminatedUnion('status', [
  z.object({
    status: z.literal('accepted'),
    value: z.number().describe('Final result, °C'),
    basis: z.enum(['mean_of_2', 'mean_of_4', 'median_of_4']),
    used: z.union([z.literal(2), z.literal(4)]).describe('Readings the result is built from'),
  }),
  z.object({
    status: z.literal('needs_more_readings'),
    needed: z.number().int().min(1),
  }),
]);

export const conformityResultSchema = z.object({
  beyond: z.boolean(),
  acceptanceLimit: z.number().describe('The limit moved by the guard band, °C'),
  guardBand: z.number().min(0).describe('°C'),
  probabilityBeyond: z.number().min(0).max(1).describe('Probability that the true value is beyond the limit'),
});

export const addedWaterSchema = z.object({
  percent: z.number(),
  indicated: z.boolean(),
});

export const OUTCOMES = ['uphold', 'reverse', 'adjust', 'further_test', 'incomplete'] as const;

export const CHECK_IDS = [
  'retest.readings',
  'retest.calibration',
  'retest.sample.seal',
  'retest.sample.frozen',
  'retest.sample.custody',
  'retest.sample.storage',
  'retest.sample.age',
  'original.readings',
  'original.calibration',
  'comparison',
  'conformity.upper',
  'conformity.lower',
  'added_water',
  'intake.added_water',
] as const;

export const checkSchema = z.object({
  id: z.enum(CHECK_IDS),
  status: z.enum(['pass', 'fail', 'not_applicable', 'missing']),
  detail: z.string().describe('The step in plain words'),
  source: z.string().describe('Published source of the rule, or "common practice, no published source"'),
});

export const assessmentSchema = z
  .object({
    outcome: z.enum(OUTCOMES),
    summary: z.string().describe('One sentence for the arbiter; the arbiter decides'),
    missing: z.array(z.string()).describe('Input paths still needed before a proposal can be made'),
    decisionRule: decisionRuleSchema,
    original: finalResultSchema,
    retest: finalResultSchema.nullable(),
    originalCounts: z.boolean().describe('Whether the original result takes part in the accepted value'),
    comparison: z
      .object({
        difference: z.number().describe('Retest minus original, °C'),
        criticalDifference: z.number().describe('°C'),
        agree: z.boolean(),
      })
      .nullable(),
    acceptedValue: z.number().nullable().describe('°C'),
    acceptedBasis: z.enum(['mean_of_both', 'retest_alone']).nullable(),
    n: z.array(z.number().int()).describe('Readings used by each laboratory in the accepted value'),
    conformity: z
      .object({
        upper: conformityResultSchema,
        lower: conformityResultSchema.nullable(),
      })
      .nullable(),
    addedWater: addedWaterSchema.nullable(),
    checks: z.array(checkSchema),
  })
  .describe('The proposed outcome of a dispute, with every step explained');

export type FinalResult = z.infer<typeof finalResultSchema>;
export type ConformityResult = z.infer<typeof conformityResultSchema>;
export type AddedWater = z.infer<typeof addedWaterSchema>;
export type Outcome = (typeof OUTCOMES)[number];
export type CheckId = (typeof CHECK_IDS)[number];
export type Check = z.infer<typeof checkSchema>;
export type CheckStatus = Check['status'];
export type Assessment = z.infer<typeof assessmentSchema>;
