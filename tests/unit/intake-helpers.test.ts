import { describe, expect, it } from 'vitest';
import { instrumentStatusAt } from '@/lib/intake/instrument-status';
import { sampleTemperatureCheck } from '@/lib/intake/practice';
import { contestDeadline, intakeNotice, type IntakeNoticeFacts } from '@/lib/intake/notice';
import { calibrationCheckInputSchema, correctionInputSchema, intakeInputSchema } from '@/lib/intake/schemas';
import { publishRulesSchema, rulesErrorMap } from '@/lib/intake/rules-input';
import { defaultSchemeRules } from '@/lib/rules/defaults';
import { describeReadings, typedReadings } from '@/components/readings/live';
import { changedLeaves, rulesLeaves } from '@/components/rules/rules-fields';
import { rulesExplained } from '@/components/rules/rules-explained';
import { fieldErrorsFromZod } from '@/lib/errors';

const HOUR = 3_600_000;
const iso5764 = { r: 0.004, R: 0.006 }; // ISO 5764:2009 Annex A, rounded clause values (from memory)

describe('instrument status', () => {
  const at = new Date('2026-03-14T08:00:00Z');
  const check = (over: Partial<{ checkedAt: Date; pass: boolean; validUntil: Date }> = {}) => ({
    id: 'c1',
    checkedAt: new Date(at.getTime() - 2 * HOUR),
    pass: true,
    within: 5,
    total: 5,
    validUntil: new Date(at.getTime() + 22 * HOUR),
    ...over,
  });

  it('is fit until the passing check runs out, and unfit a moment after', () => {
    const fit = instrumentStatusAt(check(), at);
    expect(fit).toMatchObject({ state: 'fit', until: new Date(at.getTime() + 22 * HOUR) });
    expect(fit.label).toContain('Fit for work until 15 Mar 2026, 06:00 UTC');
    const later = new Date(at.getTime() + 22 * HOUR + 1);
    expect(instrumentStatusAt(check(), later)).toMatchObject({ state: 'unfit', reason: 'expired' });
  });

  it('is unfit after a failed check even while an earlier pass would still run', () => {
    const failed = instrumentStatusAt(check({ pass: false }), at);
    expect(failed).toMatchObject({ state: 'unfit', reason: 'failed' });
    expect(failed.label).toContain('recalibrate');
  });

  it('is unfit with no check, with a check only after the moment asked about, and when out of service', () => {
    expect(instrumentStatusAt(null, at)).toMatchObject({ state: 'unfit', reason: 'never_checked' });
    expect(instrumentStatusAt(check({ checkedAt: new Date(at.getTime() + HOUR) }), at)).toMatchObject({ state: 'unfit', reason: 'never_checked' });
    expect(instrumentStatusAt(check(), at, { active: false })).toMatchObject({ state: 'unfit', reason: 'retired' });
  });
});

describe('sample temperature', () => {
  it('accepts 18.0 to 22.0 °C and flags 17.9 and 22.1 °C', () => {
    // A test portion at 20 ± 2 °C (common practice, no published source)
    expect(sampleTemperatureCheck(18).ok).toBe(true);
    expect(sampleTemperatureCheck(22).ok).toBe(true);
    expect(sampleTemperatureCheck(17.9).ok).toBe(false);
    expect(sampleTemperatureCheck(22.1)).toMatchObject({ ok: false });
    expect(sampleTemperatureCheck(22.1).message).toContain('20 ± 2 °C');
  });
});

describe('the live readings helper', () => {
  it('reads what was typed, with the minus sign as shown on screen, up to the first gap', () => {
    expect(typedReadings(['\u22120.5120', '-0,5131', '', '-0.5'])).toEqual([-0.512, -0.5131]);
    expect(typedReadings(['0.3'])).toEqual([]);
  });

  it('asks for one more after the first reading, and two more when the first two differ by more than r', () => {
    // ISO 5725-6:1994, 5.2.2: two results within r give their mean; otherwise two more are obtained
    expect(describeReadings([-0.5032], iso5764)).toMatchObject({ state: 'more', needed: 1 });
    const disagree = describeReadings([-0.5032, -0.5079], iso5764);
    expect(disagree).toMatchObject({ state: 'more', needed: 2 });
    expect(disagree.message).toBe('2 more readings needed: the first two differ by 4.7 m°C, more than r = 4.0 m°C.');
    expect(describeReadings([-0.5032, -0.5079, -0.5041], iso5764)).toMatchObject({ state: 'more', needed: 1 });
  });

  it('gives the mean of four when their range is within the critical range, the median otherwise', () => {
    // ISO 5725-6:1994, 5.2.2 and Table 1: CR0.95(4) = 3.6·σr = 5.14 m°C with r = 4 m°C (derived)
    const mean = describeReadings([-0.5032, -0.5079, -0.5041, -0.5048], iso5764);
    expect(mean).toMatchObject({ state: 'accepted', result: { basis: 'mean_of_4', used: 4 } });
    if (mean.state !== 'accepted') throw new Error('expected a result');
    expect(mean.result.value).toBeCloseTo(-0.505, 9);
    const median = describeReadings([-0.5032, -0.5079, -0.5021, -0.5048], iso5764);
    expect(median).toMatchObject({ state: 'accepted', result: { basis: 'median_of_4' } });
    expect(median.message).toContain('median of four readings');
  });

  it('says which readings beyond the procedure are not used', () => {
    const extra = describeReadings([-0.5201, -0.5205, -0.5210], iso5764);
    expect(extra).toMatchObject({ state: 'accepted', spare: 1 });
    expect(extra.message).toContain('1 further reading is not used');
  });
});

