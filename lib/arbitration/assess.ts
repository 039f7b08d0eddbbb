import { addedWater } from './added-water';
import { calibrationCheck, type CalibrationCheckResult } from './calibration';
import {
  addedWaterCheck,
  calibrationEntry,
  check,
  comparisonCheck,
  conformityCheck,
  intakeCheck,
  notAssessed,
  readingsCheck,
  retestAbsentChecks,
  sampleChecks,
} from './checks';
import { conformity, standardUncertainty } from './conformity';
import { finalResult } from './final-result';
import { celsius, count, milliCelsius, percent } from './format';
import { criticalDifference, differenceWithin, withoutNoise } from './precision';
import type {
  AddedWater,
  Assessment,
  AssessmentInput,
  AssessmentRules,
  CalibrationCheckRecord,
  Check,
  ConformityResult,
  FinalResult,
  Outcome,
} from './schema';
import { conformitySource, RULE_NAMES, SOURCES } from './sources';

// Percentages get the same kind of allowance as temperatures: enough for arithmetic noise, far
// too small to matter.
const PERCENT_NOISE = 1e-9;

type AcceptedBasis = NonNullable<Assessment['acceptedBasis']>;

const BASIS_WORDS: Record<AcceptedBasis, string> = {
  mean_of_both: 'the mean of both laboratories',
  retest_alone: 'the retest alone',
};

function checkCalibration(
  record: CalibrationCheckRecord | undefined,
  rule: AssessmentRules['calibration'],
): CalibrationCheckResult | null {
  if (record === undefined) return null;
  return calibrationCheck({
    nominal: record.nominal,
    readings: record.readings,
    tolerance: rule.tolerance,
    required: rule.required,
  });
}

function missingInWords(path: string, retest: FinalResult | null): string {
  if (path === 'retest') return 'the retest of the retained sample';
  if (path === 'retest.readings') {
    const needed = retest !== null && retest.status === 'needs_more_readings' ? retest.needed : 1;
    return count(needed, 'more retest reading', 'more retest readings');
  }
  if (path === 'retest.calibration') return "the referee instrument's calibration check";
  if (path === 'retest.sample.storageTemperatures') return 'the storage temperatures of the retained sample';
  return path;
}

function listInWords(items: readonly string[]): string {
  let words = '';
  for (let i = 0; i < items.length; i++) {
    words += (i === 0 ? '' : i === items.length - 1 ? ' and ' : ', ') + items[i];
  }
  return words;
}

/**
 * The proposed outcome of a dispute over an intake freezing-point result, each step explained.
 * It is decision support: the arbiter decides. Input is expected to have passed the input schema;
 * a value that could not have passed it is the caller's bug and is thrown as a RangeError.
 */
