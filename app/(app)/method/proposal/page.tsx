import type { Metadata } from 'next';
import type { ReactNode } from 'react';
import Link from 'next/link';
import {
  addedWater,
  assess,
  calibrationCheck,
  conformity,
  criticalDifference,
  criticalRangeFactor,
  criticalRangeOfFour,
  finalResult,
  GUARD_BAND_COVERAGE,
  PRACTICE,
  SOURCES,
  sodiumChlorideFor,
  standardUncertainty,
  type Assessment,
  type AssessmentInput,
  type CheckId,
  type DecisionRule,
  type FinalResult,
  type Outcome,
} from '@/lib/arbitration';
import { celsius, milliCelsius, percent, probability } from '@/lib/arbitration/format';
import { conformitySource, RULE_NAMES } from '@/lib/arbitration/sources';
import { defaultSchemeRules } from '@/lib/rules/defaults';
import { assessmentRules } from '@/lib/rules/to-assessment';
import { requireActor } from '@/lib/auth/session';
import { Card, DefinitionList, PageHeader } from '@/components/ui/card';
import { Badge } from '@/components/ui/status';

export const metadata: Metadata = { title: 'How a proposal is made' };

// Every number on this page is computed by the decision module while the page renders, so the
// explanation cannot drift from the arithmetic that makes real proposals. All cases are invented.

const PRECISION = defaultSchemeRules.precision;
const UPPER_LIMIT = defaultSchemeRules.limits.upper;
const RULES_IN_ORDER: readonly DecisionRule[] = ['simple', 'guarded_rejection', 'guarded_acceptance'];

/** An invented disputed delivery: the intake result is just above the limit, the retest agrees with it. */
function exampleCase(): AssessmentInput {
  return {
    rules: assessmentRules(defaultSchemeRules),
    original: {
      readings: [-0.5131, -0.5137],
      testedAt: '2025-06-02T05:50:00+02:00',
      calibration: { nominal: -0.512, readings: [-0.5122, -0.5118, -0.5125, -0.5119, -0.5121] },
    },
    retest: {
      readings: [-0.5139, -0.5146],
      testedAt: '2025-06-03T09:15:00+02:00',
      calibration: { nominal: -0.512, readings: [-0.5117, -0.5123, -0.512, -0.5124, -0.5118] },
      sample: {
        sampledAt: '2025-06-02T05:20:00+02:00',
        sealIntact: true,
        frozen: false,
        custodyComplete: true,
        storageTemperatures: [4.1, 3.7, 4.4, 3.9],
      },
    },
  };
}

function variant(edit: (input: AssessmentInput) => void): AssessmentInput {
  const input = exampleCase();
  edit(input);
  return input;
}

/** Variants of the example that reach each outcome, in the order the module tries them. */
const OUTCOME_CASES: readonly { label: string; input: AssessmentInput }[] = [
  { label: 'The retained sample has not been retested yet', input: variant((i) => delete i.retest) },
  {
    label: 'The retained sample arrived frozen',
    input: variant((i) => {
      if (i.retest) i.retest.sample.frozen = true;
    }),
  },
  { label: 'The example case as given above', input: exampleCase() },
  {
    label: 'Both laboratories find clearly watered milk',
    input: variant((i) => {
      i.original.readings = [-0.5101, -0.5107];
      if (i.retest) i.retest.readings = [-0.5098, -0.5104];
    }),
  },
  {
    label: 'The same, but the intake charged 3.5 % added water',
    input: variant((i) => {
      i.original.readings = [-0.5101, -0.5107];
      if (i.retest) i.retest.readings = [-0.5098, -0.5104];
      i.intake = { addedWaterPercent: 3.5 };
    }),
  },
];

const OUTCOME_LABELS: Record<Outcome, string> = {
  incomplete: 'Incomplete',
  further_test: 'Further test',
  reverse: 'Reverse',
  uphold: 'Uphold',
  adjust: 'Adjust',
};

const OUTCOME_TONES: Record<Outcome, 'neutral' | 'action' | 'warning' | 'failure' | 'success'> = {
  incomplete: 'neutral',
  further_test: 'action',
  reverse: 'success',
  uphold: 'failure',
  adjust: 'warning',
};