describe('the notice to the supplier', () => {
  const facts: IntakeNoticeFacts = {
    reference: 'LW-20260314-UL-104',
    farmName: 'Ashby Mire Farm',
    herdCode: 'UL-104',
    receivedAt: new Date('2026-03-14T07:40:00Z'),
    volumeLitres: 9_000,
    verdict: 'rejected',
    valueTenthMilliC: -5036,
    readingsTenthMilliC: [-5032, -5079, -5021, -5048],
    resultBasis: 'median_of_4',
    limitTenthMilliC: -5150,
    acceptanceLimitTenthMilliC: -5119,
    limitApplied: 'upper',
    decisionRule: 'guarded_rejection',
    rulesName: 'Larch Valley raw milk scheme',
    rulesVersion: 1,
    addedWaterBasisPoints: 317,
    referenceTenthMilliC: -5200,
    amountMinor: 414_000,
    currency: 'EUR',
    arithmetic: '9000 l × 0.46 EUR/l',
    instrumentSerial: 'LW-CRY-01',
    calibrationWarning: null,
    notifiedAt: new Date('2026-03-14T08:30:00Z'),
    contestHours: 24,
  };

  it('names the values, the rule applied, the money and the deadline 24 h after notice', () => {
    const notice = intakeNotice(facts);
    expect(contestDeadline(facts.notifiedAt, 24)).toEqual(new Date('2026-03-15T08:30:00Z'));
    const text = notice.lines.join('\n');
    expect(notice.subject).toBe('LW-20260314-UL-104: rejected');
    expect(text).toContain('Freezing point −0.5036 °C (median of 4 readings; readings −0.5032, −0.5079, −0.5021, −0.5048 °C) on instrument LW-CRY-01.');
    expect(text).toContain('upper limit (added water suspected above it) −0.515 °C under guarded rejection, acceptance limit −0.5119 °C; Larch Valley raw milk scheme, rules version 1.');
    expect(text).toContain('Added water estimated at 3.17 %');
    expect(text).toContain('Withheld: €4,140.00 (9000 l × 0.46 EUR/l).');
    expect(text).toContain('You may contest this result until 15 Mar 2026, 08:30 UTC (24 h after this notice)');
    expect(text).toContain('supply contract and local regulations prevail');
  });

  it('carries an instrument warning and a correction when there are', () => {
    const notice = intakeNotice({ ...facts, calibrationWarning: 'Tested on LW-CRY-02 without a passing calibration check in force.', correction: { reason: 'Reading 2 was mistyped.', previousVerdict: 'deducted', previousValueTenthMilliC: -5120 } });
    expect(notice.subject).toBe('LW-20260314-UL-104: corrected result, rejected');
    expect(notice.lines.join('\n')).toContain('Note: Tested on LW-CRY-02 without a passing calibration check in force.');
    expect(notice.lines.join('\n')).toContain('This corrects the earlier result (deducted, −0.512 °C). Reason given: Reading 2 was mistyped.');
  });
});

