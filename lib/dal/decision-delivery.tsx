import 'server-only';
import { and, eq, sql } from 'drizzle-orm';
import type { Db } from '@/db/client';
import { auditEvent, decision, disputeCase } from '@/db/schema';
import type { Actor } from '@/lib/auth/actor';
import { recordAudit } from '@/lib/audit/record';
import type { Audience } from '@/lib/cases/lifecycle';
import { decisionOutcomeLabels } from '@/lib/decision/labels';
import { verificationLinks } from '@/lib/decision/links';
import { renderDecisionLetter, type RenderedLetter } from '@/lib/decision/letter/render';
import { recordSha256 } from '@/lib/decision/record';
import type { Settlement } from '@/lib/decision/settlement';
import { verifyRecordSignature } from '@/lib/decision/signature';
import { signingKey } from '@/lib/decision/signing-key';
import { env } from '@/lib/env';
import { AppError } from '@/lib/errors';
import { recipientsOf } from '@/lib/mail/case-mails';
import { sendMail } from '@/lib/mail/send';
import { CaseNoticeMail } from '@/lib/mail/templates/case-notice';
import { findVisibleCase } from './cases';
import { rebuildSealedRecord } from './decision-record';

type DecisionRow = typeof decision.$inferSelect;

const LETTER_LOCK_NAMESPACE = 0x4353_4c45; // "CSLE": one writer at a time records a letter of a decision

/**
 * Renders the letter of a sealed decision, after checking that the record rebuilt from the database
 * still has the sealed hash and signature: a letter is never issued for a record that no longer
 * matches its seal. Each distinct file issued is recorded once in the audit chain with its SHA-256,
 * which is what lets the public page recognise an uploaded letter. The rendering is deterministic,
 * so this happens at sealing and again only if the layout or the address of the service changes.
 */
export async function issueLetter(db: Db, row: DecisionRow, context: { actor?: Actor | null; origin?: string } = {}): Promise<RenderedLetter> {
  const { recordSha256: sealedSha256, recordSignature, signingKeyId } = row;
  if (!sealedSha256 || !recordSignature || !signingKeyId) throw new AppError('conflict', 'This decision was never sealed, so it has no letter.');
  const record = await rebuildSealedRecord(db, row);
  const key = signingKey();
  if (recordSha256(record) !== sealedSha256 || signingKeyId !== key.keyId || !verifyRecordSignature(key.publicKey, sealedSha256, recordSignature)) {
    throw new AppError('conflict', 'The record of this decision no longer matches its seal, so no letter is issued. Tell the board; run verify:decision to see what differs.');
  }
  const letter = await renderDecisionLetter(record, { recordSha256: sealedSha256, recordSignature, signingKeyId }, verificationLinks(sealedSha256));
  await db.transaction(async (tx) => {
    await tx.execute(sql`select pg_advisory_xact_lock(${LETTER_LOCK_NAMESPACE}, hashtext(${row.id}))`);
    const [known] = await tx
      .select({ seq: auditEvent.seq })
      .from(auditEvent)
      .where(and(eq(auditEvent.action, 'decision.letter_issued'), eq(auditEvent.objectId, row.id), sql`${auditEvent.change}->>'letterSha256' = ${letter.sha256}`))
      .limit(1);
    if (known) return;
    await recordAudit(
      tx,
      { actorUserId: context.actor?.userId ?? null, actorOrganisationId: context.actor?.organisationId ?? null, origin: context.origin },
      { action: 'decision.letter_issued', objectType: 'decision', objectId: row.id, caseId: row.caseId, change: { letterSha256: letter.sha256, bytes: letter.pdf.length, recordSha256: sealedSha256 } },
    );
  });
  return letter;
}

/** The letter of a case's decision (the current one unless another of the case is named), for a party of the case. */
export async function letterForParty(db: Db, actor: Actor, caseId: string, decisionId?: string, origin?: string): Promise<RenderedLetter> {
  const found = await findVisibleCase(db, actor, caseId);
  const rows = await db.select().from(decision).where(eq(decision.caseId, found.id));
  const superseded = new Set(rows.map((r) => r.supersedesId));
  const row = decisionId ? rows.find((r) => r.id === decisionId) : rows.find((r) => !superseded.has(r.id));
  if (!row) throw new AppError('not_found', decisionId ? 'That decision was not found.' : 'This case has no signed decision yet.');
  return issueLetter(db, row, { actor, origin });
}

const audiences: Audience[] = ['supplier', 'plant', 'lab', 'board'];

function moneyLine(settlement: Settlement): string {
  return settlement.lines.join(' ');
}

/**
 * After the commit: the letter is issued and sent to the supplier, the plant, the laboratory and the
 * board, one message per party with the PDF attached. A failed hand-over is recorded on the outgoing
 * mail and never undoes the decision; the letter stays downloadable from the case.
 */
export async function deliverDecision(db: Db, decisionId: string, context: { origin?: string } = {}): Promise<void> {
  const [row] = await db.select().from(decision).where(eq(decision.id, decisionId));
  const [parties] = await db.select().from(disputeCase).where(eq(disputeCase.id, row.caseId));
  const letter = await issueLetter(db, row, { origin: context.origin });
  const { verifyUrl } = verificationLinks(row.recordSha256!);
  const url = `${env().BETTER_AUTH_URL}/cases/${parties.id}`;
  const outcome = decisionOutcomeLabels[row.outcome];
  for (const audience of audiences) {
    const to = await recipientsOf(db, parties, audience);
    if (to.length === 0) continue;
    await sendMail({
      to,
      subject: `${parties.number}: ${row.supersedesId ? 'the board has corrected its decision' : 'the board’s binding decision'} (${outcome.toLowerCase()})`,
      template: 'case-decided',
      caseId: parties.id,
      attachments: [{ filename: letter.fileName, content: letter.pdf, contentType: 'application/pdf' }],
      body: (
        <CaseNoticeMail
          greeting="Hello,"
          headline={`${row.supersedesId ? 'The board has corrected its decision' : 'The board has decided'} on ${parties.number}: ${outcome}. The decision letter is attached.`}
          lines={[
            `Signed by ${row.signerName} on ${row.signedAt.toISOString().replace('T', ' ').slice(0, 16)} UTC, as a binding decision.`,
            moneyLine(row.settlement as Settlement),
            `Record SHA-256: ${row.recordSha256}. Anyone holding the letter can check it at ${verifyUrl}.`,
            'Local regulations and the supply contract prevail.',
          ]}
          url={url}
          actionLabel={`Open ${parties.number}`}
        />
      ),
    });
  }
}
