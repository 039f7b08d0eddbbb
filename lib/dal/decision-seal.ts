import 'server-only';
import type { Tx } from '@/db/client';
import { decision, type DecisionOutcome } from '@/db/schema';
import { recordSha256, sealedRecord } from '@/lib/decision/record';
import { signRecordHash } from '@/lib/decision/signature';
import { signingKey } from '@/lib/decision/signing-key';
import { asStoredJson, caseEvidence, recordDecisionOf } from './decision-record';

export type SealInput = {
  caseId: string;
  outcome: DecisionOutcome;
  reasons: string;
  followedProposal: boolean;
  departureReason: string | null;
  proposal: unknown;
  settlement: unknown;
  signer: { userId: string; name: string };
  signedAt: Date;
  signatureMeaning: string;
  reauthenticatedAt: Date;
  reauthenticationMethod: string;
  supersedes: { id: string; recordSha256: string } | null;
};

export type SealedDecision = { id: string; recordSha256: string; recordSignature: string; signingKeyId: string };

/**
 * Writes a decision already sealed: the case record with this decision in it is hashed and signed
 * before the row exists, so the row is inserted once, complete, and never updated. Runs inside the
 * caller's transaction, after the caller has locked the case and checked who signs.
 */
export async function insertSealedDecision(tx: Tx, input: SealInput): Promise<SealedDecision> {
  const id = crypto.randomUUID();
  const row: typeof decision.$inferSelect = {
    id,
    caseId: input.caseId,
    outcome: input.outcome,
    reasons: input.reasons,
    followedProposal: input.followedProposal,
    departureReason: input.departureReason,
    proposal: asStoredJson(input.proposal),
    settlement: asStoredJson(input.settlement),
    signerUserId: input.signer.userId,
    signerName: input.signer.name,
    signedAt: input.signedAt,
    signatureMeaning: input.signatureMeaning,
    reauthenticatedAt: input.reauthenticatedAt,
    reauthenticationMethod: input.reauthenticationMethod,
    recordSha256: null,
    recordSignature: null,
    signingKeyId: null,
    supersedesId: input.supersedes?.id ?? null,
    createdAt: input.signedAt,
  };
  const record = sealedRecord(await caseEvidence(tx, input.caseId), row.proposal, recordDecisionOf(row, input.supersedes));
  const hash = recordSha256(record);
  const key = signingKey();
  const signature = signRecordHash(key.privateKey, hash);
  await tx.insert(decision).values({ ...row, recordSha256: hash, recordSignature: signature, signingKeyId: key.keyId });
  return { id, recordSha256: hash, recordSignature: signature, signingKeyId: key.keyId };
}
