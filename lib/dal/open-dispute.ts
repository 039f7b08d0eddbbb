import 'server-only';
import { and, asc, eq, inArray, ne, sql } from 'drizzle-orm';
import type { z } from 'zod';
import type { Db } from '@/db/client';
import { delivery, disputeCase, intakeResult, organisation, sample, schemeRules } from '@/db/schema';
import type { Actor } from '@/lib/auth/actor';
import { assertCan } from '@/lib/auth/session';
import { recordAudit } from '@/lib/audit/record';
import { openDisputeSchema } from '@/lib/cases/schemas';
import { AppError, invalidInput } from '@/lib/errors';
import { formatDateTime } from '@/lib/format/dates';
import { notifyCase } from '@/lib/mail/case-mails';
import { mailAfterCommit } from '@/lib/mail/outbox';
import { rulesInForce } from './rules';

const CASE_NUMBER_LOCK = 0x43534e4f; // "CSNO": one writer at a time picks the next number of a year

export type OpenDisputeInput = z.input<typeof openDisputeSchema>;

/** A supplier contests one of its rejected or deducted intake results while the contest window is open. */
export async function openDispute(db: Db, actor: Actor, rawInput: unknown, context: { origin?: string; now?: Date } = {}) {
  assertCan(actor, 'case', 'open');
  const parsed = openDisputeSchema.safeParse(rawInput);
  if (!parsed.success) throw invalidInput(parsed.error);
  const input = parsed.data;
  const now = context.now ?? new Date();

  const created = await db.transaction(async (tx) => {
    const [result] = await tx
      .select({
        id: intakeResult.id,
        deliveryId: intakeResult.deliveryId,
        deliveryReference: delivery.reference,
        farmId: delivery.farmId,
        deliveredAt: delivery.receivedAt,
        verdict: intakeResult.verdict,
        notifiedAt: intakeResult.notifiedAt,
        supersededAt: intakeResult.supersededAt,
        contestHours: sql<number>`(${schemeRules.rules}->'deadlines'->>'contestHours')::int`,
        supplierOrganisationId: delivery.supplierOrganisationId,
        plantOrganisationId: delivery.plantOrganisationId,
      })
      .from(intakeResult)
      .innerJoin(delivery, eq(delivery.id, intakeResult.deliveryId))
      .innerJoin(schemeRules, eq(schemeRules.id, intakeResult.rulesVersionId))
      .where(and(eq(intakeResult.id, input.intakeResultId), eq(delivery.supplierOrganisationId, actor.organisationId)))
      .for('update', { of: intakeResult });
    if (!result) throw new AppError('not_found', 'That delivery result was not found.');
    if (result.supersededAt) throw new AppError('conflict', 'This result has been corrected since; contest the corrected result instead.');
    if (result.verdict === 'accepted') throw new AppError('conflict', 'This delivery was accepted; only a rejection or a deduction can be contested.');
    if (!result.notifiedAt) throw new AppError('conflict', 'You have not been told of this result yet, so the contest window has not opened.');
    const closesAt = new Date(result.notifiedAt.getTime() + result.contestHours * 3_600_000);
    if (now.getTime() > closesAt.getTime()) {
      throw new AppError('conflict', `The contest window for this result closed on ${formatDateTime(closesAt)}; it can no longer be disputed here.`);
    }
    const [live] = await tx.select({ number: disputeCase.number }).from(disputeCase).where(and(eq(disputeCase.intakeResultId, result.id), ne(disputeCase.status, 'withdrawn')));
    if (live) throw new AppError('conflict', `This result is already disputed in ${live.number}.`);

    const [board] = await tx.select({ id: organisation.id }).from(organisation).where(eq(organisation.kind, 'board')).orderBy(asc(organisation.createdAt)).limit(1);
    if (!board) throw new AppError('unavailable', 'No arbitration board is set up yet; ask the scheme’s administrator.');
    const rules = await rulesInForce(tx, now);
    if (!rules) throw new AppError('unavailable', 'No scheme rules are in force; ask the scheme’s administrator.');
    const [retained] = await tx.select({ sampledAt: sample.sampledAt }).from(sample).where(and(eq(sample.deliveryId, result.deliveryId), inArray(sample.kind, ['retained', 'counter']))).limit(1);

    const year = now.getUTCFullYear();
    await tx.execute(sql`select pg_advisory_xact_lock(${CASE_NUMBER_LOCK}, ${year})`);
    const [{ next }] = await tx.select({ next: sql<number>`coalesce(max(${disputeCase.sequence}), 0) + 1` }).from(disputeCase).where(eq(disputeCase.year, year));
    const sequence = Number(next);
    const number = `CS-${year}-${String(sequence).padStart(4, '0')}`;
    const [row] = await tx
      .insert(disputeCase)
      .values({
        number,
        year,
        sequence,
        deliveryId: result.deliveryId,
        deliveryReference: result.deliveryReference,
        farmId: result.farmId,
        deliveredAt: result.deliveredAt,
        intakeResultId: result.id,
        supplierOrganisationId: result.supplierOrganisationId,
        plantOrganisationId: result.plantOrganisationId,
        boardOrganisationId: board.id,
        rulesVersionId: rules.id,
        status: 'open',
        grounds: input.grounds,
        explanation: input.explanation,
        remedy: input.remedy,
        openedBy: actor.userId,
        openedAt: now,
        dispatchDueAt: new Date(now.getTime() + rules.rules.deadlines.dispatchHours * 3_600_000),
        sampleValidUntil: retained ? new Date(retained.sampledAt.getTime() + rules.rules.sample.validHours * 3_600_000) : null,
        updatedAt: now,
      })
      .returning();
    await recordAudit(tx, { actorUserId: actor.userId, actorOrganisationId: actor.organisationId, origin: context.origin, at: now }, {
      action: 'case.opened',
      objectType: 'case',
      objectId: row.id,
      caseId: row.id,
      change: { number, status: 'open' },
    });
    await notifyCase(tx, row, ['plant', 'board'], {
      template: 'case-opened',
      subject: 'a supplier contests an intake result',
      headline: `${actor.organisationName} contests an intake result in ${row.number}.`,
      lines: ['The plant laboratory completes its side and dispatches the retained sample to the referee laboratory.', `Dispatch due by ${formatDateTime(row.dispatchDueAt!)}.`],
    });
    return row;
  });

  await mailAfterCommit();
  return created;
}
