import 'server-only';
import { and, eq, inArray } from 'drizzle-orm';
import { verifyPassword } from 'better-auth/crypto';
import type { DbOrTx } from '@/db/client';
import { account, delivery, organisation, supplierFarm } from '@/db/schema';
import type { Actor } from '@/lib/auth/actor';
import { clearAttempts, countAttempt } from '@/lib/throttle/window-counter';
import { AppError } from '@/lib/errors';
import type { CaseRow } from './transitions/context';

/**
 * Signing asks for the password again, even inside a session (21 CFR 11.200; ASVS 3.7.1). The check
 * bypasses better-auth's sign-in route and with it that route's limiter, so failures are counted here,
 * per account and in the database, where a restart or a second instance does not reset them.
 */
export const SIGNING_MAX_FAILURES = 5;
export const SIGNING_WINDOW_MS = 15 * 60_000;

const throttleKey = (userId: string) => `decision-signing:${userId}`;

/**
 * Re-checks the signer's password against their better-auth credential. A wrong one is a field
 * error and changes nothing but the count; too many in the window refuse even the right one.
 */
export async function reauthenticate(db: DbOrTx, actor: Actor, password: string, now = new Date()): Promise<{ at: Date; method: 'password' }> {
  const attempts = await countAttempt(throttleKey(actor.userId), SIGNING_WINDOW_MS, now.getTime(), db);
  if (attempts > SIGNING_MAX_FAILURES) {
    throw new AppError('rate_limited', 'Too many wrong passwords at signing. Wait 15 minutes, then try again; nothing was signed.');
  }
  const [credential] = await db
    .select({ hash: account.password })
    .from(account)
    .where(and(eq(account.userId, actor.userId), eq(account.providerId, 'credential')));
  const valid = !!credential?.hash && (await verifyPassword({ hash: credential.hash, password }));
  if (!valid) {
    throw new AppError('invalid', 'The password is not correct; nothing was signed.', { fieldErrors: { password: ['The password is not correct.'] } });
  }
  await clearAttempts(throttleKey(actor.userId), db);
  return { at: new Date(), method: 'password' };
}

/**
 * Separation of duties (ASVS 4.3.3): only an arbiter of the case's own board signs, and never one
 * connected to a party — a member of a party's organisation, or the person behind a party's or the
 * farm's contact address (a farmer who also sits on the board). Returns why not, or null.
 */
export async function conflictOfInterest(db: DbOrTx, actor: Actor, caseRow: CaseRow): Promise<string | null> {
  if (actor.organisationKind !== 'board' || actor.organisationId !== caseRow.boardOrganisationId) {
    return 'Only an arbiter of the board assigned to this case can sign its decision.';
  }
  const parties = [caseRow.supplierOrganisationId, caseRow.plantOrganisationId, caseRow.labOrganisationId].filter((id): id is string => id !== null);
  if (parties.includes(actor.organisationId)) return 'You belong to an organisation that is a party to this case, so you cannot sign its decision.';
  const email = actor.email.trim().toLowerCase();
  const [contacts, [farm]] = await Promise.all([
    db.select({ name: organisation.name, email: organisation.contactEmail }).from(organisation).where(inArray(organisation.id, parties)),
    db.select({ name: supplierFarm.name, email: supplierFarm.contactEmail }).from(delivery).innerJoin(supplierFarm, eq(supplierFarm.id, delivery.farmId)).where(eq(delivery.id, caseRow.deliveryId)),
  ]);
  const connected = [...contacts, ...(farm ? [farm] : [])].find((c) => c.email?.trim().toLowerCase() === email);
  if (connected) return `Your address is the contact of ${connected.name}, a party to this case, so you cannot sign its decision; another arbiter of the board must.`;
  return null;
}
