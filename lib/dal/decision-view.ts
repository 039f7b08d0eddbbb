import 'server-only';
import { asc, eq } from 'drizzle-orm';
import type { DbOrTx } from '@/db/client';
import { decision } from '@/db/schema';
import type { Actor } from '@/lib/auth/actor';
import { can } from '@/lib/auth/permissions';
import { bindingOutcomes, SIGNATURE_MEANING, type BindingOutcome } from '@/lib/decision/labels';
import type { Settlement } from '@/lib/decision/settlement';
import { findVisibleCase } from './cases';
import { conflictOfInterest } from './decision-auth';
import { decisionBasis } from './decision-draft';
import type { proposalFor } from './case-assessment';
import { verificationLinks } from '@/lib/decision/links';

export type SettlementPreview = { lines: string[] } | { unavailable: string };

export type DecisionFormData = {
  proposalOutcome: string;
  proposalSummary: string;
  settlements: Record<BindingOutcome, SettlementPreview>;
  signerName: string;
  boardName: string;
  meaning: string;
  /** Why this arbiter may not sign here, when that is so. */
  blockedBecause: string | null;
  /** On a decided case: the current decision, which a signed correction supersedes. */
  correcting: { decisionId: string; outcome: string } | null;
};

export type SealedDecisionView = {
  id: string;
  outcome: string;
  reasons: string;
  followedProposal: boolean;
  departureReason: string | null;
  settlementLines: string[];
  signerName: string;
  signedAt: Date;
  signatureMeaning: string;
  reauthenticationMethod: string;
  reauthenticatedAt: Date;
  recordSha256: string | null;
  recordSignature: string | null;
  signingKeyId: string | null;
  supersedesId: string | null;
  supersededById: string | null;
  letterUrl: string;
  verifyUrl: string | null;
};

/**
 * The decision part of the case file for this actor: the form while an arbiter of the board may
 * sign, and the sealed decisions (newest first, superseded ones kept) once there are any.
 */
export async function decisionPanel(db: DbOrTx, actor: Actor, caseId: string, known: { proposal?: Awaited<ReturnType<typeof proposalFor>> } = {}): Promise<{ form: DecisionFormData | null; decisions: SealedDecisionView[] }> {
  const row = await findVisibleCase(db, actor, caseId);
  const rows = await db.select().from(decision).where(eq(decision.caseId, row.id)).orderBy(asc(decision.signedAt));
  const successorOf = new Map(rows.filter((r) => r.supersedesId).map((r) => [r.supersedesId!, r.id]));
  const decisions = rows
    .map((r) => ({
      id: r.id,
      outcome: r.outcome,
      reasons: r.reasons,
      followedProposal: r.followedProposal,
      departureReason: r.departureReason,
      settlementLines: ((r.settlement as Partial<Settlement> | null)?.lines ?? []).filter((l): l is string => typeof l === 'string'),
      signerName: r.signerName,
      signedAt: r.signedAt,
      signatureMeaning: r.signatureMeaning,
      reauthenticationMethod: r.reauthenticationMethod,
      reauthenticatedAt: r.reauthenticatedAt,
      recordSha256: r.recordSha256,
      recordSignature: r.recordSignature,
      signingKeyId: r.signingKeyId,
      supersedesId: r.supersedesId,
      supersededById: successorOf.get(r.id) ?? null,
      letterUrl: `/api/v1/cases/${row.id}/letter?decision=${r.id}`,
      verifyUrl: r.recordSha256 ? verificationLinks(r.recordSha256).verifyUrl : null,
    }))
    .reverse();

  let form: DecisionFormData | null = null;
  // Newest first: the first one nothing supersedes is the decision in force.
  const current = decisions.find((d) => d.supersededById === null) ?? null;
  const correcting = row.status === 'decided' && current ? { decisionId: current.id, outcome: current.outcome } : null;
  if ((row.status === 'review' || correcting) && can(actor.role, 'case', 'decide')) {
    const basis = await decisionBasis(db, row, known.proposal ?? undefined);
    const settlements = {} as Record<BindingOutcome, SettlementPreview>;
    for (const outcome of bindingOutcomes) {
      const choice = basis.settlements[outcome];
      settlements[outcome] = 'unavailable' in choice ? { unavailable: choice.unavailable } : { lines: choice.settlement.lines };
    }
    form = {
      proposalOutcome: basis.proposal.assessment.outcome,
      proposalSummary: basis.proposal.assessment.summary,
      settlements,
      signerName: actor.name,
      boardName: actor.organisationName,
      meaning: SIGNATURE_MEANING,
      blockedBecause: await conflictOfInterest(db, actor, row),
      correcting,
    };
  }
  return { form, decisions };
}
