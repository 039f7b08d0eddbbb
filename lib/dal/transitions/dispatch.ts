import { custodyEvent } from '@/db/schema';
import type { TransitionInputs } from '@/lib/cases/schemas';
import { AppError } from '@/lib/errors';
import { toTenthMilliC } from '@/lib/temperature';
import { organisationById } from '../organisations';
import type { EffectContext, EffectResult } from './context';

/** The plant sends the sealed retained sample to the referee laboratory. */
export async function dispatchEffect({ tx, actor, sample: retained, input, now }: EffectContext<TransitionInputs['dispatch']>): Promise<EffectResult> {
  const named = await organisationById(tx, input.labOrganisationId);
  const lab = named?.kind === 'lab' ? named : null;
  if (!lab) throw new AppError('invalid', 'Choose a referee laboratory.', { fieldErrors: { labOrganisationId: ['That is not a referee laboratory.'] } });
  if (!retained) throw new AppError('conflict', 'No retained sample is recorded for this delivery, so there is nothing to dispatch.');
  if (retained.sealNumber && retained.sealNumber !== input.sealNumber) {
    throw new AppError('invalid', 'The seal number differs from the one recorded when the sample was sealed.', {
      fieldErrors: { sealNumber: [`The retained sample was sealed as ${retained.sealNumber}.`] },
    });
  }
  const custody = tx.insert(custodyEvent).values({
    sampleId: retained.id,
    kind: 'dispatched',
    at: now,
    actorUserId: actor.userId,
    organisationId: actor.organisationId,
    location: input.courier,
    tempTenthMilliC: toTenthMilliC(input.temperature),
    sealIntact: true,
    frozen: false,
    note: input.answer || null,
  });
  return {
    writes: [custody],
    caseChanges: { labOrganisationId: lab.id },
    detail: { sampleCode: retained.code, sealNumber: input.sealNumber, laboratory: lab.name, answer: input.answer || undefined },
    notice: (audience) => ({
      template: 'case-dispatched',
      subject: audience === 'lab' ? 'a retained sample is on its way to you' : 'the retained sample has been dispatched',
      headline: audience === 'lab' ? `Sample ${retained.code} is on its way to your laboratory.` : `The plant has dispatched sample ${retained.code} to ${lab.name}.`,
      lines: [`Seal number ${input.sealNumber}; dispatched ${now.toISOString().slice(0, 16).replace('T', ' ')} UTC by ${input.courier}.`, audience === 'lab' ? 'Record its condition on receipt, then retest it before it expires.' : 'You can follow its custody on the case file.'],
    }),
  };
}
