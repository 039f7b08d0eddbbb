import type { TransitionInputs } from '@/lib/cases/schemas';
import type { EffectContext, EffectResult } from './context';

/** The supplier ends its own dispute before a decision; the intake result then stands. */
export async function withdrawEffect({ input, now }: EffectContext<TransitionInputs['withdraw']>): Promise<EffectResult> {
  return {
    caseChanges: { withdrawnAt: now },
    detail: { reason: input.reason },
    notice: { template: 'case-withdrawn', subject: 'the supplier has withdrawn the dispute', headline: 'The supplier has withdrawn this dispute; the intake result stands.', lines: [`Reason given: ${input.reason}`] },
  };
}
