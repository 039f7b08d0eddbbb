import 'server-only';
import { and, eq } from 'drizzle-orm';
import type { Db, Tx } from '@/db/client';
import { disputeCase } from '@/db/schema';
import type { Actor } from '@/lib/auth/actor';
import { can } from '@/lib/auth/permissions';
import { recordAudit, type AuditContext } from '@/lib/audit/record';
import { caseStatusLabel } from '@/lib/cases/labels';
import { isBindingOutcome, SIGNATURE_MEANING, type BindingOutcome } from '@/lib/decision/labels';
import { correctDecisionSchema, signDecisionSchema } from '@/lib/decision/schemas';
import { AppError, invalidInput } from '@/lib/errors';
import { findVisibleCase } from './cases';
import { conflictOfInterest, reauthenticate } from './decision-auth';
import { decisionBasis, settlementOrRefusal } from './decision-draft';
import { deliverDecision } from './decision-delivery';
import { currentDecisionOf } from './decision-record';
import { insertSealedDecision, type SealedDecision } from './decision-seal';
import type { CaseRow } from './transitions/context';

export type SignOutcome = { caseId: string; number: string; decisionId: string; outcome: BindingOutcome; recordSha256: string; supersedesId: string | null };
type Context = { origin?: string; now?: Date };

/** Who may sign on this case: 404 for outsiders (the admin among them), 403 for a role or person who may not. */
async function signableCase(db: Db, actor: Actor, caseId: string): Promise<CaseRow> {
  const row = await findVisibleCase(db, actor, caseId);
  if (!can(actor.role, 'case', 'decide')) throw new AppError('forbidden', 'Your role cannot sign a decision.');
  const conflict = await conflictOfInterest(db, actor, row);
  if (conflict) throw new AppError('forbidden', conflict);
  return row;
}

/** The proposal's outcome as it stands: what the form's "departure" rule compares with. */
async function currentProposalOutcome(db: Db, row: CaseRow): Promise<string | null> {
  if (row.status !== 'review' && row.status !== 'decided') return null;
  return (await decisionBasis(db, row)).proposal.assessment.outcome;
}

async function sealInTransaction(
  tx: Tx,
  actor: Actor,
  locked: CaseRow,
  input: { outcome: BindingOutcome; reasons: string; departureReason: string },
  signature: { at: Date; method: string; now: Date },
  supersedes: { id: string; recordSha256: string } | null,
): Promise<SealedDecision & { followedProposal: boolean }> {
  const basis = await decisionBasis(tx, locked);
  const settlement = settlementOrRefusal(basis, input.outcome);
  const followedProposal = basis.proposal.assessment.outcome === input.outcome;
  // The proposal may have moved since the form was drawn; departing from it always needs its reason.
  if (!followedProposal && input.departureReason.length < 10) {
    throw new AppError('invalid', 'Some fields need attention.', { fieldErrors: { departureReason: [`The proposal is now “${basis.proposal.assessment.outcome.replaceAll('_', ' ')}”; say in at least 10 characters why you depart from it.`] } });
  }
  const sealed = await insertSealedDecision(tx, {
    caseId: locked.id,
    outcome: input.outcome,
    reasons: input.reasons,
    followedProposal,
    departureReason: followedProposal ? null : input.departureReason,
    proposal: basis.proposal,
    settlement,
    signer: { userId: actor.userId, name: actor.name },
    signedAt: signature.now,
    signatureMeaning: SIGNATURE_MEANING,
    reauthenticatedAt: signature.at,
    reauthenticationMethod: signature.method,
    supersedes,
  });
  return { ...sealed, followedProposal };
}

/**
 * The arbiter signs the binding decision on a case in review. The password is checked first; then,
 * in one transaction on the locked case row: the state check, the sealed decision, the conditional
 * move to "decided" and the audit events — so of two arbiters signing at once exactly one wins, and a
 * refusal anywhere leaves nothing behind. The letter and the mail follow the commit.
 */
