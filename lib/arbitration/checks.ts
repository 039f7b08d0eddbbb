import type { CalibrationCheckResult } from './calibration';
import { criticalRangeOfFour } from './final-result';
import { celsius, count, hours, milliCelsius, percent, probability, storageCelsius } from './format';
import { exceedsCelsius, fromTenths, toTenths } from './precision';
import type {
  AddedWater,
  AssessmentRules,
  Check,
  CheckId,
  CheckStatus,
  ConformityResult,
  DecisionRule,
  FinalResult,
  OnDisagreement,
  Precision,
  RetainedSample,
} from './schema';
import { comparisonSource, conformitySource, RULE_NAMES, SOURCES } from './sources';

// Each check explains one step of the proposal in words an arbiter can read aloud, with the rule's
// source beside it.

const MS_PER_HOUR = 3_600_000;

export type Laboratory = 'original' | 'retest';

export function check(id: CheckId, status: CheckStatus, detail: string, source: string): Check {
  return { id, status, detail, source };
}

export function notAssessed(id: CheckId, reason: string, source: string): Check {
  return check(id, 'not_applicable', `Not assessed: ${reason}.`, source);
}

function firstTwoDifference(readings: readonly number[]): number {
  return fromTenths(Math.abs(toTenths(readings[0]) - toTenths(readings[1])));
}

function rangeOfFour(readings: readonly number[]): number {
  const a = toTenths(readings[0]);
  const b = toTenths(readings[1]);
  const c = toTenths(readings[2]);
  const d = toTenths(readings[3]);
  return fromTenths(Math.max(a, b, c, d) - Math.min(a, b, c, d));
}

/** The repeatability procedure for one laboratory's readings. */
export function readingsCheck(
  lab: Laboratory,
  readings: readonly number[],
  result: FinalResult,
  precision: Precision,
): Check {
  const id: CheckId = lab === 'retest' ? 'retest.readings' : 'original.readings';
  const r = milliCelsius(precision.r);

  if (result.status === 'needs_more_readings') {
    let detail: string;
    if (readings.length === 0) {
      detail = `No ${lab} readings yet; 2 are needed.`;
    } else if (readings.length === 1) {
      detail = `One ${lab} reading, ${celsius(readings[0])}; a second is needed.`;
    } else {
      const needed = count(result.needed, 'more reading is', 'more readings are');
      detail = `The first two ${lab} readings differ by ${milliCelsius(firstTwoDifference(readings))}, more than r = ${r}; ${needed} needed.`;
    }
    // The intake laboratory will not add readings now: its result simply does not count.
    if (lab === 'original') {
      return check(
        id,
        'fail',
        `${detail} The original result does not count; the retest stands alone.`,
        SOURCES.repeatability,
      );
    }
    return check(id, 'missing', detail, SOURCES.repeatability);
  }

  const difference = milliCelsius(firstTwoDifference(readings));
  let detail: string;
  if (result.basis === 'mean_of_2') {
    detail =
      `The first two ${lab} readings, ${celsius(readings[0])} and ${celsius(readings[1])}, differ by ${difference}, ` +
      `within r = ${r}: the final result is their mean, ${celsius(result.value)}.`;
  } else {
    const range = milliCelsius(rangeOfFour(readings));
    const critical = milliCelsius(criticalRangeOfFour(precision));
    const verdict =
      result.basis === 'mean_of_4'
        ? `is within the critical range f(4)·r/2.8 = ${critical}: the final result is the mean of four`
        : `is over the critical range f(4)·r/2.8 = ${critical}: the final result is the median of four`;
    detail =
      `The first two ${lab} readings differ by ${difference}, more than r = ${r}; ` +
      `the range of four readings, ${range}, ${verdict}, ${celsius(result.value)}.`;
  }
  const unused = readings.length - result.used;
  if (unused > 0) detail += ` ${count(unused, 'further reading was', 'further readings were')} not used.`;
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
  const setAside = 'the original result does not count and the retest stands alone';
  if (result === null || nominal === undefined) {
    const consequence = lab === 'retest' ? 'A proposal needs it.' : `Without it ${setAside}.`;
    return check(
      id,
      'missing',
      `No calibration check of the ${instrument} is recorded. ${consequence}`,
      SOURCES.calibration,
    );
  }
  const tally =
    `${result.within} of ${result.total} readings on the ${celsius(nominal)} standard lie within ` +
    `±${milliCelsius(rule.tolerance)}; at least ${rule.required} are required`;
  if (result.pass) return check(id, 'pass', `${tally}: the ${instrument} was fit for work.`, SOURCES.calibration);
  const consequence = lab === 'retest' ? 'so the retest cannot be relied on' : setAside;
  return check(id, 'fail', `${tally}: the ${instrument} was not fit for work, ${consequence}.`, SOURCES.calibration);
}