export function assess(input: AssessmentInput): Assessment {
  const { rules, original, retest, intake } = input;
  const { precision, decisionRule } = rules;
  const checks: Check[] = [];
  const missing: string[] = [];

  // 1–3. The retest: its readings, the retained sample, the referee instrument.
  let retestResult: FinalResult | null = null;
  let unfit: string[] = [];
  let retestCalibration: CalibrationCheckResult | null = null;
  if (retest === undefined) {
    missing.push('retest');
    for (const absent of retestAbsentChecks()) checks.push(absent);
  } else {
    retestResult = finalResult(retest.readings, precision);
    checks.push(readingsCheck('retest', retest.readings, retestResult, precision));
    if (retestResult.status !== 'accepted') missing.push('retest.readings');

    const fitness = sampleChecks(retest.sample, retest.testedAt, rules);
    for (const sampleCheck of fitness.checks) checks.push(sampleCheck);
    for (const path of fitness.missing) missing.push(path);
    unfit = fitness.unfit;

    retestCalibration = checkCalibration(retest.calibration, rules.calibration);
    if (retestCalibration === null) missing.push('retest.calibration');
    checks.push(calibrationEntry('retest', retest.calibration?.nominal, retestCalibration, rules.calibration));
  }

  // 4. The original result counts only with accepted readings and a passed calibration check.
  const originalResult = finalResult(original.readings, precision);
  checks.push(readingsCheck('original', original.readings, originalResult, precision));
  const originalCalibration = checkCalibration(original.calibration, rules.calibration);
  checks.push(calibrationEntry('original', original.calibration?.nominal, originalCalibration, rules.calibration));
  const originalCounts =
    originalResult.status === 'accepted' && originalCalibration !== null && originalCalibration.pass;

  let outcome: Outcome | null = null;
  let summary = '';
  let notAssessedBecause = '';
  if (missing.length > 0) {
    outcome = 'incomplete';
    notAssessedBecause = 'the retest is not complete yet';
    const needs: string[] = [];
    for (const path of missing) needs.push(missingInWords(path, retestResult));
    summary = `No proposal yet: still needed: ${listInWords(needs)}.`;
    if (unfit.length > 0) {
      summary += ` The retained sample already looks unfit (${unfit.join('; ')}), which calls for a further test.`;
    }
  } else if (unfit.length > 0) {
    outcome = 'further_test';
    notAssessedBecause = 'the retained sample is unfit';
    summary = `Proposal: a further test, because the retained sample is unfit: ${unfit.join('; ')}.`;
  } else if (retestCalibration !== null && !retestCalibration.pass) {
    outcome = 'further_test';
    notAssessedBecause = 'the referee instrument failed its calibration check';
    summary =
      `Proposal: a further test, because the referee instrument failed its calibration check ` +
      `(${retestCalibration.within} of ${retestCalibration.total} readings within ` +
      `±${milliCelsius(rules.calibration.tolerance)}; ${rules.calibration.required} required).`;
  }

  // 5. Both results, or the retest alone.
  let comparison: Assessment['comparison'] = null;
  let acceptedValue: number | null = null;
  let acceptedBasis: AcceptedBasis | null = null;
  let n: number[] = [];
  if (outcome !== null || retestResult === null || retestResult.status !== 'accepted') {
    checks.push(notAssessed('comparison', notAssessedBecause, SOURCES.criticalDifference));
  } else if (originalCounts && originalResult.status === 'accepted') {
    const retestValue = retestResult.value;
    const originalValue = originalResult.value;
    const critical = criticalDifference(precision, originalResult.used, retestResult.used);
    const agree = differenceWithin(retestValue, originalValue, critical);
    comparison = { difference: withoutNoise(retestValue - originalValue), criticalDifference: critical, agree };
    checks.push(
      comparisonCheck(
        comparison.difference,
        critical,
        agree,
        originalResult.used,
        retestResult.used,
        rules.onDisagreement,
      ),
    );
    if (agree) {
      acceptedValue = withoutNoise((retestValue + originalValue) / 2);
      acceptedBasis = 'mean_of_both';
      n = [originalResult.used, retestResult.used];
    } else if (rules.onDisagreement === 'third_laboratory') {
      outcome = 'further_test';
      notAssessedBecause = 'the two results disagree and a third laboratory is to test a third sample';
      summary =
        `Proposal: a further test by a third laboratory, because the retest (${celsius(retestValue)}) and the ` +
        `original (${celsius(originalValue)}) differ by ${milliCelsius(Math.abs(comparison.difference))}, ` +
        `more than the critical difference of ${milliCelsius(critical)}.`;
    } else {
      acceptedValue = retestValue;
      acceptedBasis = 'retest_alone';
      n = [retestResult.used];
    }
  } else {
    const reason = 'the original result does not count, so the retest stands alone';
    checks.push(notAssessed('comparison', reason, SOURCES.criticalDifference));
    acceptedValue = retestResult.value;
    acceptedBasis = 'retest_alone';
    n = [retestResult.used];
  }

  // 6. The accepted value against the limits, and the added water it shows.
  let conformityResult: Assessment['conformity'] = null;
  let water: AddedWater | null = null;
  if (acceptedValue === null || acceptedBasis === null) {
    checks.push(notAssessed('conformity.upper', notAssessedBecause, conformitySource(decisionRule)));
    checks.push(notAssessed('conformity.lower', notAssessedBecause, conformitySource(decisionRule)));
    checks.push(notAssessed('added_water', notAssessedBecause, SOURCES.addedWater));
    checks.push(notAssessed('intake.added_water', notAssessedBecause, SOURCES.adjust));
  } else {
    const value = acceptedValue;
    const { upper: upperLimit, lower: lowerLimit } = rules.limits;
    const uncertainty = standardUncertainty(precision, n);
    const upper = conformity({ value, n, precision, limit: upperLimit, side: 'upper', rule: decisionRule });
    checks.push(conformityCheck('upper', value, upperLimit, upper, uncertainty, decisionRule));
    let lower: ConformityResult | null = null;
    if (lowerLimit === undefined) {
      const source = conformitySource(decisionRule);
      checks.push(check('conformity.lower', 'not_applicable', 'The scheme sets no lower limit.', source));
    } else {
      lower = conformity({ value, n, precision, limit: lowerLimit, side: 'lower', rule: decisionRule });
      checks.push(conformityCheck('lower', value, lowerLimit, lower, uncertainty, decisionRule));
    }
    conformityResult = { upper, lower };

    water = addedWater({ reference: rules.referenceFreezingPoint, sample: value });
    checks.push(addedWaterCheck(value, rules.referenceFreezingPoint, water));

    const accepted = `the accepted value ${celsius(value)} (${BASIS_WORDS[acceptedBasis]})`;
    const underRule = `under ${RULE_NAMES[decisionRule]}`;
    const charged = intake?.addedWaterPercent;
    if (lower !== null && lower.beyond && lowerLimit !== undefined) {
      outcome = 'uphold';
      checks.push(notAssessed('intake.added_water', 'the accepted value is beyond the lower limit', SOURCES.adjust));
      summary = `Proposal: uphold the intake result: ${accepted} is beyond the lower limit ${celsius(lowerLimit)} ${underRule}.`;
    } else if (!upper.beyond) {
      outcome = 'reverse';
      checks.push(notAssessed('intake.added_water', 'the accepted value is within the upper limit', SOURCES.adjust));
      summary = `Proposal: reverse the intake result: ${accepted} is within the upper limit ${celsius(upperLimit)} ${underRule}.`;
    } else {
      const beyond = `${accepted} is beyond the upper limit ${celsius(upperLimit)} ${underRule}`;
      const adjust =
        charged !== undefined && Math.abs(water.percent - charged) > rules.adjustThresholdPercent + PERCENT_NOISE;
      if (charged === undefined) {
        const reason = 'the intake result did not charge by added water';
        checks.push(notAssessed('intake.added_water', reason, SOURCES.adjust));
      } else {
        checks.push(intakeCheck(charged, water.percent, rules.adjustThresholdPercent, adjust));
      }
      if (adjust && charged !== undefined) {
        outcome = 'adjust';
        summary =
          `Proposal: adjust the charge to ${percent(water.percent)} added water ` +
          `(the intake charged ${percent(charged)}): ${beyond}.`;
      } else {
        outcome = 'uphold';
        const shows = water.indicated ? `, indicating ${percent(water.percent)} added water` : '';
        summary = `Proposal: uphold the intake result: ${beyond}${shows}.`;
      }
    }
  }

  // Every path above ends in an outcome; reaching here without one is a bug, not an input problem.
  if (outcome === null) throw new Error('assess: no outcome was reached');

  return {
    outcome,
    summary: `${summary} The arbiter decides.`,
    missing,
    decisionRule,
    original: originalResult,
    retest: retestResult,
    originalCounts,
    comparison,
    acceptedValue,
    acceptedBasis,
    n,
    conformity: conformityResult,
    addedWater: water,
    checks,
  };
}
