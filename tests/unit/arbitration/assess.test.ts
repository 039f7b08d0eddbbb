import { describe, expect, it } from 'vitest';
import {
  assess,
  assessmentSchema,
  CHECK_IDS,
  type Assessment,
  type AssessmentInput,
  type CheckId,
} from '@/lib/arbitration';
import { deepFreeze, disputedDelivery, failedCalibration, goodCalibration, withRetest } from './fixtures';

function checkOf(assessment: Assessment, id: CheckId) {
  const found = assessment.checks.find((c) => c.id === id);
  if (found === undefined) throw new Error('no check ' + id);
  return found;
}

/** Outcome-independent promises: every check once, each with words and a source, a valid shape. */
function expectWellFormed(assessment: Assessment) {
  expect(assessment.checks.map((c) => c.id).sort()).toEqual([...CHECK_IDS].sort());
  for (const c of assessment.checks) {
    expect(c.detail.length).toBeGreaterThan(10);
    expect(c.source.length).toBeGreaterThan(5);
  }
  expect(assessment.summary.endsWith('The arbiter decides.')).toBe(true);
  expect(assessmentSchema.safeParse(assessment).success).toBe(true);
}

function run(input: AssessmentInput): Assessment {
  const assessment = assess(deepFreeze(input));
  expectWellFormed(assessment);
  return assessment;
}

describe('assess: incomplete', () => {
  it('has no proposal before the retained sample is retested', () => {
    const input = disputedDelivery();
    delete input.retest;
    const a = run(input);
    expect(a.outcome).toBe('incomplete');
    expect(a.missing).toEqual(['retest']);
    expect(a.retest).toBeNull();
    expect(a.acceptedValue).toBeNull();
    expect(a.conformity).toBeNull();
    expect(checkOf(a, 'retest.readings').status).toBe('missing');
    expect(checkOf(a, 'retest.sample.seal').status).toBe('missing');
    expect(checkOf(a, 'conformity.upper').status).toBe('not_applicable');
    expect(a.summary).toContain('the retest of the retained sample');
  });

  it('waits for a second retest reading', () => {
    // ISO 5725-6:1994, 5.2.2
    const a = run(withRetest((i) => (i.retest.readings = [-0.514])));
    expect(a.outcome).toBe('incomplete');
    expect(a.retest).toEqual({ status: 'needs_more_readings', needed: 1 });
    expect(a.missing).toEqual(['retest.readings']);
    expect(a.summary).toContain('1 more retest reading');
  });

  it('waits for two more when the first two retest readings disagree', () => {
    // ISO 5725-6:1994, 5.2.2: 4.5 m°C apart, over r = 4 m°C
    const a = run(withRetest((i) => (i.retest.readings = [-0.514, -0.5185])));
    expect(a.outcome).toBe('incomplete');
    expect(a.retest).toEqual({ status: 'needs_more_readings', needed: 2 });
    expect(checkOf(a, 'retest.readings').detail).toContain('4.5 m°C');
    expect(a.summary).toContain('2 more retest readings');
  });

  it('waits for a fourth when three retest readings are in and the first two disagree', () => {
    // ISO 5725-6:1994, 5.2.2
    const a = run(withRetest((i) => (i.retest.readings = [-0.514, -0.5185, -0.5161])));
    expect(a.outcome).toBe('incomplete');
    expect(a.retest).toEqual({ status: 'needs_more_readings', needed: 1 });
  });

  it('waits for the referee instrument’s calibration check', () => {
    // common practice, no published source
    const a = run(withRetest((i) => delete i.retest.calibration));
    expect(a.outcome).toBe('incomplete');
    expect(a.missing).toEqual(['retest.calibration']);
    expect(checkOf(a, 'retest.calibration').status).toBe('missing');
  });

  it('lists everything still missing, and stays incomplete even when the sample already looks unfit', () => {
    // The outcome order puts incomplete before an unfit sample.
    const a = run(
      withRetest((i) => {
        i.retest.readings = [];
        delete i.retest.calibration;
        i.retest.sample.sealIntact = false;
      }),
    );
    expect(a.outcome).toBe('incomplete');
    expect(a.missing).toEqual(['retest.readings', 'retest.calibration']);
    expect(checkOf(a, 'retest.sample.seal').status).toBe('fail');
    expect(a.summary).toContain('already looks unfit');
  });

  it('treats a retained sample with no storage temperatures recorded as incomplete', () => {
    // ISO 5764:2009, clause 7: storage at 0–6 °C cannot be shown without a record
    const a = run(withRetest((i) => (i.retest.sample.storageTemperatures = [])));
    expect(a.outcome).toBe('incomplete');
    expect(a.missing).toEqual(['retest.sample.storageTemperatures']);
    expect(checkOf(a, 'retest.sample.storage').status).toBe('missing');
  });
});

