import 'server-only';
import { cache } from 'react';
import { headers } from 'next/headers';
import { redirect } from 'next/navigation';
import { eq } from 'drizzle-orm';
import { getDb } from '@/db/client';
import { organisation } from '@/db/schema';
import { AppError } from '@/lib/errors';
import { getAuth } from './auth';
import type { Actor } from './actor';
import { can, isRole, type Action, type Resource } from './permissions';

type OrganisationOfActor = { id: string; name: string; kind: Actor['organisationKind'] };

// Organisations are only ever added (createOrganisation), never edited or removed, so a row read
// once holds for the life of the process and every request is spared one query. Which organisation
// a user belongs to still comes fresh from the session's user row.
const organisationsById = new Map<string, OrganisationOfActor>();

async function organisationOf(id: string): Promise<OrganisationOfActor | null> {
  const known = organisationsById.get(id);
  if (known) return known;
  const [row] = await getDb().select({ id: organisation.id, name: organisation.name, kind: organisation.kind }).from(organisation).where(eq(organisation.id, id));
  if (row) organisationsById.set(id, row);
  return row ?? null;
}

/** Resolves the signed-in actor from request headers, or null; a banned or role-less user is nobody. */
export async function actorFromHeaders(requestHeaders: Headers): Promise<Actor | null> {
  const found = await getAuth().api.getSession({ headers: requestHeaders });
  if (!found) return null;
  const { user, session } = found;
  if (user.banned || !isRole(user.role)) return null;
  const org = await organisationOf(user.organisationId as string);
  if (!org) return null;
  return {
    userId: user.id,
    sessionId: session.id,
    name: user.name,
    email: user.email,
    role: user.role,
    organisationId: org.id,
    organisationName: org.name,
    organisationKind: org.kind,
  };
}

/** The actor of the current page or action, once per request. */
export const getActor = cache(async (): Promise<Actor | null> => actorFromHeaders(await headers()));

/** For pages: sends a visitor without a session to sign in. */
export async function requireActor(): Promise<Actor> {
  const actor = await getActor();
  if (!actor) redirect('/sign-in');
  return actor;
}

/** For pages: a role without the permission gets the not-found page, like an outsider would. */
export async function requirePermission<R extends Resource>(resource: R, action: Action<R>): Promise<Actor> {
  const actor = await requireActor();
  if (!can(actor.role, resource, action)) {
    const { notFound } = await import('next/navigation');
    notFound();
  }
  return actor;
}

/** For actions and routes: a typed refusal instead of a redirect. */
export function assertCan<R extends Resource>(actor: Actor, resource: R, action: Action<R>): void {
  if (!can(actor.role, resource, action)) {
    throw new AppError('forbidden', 'Your role does not allow this.');
  }
}