describe('form schemas', () => {
  const valid = {
    farmId: '7b0c2f4e-1f5e-4a57-9f40-3c8d1b2a6e90',
    reference: 'LW-20260314-UL-104',
    collectedAt: '2026-03-14T05:10',
    receivedAt: '2026-03-14T07:40',
    volumeLitres: '9000',
    tanker: 'LV-T2',
    compartment: '1',
    receiptTemperature: '4.2',
    routineCode: '',
    retainedCode: '',
    sealNumber: 'LVS-204611',
    retainedLocation: 'Retained-sample refrigerator B',
    retainedTemperature: '4.0',
    instrumentId: '0d7c9a52-38b5-4d25-8c1e-2a9d7f6b3e11',
    analystName: 'T. Fenwick',
    testedAt: '2026-03-14T08:05',
    sampleTemperature: '20.1',
    preparation: 'none',
    readings: [{ value: '−0.5032', flag: 'none' }, { value: '-0.5031', flag: 'none' }],
  };

  it('parses an intake as the form sends it: typed numbers, local times, empty codes left to the server', () => {
    const parsed = intakeInputSchema.parse(valid);
    expect(parsed).toMatchObject({ volumeLitres: 9000, receiptTemperature: 4.2, routineCode: undefined, acknowledgeUnfit: false });
    expect(parsed.readings.map((r) => r.value)).toEqual([-0.5032, -0.5031]);
  });

  it('names every bad field, and an empty reading is missing, not 0.000 °C', () => {
    const result = intakeInputSchema.safeParse({ ...valid, volumeLitres: '0', readings: [{ value: '', flag: 'none' }, { value: '-0.51234', flag: 'none' }], farmId: '' });
    expect(result.success).toBe(false);
    const errors = fieldErrorsFromZod(result.error!);
    expect(errors['readings.0.value']).toEqual(['Enter the reading in °C, such as −0.5120.']);
    expect(errors['readings.1.value']).toEqual(['Use at most 4 decimals.']);
    expect(errors.volumeLitres).toEqual(['Enter a volume from 1 to 60 000 litres.']);
    expect(errors.farmId).toEqual(['Choose the farm the load came from.']);
  });

  it('checks the order of collection, receipt and test once the fields themselves are valid', () => {
    const errors = fieldErrorsFromZod(intakeInputSchema.safeParse({ ...valid, receivedAt: '2026-03-14T04:00', testedAt: '2026-03-14T03:00' }).error!);
    expect(errors).toEqual({ receivedAt: ['A load is received after it is collected.'], testedAt: ['The sample is tested after the load is received.'] });
  });

  it('refuses a test time in the future and a standard outside ISO 5764 Table 1', () => {
    const future = new Date(Date.now() + 2 * HOUR).toISOString();
    const errors = fieldErrorsFromZod(calibrationCheckInputSchema.safeParse({ instrumentId: valid.instrumentId, analystName: 'T. Fenwick', checkedAt: future, nominal: '-0.65', readings: ['-0.512'] }).error!);
    expect(errors.checkedAt).toEqual(['This cannot be in the future.']);
    expect(errors.nominal).toEqual(['Use a standard between −0.600 and −0.400 °C (ISO 5764, Table 1).']);
  });

  it('asks a correction for its reason', () => {
    const errors = fieldErrorsFromZod(correctionInputSchema.safeParse({ intakeResultId: valid.farmId, reason: 'typo', sampleTemperature: '20', preparation: 'none', readings: valid.readings }).error!);
    expect(Object.keys(errors)).toEqual(['reason']);
  });
});

describe('the rules editor', () => {
  it('draws a control for every field of the rules schema, each explained, and nothing more', () => {
    const leaves = rulesLeaves();
    expect(leaves.map((l) => l.path).sort()).toEqual(Object.keys(rulesExplained).sort());
    expect(leaves.find((l) => l.path === 'limits.lower')).toMatchObject({ kind: 'number', optional: true, min: -1, max: 0 });
    expect(leaves.find((l) => l.path === 'calibration.required')).toMatchObject({ kind: 'number', integer: true, min: 1, max: 20 });
    expect(leaves.find((l) => l.path === 'decisionRule')).toMatchObject({ kind: 'enum', options: ['simple', 'guarded_rejection', 'guarded_acceptance'] });
    for (const leaf of leaves.filter((l) => l.kind === 'enum')) expect(Object.keys(rulesExplained[leaf.path].options ?? {}).sort()).toEqual([...leaf.options].sort());
  });

  it('lists what a new version changes', () => {
    const next = { ...defaultSchemeRules, limits: { upper: -0.512 }, decisionRule: 'simple' as const };
    expect(changedLeaves(defaultSchemeRules, next)).toEqual([
      { path: 'limits.upper', before: -0.515, after: -0.512 },
      { path: 'limits.lower', before: -0.56, after: undefined },
      { path: 'decisionRule', before: 'guarded_rejection', after: 'simple' },
    ]);
  });

  it('answers bad rules with plain messages at each field', () => {
    const bad = { ...defaultSchemeRules, precision: { r: 0.007, R: 0.006 }, calibration: { ...defaultSchemeRules.calibration, required: 6 }, adjustThresholdPercent: 140, money: { ...defaultSchemeRules.money, feeBorneBy: 'nobody' } };
    const result = publishRulesSchema.safeParse({ effectiveFrom: new Date(Date.now() - 2 * HOUR), note: 'x', rules: bad }, { error: rulesErrorMap });
    const errors = fieldErrorsFromZod(result.error!);
    expect(errors.effectiveFrom).toEqual(['A new version takes effect now or later, never in the past.']);
    expect(errors.note).toEqual(['Say what changes and why (at least 5 characters).']);
    expect(errors['rules.adjustThresholdPercent']).toEqual(['Must be at most 100.']);
    expect(errors['rules.money.feeBorneBy']).toEqual(['Choose one of the options offered.']);
    // The rules' own cross-field checks run once every field is valid: fixed the others, they speak.
    const crossed = publishRulesSchema.safeParse({ effectiveFrom: new Date(), note: 'Tighter precision.', rules: { ...defaultSchemeRules, precision: { r: 0.007, R: 0.006 }, calibration: { ...defaultSchemeRules.calibration, required: 6 } } }, { error: rulesErrorMap });
    const crossedErrors = fieldErrorsFromZod(crossed.error!);
    expect(crossedErrors['rules.precision.r']).toEqual(['the repeatability limit r cannot exceed the reproducibility limit R']);
    expect(crossedErrors['rules.calibration.required']).toEqual(['cannot require more readings within tolerance than are taken']);
  });
});
