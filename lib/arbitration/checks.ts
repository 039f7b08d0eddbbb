import type { CalibrationCheckResult } from './calibration';
import { criticalRangeOfFour } from './final-result';
import * as format from './format';
import { exceedsCelsius, fromTenths, toTenths } from './precision';
import type {
  AddedWater,
  AssessmentRules,
  Check,
  CheckId,
  CheckStatus,
  ConformityResult,
  FinalResult,
  OnDisagreement,
  Precision,
  RetainedSample,
} from './schema';
import { comparisonSource, conformitySource, RULE_NAMES, SOURCES } from './sources';

const MS_PER_HOUR = 3_600_000;

export function check(id: CheckId, status: CheckStatus, detail: string, source: string): Check {
  return { id, status, detail, source };
}

export type Laboratory = 'original' | 'retest';

const LAB_NAMES: Record<Laboratory, string> = { original: 'original', retest: 'retest' };

function readingsDifference(readings: readonly number[]): number {
  return fromTenths(Math.abs(toTenths(readings[0]) - toTenths(readings[1])));
}

function rangeOfFour(readings: readonly number[]): number {
  const a = toTenths(readings[0]);
  const b = toTenths(readings[1]);
  const c = toTenths(readings[2]);
  const d = toTenths(readings[3]);
  return fromTenths(Math.max(a, b, c, d) - Math.min(a, b, c, d));
}

/** The repeatability step for one laboratory, in words. */
export function readingsCheck(
  lab: Laboratory,
  readings: readonly number[],
  result: FinalResult,
  precision: Precision,
): Check {
  const id: CheckId = lab === 'retest' ? 'retest.readings' : 'original.readings';
  const name = LAB_NAMES[lab];
  const r = format.milliCelsius(precision.r);

  if (result.status === 'needs_more_readings') {
    let detail: string;
    if (readings.length === 0) {
      detail = 'No ' + name + ' readings yet; 2 are needed.';
    } else if (readings.length === 1) {
      detail = 'One ' + name + ' reading, ' + format.celsius(readings[0]) + '; a second is needed.';
    } else {
      detail =
        'The first two ' + name + ' readings differ by ' + format.milliCelsius(readingsDifference(readings)) +
        ', more than r = ' + r + '; ' + format.count(result.needed, 'more reading is', 'more readings are') +
        ' needed.';
    }
    if (lab === 'original') {
      return check(id, 'fail', detail + ' The original result does not count; the retest stands alone.', SOURCES.repeatability);
    }
    return check(id, 'missing', detail, SOURCES.repeatability);
  }

  let detail: string;
  const difference = format.milliCelsius(readingsDifference(readings));
  if (result.basis === 'mean_of_2') {
    detail =
      'The first two ' + name + ' readings, ' + format.celsius(readings[0]) + ' and ' + format.celsius(readings[1]) +
      ', differ by ' + difference + ', within r = ' + r + ': the final result is their mean, ' +
      format.celsius(result.value) + '.';
  } else {
    const range = format.milliCelsius(rangeOfFour(readings));
    const critical = format.milliCelsius(criticalRangeOfFour(precision));
    detail =
      'The first two ' + name + ' readings differ by ' + difference + ', more than r = ' + r +
      '; the range of four readings, ' + range +
      (result.basis === 'mean_of_4'
        ? ', is within the critical range f(4)·r/2.8 = ' + critical + ': the final result is the mean of four, '
        : ', is over the critical range f(4)·r/2.8 = ' + critical + ': the final result is the median of four, ') +
      format.celsius(result.value) + '.';
  }
  const unused = readings.length - result.used;
  if (unused > 0) detail += ' ' + format.count(unused, 'further reading was', 'further readings were') + ' not used.';
  return check(id, 'pass', detail, SOURCES.repeatability);
}

export function calibrationEntry(
  lab: Laboratory,
  nominal: number | undefined,
  result: CalibrationCheckResult | null,
  rule: AssessmentRules['calibration'],
): Check {
  const id: CheckId = lab === 'retest' ? 'retest.calibration' : 'original.calibration';
  const instrument = lab === 'retest' ? 'referee instrument' : 'intake instrument';
  if (result === null || nominal === undefined) {
    const consequence =
      lab === 'retest'
        ? ' A proposal needs it.'
        : ' The original result does not count; the retest stands alone.';
    return check(
      id,
      'missing',
      'No calibration check of the ' + instrument + ' is recorded.' + consequence,
      SOURCES.calibration,
    );
  }
  const base =
    result.within + ' of ' + result.total + ' readings on the ' + format.celsius(nominal) + ' standard lie within ±' +
    format.milliCelsius(rule.tolerance) + '; at least ' + rule.required + ' are required: ';
  if (result.pass) return check(id, 'pass', base + 'the ' + instrument + ' was fit for work.', SOURCES.calibration);
  const consequence =
    lab === 'retest'
      ? 'the ' + instrument + ' was not fit for work, so the retest cannot be relied on.'
      : 'the ' + instrument + ' was not fit for work; the original result does not count and the retest stands alone.';
  return check(id, 'fail', base + consequence, SOURCES.calibration);
}