const SAMPLE_CHECKS: readonly (readonly [CheckId, string])[] = [
  ['retest.sample.seal', SOURCES.seal],
  ['retest.sample.frozen', SOURCES.frozen],
  ['retest.sample.custody', SOURCES.custody],
  ['retest.sample.storage', SOURCES.storage],
  ['retest.sample.age', SOURCES.sampleAge],
];

/** The checks that wait for the retest of the retained sample. */
export function retestAbsentChecks(): Check[] {
  const waiting = 'Recorded with the retest, which is not in yet.';
  const checks: Check[] = [
    check('retest.readings', 'missing', 'The retained sample has not been retested yet.', SOURCES.repeatability),
  ];
  for (const [id, source] of SAMPLE_CHECKS) checks.push(check(id, 'missing', waiting, source));
  checks.push(check('retest.calibration', 'missing', waiting, SOURCES.calibration));
  return checks;
}

export type SampleFitness = {
  checks: Check[];
  /** Why the retained sample is unfit, in words; empty when it is fit. */
  unfit: string[];
  /** Input paths still needed to judge the sample. */
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
    checks.push(
      check('retest.sample.seal', 'pass', 'The seal of the retained sample was intact on receipt.', SOURCES.seal),
    );
  } else {
    unfit.push('its seal was broken');
    const detail = 'The seal of the retained sample was broken: it cannot be shown to be the sample taken at intake.';
    checks.push(check('retest.sample.seal', 'fail', detail, SOURCES.seal));
  }

  if (sample.frozen) {
    unfit.push('it had been frozen');
    const detail =
      'The retained sample had been frozen; freezing shifts the freezing point, so it is no longer valid for this test.';
    checks.push(check('retest.sample.frozen', 'fail', detail, SOURCES.frozen));
  } else {
    checks.push(check('retest.sample.frozen', 'pass', 'The retained sample had not been frozen.', SOURCES.frozen));
  }

  if (sample.custodyComplete) {
    checks.push(
      check('retest.sample.custody', 'pass', 'Every hand-over of the retained sample is recorded.', SOURCES.custody),
    );
  } else {
    unfit.push('its custody record is incomplete');
    const detail = 'The custody record of the retained sample has a gap: a hand-over is not recorded.';
    checks.push(check('retest.sample.custody', 'fail', detail, SOURCES.custody));
  }

  const { min, max } = rules.storageRange;
  const temperatures = sample.storageTemperatures;
  const range = `${storageCelsius(min)} to ${storageCelsius(max)}`;
  if (temperatures.length === 0) {
    // Without a record, storage within the range cannot be shown, only assumed.
    missing.push('retest.sample.storageTemperatures');
    const detail = 'No storage temperature of the retained sample is recorded.';
    checks.push(check('retest.sample.storage', 'missing', detail, SOURCES.storage));
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
    const span = `(lowest ${storageCelsius(lowest)}, highest ${storageCelsius(highest)})`;
    if (outside === 0) {
      const detail = `All ${temperatures.length} recorded storage temperatures lie within ${range} ${span}.`;
      checks.push(check('retest.sample.storage', 'pass', detail, SOURCES.storage));
    } else {
      unfit.push(`it was stored outside ${range}`);
      const detail = `${outside} of ${temperatures.length} recorded storage temperatures lie outside ${range} ${span}.`;
      checks.push(check('retest.sample.storage', 'fail', detail, SOURCES.storage));
    }
  }

  const sampledAtMs = Date.parse(sample.sampledAt);
  const testedAtMs = Date.parse(testedAt);
  if (Number.isNaN(sampledAtMs)) throw new RangeError(`retest.sample.sampledAt is not a date: ${sample.sampledAt}`);
  if (Number.isNaN(testedAtMs)) throw new RangeError(`retest.testedAt is not a date: ${testedAt}`);
  const elapsedHours = (testedAtMs - sampledAtMs) / MS_PER_HOUR;
  const allowed = hours(rules.sampleValidHours);
  if (elapsedHours < 0) {
    unfit.push('its recorded test time is before its sampling time');
    const detail = `The retest is recorded ${hours(-elapsedHours)} before the sample was taken; the times cannot both be right.`;
    checks.push(check('retest.sample.age', 'fail', detail, SOURCES.sampleAge));
  } else if (elapsedHours > rules.sampleValidHours) {
    unfit.push(`it was tested ${hours(elapsedHours)} after sampling, more than ${allowed}`);
    const detail = `The retained sample was tested ${hours(elapsedHours)} after sampling, later than the ${allowed} allowed.`;
    checks.push(check('retest.sample.age', 'fail', detail, SOURCES.sampleAge));
  } else {
    const detail = `The retained sample was tested ${hours(elapsedHours)} after sampling, within the ${allowed} allowed.`;
    checks.push(check('retest.sample.age', 'pass', detail, SOURCES.sampleAge));
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
    `The retest differs from the original by ${milliCelsius(Math.abs(difference))}; ` +
    `the critical difference for means of ${n1} and ${n2} readings is ${milliCelsius(criticalDifference)}`;
  const source = comparisonSource(agree, onDisagreement);
  if (agree) return check('comparison', 'pass', `${base}: they agree, and their mean is the accepted value.`, source);
  const consequence =
    onDisagreement === 'third_laboratory'
      ? 'the scheme sends a third sample to a third laboratory'
      : 'under the scheme the retest stands alone';
  return check('comparison', 'fail', `${base}: they disagree, and ${consequence}.`, source);
}

