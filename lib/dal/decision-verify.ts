import 'server-only';
import { and, eq, sql } from 'drizzle-orm';
import type { DbOrTx } from '@/db/client';
import { auditEvent, decision, disputeCase } from '@/db/schema';
import { recordSha256 } from '@/lib/decision/record';
import { verifyRecordSignature } from '@/lib/decision/signature';
import { signingKey, verificationKey } from '@/lib/decision/signing-key';
import { rebuildSealedRecord } from './decision-record';

export type DecisionVerification = {
  decisionId: string;
  caseId: string;
  caseNumber: string;
  signedAt: Date;
  /** Whether another decision of the case supersedes this one. */
  supersededBy: { id: string; signedAt: Date } | null;
  storedSha256: string | null;
  recomputedSha256: string;
  hashMatches: boolean;
  signingKeyId: string | null;
  keyIsCurrent: boolean;
  signatureValid: boolean;
  ok: boolean;
  problems: string[];
};

/**
 * Rebuilds a decision's sealed record from the database as it is now, hashes it, and checks the hash
 * against the one sealed and the signature against the server's public key. The core of
 * `npm run verify:decision` and of the public verification page. Unscoped: callers say nothing of the
 * record beyond what they have a right to.
 */
export async function verifySealedDecision(db: DbOrTx, decisionId: string): Promise<DecisionVerification | null> {
  const [row] = await db.select().from(decision).where(eq(decision.id, decisionId));
  if (!row) return null;
  const [[caseRow], [successor]] = await Promise.all([
    db.select({ number: disputeCase.number }).from(disputeCase).where(eq(disputeCase.id, row.caseId)),
    db.select({ id: decision.id, signedAt: decision.signedAt }).from(decision).where(eq(decision.supersedesId, row.id)),
  ]);
  const recomputed = recordSha256(await rebuildSealedRecord(db, row));
  const key = signingKey();
  const problems: string[] = [];
  const hashMatches = row.recordSha256 !== null && recomputed === row.recordSha256;
  if (!row.recordSha256) problems.push('the decision was never sealed');
  else if (!hashMatches) problems.push('the record in the database no longer has the sealed hash: something was changed after sealing');
  const keyIsCurrent = row.signingKeyId === key.keyId;
  // A decision sealed before a key rotation verifies with the retired key it names.
  const verifier = row.signingKeyId ? verificationKey(key, row.signingKeyId) : null;
  if (row.signingKeyId && !verifier) problems.push(`it was signed with key ${row.signingKeyId}, which is neither the server's current key ${key.keyId} nor one of its retired keys`);
  const signatureValid = !!row.recordSha256 && !!row.recordSignature && !!verifier && verifyRecordSignature(verifier.publicKey, row.recordSha256, row.recordSignature);
  if (row.recordSha256 && verifier && !signatureValid) problems.push('the signature does not verify with the public key');
  return {
    decisionId: row.id,
    caseId: row.caseId,
    caseNumber: caseRow?.number ?? 'unknown case',
    signedAt: row.signedAt,
    supersededBy: successor ?? null,
    storedSha256: row.recordSha256,
    recomputedSha256: recomputed,
    hashMatches,
    signingKeyId: row.signingKeyId,
    keyIsCurrent,
    signatureValid,
    ok: hashMatches && signatureValid,
    problems,
  };
}

/** What the public page may say to anyone: enough to match a letter in hand, nothing of its contents. */
export type PublicVerification =
  | { found: false }
  | {
      found: true;
      matchedBy: 'record' | 'letter';
      caseNumber: string;
      signedAt: string;
      recordSha256: string;
      intact: boolean;
      signatureValid: boolean;
      superseded: { signedAt: string } | null;
    };

/**
 * The public check: a record hash as printed on a letter, or the SHA-256 of a letter file. A letter
 * file is recognised only as it was issued (each issued file's hash is in the audit chain); either
 * way the record is rebuilt and checked against its seal, so a record altered after sealing fails.
 */
export async function publicVerification(db: DbOrTx, query: { recordSha256?: string; letterSha256?: string }): Promise<PublicVerification> {
  let decisionId: string | null = null;
  let matchedBy: 'record' | 'letter' = 'record';
  if (query.recordSha256) {
    const [row] = await db.select({ id: decision.id }).from(decision).where(eq(decision.recordSha256, query.recordSha256));
    decisionId = row?.id ?? null;
  } else if (query.letterSha256) {
    const [row] = await db
      .select({ id: auditEvent.objectId })
      .from(auditEvent)
      .where(and(eq(auditEvent.action, 'decision.letter_issued'), sql`${auditEvent.change}->>'letterSha256' = ${query.letterSha256}`))
      .limit(1);
    decisionId = row?.id ?? null;
    matchedBy = 'letter';
  }
  if (!decisionId) return { found: false };
  const check = await verifySealedDecision(db, decisionId);
  if (!check || !check.storedSha256) return { found: false };
  return {
    found: true,
    matchedBy,
    caseNumber: check.caseNumber,
    signedAt: check.signedAt.toISOString(),
    recordSha256: check.storedSha256,
    intact: check.hashMatches,
    signatureValid: check.signatureValid,
    superseded: check.supersededBy ? { signedAt: check.supersededBy.signedAt.toISOString() } : null,
  };
}
