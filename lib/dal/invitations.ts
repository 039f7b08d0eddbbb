import 'server-only';
import { randomBytes } from 'node:crypto';
import { and, desc, eq, gt, isNull } from 'drizzle-orm';
import type { Db } from '@/db/client';
import { invitation, organisation, user } from '@/db/schema';
import type { Actor } from '@/lib/auth/actor';
import { getAuth } from '@/lib/auth/auth';
import { assertCan } from '@/lib/auth/session';
import { organisationKindForRole, roleLabels, type Role } from '@/lib/auth/permissions';
import { recordAudit } from '@/lib/audit/record';
import { sha256Hex } from '@/lib/canonical-json';
import { AppError, invalidInput } from '@/lib/errors';
import { acceptInvitationSchema } from '@/lib/auth/schemas';
import { env } from '@/lib/env';
import { formatDateTime } from '@/lib/format/dates';
import { sendInvitationMail } from '@/lib/mail/auth-mails';

const INVITATION_DAYS = 7;

export async function createInvitation(db: Db, actor: Actor, input: { email: string; name: string; role: Role; organisationId: string }) {
  assertCan(actor, 'invitation', 'create');
  const email = input.email.toLowerCase();
  const [org] = await db.select().from(organisation).where(eq(organisation.id, input.organisationId));
  if (!org) throw new AppError('invalid', 'Choose an organisation.', { fieldErrors: { organisationId: ['That organisation does not exist.'] } });
  if (!organisationKindForRole[input.role].includes(org.kind)) {
    throw new AppError('invalid', 'That role does not belong in that organisation.', {
      fieldErrors: { role: [`A ${roleLabels[input.role].toLowerCase()} cannot belong to a ${org.kind} organisation.`] },
    });
  }
  const [existingUser] = await db.select({ id: user.id }).from(user).where(eq(user.email, email));
  if (existingUser) throw new AppError('conflict', 'Someone already has an account with that address.', { fieldErrors: { email: ['This address already has an account.'] } });

  const token = randomBytes(32).toString('base64url');
  const expiresAt = new Date(Date.now() + INVITATION_DAYS * 86_400_000);
  const row = await db.transaction(async (tx) => {
    // A new invitation replaces any earlier open one for the same address.
    await tx.update(invitation).set({ revokedAt: new Date() }).where(and(eq(invitation.email, email), isNull(invitation.acceptedAt), isNull(invitation.revokedAt)));
    const [created] = await tx
      .insert(invitation)
      .values({ email, name: input.name, organisationId: org.id, role: input.role, tokenHash: sha256Hex(token), invitedBy: actor.userId, expiresAt })
      .returning();
    await recordAudit(tx, { actorUserId: actor.userId, actorOrganisationId: actor.organisationId }, {
      action: 'invitation.created',
      objectType: 'invitation',
      objectId: created.id,
      change: { email, role: input.role, organisationId: org.id },
    });
    return created;
  });
  const url = `${env().BETTER_AUTH_URL}/invitation/${token}`;
  const mail = await sendInvitationMail({ to: email, name: input.name, organisationName: org.name, roleLabel: roleLabels[input.role].toLowerCase(), url, expiresAt: formatDateTime(expiresAt) });
  return { invitation: row, mailStatus: mail.status };
}

/** The open invitation a token names, for the acceptance page; null when it is unknown, used, revoked or expired. */
export async function findOpenInvitation(db: Db, token: string) {
  const [row] = await db
    .select({ id: invitation.id, email: invitation.email, name: invitation.name, role: invitation.role, organisationName: organisation.name, expiresAt: invitation.expiresAt })
    .from(invitation)
    .innerJoin(organisation, eq(organisation.id, invitation.organisationId))
    .where(and(eq(invitation.tokenHash, sha256Hex(token)), isNull(invitation.acceptedAt), isNull(invitation.revokedAt), gt(invitation.expiresAt, new Date())));
  return row ?? null;
}

export async function acceptInvitation(db: Db, rawInput: { token: string; name: string; password: string }) {
  // The data layer checks its own input: a caller that skipped the form's validation gets the same refusal.
  const parsed = acceptInvitationSchema.safeParse({ ...rawInput, confirm: rawInput.password });
  if (!parsed.success) throw invalidInput(parsed.error);
  const input = parsed.data;
  // Claim the invitation first, conditionally, so a double submit creates one account at most.
  const [claimed] = await db
    .update(invitation)
    .set({ acceptedAt: new Date() })
    .where(and(eq(invitation.tokenHash, sha256Hex(input.token)), isNull(invitation.acceptedAt), isNull(invitation.revokedAt), gt(invitation.expiresAt, new Date())))
    .returning();
  if (!claimed) throw new AppError('gone', 'This invitation has expired, was revoked or was already used. Ask your administrator for a new one.');
  try {
    await getAuth().api.createUser({
      body: { email: claimed.email, name: input.name, password: input.password, role: claimed.role as Role, data: { organisationId: claimed.organisationId, emailVerified: true } },
    });
  } catch (error) {
    await db.update(invitation).set({ acceptedAt: null }).where(eq(invitation.id, claimed.id));
    throw error;
  }
  const [created] = await db.select({ id: user.id }).from(user).where(eq(user.email, claimed.email));
  await recordAudit(db, { actorUserId: created.id, actorOrganisationId: claimed.organisationId }, {
    action: 'invitation.accepted',
    objectType: 'user',
    objectId: created.id,
    change: { email: claimed.email, role: claimed.role, organisationId: claimed.organisationId },
  });
}

export async function revokeInvitation(db: Db, actor: Actor, invitationId: string) {
  assertCan(actor, 'invitation', 'revoke');
  await db.transaction(async (tx) => {
    const [row] = await tx
      .update(invitation)
      .set({ revokedAt: new Date() })
      .where(and(eq(invitation.id, invitationId), isNull(invitation.acceptedAt), isNull(invitation.revokedAt)))
      .returning();
    if (!row) throw new AppError('conflict', 'That invitation is no longer open.');
    await recordAudit(tx, { actorUserId: actor.userId, actorOrganisationId: actor.organisationId }, { action: 'invitation.revoked', objectType: 'invitation', objectId: row.id, change: { email: row.email } });
  });
}

export async function listInvitations(db: Db, actor: Actor) {
  assertCan(actor, 'invitation', 'create');
  return db
    .select({ id: invitation.id, email: invitation.email, name: invitation.name, role: invitation.role, organisationName: organisation.name, expiresAt: invitation.expiresAt, acceptedAt: invitation.acceptedAt, revokedAt: invitation.revokedAt, createdAt: invitation.createdAt })
    .from(invitation)
    .innerJoin(organisation, eq(organisation.id, invitation.organisationId))
    .orderBy(desc(invitation.createdAt))
    .limit(200);
}
