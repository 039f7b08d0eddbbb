import 'server-only';
import { and, eq, inArray } from 'drizzle-orm';
import { z } from 'zod';
import type { Db } from '@/db/client';
import { pipelined } from '@/db/pipeline';
import { countedOf, writesAsOne } from '@/db/writes-as-one';
import { disputeCase, type CaseStatus } from '@/db/schema';
import type { Actor } from '@/lib/auth/actor';
import { can } from '@/lib/auth/permissions';
import { recordAudit } from '@/lib/audit/record';
import { transitions, type TransitionName } from '@/lib/cases/lifecycle';
import { transitionSchemas, type TransitionInputs } from '@/lib/cases/schemas';
import { caseStatusLabel } from '@/lib/cases/labels';
import { AppError, invalidInput } from '@/lib/errors';
import { caseNoticeInsert } from '@/lib/mail/case-mails';
import { mailAfterCommit } from '@/lib/mail/outbox';
import { currentSample } from './case-samples';
import { caseVisibility, holdsRoleOn } from './case-scope';
import { rulesVersion } from './rules';
import type { EffectContext, EffectResult } from './transitions/context';
import { dispatchEffect } from './transitions/dispatch';
import { receiveEffect } from './transitions/receive';
import { submitRetestEffect } from './transitions/submit-retest';
import { orderFurtherTestEffect } from './transitions/order-further-test';
import { withdrawEffect } from './transitions/withdraw';

const effects: { [N in TransitionName]: (context: EffectContext<TransitionInputs[N]>) => Promise<EffectResult> } = {
  dispatch: dispatchEffect,
  receive: receiveEffect,
  submit_retest: submitRetestEffect,
  order_further_test: orderFurtherTestEffect,
  withdraw: withdrawEffect,
};

export type TransitionOutcome = { caseId: string; number: string; from: string; to: string; transition: TransitionName };

/**
 * Makes one lifecycle transition: outsiders get 404, a party without the right 403, bad input 400,
 * a case no longer in a state the transition leaves from 409. The state check, the change, its
 * effects and the audit event are one transaction on a locked row, so of two racing submits exactly
 * one wins. The notices are queued in that transaction and delivered after the commit.
 */
export async function runTransition<N extends TransitionName>(
  db: Db,
  actor: Actor,
  caseId: string,
  name: N,
  rawInput: unknown,
  context: { origin?: string; now?: Date; expectedStatus?: CaseStatus } = {},
): Promise<TransitionOutcome> {
  const spec = transitions[name];
  // Not an id at all names no case; checked here, because the database would refuse the comparison with an error.
  if (!z.uuid().safeParse(caseId).success) throw new AppError('not_found', 'That case was not found.');
  const allowed = can(actor.role, 'case', 'read') && can(actor.role, 'case', spec.permission);
  const parsed = transitionSchemas[name].safeParse(rawInput);
  if (!allowed || !parsed.success) {
    // Refusals keep their order (an outsider hears "not found" whatever it sent); the visibility
    // query runs here only, because on the way to a change the locking select below checks it.
    const [visible] = await db.select({ id: disputeCase.id }).from(disputeCase).where(and(eq(disputeCase.id, caseId), caseVisibility(actor)));
    if (!visible || !can(actor.role, 'case', 'read')) throw new AppError('not_found', 'That case was not found.');
    if (!allowed) throw new AppError('forbidden', `Your role cannot ${spec.label.toLowerCase()}.`);
    throw invalidInput(parsed.error!);
  }
  const input = parsed.data as TransitionInputs[N];
  const now = context.now ?? new Date();

  const before = await db.transaction(async (tx) => {
    // The case is locked and its sample read in one wait; the sample query finds the case by itself.
    const [[locked], sample] = await pipelined([
      () => tx.select().from(disputeCase).where(and(eq(disputeCase.id, caseId), caseVisibility(actor))).for('update'),
      () => currentSample(tx, { id: caseId }),
    ]);
    if (!locked) throw new AppError('not_found', 'That case was not found.');
    if (!holdsRoleOn(actor, locked)) throw new AppError('forbidden', 'Your organisation no longer holds this case: the board has sent the sample to another laboratory.');
    // A form or client that says which state it saw gets 409 when the case has moved on since,
    // even if the transition would still be allowed from the new state.
    if (!spec.from.includes(locked.status) || (context.expectedStatus && context.expectedStatus !== locked.status)) {
      throw new AppError('conflict', `This case is now “${caseStatusLabel(locked.status)}”, so it cannot be changed that way. Reload the case to see what happened.`);
    }
    const rules = await rulesVersion(tx, locked.rulesVersionId);
    if (!rules) throw new Error(`Case ${locked.number} names rules version ${locked.rulesVersionId}, which is missing`);
    const result = await effects[name]({ tx, actor, caseRow: locked, sample, input, now, rules: rules.rules });
    const parties = { ...locked, ...result.caseChanges };
    const update = tx
      .update(disputeCase)
      .set({ ...result.caseChanges, status: spec.to, updatedAt: now })
      .where(and(eq(disputeCase.id, caseId), inArray(disputeCase.status, [...spec.from])))
      .returning({ id: disputeCase.id });
    const notices = caseNoticeInsert(parties, spec.notify, result.notice);
    // The case's update, the effect's inserts and the notices are one statement; the audit event
    // follows it without waiting, so the lock waits once for the lot.
    const [written] = await pipelined([
      () => tx.execute(writesAsOne(update, [...(result.writes ?? []), ...(notices ? [notices] : [])])),
      () =>
        recordAudit(tx, { actorUserId: actor.userId, actorOrganisationId: actor.organisationId, origin: context.origin, at: now }, {
          action: 'case.transitioned',
          objectType: 'case',
          objectId: caseId,
          caseId,
          change: { from: locked.status, to: spec.to, transition: name, detail: result.detail },
        }),
    ]);
    if (countedOf(written) !== 1) throw new AppError('conflict', 'Someone else changed this case at the same moment. Reload it to see what happened.');
    return { status: locked.status, number: locked.number };
  });

  await mailAfterCommit();
  return { caseId, number: before.number, from: before.status, to: spec.to, transition: name };
}
