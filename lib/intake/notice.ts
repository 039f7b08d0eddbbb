import { formatDateTime } from '@/lib/format/dates';
import { formatMoney } from '@/lib/money/minor-units';
import { formatCelsius } from '@/lib/temperature';
import { decisionRuleLabels, resultBasisLabels } from './practice';

export type IntakeNoticeFacts = {
  reference: string;
  farmName: string;
  herdCode: string;
  receivedAt: Date;
  volumeLitres: number;
  verdict: 'accepted' | 'deducted' | 'rejected';
  valueTenthMilliC: number;
  readingsTenthMilliC: number[];
  resultBasis: keyof typeof resultBasisLabels;
  limitTenthMilliC: number;
  acceptanceLimitTenthMilliC: number;
  limitApplied: 'upper' | 'lower' | null;
  decisionRule: keyof typeof decisionRuleLabels;
  rulesName: string;
  rulesVersion: number;
  addedWaterBasisPoints: number;
  referenceTenthMilliC: number;
  amountMinor: number;
  currency: string;
  arithmetic: string;
  instrumentSerial: string;
  calibrationWarning: string | null;
  notifiedAt: Date;
  contestHours: number;
  correction?: { reason: string; previousVerdict: string; previousValueTenthMilliC: number };
};

export function contestDeadline(notifiedAt: Date, contestHours: number): Date {
  return new Date(notifiedAt.getTime() + contestHours * 3_600_000);
}

const verdictWords = { accepted: 'accepted', deducted: 'paid with a deduction', rejected: 'rejected' } as const;

/**
 * What the supplier is told of an intake result: the values, the rule that decided it, the money and
 * the deadline to contest. The same lines go into the e-mail and can be shown on screen.
 */
export function intakeNotice(facts: IntakeNoticeFacts): { subject: string; headline: string; lines: string[] } {
  const deadline = contestDeadline(facts.notifiedAt, facts.contestHours);
  const readings = facts.readingsTenthMilliC.map((v) => formatCelsius(v, 4).replace(' °C', '')).join(', ');
  const side = facts.limitApplied === 'lower' ? 'lower limit (added solutes suspected below it)' : 'upper limit (added water suspected above it)';
  // The result and the acceptance limit to the 0.0001 °C they are compared at, so a result near the limit reads as it was judged.
  const lines = [
    `Delivery ${facts.reference} from ${facts.farmName} (${facts.herdCode}), received ${formatDateTime(facts.receivedAt)}, ${facts.volumeLitres.toLocaleString('en-GB')} l.`,
    `Freezing point ${formatCelsius(facts.valueTenthMilliC, 4)} (${resultBasisLabels[facts.resultBasis]}; readings ${readings} °C) on instrument ${facts.instrumentSerial}.`,
    `Rule applied: ${side} ${formatCelsius(facts.limitTenthMilliC)} under ${decisionRuleLabels[facts.decisionRule]}, acceptance limit ${formatCelsius(facts.acceptanceLimitTenthMilliC, 4)}; ${facts.rulesName}, rules version ${facts.rulesVersion}.`,
  ];
  if (facts.limitApplied !== 'lower') {
    lines.push(`Added water estimated at ${(facts.addedWaterBasisPoints / 100).toFixed(2)} % against the scheme’s reference freezing point of ${formatCelsius(facts.referenceTenthMilliC)}.`);
  }
  if (facts.verdict !== 'accepted') lines.push(`Withheld: ${formatMoney(facts.amountMinor, facts.currency)} (${facts.arithmetic}).`);
  if (facts.calibrationWarning) lines.push(`Note: ${facts.calibrationWarning}`);
  if (facts.correction) {
    lines.push(`This corrects the earlier result (${facts.correction.previousVerdict}, ${formatCelsius(facts.correction.previousValueTenthMilliC)}). Reason given: ${facts.correction.reason}`);
  }
  if (facts.verdict !== 'accepted') {
    lines.push(
      `You may contest this result until ${formatDateTime(deadline)} (${facts.contestHours} h after this notice) by opening a dispute; the sealed retained sample is then retested by the referee laboratory.`,
    );
  }
  lines.push('Your supply contract and local regulations prevail over this notice where they differ.');
  const subject = `${facts.reference}: ${facts.correction ? 'corrected result, ' : ''}${verdictWords[facts.verdict]}`;
  const headline = `${facts.correction ? 'A corrected intake result: ' : 'Intake result: '}delivery ${facts.reference} was ${verdictWords[facts.verdict]}.`;
  return { subject, headline, lines };
}