const BASIS_WORDS: Record<Extract<FinalResult, { status: 'accepted' }>['basis'], string> = {
  mean_of_2: 'the first two agree: their mean',
  mean_of_4: 'four readings within the critical range: their mean',
  median_of_4: 'four readings beyond the critical range: their median',
};

function checkDetail(assessment: Assessment, id: CheckId): string {
  return assessment.checks.find((c) => c.id === id)?.detail ?? '';
}

function Caution({ title, children }: { title: string; children: ReactNode }) {
  return (
    <aside className="rounded-card border-2 border-amber bg-amber-soft p-4">
      <p className="font-bold text-amber">▲ {title}</p>
      <div className="mt-1 text-ink">{children}</div>
    </aside>
  );
}

function Formula({ children }: { children: ReactNode }) {
  return <p className="my-3 overflow-x-auto rounded-control bg-paper-deep px-3 py-2 font-mono text-sm text-ink">{children}</p>;
}

function Example({ children }: { children: ReactNode }) {
  return (
    <div className="my-3 rounded-control border border-frost bg-frost-soft/60 px-3 py-2 text-sm">
      <p className="font-bold text-frost-dark">Worked example</p>
      <div className="mt-1 grid gap-1 text-ink">{children}</div>
    </div>
  );
}

function Source({ children }: { children: ReactNode }) {
  return (
    <p className="mt-3 border-t border-line pt-2 text-sm text-brine">
      <span className="font-bold">Source:</span> {children}
    </p>
  );
}

function ModuleWords({ children }: { children: ReactNode }) {
  return (
    <p>
      In the module’s own words, for the example case: <q className="italic">{children}</q>
    </p>
  );
}

/** Six decimals, where the point is a difference smaller than the usual four decimals show. */
function preciseCelsius(value: number): string {
  return (value < 0 ? '\u2212' : '') + Math.abs(value).toFixed(6) + ' °C';
}

function Num({ children }: { children: ReactNode }) {
  return <span className="num">{children}</span>;
}

const tableClass = 'mt-2 w-full border-collapse text-left text-sm [&_td]:border-t [&_td]:border-line [&_td]:py-1 [&_td]:pr-3 [&_th]:pb-1 [&_th]:pr-3';

