import type { DecisionOutcome } from '@/lib/enums';

/** What the signature means, recorded with it and printed on the letter (21 CFR 11.50). */
export const SIGNATURE_MEANING = 'binding decision';

/** The outcomes a signed decision can have; a further test sends the case back instead. */
export const bindingOutcomes = ['uphold', 'reverse', 'adjust'] as const;
export type BindingOutcome = (typeof bindingOutcomes)[number];

export function isBindingOutcome(value: string): value is BindingOutcome {
  return (bindingOutcomes as readonly string[]).includes(value);
}

export const decisionOutcomeLabels: Record<DecisionOutcome, string> = {
  uphold: 'Intake result upheld',
  reverse: 'Intake result reversed',
  adjust: 'Intake result adjusted',
  further_test: 'Further test ordered',
};

/** The same outcomes as the arbiter chooses them. */
export const decisionOutcomeChoices: Record<BindingOutcome | 'further_test', string> = {
  uphold: 'Uphold the intake result',
  reverse: 'Reverse the intake result',
  adjust: 'Adjust the intake result to the accepted added water',
  further_test: 'Order a further test (not a decision)',
};
