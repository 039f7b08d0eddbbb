import 'server-only';
import { and, asc, eq, inArray, sql, type SQL } from 'drizzle-orm';
import type { DbOrTx } from '@/db/client';
import { outgoingMail, user } from '@/db/schema';
import type { Audience } from '@/lib/cases/lifecycle';
import { env } from '@/lib/env';
import type { QueuedMessage } from './outbox';

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

/** The addresses of the people of one party of a case, for mail sent at once (the decision letter). */
export async function recipientsOf(db: DbOrTx, parties: CaseParties, audience: Audience): Promise<string[]> {
  const organisationId = organisationFor(parties, audience);
  if (!organisationId) return [];
  const rows = await db
    .select({ email: user.email })
    .from(user)
    .where(and(eq(user.organisationId, organisationId), inArray(user.role, rolesFor[audience])))
    .orderBy(asc(user.email));
  return rows.map((r) => r.email);
}

export type CaseNotice = { template: string; subject: string; headline: string; lines: string[]; actionLabel?: string };

type AudienceMessage = Omit<QueuedMessage, 'to'>;

/**
 * The statement that queues one message per audience, addressed to that party's people: the
 * addresses are looked up by the insert itself, and a party with nobody to tell gets no message.
 * Null when no audience names an organisation. It needs no answer first, so a transition sends it
 * with its other writes while the case is locked.
 */
function audienceMailsInsert(parties: CaseParties, audiences: readonly Audience[], message: (audience: Audience) => AudienceMessage): SQL | null {
  const wanted = audiences.flatMap((audience, order) => {
    const organisationId = organisationFor(parties, audience);
    if (!organisationId) return [];
    const m = message(audience);
    return [{ order, organisation_id: organisationId, roles: rolesFor[audience], subject: m.subject, template: m.template, case_id: m.caseId ?? null, content: m.content }];
  });
  if (wanted.length === 0) return null;
  return sql`
    insert into ${outgoingMail} ("to", subject, template, case_id, content)
    select r.emails, m.subject, m.template, m.case_id, m.content
    from jsonb_to_recordset(${JSON.stringify(wanted)}::jsonb) as m("order" int, organisation_id uuid, roles text[], subject text, template text, case_id uuid, content jsonb)
    cross join lateral (
      select array_agg(u.email order by u.email) as emails from ${user} u where u.organisation_id = m.organisation_id and u.role = any(m.roles)
    ) r
    where r.emails is not null
    order by m."order"`;
}

async function queueForAudiences(tx: DbOrTx, parties: CaseParties, audiences: readonly Audience[], message: (audience: Audience) => AudienceMessage): Promise<void> {
  const statement = audienceMailsInsert(parties, audiences, message);
  if (statement) await tx.execute(statement);
}

/**
 * Queues a notice of a case event for each audience, one message per party, in the transaction of
 * the event itself; the delivery worker sends them once it has committed (mailAfterCommit). A
 * failed hand-over is recorded on the message and never undoes the change.
 */
export function notifyCase(tx: DbOrTx, parties: CaseParties, audiences: readonly Audience[], notice: CaseNotice | ((audience: Audience) => CaseNotice)) {
  return queueForAudiences(tx, parties, audiences, caseNoticeMessage(parties, notice));
}

/** notifyCase's statement, for a caller that sends it as part of a larger one; null when nobody is addressed. */
export function caseNoticeInsert(parties: CaseParties, audiences: readonly Audience[], notice: CaseNotice | ((audience: Audience) => CaseNotice)): SQL | null {
  return audienceMailsInsert(parties, audiences, caseNoticeMessage(parties, notice));
}

function caseNoticeMessage(parties: CaseParties, notice: CaseNotice | ((audience: Audience) => CaseNotice)) {
  const url = `${env().BETTER_AUTH_URL}/cases/${parties.id}`;
  return (audience: Audience): AudienceMessage => {
    const n = typeof notice === 'function' ? notice(audience) : notice;
    return {
      subject: `${parties.number}: ${n.subject}`,
      template: n.template,
      caseId: parties.id,
      content: { layout: 'case-notice', props: { greeting: 'Hello,', headline: n.headline, lines: n.lines, url, actionLabel: n.actionLabel ?? `Open ${parties.number}` } },
    };
  };
}

/** Queues the news of a shared note for each audience, one message per party, in the note's transaction. */
export function notifyCaseNote(
  tx: DbOrTx,
  parties: CaseParties,
  audiences: readonly Audience[],
  note: { authorName: string; organisationName: string; isReply: boolean; excerpt: string },
) {
  const url = `${env().BETTER_AUTH_URL}/cases/${parties.id}#notes`;
  return queueForAudiences(tx, parties, audiences, () => ({
    subject: `${parties.number}: ${note.isReply ? 'a reply' : 'a new note'} from ${note.organisationName}`,
    template: 'note-posted',
    caseId: parties.id,
    content: { layout: 'note-posted', props: { caseNumber: parties.number, ...note, url } },
  }));
}
