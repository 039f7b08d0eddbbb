import 'server-only';
import { and, asc, inArray } from 'drizzle-orm';
import type { DbOrTx } from '@/db/client';
import { user } from '@/db/schema';
import type { Audience } from '@/lib/cases/lifecycle';
import { env } from '@/lib/env';
import { queueMail, type QueuedMessage } from './outbox';

export type CaseParties = {
  id: string;
  number: string;
  supplierOrganisationId: string;
  plantOrganisationId: string;
  labOrganisationId: string | null;
  boardOrganisationId: string;
};

const rolesFor: Record<Audience, string[]> = { supplier: ['supplier'], plant: ['plant'], lab: ['lab'], board: ['arbiter'] };

function organisationFor(parties: CaseParties, audience: Audience): string | null {
  return { supplier: parties.supplierOrganisationId, plant: parties.plantOrganisationId, lab: parties.labOrganisationId, board: parties.boardOrganisationId }[audience];
}

/** The addresses of the people of one party of a case. */
export async function recipientsOf(db: DbOrTx, parties: CaseParties, audience: Audience): Promise<string[]> {
  return (await recipientsByAudience(db, parties, [audience])).get(audience) ?? [];
}

/** The addresses of the people of several parties of a case, in one query. */
async function recipientsByAudience(db: DbOrTx, parties: CaseParties, audiences: readonly Audience[]): Promise<Map<Audience, string[]>> {
  const wanted = audiences.flatMap((audience) => {
    const organisationId = organisationFor(parties, audience);
    return organisationId ? [{ audience, organisationId }] : [];
  });
  const found = new Map<Audience, string[]>();
  if (wanted.length === 0) return found;
  const rows = await db
    .select({ email: user.email, organisationId: user.organisationId, role: user.role })
    .from(user)
    .where(and(inArray(user.organisationId, [...new Set(wanted.map((w) => w.organisationId))]), inArray(user.role, [...new Set(wanted.flatMap((w) => rolesFor[w.audience]))])))
    .orderBy(asc(user.email));
  for (const { audience, organisationId } of wanted) {
    const emails = rows.filter((r) => r.organisationId === organisationId && r.role !== null && rolesFor[audience].includes(r.role)).map((r) => r.email);
    found.set(audience, emails);
  }
  return found;
}

export type CaseNotice = { template: string; subject: string; headline: string; lines: string[]; actionLabel?: string };

/**
 * Queues a notice of a case event for each audience, one message per party, in the transaction of
 * the event itself; the delivery worker sends them once it has committed (mailAfterCommit). A
 * failed hand-over is recorded on the message and never undoes the change.
 */
export async function notifyCase(tx: DbOrTx, parties: CaseParties, audiences: readonly Audience[], notice: CaseNotice | ((audience: Audience) => CaseNotice)) {
  const url = `${env().BETTER_AUTH_URL}/cases/${parties.id}`;
  const messages: QueuedMessage[] = [];
  const recipients = await recipientsByAudience(tx, parties, audiences);
  for (const audience of audiences) {
    const to = recipients.get(audience) ?? [];
    if (to.length === 0) continue;
    const n = typeof notice === 'function' ? notice(audience) : notice;
    messages.push({
      to,
      subject: `${parties.number}: ${n.subject}`,
      template: n.template,
      caseId: parties.id,
      content: { layout: 'case-notice', props: { greeting: 'Hello,', headline: n.headline, lines: n.lines, url, actionLabel: n.actionLabel ?? `Open ${parties.number}` } },
    });
  }
  await queueMail(tx, messages);
}

/** Queues the news of a shared note for each audience, one message per party, in the note's transaction. */
export async function notifyCaseNote(
  tx: DbOrTx,
  parties: CaseParties,
  audiences: readonly Audience[],
  note: { authorName: string; organisationName: string; isReply: boolean; excerpt: string },
) {
  const url = `${env().BETTER_AUTH_URL}/cases/${parties.id}#notes`;
  const messages: QueuedMessage[] = [];
  const recipients = await recipientsByAudience(tx, parties, audiences);
  for (const audience of audiences) {
    const to = recipients.get(audience) ?? [];
    if (to.length === 0) continue;
    messages.push({
      to,
      subject: `${parties.number}: ${note.isReply ? 'a reply' : 'a new note'} from ${note.organisationName}`,
      template: 'note-posted',
      caseId: parties.id,
      content: { layout: 'note-posted', props: { caseNumber: parties.number, ...note, url } },
    });
  }
  await queueMail(tx, messages);
}
