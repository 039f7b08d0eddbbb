import { z } from 'zod';

// Shared by the decision form in the browser and the signing on the server: one set of rules and messages.

const FURTHER_TEST_MESSAGE =
  'A further test is not a binding decision: order it with “Order a further test”. The case then goes back for a new sample and nothing is sealed.';

const baseSchema = z.object({
  outcome: z.enum(['uphold', 'reverse', 'adjust', 'further_test'], { error: 'Choose the outcome.' }),
  reasons: z.string().trim().min(20, 'The reasons need at least 20 characters.').max(4000, 'The reasons are limited to 4000 characters.'),
  departureReason: z.string().trim().max(4000, 'The reason is limited to 4000 characters.').optional().default(''),
  confirm: z.preprocess((v) => v === true || v === 'on' || v === 'true', z.boolean()).refine((v) => v, 'Confirm that you sign this as the binding decision.'),
  password: z.string().min(1, 'Enter your password to sign.').max(128, 'That is longer than any password here.'),
});

/**
 * The decision form for a case whose proposal is `proposalOutcome`: departing from the proposal
 * needs its own reason, and a further test is refused here because it is a transition, not a decision.
 */
export function signDecisionSchema(proposalOutcome: string | null) {
  // Both rules run even while other fields are still wrong, so the form shows every problem at once.
  const outcomeOf = (payload: z.core.ParsePayload) => (payload.value as { outcome?: unknown } | undefined)?.outcome;
  return baseSchema
    .refine((value) => value.outcome !== 'further_test', { path: ['outcome'], message: FURTHER_TEST_MESSAGE, when: (payload) => outcomeOf(payload) === 'further_test' })
    .refine((value) => value.outcome === proposalOutcome || (value.departureReason ?? '').trim().length >= 10, {
      path: ['departureReason'],
      message: 'Say in at least 10 characters why you depart from the proposal.',
      when: (payload) => ['uphold', 'reverse', 'adjust'].includes(outcomeOf(payload) as string),
    });
}

export type SignDecisionInput = z.output<ReturnType<typeof signDecisionSchema>>;

/** A correction of a sealed decision: a new decision that supersedes the one named. */
export function correctDecisionSchema(proposalOutcome: string | null) {
  return signDecisionSchema(proposalOutcome).and(
    z.object({
      supersedesId: z.uuid('Name the decision that is corrected.'),
      correctionReason: z.string().trim().min(20, 'Say in at least 20 characters what is corrected and why.').max(4000, 'The reason is limited to 4000 characters.'),
    }),
  );
}

export type CorrectDecisionInput = z.output<ReturnType<typeof correctDecisionSchema>>;

/** What the public verification page takes: a record hash as printed on a letter. */
export const recordHashSchema = z
  .string()
  .trim()
  .transform((v) => v.toLowerCase().replace(/\s+/g, ''))
  .pipe(z.string().regex(/^[0-9a-f]{64}$/, 'A record hash is 64 hexadecimal digits (0–9, a–f), as printed on the letter.'));