describe('assess: unfit retained sample → further test', () => {
  const unfitCases: [
    string,
    CheckId,
    (i: ReturnType<typeof disputedDelivery> & { retest: NonNullable<AssessmentInput['retest']> }) => void,
  ][] = [
    // common practice, no published source
    ['a broken seal', 'retest.sample.seal', (i) => (i.retest.sample.sealIntact = false)],
    // common practice, no published source
    ['a frozen sample', 'retest.sample.frozen', (i) => (i.retest.sample.frozen = true)],
    // common practice, no published source
    ['a gap in custody', 'retest.sample.custody', (i) => (i.retest.sample.custodyComplete = false)],
    // ISO 5764:2009, clause 7: 0 °C to 6 °C
    ['storage at 6.5 °C', 'retest.sample.storage', (i) => (i.retest.sample.storageTemperatures = [4.1, 6.5, 4.0])],
    // ISO 5764:2009, clause 7: 0 °C to 6 °C
    ['storage at −0.5 °C', 'retest.sample.storage', (i) => (i.retest.sample.storageTemperatures = [2.1, -0.5])],
    // ISO 5764:2009, clause 7: tested within 48 h of sampling; here 48 h 30 min
    ['a test 48.5 h after sampling', 'retest.sample.age', (i) => (i.retest.testedAt = '2025-03-16T07:10:00+01:00')],
    // a test recorded before the sampling time cannot be placed in the 48 h window
    [
      'a test time before the sampling time',
      'retest.sample.age',
      (i) => (i.retest.testedAt = '2025-03-14T05:00:00+01:00'),
    ],
  ];

  for (const [what, id, edit] of unfitCases) {
    it('proposes a further test for ' + what, () => {
      const a = run(withRetest(edit));
      expect(a.outcome).toBe('further_test');
      expect(checkOf(a, id).status).toBe('fail');
      expect(a.missing).toEqual([]);
      expect(a.acceptedValue).toBeNull();
      expect(a.conformity).toBeNull();
      expect(checkOf(a, 'comparison').status).toBe('not_applicable');
      expect(a.summary).toContain('the retained sample is unfit');
    });
  }

  it('accepts a test exactly 48 h after sampling and storage exactly at 0 °C and 6 °C', () => {
    // ISO 5764:2009, clause 7: the limits themselves are within
    const a = run(
      withRetest((i) => {
        i.retest.testedAt = '2025-03-16T05:40:00Z';
        i.retest.sample.sampledAt = '2025-03-14T05:40:00Z';
        i.retest.sample.storageTemperatures = [0, 3.2, 6];
      }),
    );
    expect(checkOf(a, 'retest.sample.age').status).toBe('pass');
    expect(checkOf(a, 'retest.sample.age').detail).toContain('48 h');
    expect(checkOf(a, 'retest.sample.storage').status).toBe('pass');
    expect(a.outcome).toBe('reverse');
  });
});

describe('assess: referee instrument calibration', () => {
  it('proposes a further test when the retest calibration check fails', () => {
    // common practice, no published source: 2 of 5 within ±0.004 °C, 3 required
    const a = run(withRetest((i) => (i.retest.calibration = failedCalibration())));
    expect(a.outcome).toBe('further_test');
    expect(checkOf(a, 'retest.calibration').status).toBe('fail');
    expect(checkOf(a, 'retest.calibration').detail).toContain('2 of 5');
    expect(a.acceptedValue).toBeNull();
    expect(a.summary).toContain('calibration check');
  });
});

