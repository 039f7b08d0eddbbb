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
import * as format from './format';
import { criticalDifference, differenceWithin, withoutNoise } from './precision';
import type {
  AddedWater,
  Assessment,
  AssessmentInput,
  Check,
  ConformityResult,
  FinalResult,
  Outcome,
} from './schema';
import { conformitySource, RULE_NAMES, SOURCES } from './sources';

// Percentages are compared with the same kind of allowance as temperatures: enough for arithmetic
// noise, far too small to matter.
const PERCENT_NOISE = 1e-9;

type AcceptedBasis = 'mean_of_both' | 'retest_alone';

const BASIS_WORDS: Record<AcceptedBasis, string> = {
  mean_of_both: 'the mean of both laboratories',
  retest_alone: 'the retest alone',
};

function missingInWords(path: string, retestResult: FinalResult | null): string {
  if (path === 'retest') return 'the retest of the retained sample';
  if (path === 'retest.readings') {
    const needed = retestResult !== null && retestResult.status === 'needs_more_readings' ? retestResult.needed : 1;
    return format.count(needed, 'more retest reading', 'more retest readings');
  }
  if (path === 'retest.calibration') return "the referee instrument's calibration check";
  if (path === 'retest.sample.storageTemperatures') return 'the storage temperatures of the retained sample';
  return path;
}

/**
 * The proposed outcome of a dispute over an intake freezing-point result, with each step explained.
 * It is decision support: the arbiter decides. Input is expected to have passed the input schema;
 * a value that could not have passed it is a bug in the caller and is thrown as a RangeError.
 */
