import 'server-only';
import { asc, count, eq, isNull, and, gt } from 'drizzle-orm';
import type { Db, DbOrTx } from '@/db/client';
import { invitation, organisation, session, user, type OrganisationKind } from '@/db/schema';
import type { Actor } from '@/lib/auth/actor';
import { assertCan } from '@/lib/auth/session';
import { recordAudit } from '@/lib/audit/record';
import { AppError } from '@/lib/errors';

export async function listOrganisations(db: DbOrTx, actor: Actor) {
  assertCan(actor, 'organisation', 'read');
  const members = db.select({ organisationId: user.organisationId, members: count().as('members') }).from(user).groupBy(user.organisationId).as('members');
  return db
    .select({ id: organisation.id, name: organisation.name, kind: organisation.kind, contactEmail: organisation.contactEmail, createdAt: organisation.createdAt, members: members.members })
    .from(organisation)
    .leftJoin(members, eq(members.organisationId, organisation.id))
    .orderBy(asc(organisation.kind), asc(organisation.name));
}

export async function addOrganisation(db: Db, actor: Actor, input: { name: string; kind: OrganisationKind; contactEmail?: string }) {
  assertCan(actor, 'organisation', 'manage');
  const [existing] = await db.select({ id: organisation.id }).from(organisation).where(eq(organisation.name, input.name));
  if (existing) throw new AppError('conflict', 'An organisation with that name exists.', { fieldErrors: { name: ['This name is taken.'] } });
  return db.transaction(async (tx) => {
    const [row] = await tx.insert(organisation).values(input).returning();
    await recordAudit(tx, { actorUserId: actor.userId, actorOrganisationId: actor.organisationId }, { action: 'organisation.created', objectType: 'organisation', objectId: row.id, change: { name: row.name, kind: row.kind } });
    return row;
  });
}

/** People and their organisations, without any credential or session secret. */
export async function listPeople(db: DbOrTx, actor: Actor) {
  assertCan(actor, 'invitation', 'create');
  return db
    .select({ id: user.id, name: user.name, email: user.email, role: user.role, banned: user.banned, organisationName: organisation.name, createdAt: user.createdAt })
    .from(user)
    .innerJoin(organisation, eq(organisation.id, user.organisationId))
    .orderBy(asc(organisation.name), asc(user.name));
}

export async function adminCounts(db: DbOrTx, actor: Actor) {
  assertCan(actor, 'organisation', 'read');
  const now = new Date();
  const [[orgs], [people], [invites], [sessions]] = await Promise.all([
    db.select({ n: count() }).from(organisation),
    db.select({ n: count() }).from(user),
    db.select({ n: count() }).from(invitation).where(and(isNull(invitation.acceptedAt), isNull(invitation.revokedAt), gt(invitation.expiresAt, now))),
    db.select({ n: count() }).from(session).where(gt(session.expiresAt, now)),
  ]);
  return { organisations: orgs.n, people: people.n, openInvitations: invites.n, activeSessions: sessions.n };
}