describe('assess: both results count and agree', () => {
  it('takes the mean of both laboratories and reverses under guarded rejection', () => {
    // ISO 5725-6:1994, 5.3.2 (clause from memory): 1.2 m°C ≤ CD(2, 2) = 5.292 m°C → mean
    // JCGM 106:2012 guarded rejection: acceptance limit −0.515 + 2.198 m°C (derived from the formula)
    const a = run(disputedDelivery());
    expect(a.original).toEqual({ status: 'accepted', value: -0.5131, basis: 'mean_of_2', used: 2 });
    expect(a.retest).toEqual({ status: 'accepted', value: -0.5143, basis: 'mean_of_2', used: 2 });
    expect(a.originalCounts).toBe(true);
    expect(a.comparison?.agree).toBe(true);
    expect(a.comparison?.difference).toBe(-0.0012);
    expect(a.comparison?.criticalDifference).toBeCloseTo(Math.sqrt(28) / 1000, 12);
    expect(a.acceptedValue).toBe(-0.5137);
    expect(a.acceptedBasis).toBe('mean_of_both');
    expect(a.n).toEqual([2, 2]);
    expect(a.conformity?.upper.beyond).toBe(false);
    expect(a.conformity?.upper.acceptanceLimit).toBeCloseTo(-0.512802, 6);
    expect(a.conformity?.lower?.beyond).toBe(false);
    expect(a.addedWater?.percent).toBeCloseTo(1.2115, 4); // derived from the formula
    expect(a.outcome).toBe('reverse');
    expect(checkOf(a, 'comparison').detail).toContain('1.2 m°C');
    expect(checkOf(a, 'comparison').detail).toContain('5.292 m°C');
    expect(checkOf(a, 'original.readings').detail).toContain('−0.5128 °C');
    expect(checkOf(a, 'conformity.upper').source).toContain('JCGM 106:2012');
    expect(a.summary).toContain('Proposal: reverse');
  });

  it('upholds the same results under simple acceptance, −0.5137 °C being above −0.515 °C', () => {
    // ILAC G8:09/2019, simple acceptance
    const input = disputedDelivery();
    input.rules.decisionRule = 'simple';
    const a = run(input);
    expect(a.outcome).toBe('uphold');
    expect(a.conformity?.upper).toMatchObject({ beyond: true, guardBand: 0, acceptanceLimit: -0.515 });
    expect(checkOf(a, 'intake.added_water').status).toBe('not_applicable');
  });

  it('upholds when the accepted value is beyond the upper limit even with the guard band', () => {
    // JCGM 106:2012 guarded rejection; accepted (−0.5075 − 0.5082)/2 = −0.50785 °C
    const input = disputedDelivery();
    input.original.readings = [-0.5072, -0.5078];
    input.retest!.readings = [-0.508, -0.5084];
    const a = run(input);
    expect(a.acceptedValue).toBe(-0.50785);
    expect(a.conformity?.upper.beyond).toBe(true);
    expect(a.outcome).toBe('uphold');
    expect(a.addedWater?.indicated).toBe(true);
    expect(a.summary).toContain('added water');
  });

  it('upholds when the accepted value is beyond the lower limit', () => {
    // JCGM 106:2012 guarded rejection on the lower side: −0.566 °C < −0.560 − 2.198 m°C
    const input = disputedDelivery();
    input.original.readings = [-0.5652, -0.566];
    input.retest!.readings = [-0.5661, -0.5667];
    const a = run(input);
    expect(a.acceptedValue).toBe(-0.566);
    expect(a.conformity?.lower?.beyond).toBe(true);
    expect(a.conformity?.upper.beyond).toBe(false);
    expect(a.outcome).toBe('uphold');
    expect(checkOf(a, 'conformity.lower').status).toBe('fail');
    expect(a.addedWater?.indicated).toBe(false);
  });

  it('gives no lower-limit check when the scheme sets none', () => {
    const input = disputedDelivery();
    delete input.rules.limits.lower;
    const a = run(input);
    expect(a.conformity?.lower).toBeNull();
    expect(checkOf(a, 'conformity.lower').status).toBe('not_applicable');
    expect(a.outcome).toBe('reverse');
  });
});