const SAMPLE_CHECKS: readonly (readonly [CheckId, string])[] = [
  ['retest.sample.seal', SOURCES.seal],
  ['retest.sample.frozen', SOURCES.frozen],
  ['retest.sample.custody', SOURCES.custody],
  ['retest.sample.storage', SOURCES.storage],
  ['retest.sample.age', SOURCES.sampleAge],
];

/** The checks that cannot be made before the retained sample has been tested. */
export function retestAbsentChecks(): Check[] {
  const checks: Check[] = [
    check('retest.readings', 'missing', 'The retained sample has not been retested yet.', SOURCES.repeatability),
  ];
  for (const [id, source] of SAMPLE_CHECKS) {
    checks.push(check(id, 'missing', 'Recorded with the retest, which is not in yet.', source));
  }
  checks.push(
    check('retest.calibration', 'missing', 'Recorded with the retest, which is not in yet.', SOURCES.calibration),
  );
  return checks;
}

export type SampleFitness = {
  checks: Check[];
  /** Why the retained sample is unfit, in words; empty when it is fit. */
  unfit: string[];
  /** Input paths that are needed to judge the sample. */
  missing: string[];
};

export function sampleChecks(
  sample: RetainedSample,
  testedAt: string,
  rules: Pick<AssessmentRules, 'sampleValidHours' | 'storageRange'>,
): SampleFitness {
  const checks: Check[] = [];
  const unfit: string[] = [];
  const missing: string[] = [];

  if (sample.sealIntact) {
    checks.push(check('retest.sample.seal', 'pass', 'The seal of the retained sample was intact on receipt.', SOURCES.seal));
  } else {
    unfit.push('its seal was broken');
    checks.push(
      check(
        'retest.sample.seal',
        'fail',
        'The seal of the retained sample was broken: it cannot be shown to be the sample taken at intake.',
        SOURCES.seal,
      ),
    );
  }

  if (sample.frozen) {
    unfit.push('it had been frozen');
    checks.push(
      check(
        'retest.sample.frozen',
        'fail',
        'The retained sample had been frozen; freezing shifts the freezing point, so the sample is no longer valid for this test.',
        SOURCES.frozen,
      ),
    );
  } else {
    checks.push(check('retest.sample.frozen', 'pass', 'The retained sample had not been frozen.', SOURCES.frozen));
  }

  if (sample.custodyComplete) {
    checks.push(check('retest.sample.custody', 'pass', 'Every hand-over of the retained sample is recorded.', SOURCES.custody));
  } else {
    unfit.push('its custody record is incomplete');
    checks.push(
      check(
        'retest.sample.custody',
        'fail',
        'The custody record of the retained sample has a gap: a hand-over is not recorded.',
        SOURCES.custody,
      ),
    );
  }

  const { min, max } = rules.storageRange;
  const temperatures = sample.storageTemperatures;
  const range = format.storageCelsius(min) + ' to ' + format.storageCelsius(max);
  if (temperatures.length === 0) {
    missing.push('retest.sample.storageTemperatures');
    checks.push(
      check('retest.sample.storage', 'missing', 'No storage temperature of the retained sample is recorded.', SOURCES.storage),
    );
  } else {
    let outside = 0;
    let lowest = temperatures[0];
    let highest = temperatures[0];
    for (let i = 0; i < temperatures.length; i++) {
      const t = temperatures[i];
      if (exceedsCelsius(min, t) || exceedsCelsius(t, max)) outside++;
      if (t < lowest) lowest = t;
      if (t > highest) highest = t;
    }
    const span =
      ' (lowest ' + format.storageCelsius(lowest) + ', highest ' + format.storageCelsius(highest) + ')';
    if (outside === 0) {
      checks.push(
        check(
          'retest.sample.storage',
          'pass',
          'All ' + temperatures.length + ' recorded storage temperatures lie within ' + range + span + '.',
          SOURCES.storage,
        ),
      );
    } else {
      unfit.push('it was stored outside ' + range);
      checks.push(
        check(
          'retest.sample.storage',
          'fail',
          outside + ' of ' + temperatures.length + ' recorded storage temperatures lie outside ' + range + span + '.',
          SOURCES.storage,
        ),
      );
    }
  }

  const sampledAtMs = Date.parse(sample.sampledAt);
  const testedAtMs = Date.parse(testedAt);
  if (Number.isNaN(sampledAtMs)) throw new RangeError(`retest.sample.sampledAt is not a date: ${sample.sampledAt}`);
  if (Number.isNaN(testedAtMs)) throw new RangeError(`retest.testedAt is not a date: ${testedAt}`);
  const elapsedHours = (testedAtMs - sampledAtMs) / MS_PER_HOUR;
  const allowed = format.hours(rules.sampleValidHours);
  if (elapsedHours < 0) {
    unfit.push('its recorded test time is before its sampling time');
    checks.push(
      check(
        'retest.sample.age',
        'fail',
        'The retest is recorded ' + format.hours(-elapsedHours) + ' before the sample was taken; the times cannot both be right.',
        SOURCES.sampleAge,
      ),
    );
  } else if (elapsedHours > rules.sampleValidHours) {
    unfit.push('it was tested ' + format.hours(elapsedHours) + ' after sampling, more than ' + allowed);
    checks.push(
      check(
        'retest.sample.age',
        'fail',
        'The retained sample was tested ' + format.hours(elapsedHours) + ' after sampling, later than the ' + allowed + ' allowed.',
        SOURCES.sampleAge,
      ),
    );
  } else {
    checks.push(
      check(
        'retest.sample.age',
        'pass',
        'The retained sample was tested ' + format.hours(elapsedHours) + ' after sampling, within the ' + allowed + ' allowed.',
        SOURCES.sampleAge,
      ),
    );
  }

  return { checks, unfit, missing };
}