export function assess(input: AssessmentInput): Assessment {
  const { rules, original, retest, intake } = input;
  const { precision, decisionRule } = rules;
  const checks: Check[] = [];
  const missing: string[] = [];

  // 1–3. The retest: its readings, the retained sample and the referee instrument.
  let retestResult: FinalResult | null = null;
  let unfit: string[] = [];
  let retestCalibration: CalibrationCheckResult | null = null;
  if (retest === undefined) {
    missing.push('retest');
    const absent = retestAbsentChecks();
    for (let i = 0; i < absent.length; i++) checks.push(absent[i]);
  } else {
    retestResult = finalResult(retest.readings, precision);
    checks.push(readingsCheck('retest', retest.readings, retestResult, precision));
    if (retestResult.status !== 'accepted') missing.push('retest.readings');

    const fitness = sampleChecks(retest.sample, retest.testedAt, rules);
    for (let i = 0; i < fitness.checks.length; i++) checks.push(fitness.checks[i]);
    for (let i = 0; i < fitness.missing.length; i++) missing.push(fitness.missing[i]);
    unfit = fitness.unfit;

    if (retest.calibration === undefined) {
      missing.push('retest.calibration');
    } else {
      retestCalibration = calibrationCheck({
        nominal: retest.calibration.nominal,
        readings: retest.calibration.readings,
        tolerance: rules.calibration.tolerance,
        required: rules.calibration.required,
      });
    }
    checks.push(calibrationEntry('retest', retest.calibration?.nominal, retestCalibration, rules.calibration));
  }

  // 4. The original result counts only with accepted readings and a passed calibration check.
  const originalResult = finalResult(original.readings, precision);
  checks.push(readingsCheck('original', original.readings, originalResult, precision));
  const originalCalibration =
    original.calibration === undefined
      ? null
      : calibrationCheck({
          nominal: original.calibration.nominal,
          readings: original.calibration.readings,
          tolerance: rules.calibration.tolerance,
          required: rules.calibration.required,
        });
  checks.push(calibrationEntry('original', original.calibration?.nominal, originalCalibration, rules.calibration));
  const originalCounts =
    originalResult.status === 'accepted' && originalCalibration !== null && originalCalibration.pass;

  let outcome: Outcome | null = null;
  let summary = '';
  let notAssessedBecause = '';
  if (missing.length > 0) {
    outcome = 'incomplete';
    notAssessedBecause = 'the retest is not complete yet';
    let needs = '';
    for (let i = 0; i < missing.length; i++) {
      needs += (i === 0 ? '' : i === missing.length - 1 ? ' and ' : ', ') + missingInWords(missing[i], retestResult);
    }
    summary = 'No proposal yet: still needed: ' + needs + '.';
    if (unfit.length > 0) {
      summary += ' The retained sample already looks unfit (' + unfit.join('; ') + '), which calls for a further test.';
    }
  } else if (unfit.length > 0) {
    outcome = 'further_test';
    notAssessedBecause = 'the retained sample is unfit';
    summary = 'Proposal: a further test, because the retained sample is unfit: ' + unfit.join('; ') + '.';
  } else if (retestCalibration !== null && !retestCalibration.pass) {
    outcome = 'further_test';
    notAssessedBecause = 'the referee instrument failed its calibration check';
    summary =
      'Proposal: a further test, because the referee instrument failed its calibration check (' +
      retestCalibration.within + ' of ' + retestCalibration.total + ' readings within ±' +
      format.milliCelsius(rules.calibration.tolerance) + '; ' + rules.calibration.required + ' required).';
  }

  // 5. Both results, or the retest alone.
  let comparison: Assessment['comparison'] = null;
  let acceptedValue: number | null = null;
  let acceptedBasis: AcceptedBasis | null = null;
  let n: number[] = [];
  if (outcome === null && retestResult !== null && retestResult.status === 'accepted') {
    const retestValue = retestResult.value;
    if (originalCounts && originalResult.status === 'accepted') {
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
          'Proposal: a further test by a third laboratory, because the retest (' + format.celsius(retestValue) +
          ') and the original (' + format.celsius(originalValue) + ') differ by ' +
          format.milliCelsius(Math.abs(comparison.difference)) + ', more than the critical difference of ' +
          format.milliCelsius(critical) + '.';
      } else {
        acceptedValue = retestValue;
        acceptedBasis = 'retest_alone';
        n = [retestResult.used];
      }
    } else {
      checks.push(
        notAssessed('comparison', 'the original result does not count, so the retest stands alone', SOURCES.criticalDifference),
      );
      acceptedValue = retestValue;
      acceptedBasis = 'retest_alone';
      n = [retestResult.used];
    }
  } else {
    checks.push(notAssessed('comparison', notAssessedBecause, SOURCES.criticalDifference));
  }

  // 6. The accepted value against the limits, and the added water it shows.
  let conformityResult: Assessment['conformity'] = null;
  let water: AddedWater | null = null;
  if (acceptedValue !== null && acceptedBasis !== null) {
    const { upper: upperLimit, lower: lowerLimit } = rules.limits;
    const uncertainty = standardUncertainty(precision, n);
    const upper = conformity({ value: acceptedValue, n, precision, limit: upperLimit, side: 'upper', rule: decisionRule });
    checks.push(conformityCheck('upper', acceptedValue, upperLimit, upper, uncertainty, decisionRule));
    let lower: ConformityResult | null = null;
    if (lowerLimit === undefined) {
      checks.push(check('conformity.lower', 'not_applicable', 'The scheme sets no lower limit.', conformitySource(decisionRule)));
    } else {
      lower = conformity({ value: acceptedValue, n, precision, limit: lowerLimit, side: 'lower', rule: decisionRule });
      checks.push(conformityCheck('lower', acceptedValue, lowerLimit, lower, uncertainty, decisionRule));
    }
    conformityResult = { upper, lower };

    water = addedWater({ reference: rules.referenceFreezingPoint, sample: acceptedValue });
    checks.push(addedWaterCheck(acceptedValue, rules.referenceFreezingPoint, water));

    const valueWords =
      'the accepted value ' + format.celsius(acceptedValue) + ' (' + BASIS_WORDS[acceptedBasis] + ')';
    const ruleWords = ' under ' + RULE_NAMES[decisionRule];
    const charged = intake?.addedWaterPercent;
    if (lower !== null && lower.beyond && lowerLimit !== undefined) {
      outcome = 'uphold';
      checks.push(notAssessed('intake.added_water', 'the accepted value is beyond the lower limit', SOURCES.adjust));
      summary =
        'Proposal: uphold the intake result: ' + valueWords + ' is beyond the lower limit ' +
        format.celsius(lowerLimit) + ruleWords + '.';
    } else if (!upper.beyond) {
      outcome = 'reverse';
      checks.push(notAssessed('intake.added_water', 'the accepted value is within the upper limit', SOURCES.adjust));
      summary =
        'Proposal: reverse the intake result: ' + valueWords + ' is within the upper limit ' +
        format.celsius(upperLimit) + ruleWords + '.';
    } else {
      const beyondWords = valueWords + ' is beyond the upper limit ' + format.celsius(upperLimit) + ruleWords;
      if (charged === undefined) {
        outcome = 'uphold';
        checks.push(notAssessed('intake.added_water', 'the intake result did not charge by added water', SOURCES.adjust));
      } else {
        const adjust = Math.abs(water.percent - charged) > rules.adjustThresholdPercent + PERCENT_NOISE;
        outcome = adjust ? 'adjust' : 'uphold';
        checks.push(intakeCheck(charged, water.percent, rules.adjustThresholdPercent, adjust));
      }
      if (outcome === 'adjust' && charged !== undefined) {
        summary =
          'Proposal: adjust the charge to ' + format.percent(water.percent) + ' added water (the intake charged ' +
          format.percent(charged) + '): ' + beyondWords + '.';
      } else {
        summary =
          'Proposal: uphold the intake result: ' + beyondWords +
          (water.indicated ? ', indicating ' + format.percent(water.percent) + ' added water.' : '.');
      }
    }
  } else {
    checks.push(notAssessed('conformity.upper', notAssessedBecause, conformitySource(decisionRule)));
    checks.push(notAssessed('conformity.lower', notAssessedBecause, conformitySource(decisionRule)));
    checks.push(notAssessed('added_water', notAssessedBecause, SOURCES.addedWater));
    checks.push(notAssessed('intake.added_water', notAssessedBecause, SOURCES.adjust));
  }

  // Every path above ends in an outcome; reaching here without one is a bug, not an input problem.
  if (outcome === null) throw new Error('assess: no outcome was reached');

  return {
    outcome,
    summary: summary + ' The arbiter decides.',
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