describe('assess: adjust', () => {
  // Accepted (−0.5092 − 0.5100)/2 = −0.5096 °C: 2.000 % added water against −0.520 °C, derived from the formula.
  function twoPercent(charged: number): AssessmentInput {
    const input = disputedDelivery();
    input.original.readings = [-0.509, -0.5094];
    input.retest!.readings = [-0.5098, -0.5102];
    input.intake = { addedWaterPercent: charged };
    return input;
  }

  it('adjusts when the intake charge differs from the accepted value’s added water by more than the threshold', () => {
    // common practice, no published source: the scheme's adjust threshold, here 1.0 %
    const a = run(twoPercent(3.2));
    expect(a.acceptedValue).toBe(-0.5096);
    expect(a.addedWater?.percent).toBeCloseTo(2, 9);
    expect(a.outcome).toBe('adjust');
    expect(checkOf(a, 'intake.added_water').status).toBe('fail');
    expect(a.summary).toContain('adjust the charge to 2.0 %');
  });

  it('upholds when the difference is exactly the threshold, despite floating point', () => {
    // common practice, no published source: "more than" the threshold adjusts, equal does not
    const a = run(twoPercent(3));
    expect(Math.abs((a.addedWater?.percent ?? 0) - 3)).toBeGreaterThan(1); // the raw float difference is over 1
    expect(a.outcome).toBe('uphold');
    expect(checkOf(a, 'intake.added_water').status).toBe('pass');
  });

  it('adjusts downward as well as upward', () => {
    // common practice, no published source
    expect(run(twoPercent(0.9)).outcome).toBe('adjust');
    expect(run(twoPercent(1.1)).outcome).toBe('uphold');
  });

  it('does not adjust when the accepted value is within the upper limit', () => {
    const input = disputedDelivery();
    input.intake = { addedWaterPercent: 4 };
    const a = run(input);
    expect(a.outcome).toBe('reverse');
    expect(checkOf(a, 'intake.added_water').status).toBe('not_applicable');
  });
});

describe('assess: both results count and disagree', () => {
  // Original −0.5101 °C, retest −0.5163 °C: 6.2 m°C apart, over CD(2, 2) = 5.292 m°C.
  function disagreeing(onDisagreement: 'third_laboratory' | 'referee_decides'): AssessmentInput {
    const input = disputedDelivery();
    input.rules.onDisagreement = onDisagreement;
    input.original.readings = [-0.5098, -0.5104];
    input.retest!.readings = [-0.516, -0.5166];
    return input;
  }

  it('sends a third sample to a third laboratory', () => {
    // ISO 5725-6:1994, 5.3.2 (clause from memory); ISO 4259, clause 10
    const a = run(disagreeing('third_laboratory'));
    expect(a.comparison).toMatchObject({ agree: false, difference: -0.0062 });
    expect(a.outcome).toBe('further_test');
    expect(a.acceptedValue).toBeNull();
    expect(checkOf(a, 'comparison').status).toBe('fail');
    expect(checkOf(a, 'comparison').source).toContain('ISO 4259, clause 10');
    expect(a.summary).toContain('third laboratory');
  });

  it('lets the retest stand alone when the referee decides', () => {
    // common practice, no published source: the referee result is binding under the scheme
    const a = run(disagreeing('referee_decides'));
    expect(a.comparison?.agree).toBe(false);
    expect(a.acceptedValue).toBe(-0.5163);
    expect(a.acceptedBasis).toBe('retest_alone');
    expect(a.n).toEqual([2]);
    expect(a.outcome).toBe('reverse');
  });

  it('compares at resolution against the unrounded CD(2, 4) = 5.099 m°C: 5.0 agrees, 5.1 does not', () => {
    // ISO 5725-6:1994, 5.3.2 (clause from memory); value derived from the formula
    const withRetestReadings = (readings: number[]) => {
      const input = disputedDelivery();
      input.original.readings = [-0.512, -0.5124]; // −0.5122 °C, mean of 2
      input.retest!.readings = readings;
      return input;
    };
    const agreeing = run(withRetestReadings([-0.515, -0.5195, -0.5175, -0.5168])); // −0.5172 °C, mean of 4
    expect(agreeing.retest).toMatchObject({ basis: 'mean_of_4', value: -0.5172 });
    expect(agreeing.comparison?.criticalDifference).toBeCloseTo(Math.sqrt(26) / 1000, 12);
    expect(agreeing.comparison?.difference).toBe(-0.005);
    expect(agreeing.comparison?.agree).toBe(true);
    expect(agreeing.n).toEqual([2, 4]);

    const disagreeingBy51 = run(withRetestReadings([-0.515, -0.5195, -0.5175, -0.5172])); // −0.5173 °C
    expect(disagreeingBy51.comparison?.difference).toBe(-0.0051);
    expect(disagreeingBy51.comparison?.agree).toBe(false);
    expect(disagreeingBy51.outcome).toBe('further_test');
  });
});

