import { z } from 'zod';
import { describe, expect, it } from 'vitest';
import { assess, assessmentInputSchema, assessmentSchema } from '@/lib/arbitration';
import { disputedDelivery } from './fixtures';

// Tests break valid input on purpose, which the input type would not allow.
type Loose = Record<string, any>;

/** A valid input broken by `edit`; returns each issue as "path: message". */
function issuesAfter(edit: (input: Loose) => void): string[] {
  const input = disputedDelivery() as Loose;
  edit(input);
  const result = assessmentInputSchema.safeParse(input);
  if (result.success) return [];
  return result.error.issues.map((issue) => issue.path.join('.') + ': ' + issue.message);
}

describe('assessmentInputSchema', () => {
  it('accepts a complete, realistic input and one without a retest', () => {
    expect(assessmentInputSchema.safeParse(disputedDelivery()).success).toBe(true);
    const noRetest = disputedDelivery();
    delete noRetest.retest;
    expect(assessmentInputSchema.safeParse(noRetest).success).toBe(true);
  });

  it('names each bad field at once, with its own message', () => {
    const issues = issuesAfter((i) => {
      i.rules.precision.r = -0.004;
      i.original.readings[1] = 0.2;
      i.original.testedAt = 'yesterday';
      i.retest.readings[0] = -0.51234;
      i.retest.readings[1] = '-0.5146';
      i.retest.sample.frozen = 'no';
      delete i.rules.decisionRule;
      i.rules.onDisagreement = 'toss_a_coin';
    });
    expect(issues).toEqual(
      expect.arrayContaining([
        'rules.precision.r: must be greater than 0 °C',
        'original.readings.1: must be between −1 and 0 °C',
        expect.stringMatching(/^original\.testedAt: must be an ISO 8601 date and time/),
        'retest.readings.0: must have at most 4 decimals (0.0001 °C resolution)',
        'retest.readings.1: must be a number in °C',
        'retest.sample.frozen: must be true or false (the sample had been frozen)',
        'rules.decisionRule: must be one of simple, guarded_rejection, guarded_acceptance',
        'rules.onDisagreement: must be one of third_laboratory, referee_decides',
      ]),
    );
    expect(issues).toHaveLength(8);
  });

  it('says "required" for a missing field', () => {
    expect(issuesAfter((i) => delete i.rules.referenceFreezingPoint)).toEqual([
      'rules.referenceFreezingPoint: required: a number in °C',
    ]);
    expect(issuesAfter((i) => delete i.retest.sample.sampledAt)).toEqual([
      expect.stringMatching(/^retest\.sample\.sampledAt: required: an ISO 8601 date and time/),
    ]);
  });

  it('checks the fields against each other', () => {
    expect(issuesAfter((i) => (i.rules.precision.R = 0.003))).toEqual(['rules.precision.R: must not be below r']);
    expect(issuesAfter((i) => (i.rules.limits.lower = -0.5))).toEqual([
      'rules.limits.lower: must be below the upper limit',
    ]);
    expect(issuesAfter((i) => (i.rules.storageRange = { min: 6, max: 0 }))).toEqual([
      'rules.storageRange.max: must not be below min',
    ]);
    expect(issuesAfter((i) => (i.retest.testedAt = '2025-03-13T22:00:00Z'))).toEqual([
      'retest.testedAt: must not be before retest.sample.sampledAt',
    ]);
  });

  it('reports a bad field once, not again as a broken relation with its neighbour', () => {
    expect(issuesAfter((i) => (i.rules.precision.r = 0.2))).toEqual(['rules.precision.r: must be at most 0.1 °C']);
    expect(issuesAfter((i) => (i.rules.limits.upper = -1.2))).toEqual([
      'rules.limits.upper: must be between −1 and 0 °C',
    ]);
    expect(issuesAfter((i) => (i.retest.sample.sampledAt = 'last Tuesday'))).toEqual([
      expect.stringMatching(/^retest\.sample\.sampledAt: must be an ISO 8601 date and time/),
    ]);
  });

  it('accepts r equal to R and readings with exactly 4 decimals', () => {
    expect(issuesAfter((i) => (i.rules.precision = { r: 0.005, R: 0.005 }))).toEqual([]);
    expect(issuesAfter((i) => (i.original.readings = [-0.5215, -0.5219]))).toEqual([]);
  });

  it('accepts date-times with Z or an offset, but not without a zone', () => {
    expect(issuesAfter((i) => (i.original.testedAt = '2025-03-14T06:05:00Z'))).toEqual([]);
    expect(issuesAfter((i) => (i.original.testedAt = '2025-03-14T06:05:00.250+01:00'))).toEqual([]);
    expect(issuesAfter((i) => (i.original.testedAt = '2025-03-14T06:05:00'))).toHaveLength(1);
    expect(issuesAfter((i) => (i.original.testedAt = '2025-03-14'))).toHaveLength(1);
  });

  it('keeps numbers in range', () => {
    expect(issuesAfter((i) => (i.rules.referenceFreezingPoint = 0))).toEqual([
      'rules.referenceFreezingPoint: must be below 0 °C',
    ]);
    expect(issuesAfter((i) => (i.rules.calibration.required = 2.5))).toEqual([
      'rules.calibration.required: must be a whole number of readings',
    ]);
    expect(issuesAfter((i) => (i.rules.limits.upper = -1.2))).toEqual([
      'rules.limits.upper: must be between −1 and 0 °C',
    ]);
    expect(issuesAfter((i) => (i.intake = { addedWaterPercent: -2 }))).toEqual([
      'intake.addedWaterPercent: must be 0 % or more',
    ]);
    expect(issuesAfter((i) => (i.original.readings = []))).toEqual(['original.readings: needs at least one reading']);
    expect(issuesAfter((i) => (i.retest.sample.storageTemperatures = []))).toEqual([
      'retest.sample.storageTemperatures: needs at least one recorded storage temperature',
    ]);
  });

  it('rejects non-finite numbers, which JSON cannot carry but a caller in code can', () => {
    expect(issuesAfter((i) => (i.original.readings = [-0.52, Number.NaN]))).toHaveLength(1);
    expect(issuesAfter((i) => (i.rules.sampleValidHours = Number.POSITIVE_INFINITY))).toHaveLength(1);
  });

  it('names unknown fields instead of dropping them', () => {
    expect(issuesAfter((i) => (i.rules.limits.lowr = -0.56))).toEqual(['rules.limits: unknown field: lowr']);
    expect(issuesAfter((i) => (i.verdict = 'uphold'))).toEqual([': unknown field: verdict']);
  });

  it('rejects a body that is not an object', () => {
    const result = assessmentInputSchema.safeParse('uphold');
    expect(result.success).toBe(false);
    expect(result.error?.issues[0].message).toBe('must be an object');
  });

  it('converts to JSON Schema for the API document', () => {
    const jsonSchema = z.toJSONSchema(assessmentInputSchema) as Loose;
    const reading = jsonSchema.properties.original.properties.readings.items;
    expect(reading).toMatchObject({ type: 'number', minimum: -1, maximum: 0, multipleOf: 0.0001 });
    expect(jsonSchema.properties.rules.additionalProperties).toBe(false);
    expect(jsonSchema.required).toEqual(['rules', 'original']);
    expect(() => z.toJSONSchema(assessmentSchema)).not.toThrow();
  });
});

describe('assessmentSchema', () => {
  it('describes what assess returns', () => {
    const parsed = assessmentSchema.safeParse(assess(disputedDelivery()));
    expect(parsed.success).toBe(true);
  });

  it('would notice an outcome outside the contract', () => {
    const assessment = { ...assess(disputedDelivery()), outcome: 'settle' };
    expect(assessmentSchema.safeParse(assessment).success).toBe(false);
  });
});
