import 'server-only';
import { and, eq, inArray } from 'drizzle-orm';
import type { DbOrTx } from '@/db/client';
import { user } from '@/db/schema';
import type { Audience } from '@/lib/cases/lifecycle';
import { env } from '@/lib/env';
import { sendMail } from './send';
import { CaseNoticeMail } from './templates/case-notice';
import { NotePostedMail } from './templates/note-posted';

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
  const organisationId = organisationFor(parties, audience);
  if (!organisationId) return [];
  const rows = await db.select({ email: user.email }).from(user).where(and(eq(user.organisationId, organisationId), inArray(user.role, rolesFor[audience])));
  return rows.map((r) => r.email);
}

export type CaseNotice = { template: string; subject: string; headline: string; lines: string[]; actionLabel?: string };

/**
 * Tells each audience about a case event, one message per party. Mail goes out after the change has
 * committed; a failure is recorded on the outgoing mail and never undoes the change.
 */
export async function notifyCase(db: DbOrTx, parties: CaseParties, audiences: readonly Audience[], notice: CaseNotice | ((audience: Audience) => CaseNotice)) {
  const url = `${env().BETTER_AUTH_URL}/cases/${parties.id}`;
  for (const audience of audiences) {
    const to = await recipientsOf(db, parties, audience);
    if (to.length === 0) continue;
    const n = typeof notice === 'function' ? notice(audience) : notice;
    await sendMail({
      to,
      subject: `${parties.number}: ${n.subject}`,
      template: n.template,
      caseId: parties.id,
      body: <CaseNoticeMail greeting="Hello," headline={n.headline} lines={n.lines} url={url} actionLabel={n.actionLabel ?? `Open ${parties.number}`} />,
    });
  }
}

/** Tells each audience of a shared note, one message per party, after the note has committed. */
export async function notifyCaseNote(
  db: DbOrTx,
  parties: CaseParties,
  audiences: readonly Audience[],
  note: { authorName: string; organisationName: string; isReply: boolean; excerpt: string },
) {
  const url = `${env().BETTER_AUTH_URL}/cases/${parties.id}#notes`;
  for (const audience of audiences) {
    const to = await recipientsOf(db, parties, audience);
    if (to.length === 0) continue;
    await sendMail({
      to,
      subject: `${parties.number}: ${note.isReply ? 'a reply' : 'a new note'} from ${note.organisationName}`,
      template: 'note-posted',
      caseId: parties.id,
      body: <NotePostedMail caseNumber={parties.number} {...note} url={url} />,
    });
  }
}