describe('assess: the original result does not count', () => {
  // With the original at −0.5101 °C and the retest at −0.5163 °C they would disagree and go to a
  // third laboratory; with the original set aside the retest alone is within the limit.
  function setAside(edit: (input: AssessmentInput) => void): Assessment {
    const input = disputedDelivery();
    input.original.readings = [-0.5098, -0.5104];
    input.retest!.readings = [-0.516, -0.5166];
    edit(input);
    return run(input);
  }

  const cases: [string, (input: AssessmentInput) => void, CheckId, 'fail' | 'missing'][] = [
    // ISO 5725-6:1994, 5.2.2: two readings 4.6 m°C apart and no more taken
    [
      'its readings were never accepted',
      (i) => (i.original.readings = [-0.5098, -0.5144]),
      'original.readings',
      'fail',
    ],
    // common practice, no published source
    ['it has no calibration check', (i) => delete i.original.calibration, 'original.calibration', 'missing'],
    // common practice, no published source
    [
      'its calibration check failed',
      (i) => (i.original.calibration = failedCalibration()),
      'original.calibration',
      'fail',
    ],
  ];

  for (const [why, edit, id, status] of cases) {
    it('lets the retest stand alone when ' + why, () => {
      const a = setAside(edit);
      expect(a.originalCounts).toBe(false);
      expect(checkOf(a, id).status).toBe(status);
      expect(a.comparison).toBeNull();
      expect(checkOf(a, 'comparison').status).toBe('not_applicable');
      expect(a.acceptedValue).toBe(-0.5163);
      expect(a.acceptedBasis).toBe('retest_alone');
      expect(a.n).toEqual([2]);
      expect(a.outcome).toBe('reverse');
    });
  }

  it('would have gone to a third laboratory with the original counting', () => {
    expect(setAside(() => undefined).outcome).toBe('further_test');
  });

  it('uses the one-laboratory guard band for the retest alone', () => {
    // the product's guard band: n = [2] → u² = σR² − σr² + σr²/2, derived from the formula
    const a = setAside((i) => (i.original.calibration = undefined));
    const sR = 0.006 / 2.8;
    const sr = 0.004 / 2.8;
    expect(a.conformity?.upper.guardBand).toBeCloseTo(1.645 * Math.sqrt(sR * sR - sr * sr + (sr * sr) / 2), 12);
  });
});

describe('assess: details', () => {
  it('reports readings past the ones used', () => {
    // ISO 5725-6:1994, 5.2.2
    const a = run(withRetest((i) => (i.retest.readings = [-0.514, -0.5146, -0.5177])));
    expect(checkOf(a, 'retest.readings').detail).toContain('1 further reading was not used');
    expect(a.retest).toMatchObject({ used: 2 });
  });

  it('shows temperatures with 3 or 4 decimals and a true minus sign', () => {
    const a = run(disputedDelivery());
    const upper = checkOf(a, 'conformity.upper').detail;
    expect(upper).toContain('−0.5137 °C');
    expect(upper).toContain('−0.515 °C');
    expect(upper).toContain('2.198 m°C');
  });

  it('does not change its input', () => {
    const input = disputedDelivery();
    const copy = structuredClone(input);
    assess(input);
    expect(input).toEqual(copy);
  });

  it('uses the retest calibration record it is given, not a default', () => {
    const a = run(withRetest((i) => (i.retest.calibration = { ...goodCalibration(), nominal: -0.557 })));
    expect(checkOf(a, 'retest.calibration').status).toBe('fail');
    expect(checkOf(a, 'retest.calibration').detail).toContain('−0.557 °C standard');
  });
});