export function comparisonCheck(
  difference: number,
  criticalDifference: number,
  agree: boolean,
  n1: number,
  n2: number,
  onDisagreement: OnDisagreement,
): Check {
  const base =
    'The retest differs from the original by ' + format.milliCelsius(Math.abs(difference)) +
    '; the critical difference for means of ' + n1 + ' and ' + n2 + ' readings is ' +
    format.milliCelsius(criticalDifference);
  if (agree) {
    return check('comparison', 'pass', base + ': they agree, and their mean is the accepted value.', comparisonSource(true, onDisagreement));
  }
  const consequence =
    onDisagreement === 'third_laboratory'
      ? ': they disagree, and the scheme sends a third sample to a third laboratory.'
      : ': they disagree, and under the scheme the retest stands alone.';
  return check('comparison', 'fail', base + consequence, comparisonSource(false, onDisagreement));
}

export function conformityCheck(
  side: 'upper' | 'lower',
  value: number,
  limit: number,
  result: ConformityResult,
  uncertainty: number,
  rule: AssessmentRules['decisionRule'],
): Check {
  const id: CheckId = side === 'upper' ? 'conformity.upper' : 'conformity.lower';
  const direction = side === 'upper' ? 'above' : 'below';
  let detail =
    'The accepted value ' + format.celsius(value) + ' against the ' + side + ' limit ' + format.celsius(limit) +
    ', under ' + RULE_NAMES[rule] + ': ';
  if (rule !== 'simple') {
    detail +=
      'guard band ' + format.milliCelsius(result.guardBand) + ' (1.645 × u, u = ' + format.milliCelsius(uncertainty) +
      '), acceptance limit ' + format.celsius(result.acceptanceLimit) + '; ';
  }
  detail +=
    (result.beyond ? 'the value is beyond it' : 'the value is within it') +
    ' (probability that the true value is ' + direction + ' the limit: ' + format.probability(result.probabilityBeyond) + ').';
  return check(id, result.beyond ? 'fail' : 'pass', detail, conformitySource(rule));
}

export function addedWaterCheck(value: number, reference: number, water: AddedWater): Check {
  const base =
    'Against the authentic reference ' + format.celsius(reference) + ', the accepted value ' + format.celsius(value);
  if (water.indicated) {
    return check('added_water', 'fail', base + ' indicates ' + format.percent(water.percent) + ' added water.', SOURCES.addedWater);
  }
  return check('added_water', 'pass', base + ' indicates no added water.', SOURCES.addedWater);
}

export function intakeCheck(charged: number, found: number, threshold: number, adjust: boolean): Check {
  const detail =
    'The intake result charged ' + format.percent(charged) + ' added water; the accepted value gives ' +
    format.percent(found) + ', a difference of ' + format.percent(Math.abs(found - charged)) +
    (adjust
      ? ', more than the ' + format.percent(threshold) + ' threshold: the charge should follow the accepted value.'
      : ', within the ' + format.percent(threshold) + ' threshold: the charge stands.');
  return check('intake.added_water', adjust ? 'fail' : 'pass', detail, SOURCES.adjust);
}

export function notAssessed(id: CheckId, reason: string, source: string): Check {
  return check(id, 'not_applicable', 'Not assessed: ' + reason + '.', source);
}