export default async function ProposalMethodPage() {
  await requireActor();

  const example = exampleCase();
  const exampleAssessment = assess(example);

  // 1. Repeatability.
  const rangeFactor = criticalRangeFactor(4);
  const criticalRange = criticalRangeOfFour(PRECISION);
  const readingExamples = [
    [-0.514, -0.5146],
    [-0.5131, -0.5178, -0.5152, -0.516],
    [-0.512, -0.5175, -0.5149, -0.5153],
    [-0.5139, -0.5186],
  ].map((readings) => ({ readings, result: finalResult(readings, PRECISION) }));

  // 2. Calibration.
  const calibrationRule = { tolerance: 0.004, required: 3 };
  const standard = -0.512;
  const calibrationExamples = [
    [-0.5121, -0.5163, -0.5118, -0.5124, -0.5157],
    [-0.5165, -0.5071, -0.5118, -0.5163, -0.5124],
  ].map((readings) => ({ readings, result: calibrationCheck({ nominal: standard, readings, ...calibrationRule }) }));
  const saltForStandard = sodiumChlorideFor(standard);

  // 4. Two laboratories.
  const differencePairs = [
    [1, 1],
    [2, 2],
    [2, 4],
    [4, 4],
  ].map(([n1, n2]) => ({ n1, n2, cd: criticalDifference(PRECISION, n1, n2) }));

  // 5. Conformity: ISO 4259's "0.59 R" next to the guard band for a single result.
  const singleU = standardUncertainty(PRECISION, [1]);
  const singleGuarded = conformity({ value: -0.512, n: [1], precision: PRECISION, limit: UPPER_LIMIT, side: 'upper', rule: 'guarded_rejection' });
  const singleOver = conformity({ value: -0.511, n: [1], precision: PRECISION, limit: UPPER_LIMIT, side: 'upper', rule: 'guarded_rejection' });
  const singleSimple = conformity({ value: -0.513, n: [1], precision: PRECISION, limit: UPPER_LIMIT, side: 'upper', rule: 'simple' });
  const isoThreshold = UPPER_LIMIT + 0.59 * PRECISION.R;
  const twoLabU = standardUncertainty(PRECISION, [2, 2]);
  const ruleValues = [-0.5135, -0.516];
  const ruleTable = RULES_IN_ORDER.map((rule) => ({
    rule,
    results: ruleValues.map((value) => conformity({ value, n: [2, 2], precision: PRECISION, limit: UPPER_LIMIT, side: 'upper', rule })),
  }));

  // 6. Added water.
  const water = addedWater({ reference: -0.52, sample: -0.5 });
  const charged = 2;
  const threshold = 1;

  // 7. Outcomes.
  const outcomes = OUTCOME_CASES.map(({ label, input }) => ({ label, assessment: assess(input) }));

  return (
    <>
      <PageHeader title="How a proposal is made" eyebrow="Method">
        <Link href="/about/method" className="text-sm">
          About the method
        </Link>
      </PageHeader>
      <div className="grid max-w-4xl gap-6 leading-relaxed">
        <p>
          When the retained sample of a disputed delivery has been retested, Countersample proposes an outcome. It takes the
          readings of both laboratories, the record of the retained sample, the calibration checks of both instruments and the
          scheme’s rules, and works through the steps below in this order. Each step appears on the case as a check, with its
          rule and its source, so anyone can follow how the proposal came about.
        </p>
        <Caution title="A proposal is decision support, not a decision">
          The arbiter decides, gives written reasons and may depart from the proposal. Local regulations and the supply contract
          prevail over anything the proposal or this page says. Limits, tolerances and time allowances below are examples; each
          scheme sets its own.
        </Caution>
        <p className="text-sm text-brine">
          The example case used throughout is invented: limit {celsius(UPPER_LIMIT)}, repeatability limit r ={' '}
          {milliCelsius(PRECISION.r)}, reproducibility limit R = {milliCelsius(PRECISION.R)} (the rounded precision of ISO 5764 for
          cow’s milk). Readings have four decimals; a difference exactly equal to a limit counts as within it.
        </p>

        <Card id="step-readings" title="1. The readings of one laboratory">
          <p>
            A cryoscope reading is never perfectly repeatable, so each laboratory measures the sample at least twice. If the first two
            readings agree within the repeatability limit r, their mean is the laboratory’s result. If not, two more readings are taken.
            If all four lie within the critical range, their mean is the result; if one stands out, the median of the four is used, so
            a single stray reading cannot pull the result.
          </p>
          <Formula>
            <span className="block">|x₁ − x₂| ≤ r → the mean of x₁ and x₂</span>
            <span className="block">otherwise, with x₃ and x₄: range(x₁…x₄) ≤ CR(4) = f(4) · r / 2.8 → the mean of four, else the median of four</span>
          </Formula>
          <p>
            With f(4) = <Num>{rangeFactor}</Num> and r = {milliCelsius(PRECISION.r)}, the critical range of four readings is{' '}
            <Num>{milliCelsius(criticalRange)}</Num>. A retest that is not settled yet (one reading, or two that disagree) holds the
            proposal back. An intake result that did not settle simply does not count.
          </p>
          <Example>
            <table className={tableClass}>
              <thead>
                <tr>
                  <th scope="col">Readings in the order measured</th>
                  <th scope="col">What the rule finds</th>
                  <th scope="col">Result</th>
                </tr>
              </thead>
              <tbody>
                {readingExamples.map(({ readings, result }) => (
                  <tr key={readings.join()}>
                    <td className="tabular-nums">{readings.map(celsius).join(', ')}</td>
                    <td>
                      {result.status === 'accepted'
                        ? BASIS_WORDS[result.basis]
                        : `the first two differ by ${milliCelsius(Math.abs(readings[0] - readings[1]))}: ${result.needed} more needed`}
                    </td>
                    <td className="num">{result.status === 'accepted' ? celsius(result.value) : '—'}</td>
                  </tr>
                ))}
              </tbody>
            </table>
            <ModuleWords>{checkDetail(exampleAssessment, 'retest.readings')}</ModuleWords>
          </Example>
          <Source>{SOURCES.repeatability}</Source>
        </Card>

        <Card id="step-calibration" title="2. The calibration check of each instrument">
          <p>
            Before the results are relied on, each instrument must have passed a check on a standard of known freezing point: a
            sodium chloride solution. The check counts how many of its readings lie within the tolerance of the standard; the
            instrument is fit for work when at least the required number do (the trade’s usual form: 3 of 5 readings within
            ±4 m°C of a −0.512 °C standard).
          </p>
          <Formula>within = number of readings with |reading − standard| ≤ tolerance · fit for work when within ≥ k (k of n)</Formula>
          <p>
            If the referee instrument fails, its retest cannot be relied on and a further test is proposed; if its check is not
            recorded, the proposal waits for it. If the intake instrument fails or has no check on record, the intake result does not
            count and the retest stands alone.
          </p>
          <Example>
            <p>
              A {celsius(standard)} standard holds <Num>{saltForStandard.toFixed(3)} g</Num> of sodium chloride per kg of water (ISO
              5764:2009, Table 1). Tolerance ±{milliCelsius(calibrationRule.tolerance)}, {calibrationRule.required} readings required:
            </p>
            <ul className="list-disc pl-6">
              {calibrationExamples.map(({ readings, result }) => (
                <li key={readings.join()}>
                  <span className="tabular-nums">{readings.map(celsius).join(', ')}</span>: {result.within} of {result.total}{' '}
                  within — {result.pass ? 'fit for work' : 'not fit for work'}.
                </li>
              ))}
            </ul>
            <ModuleWords>{checkDetail(exampleAssessment, 'retest.calibration')}</ModuleWords>
          </Example>
          <Source>{SOURCES.calibration}</Source>
        </Card>

        <Card id="step-sample" title="3. Is the retained sample fit to test?">
          <p>
            A retest only says something about the delivery if the retained sample is still the milk that was sampled at intake, in
            the state it was sampled in. Any one of these failing makes the sample unfit, and a further test is proposed instead of a
            verdict:
          </p>
          <div className="mt-3">
            <DefinitionList
              items={[
                { term: 'Seal', detail: <>Intact on receipt; a broken seal means the sample cannot be shown to be the one taken. Source: {SOURCES.seal}.</> },
                { term: 'Custody', detail: <>Every hand-over recorded, from sealing to the referee bench. Source: {SOURCES.custody}.</> },
                {
                  term: 'Storage',
                  detail: (
                    <>
                      Every recorded storage temperature within the scheme’s range, for raw milk 0 °C to 6 °C; with no temperature
                      recorded, the proposal waits. Source: {SOURCES.storage}.
                    </>
                  ),
                },
                { term: 'Never frozen', detail: <>Freezing shifts the freezing point, so a frozen sample is no longer valid. Source: {SOURCES.frozen}.</> },
                {
                  term: 'Tested in time',
                  detail: <>Tested within the scheme’s validity after sampling, for raw milk 48 hours. Source: {SOURCES.sampleAge}.</>,
                },
              ]}
            />
          </div>
          <Example>
            <ModuleWords>{checkDetail(exampleAssessment, 'retest.sample.storage')}</ModuleWords>
            <ModuleWords>{checkDetail(exampleAssessment, 'retest.sample.age')}</ModuleWords>
          </Example>
          <Source>
            {SOURCES.storage} (storage and time); {PRACTICE} (seal, custody, freezing)
          </Source>
        </Card>

        <Card id="step-comparison" title="4. Do the two laboratories agree?">
          <p>
            When the intake result counts, it is compared with the retest. Two laboratories never find exactly the same value; the
            critical difference says how far apart two results may be before the gap is more than the method’s own scatter. It
            shrinks as each laboratory averages more readings. If they agree, the accepted value is the mean of both. If they do not,
            the scheme decides: a third laboratory tests a third sample (a further test is proposed), or the referee’s retest stands
            alone.
          </p>
          <Formula>CD = √( R² − r² · (1 − 1/(2n₁) − 1/(2n₂)) ) · agree when |retest − intake| ≤ CD</Formula>
          <Example>
            <table className={tableClass}>
              <thead>
                <tr>
                  <th scope="col">Readings averaged (intake, retest)</th>
                  <th scope="col">Critical difference</th>
                </tr>
              </thead>
              <tbody>
                {differencePairs.map(({ n1, n2, cd }) => (
                  <tr key={`${n1}-${n2}`}>
                    <td className="num">
                      {n1} and {n2}
                    </td>
                    <td className="num">{milliCelsius(cd)}</td>
                  </tr>
                ))}
              </tbody>
            </table>
            <ModuleWords>{checkDetail(exampleAssessment, 'comparison')}</ModuleWords>
          </Example>
          <Source>
            {SOURCES.criticalDifference}; on disagreement, either {SOURCES.thirdLaboratory} (third laboratory) or{' '}
            {SOURCES.refereeDecides}
          </Source>
        </Card>

        <Card id="step-conformity" title="5. Is the accepted value beyond the limit?">
          <p>
            The accepted value is compared with the scheme’s upper limit (above it, added water is suspected) and, if the scheme has
            one, its lower limit (below it, added solutes are suspected). Because every result carries some uncertainty, the scheme
            chooses a decision rule that says who gets the benefit of the doubt near the limit:
          </p>
          <ul className="mt-2 list-disc pl-6">
            <li>
              <span className="font-bold">Simple acceptance</span>: the limit itself decides; the risk near the limit is shared.
            </li>
            <li>
              <span className="font-bold">Guarded rejection</span>: a result is only held against the supplier when it is beyond the
              limit by more than a guard band (the benefit of the doubt goes to the supplier).
            </li>
            <li>
              <span className="font-bold">Guarded acceptance</span>: a result is only accepted when it is inside the limit by more than
              the guard band (the benefit of the doubt goes to the buyer).
            </li>
          </ul>
          <Formula>
            <span className="block">σr = r / 2.8, σR = R / 2.8</span>
            <span className="block">u = √( Σᵢ (σR² − σr² + σr²/nᵢ) ) / k, guard band w = {GUARD_BAND_COVERAGE} · u</span>
            <span className="block">
              acceptance limit at an upper limit L: L + w (guarded rejection), L − w (guarded acceptance), L (simple)
            </span>
            <span className="block">beyond when value &gt; acceptance limit; probability beyond = Φ((value − L) / u)</span>
          </Formula>
          <p>
            Here k is the number of laboratories averaged into the accepted value and nᵢ the readings each used. At a lower limit
            everything is mirrored.
          </p>
          <Example>
            <p>
              One result (n = 1) against {celsius(UPPER_LIMIT)}: u = R/2.8 = <Num>{milliCelsius(singleU)}</Num>, so the guard band is{' '}
              <Num>{milliCelsius(singleGuarded.guardBand)}</Num> and under guarded rejection the acceptance limit is{' '}
              <Num>{preciseCelsius(singleGuarded.acceptanceLimit)}</Num>. ISO 4259 lets a recipient reject a single result only
              when it is more than 0.59 R beyond the limit, a threshold of <Num>{preciseCelsius(isoThreshold)}</Num>: the two agree
              to{' '}
              <Num>{milliCelsius(Math.abs(isoThreshold - singleGuarded.acceptanceLimit))}</Num>. A result of {celsius(-0.512)} is{' '}
              {singleGuarded.beyond ? 'beyond' : 'within'} it and cannot be held against the supplier; {celsius(-0.511)} is{' '}
              {singleOver.beyond ? 'beyond' : 'within'} it.
            </p>
            <p>
              Under simple acceptance, a single result of {celsius(-0.513)} is {singleSimple.beyond ? 'beyond' : 'within'} the limit,
              yet the probability that the milk’s true value is beyond it is only <Num>{probability(singleSimple.probabilityBeyond)}</Num>.
            </p>
            <p>
              Two laboratories with two readings each (u = <Num>{milliCelsius(twoLabU)}</Num>), the same values under each rule:
            </p>
            <table className={tableClass}>
              <thead>
                <tr>
                  <th scope="col">Decision rule</th>
                  <th scope="col">Acceptance limit</th>
                  {ruleValues.map((value) => (
                    <th key={value} scope="col" className="num">
                      {celsius(value)}
                    </th>
                  ))}
                </tr>
              </thead>
              <tbody>
                {ruleTable.map(({ rule, results }) => (
                  <tr key={rule}>
                    <td>{RULE_NAMES[rule]}</td>
                    <td className="num">{celsius(results[0].acceptanceLimit)}</td>
                    {results.map((result, index) => (
                      <td key={ruleValues[index]}>
                        {result.beyond ? <Badge tone="failure">beyond</Badge> : <Badge tone="success">within</Badge>}
                      </td>
                    ))}
                  </tr>
                ))}
              </tbody>
            </table>
            <ModuleWords>{checkDetail(exampleAssessment, 'conformity.upper')}</ModuleWords>
          </Example>
          <Source>
            <span className="grid gap-1">
              {RULES_IN_ORDER.map((rule) => (
                <span key={rule}>
                  {RULE_NAMES[rule]}: {conformitySource(rule)}
                </span>
              ))}
            </span>
          </Source>
        </Card>

        <Card id="step-water" title="6. How much water the accepted value shows">
          <p>
            Added water dilutes milk and moves its freezing point towards 0 °C. Comparing the accepted value with the scheme’s
            authentic reference freezing point gives an estimate of the share of added water. It is an estimate: it depends on the
            reference, and a herd’s own freezing point moves with breed, feed and season. When the intake result charged for added
            water and the accepted value shows a share that differs by more than the scheme’s threshold, the proposal is to adjust the
            charge.
          </p>
          <Formula>
            added water (%) = (reference − value) / reference × 100 · adjust when |added water − charged| &gt; threshold
          </Formula>
          <Example>
            <p>
              Reference {celsius(-0.52)}, accepted value {celsius(-0.5)}: <Num>{percent(water.percent)}</Num> added water. Had the
              intake charged {percent(charged)}, the difference of <Num>{percent(Math.abs(water.percent - charged))}</Num> is{' '}
              {Math.abs(water.percent - charged) > threshold ? 'more' : 'not more'} than a {percent(threshold)} threshold.
            </p>
            <ModuleWords>{checkDetail(exampleAssessment, 'added_water')}</ModuleWords>
          </Example>
          <Source>
            {SOURCES.addedWater}; the adjustment: {SOURCES.adjust}
          </Source>
        </Card>

        <Card id="step-outcome" title="7. The proposed outcome, in this order">
          <ol className="list-decimal space-y-1 pl-6">
            <li>
              <span className="font-bold">Incomplete</span>: there is no retest yet, its readings have not settled, the referee
              instrument’s calibration check or the storage temperatures are not recorded. The proposal says what is missing.
            </li>
            <li>
              <span className="font-bold">Further test</span>: the retained sample is unfit (step 3), the referee instrument failed
              its check (step 2), or the laboratories disagree and the scheme calls a third laboratory (step 4).
            </li>
            <li>
              <span className="font-bold">Uphold</span>, when the accepted value is beyond the lower limit (step 5).
            </li>
            <li>
              <span className="font-bold">Reverse</span>, when the accepted value is within the upper limit: the intake result does
              not stand.
            </li>
            <li>
              <span className="font-bold">Uphold</span>, when it is beyond the upper limit, or{' '}
              <span className="font-bold">adjust</span> when the intake charged for added water and the accepted value’s share
              differs by more than the threshold (step 6).
            </li>
          </ol>
          <Example>
            <table className={tableClass}>
              <thead>
                <tr>
                  <th scope="col">Invented case</th>
                  <th scope="col">Proposal</th>
                  <th scope="col">Summary</th>
                </tr>
              </thead>
              <tbody>
                {outcomes.map(({ label, assessment }) => (
                  <tr key={label}>
                    <td>{label}</td>
                    <td>
                      <Badge tone={OUTCOME_TONES[assessment.outcome]}>{OUTCOME_LABELS[assessment.outcome]}</Badge>
                    </td>
                    <td>{assessment.summary}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </Example>
          <Source>each step’s own source above; the order of the outcomes is this product’s design, with no published source</Source>
        </Card>
      </div>
    </>
  );
}
