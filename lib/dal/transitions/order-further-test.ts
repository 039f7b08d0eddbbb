import { and, eq } from 'drizzle-orm';
import { custodyEvent, organisation, sample } from '@/db/schema';
import type { TransitionInputs } from '@/lib/cases/schemas';
import { AppError } from '@/lib/errors';
import type { EffectContext, EffectResult } from './context';

/**
 * The board sends the case back for another sample: a third laboratory on a further portion, or a
 * supervised authentic herd sample. The new sample has its own custody and validity.
 */
export async function orderFurtherTestEffect({ tx, actor, caseRow, input, now, rules }: EffectContext<TransitionInputs['order_further_test']>): Promise<EffectResult> {
  const [lab] = await tx.select({ id: organisation.id, name: organisation.name }).from(organisation).where(and(eq(organisation.id, input.labOrganisationId), eq(organisation.kind, 'lab')));
  if (!lab) throw new AppError('invalid', 'Choose a laboratory.', { fieldErrors: { labOrganisationId: ['That is not a laboratory.'] } });
  const [taken] = await tx.select({ id: sample.id }).from(sample).where(eq(sample.code, input.sampleCode));
  if (taken) throw new AppError('invalid', 'That sample code is in use.', { fieldErrors: { sampleCode: ['Another sample already has this code.'] } });

  const [created] = await tx
    .insert(sample)
    .values({
      deliveryId: caseRow.deliveryId,
      caseId: caseRow.id,
      code: input.sampleCode,
      kind: input.kind === 'authentic' ? 'authentic' : 'referee',
      sealNumber: input.sealNumber,
      storage: 'Cool box, 0–6 °C',
      sampledAt: input.sampledAt,
    })
    .returning();
  const custody = tx.insert(custodyEvent).values([
    { sampleId: created.id, kind: 'sealed', at: input.sampledAt, actorUserId: actor.userId, organisationId: actor.organisationId, sealIntact: true, note: input.kind === 'authentic' ? 'Supervised authentic herd sample.' : 'Further portion for a third laboratory.' },
    { sampleId: created.id, kind: 'dispatched', at: now, actorUserId: actor.userId, organisationId: actor.organisationId, location: `To ${lab.name}`, sealIntact: true, frozen: false },
  ]);
  const kindLabel = input.kind === 'authentic' ? 'an authentic herd sample' : 'a test by a third laboratory';
  return {
    writes: [custody],
    // The new laboratory starts blind, with the new sample's own validity.
    caseChanges: { labOrganisationId: lab.id, retestSubmittedAt: null, decisionDueAt: null, sampleValidUntil: new Date(input.sampledAt.getTime() + rules.sample.validHours * 3_600_000) },
    detail: { kind: input.kind, laboratory: lab.name, sampleCode: input.sampleCode, reasons: input.reasons },
    notice: (audience) => ({
      template: 'case-further-test',
      subject: 'the board has ordered a further test',
      headline: audience === 'lab' ? `Sample ${input.sampleCode} is on its way to your laboratory for a further test.` : `The board has ordered ${kindLabel}.`,
      lines: audience === 'lab' ? ['Record its condition on receipt, then retest it before it expires.'] : [`Reasons: ${input.reasons}`],
    }),
  };
}
