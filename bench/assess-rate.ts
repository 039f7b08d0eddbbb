import { assess, type AssessmentInput } from '@/lib/arbitration';
import { assessmentInputSchema } from '@/lib/arbitration/schema';
import { seededRandom } from '@/db/seed/random';
import { defaultSchemeRules } from '@/lib/rules/defaults';
import { assessmentRules } from '@/lib/rules/to-assessment';

const round4 = (x: number) => Math.round(x * 10_000) / 10_000;

/**
 * Valid proposals of every kind: results either side of the limit, agreeing and disagreeing
 * laboratories, four readings where two disagree, failed checks, broken seals, warm or old samples,
 * no retest yet, added water charged. Each is checked against the module's own input schema.
 */
export function variedInputs(count: number): AssessmentInput[] {
  const random = seededRandom(5764);
  const rules = assessmentRules(defaultSchemeRules);
  const inputs: AssessmentInput[] = [];
  const testedAt = Date.UTC(2026, 10, 2, 9, 0);
  for (let i = 0; i < count; i++) {
    const truth = random.between(-0.53, -0.5);
    const readings = (n: number, spread: number) => Array.from({ length: n }, () => round4(random.normal(truth, spread)));
    const check = () => ({ nominal: -0.512, readings: Array.from({ length: 5 }, () => round4(random.normal(-0.512, random.next() < 0.1 ? 0.004 : 0.001))) });
    const sampledAt = new Date(testedAt - random.int(1, 10) * 3_600_000);
    const input: AssessmentInput = {
      rules,
      original: { readings: readings(random.next() < 0.2 ? 4 : 2, 0.0015), testedAt: new Date(testedAt - 3_600_000).toISOString(), calibration: check() },
      ...(random.next() < 0.5 ? { intake: { addedWaterPercent: round4(random.between(0.5, 4)) } } : {}),
    };
    if (random.next() < 0.9) {
      input.retest = {
        readings: readings(random.pick([1, 2, 2, 2, 3, 4]), random.next() < 0.3 ? 0.003 : 0.001),
        testedAt: new Date(testedAt + random.int(2, 60) * 3_600_000).toISOString(),
        calibration: random.next() < 0.95 ? check() : undefined,
        sample: {
          sampledAt: sampledAt.toISOString(),
          sealIntact: random.next() < 0.95,
          frozen: random.next() < 0.05,
          custodyComplete: random.next() < 0.95,
          storageTemperatures: Array.from({ length: random.int(1, 4) }, () => round4(random.between(2, random.next() < 0.1 ? 9 : 6))),
        },
      };
    }
    inputs.push(assessmentInputSchema.parse(input));
  }
  return inputs;
}

/** Proposals per second of `assess` on this thread, after a warm-up, over a fixed time. */
export function assessRate(options: { seconds: number; inputs?: number }): { perSecond: number; proposals: number; outcomes: Record<string, number> } {
  const inputs = variedInputs(options.inputs ?? 2000);
  const outcomes: Record<string, number> = {};
  for (const input of inputs) {
    const { outcome } = assess(input);
    outcomes[outcome] = (outcomes[outcome] ?? 0) + 1;
  }
  for (let i = 0; i < 20_000; i++) assess(inputs[i % inputs.length]);
  let proposals = 0;
  const started = performance.now();
  const until = started + options.seconds * 1000;
  let sink = 0;
  while (performance.now() < until) {
    for (let i = 0; i < 1000; i++) sink += assess(inputs[(proposals + i) % inputs.length]).checks.length;
    proposals += 1000;
  }
  const elapsed = (performance.now() - started) / 1000;
  if (sink === 0) throw new Error('assess returned no checks');
  return { perSecond: proposals / elapsed, proposals, outcomes };
}
