import { custodyEvent } from '@/db/schema';
import type { TransitionInputs } from '@/lib/cases/schemas';
import { AppError } from '@/lib/errors';
import { toTenthMilliC } from '@/lib/temperature';
import type { EffectContext, EffectResult } from './context';

/** The referee laboratory records the sample's condition on arrival. A broken seal is recorded, not refused: the board weighs it. */
export async function receiveEffect({ tx, actor, sample: current, input, now, rules }: EffectContext<TransitionInputs['receive']>): Promise<EffectResult> {
  if (!current) throw new AppError('conflict', 'No sample was dispatched for this case.');
  const sealMatches = !current.sealNumber || current.sealNumber === input.sealNumber;
  const sealIntact = input.sealIntact && sealMatches;
  const custody = tx.insert(custodyEvent).values([
    { sampleId: current.id, kind: 'received', at: now, actorUserId: actor.userId, organisationId: actor.organisationId, location: actor.organisationName, tempTenthMilliC: toTenthMilliC(input.temperature), sealIntact, frozen: input.frozen, note: input.condition || null },
    { sampleId: current.id, kind: 'seal_checked', at: now, actorUserId: actor.userId, organisationId: actor.organisationId, sealIntact, note: sealMatches ? `Seal ${input.sealNumber} matches the record.` : `Seal read as ${input.sealNumber}; the record says ${current.sealNumber}.` },
  ]);
  const warm = input.temperature < rules.sample.storageRange.min || input.temperature > rules.sample.storageRange.max;
  const concerns = [!sealIntact ? 'the seal is not intact or does not match' : null, input.frozen ? 'the sample arrived frozen' : null, warm ? `it arrived at ${input.temperature} °C, outside ${rules.sample.storageRange.min}–${rules.sample.storageRange.max} °C` : null].filter(
    (c): c is string => c !== null,
  );
  return {
    writes: [custody],
    detail: { sampleCode: current.code, sealIntact, frozen: input.frozen, temperature: input.temperature },
    notice: {
      template: 'case-received',
      subject: 'the referee laboratory has received the sample',
      headline: `The referee laboratory received sample ${current.code}.`,
      lines: [concerns.length ? `On receipt: ${concerns.join('; ')}. The board will weigh this.` : 'Seal intact, sample cold and not frozen on receipt.'],
    },
  };
}