export function conformityCheck(
  side: 'upper' | 'lower',
  value: number,
  limit: number,
  result: ConformityResult,
  uncertainty: number,
  rule: DecisionRule,
): Check {
  const id: CheckId = side === 'upper' ? 'conformity.upper' : 'conformity.lower';
  const direction = side === 'upper' ? 'above' : 'below';
  const guardBand =
    rule === 'simple'
      ? ''
      : `guard band ${milliCelsius(result.guardBand)} (1.645 × u, u = ${milliCelsius(uncertainty)}), ` +
        `acceptance limit ${celsius(result.acceptanceLimit)}; `;
  const detail =
    `The accepted value ${celsius(value)} against the ${side} limit ${celsius(limit)}, under ${RULE_NAMES[rule]}: ` +
    `${guardBand}the value is ${result.beyond ? 'beyond' : 'within'} it ` +
    `(probability that the true value is ${direction} the limit: ${probability(result.probabilityBeyond)}).`;
  return check(id, result.beyond ? 'fail' : 'pass', detail, conformitySource(rule));
}

export function addedWaterCheck(value: number, reference: number, water: AddedWater): Check {
  const base = `Against the authentic reference ${celsius(reference)}, the accepted value ${celsius(value)}`;
  if (water.indicated) {
    return check('added_water', 'fail', `${base} indicates ${percent(water.percent)} added water.`, SOURCES.addedWater);
  }
  return check('added_water', 'pass', `${base} indicates no added water.`, SOURCES.addedWater);
}

export function intakeCheck(charged: number, found: number, threshold: number, adjust: boolean): Check {
  const verdict = adjust
    ? `more than the ${percent(threshold)} threshold: the charge should follow the accepted value`
    : `within the ${percent(threshold)} threshold: the charge stands`;
  const detail =
    `The intake result charged ${percent(charged)} added water; the accepted value gives ${percent(found)}, ` +
    `a difference of ${percent(Math.abs(found - charged))}, ${verdict}.`;
  return check('intake.added_water', adjust ? 'fail' : 'pass', detail, SOURCES.adjust);
}
