import 'server-only';
import { and, desc, eq, gt, ne, type SQL } from 'drizzle-orm';
import type { Db, DbOrTx } from '@/db/client';
import { organisation, session, user } from '@/db/schema';
import type { Actor } from '@/lib/auth/actor';
import { isRole } from '@/lib/auth/permissions';
import { recordAudit } from '@/lib/audit/record';
import { AppError } from '@/lib/errors';

/** Sessions that meet `where`, each with its user and organisation, in one read. */
function sessionsWithOwner(db: DbOrTx, where: SQL | undefined) {
  return db
    .select({
      sessionId: session.id,
      expiresAt: session.expiresAt,
      userId: user.id,
      name: user.name,
      email: user.email,
      role: user.role,
      banned: user.banned,
      organisationId: organisation.id,
      organisationName: organisation.name,
      organisationKind: organisation.kind,
    })
    .from(session)
    .innerJoin(user, eq(user.id, session.userId))
    .innerJoin(organisation, eq(organisation.id, user.organisationId))
    .where(where);
}

export type SessionWithOwner = Awaited<ReturnType<typeof sessionsWithOwner>>[number];

/** The session a token names, with its user and organisation: what every signed-in request needs to know who is asking. */
export async function sessionWithOwner(db: DbOrTx, token: string): Promise<SessionWithOwner | null> {
  const [row] = await sessionsWithOwner(db, eq(session.token, token));
  return row ?? null;
}

/** One session of one user, while it is live. */
export async function liveSessionOf(db: DbOrTx, ids: { sessionId: string; userId: string }, now: Date): Promise<SessionWithOwner | null> {
  const [row] = await sessionsWithOwner(db, and(eq(session.id, ids.sessionId), eq(session.userId, ids.userId), gt(session.expiresAt, now)));
  return row ?? null;
}

/** Who a session's owner is as an actor; nobody when banned or without a role of the product. */
export function actorOfSession(row: SessionWithOwner): Actor | null {
  if (row.banned || !isRole(row.role)) return null;
  const { expiresAt: _expiresAt, banned: _banned, role, ...rest } = row;
  return { ...rest, role };
}

/** The actor's own live sessions; the session token itself never leaves the server. */
export async function listOwnSessions(db: Db, actor: Actor) {
  const rows = await db
    .select({ id: session.id, createdAt: session.createdAt, updatedAt: session.updatedAt, expiresAt: session.expiresAt, ipAddress: session.ipAddress, userAgent: session.userAgent })
    .from(session)
    .where(and(eq(session.userId, actor.userId), gt(session.expiresAt, new Date())))
    .orderBy(desc(session.updatedAt));
  return rows.map((row) => ({ ...row, current: row.id === actor.sessionId }));
}

export async function revokeOwnSession(db: Db, actor: Actor, sessionId: string) {
  await db.transaction(async (tx) => {
    const deleted = await tx.delete(session).where(and(eq(session.id, sessionId), eq(session.userId, actor.userId))).returning({ id: session.id });
    if (deleted.length === 0) throw new AppError('not_found', 'That session has already ended.');
    await recordAudit(tx, { actorUserId: actor.userId, actorOrganisationId: actor.organisationId }, { action: 'session.revoked', objectType: 'session', objectId: sessionId, change: { userId: actor.userId } });
  });
}

export async function revokeOtherSessions(db: Db, actor: Actor): Promise<number> {
  return db.transaction(async (tx) => {
    const deleted = await tx.delete(session).where(and(eq(session.userId, actor.userId), ne(session.id, actor.sessionId))).returning({ id: session.id });
    for (const row of deleted) {
      await recordAudit(tx, { actorUserId: actor.userId, actorOrganisationId: actor.organisationId }, { action: 'session.revoked', objectType: 'session', objectId: row.id, change: { userId: actor.userId } });
    }
    return deleted.length;
  });
}