export async function signDecision(db: Db, actor: Actor, caseId: string, rawInput: unknown, context: Context = {}): Promise<SignOutcome> {
  const row = await signableCase(db, actor, caseId);
  if (row.status !== 'review') throw new AppError('conflict', `This case is “${caseStatusLabel(row.status)}”; a decision is signed only while it is before the board.`);
  const parsed = signDecisionSchema(await currentProposalOutcome(db, row)).safeParse(rawInput);
  if (!parsed.success) throw invalidInput(parsed.error);
  const input = parsed.data;
  if (!isBindingOutcome(input.outcome)) throw new AppError('invalid', 'Choose uphold, reverse or adjust.', { fieldErrors: { outcome: ['Choose uphold, reverse or adjust.'] } });
  const outcome = input.outcome;
  const reauthenticated = await reauthenticate(db, actor, input.password);
  const now = context.now ?? new Date();
  const audit: AuditContext = { actorUserId: actor.userId, actorOrganisationId: actor.organisationId, origin: context.origin, at: now };

  const sealed = await db.transaction(async (tx) => {
    const [locked] = await tx.select().from(disputeCase).where(eq(disputeCase.id, caseId)).for('update');
    if (locked.status !== 'review') {
      throw new AppError('conflict', `This case is now “${caseStatusLabel(locked.status)}”, so it cannot be decided. Reload the case to see what happened.`);
    }
    const result = await sealInTransaction(tx, actor, locked, { outcome, reasons: input.reasons, departureReason: input.departureReason }, { ...reauthenticated, now }, null);
    const [moved] = await tx
      .update(disputeCase)
      .set({ status: 'decided', decidedAt: now, updatedAt: now })
      .where(and(eq(disputeCase.id, caseId), eq(disputeCase.status, 'review')))
      .returning({ id: disputeCase.id });
    if (!moved) throw new AppError('conflict', 'Someone else changed this case at the same moment. Reload it to see what happened.');
    await recordAudit(tx, audit, {
      action: 'case.transitioned',
      objectType: 'case',
      objectId: caseId,
      caseId,
      change: { from: 'review', to: 'decided', transition: 'decide', detail: { decisionId: result.id, outcome, followedProposal: result.followedProposal } },
    });
    await recordAudit(tx, audit, {
      action: 'decision.sealed',
      objectType: 'decision',
      objectId: result.id,
      caseId,
      change: { outcome, followedProposal: result.followedProposal, recordSha256: result.recordSha256, signingKeyId: result.signingKeyId, signatureMeaning: SIGNATURE_MEANING, reauthenticationMethod: reauthenticated.method, supersedesId: null, correctionReason: null },
    });
    return result;
  });

  await deliverDecision(db, sealed.id, { origin: context.origin });
  return { caseId, number: row.number, decisionId: sealed.id, outcome, recordSha256: sealed.recordSha256, supersedesId: null };
}

/**
 * A correction of a sealed decision: a new decision, signed and sealed the same way, that names the
 * one it supersedes; both are kept. Only the case's current decision can be superseded, so two
 * corrections racing on one decision end with one winner. The case stays decided and read-only.
 */
export async function correctDecision(db: Db, actor: Actor, caseId: string, rawInput: unknown, context: Context = {}): Promise<SignOutcome> {
  const row = await signableCase(db, actor, caseId);
  if (row.status !== 'decided') throw new AppError('conflict', 'Only a decided case has a decision to correct.');
  const parsed = correctDecisionSchema(await currentProposalOutcome(db, row)).safeParse(rawInput);
  if (!parsed.success) throw invalidInput(parsed.error);
  const input = parsed.data;
  if (!isBindingOutcome(input.outcome)) throw new AppError('invalid', 'Choose uphold, reverse or adjust.', { fieldErrors: { outcome: ['Choose uphold, reverse or adjust.'] } });
  const outcome = input.outcome;
  const reauthenticated = await reauthenticate(db, actor, input.password);
  const now = context.now ?? new Date();
  const audit: AuditContext = { actorUserId: actor.userId, actorOrganisationId: actor.organisationId, origin: context.origin, at: now };

  const sealed = await db.transaction(async (tx) => {
    const [locked] = await tx.select().from(disputeCase).where(eq(disputeCase.id, caseId)).for('update');
    if (locked.status !== 'decided') throw new AppError('conflict', 'Only a decided case has a decision to correct.');
    const current = await currentDecisionOf(tx, caseId);
    if (!current || current.id !== input.supersedesId) {
      throw new AppError('conflict', 'That decision is no longer the current one of this case; reload the case and correct the current decision.', { fieldErrors: { supersedesId: ['Not the current decision of this case.'] } });
    }
    if (!current.recordSha256) throw new Error(`Decision ${current.id} is not sealed`);
    const result = await sealInTransaction(tx, actor, locked, { outcome, reasons: input.reasons, departureReason: input.departureReason }, { ...reauthenticated, now }, { id: current.id, recordSha256: current.recordSha256 });
    const [touched] = await tx.update(disputeCase).set({ updatedAt: now }).where(and(eq(disputeCase.id, caseId), eq(disputeCase.status, 'decided'))).returning({ id: disputeCase.id });
    if (!touched) throw new AppError('conflict', 'Someone else changed this case at the same moment. Reload it to see what happened.');
    await recordAudit(tx, audit, {
      action: 'decision.sealed',
      objectType: 'decision',
      objectId: result.id,
      caseId,
      change: { outcome, followedProposal: result.followedProposal, recordSha256: result.recordSha256, signingKeyId: result.signingKeyId, signatureMeaning: SIGNATURE_MEANING, reauthenticationMethod: reauthenticated.method, supersedesId: current.id, correctionReason: input.correctionReason },
    });
    return { ...result, supersedesId: current.id };
  });

  await deliverDecision(db, sealed.id, { origin: context.origin });
  return { caseId, number: row.number, decisionId: sealed.id, outcome, recordSha256: sealed.recordSha256, supersedesId: sealed.supersedesId };
}
