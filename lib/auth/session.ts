import 'server-only';
import { cache } from 'react';
import { headers } from 'next/headers';
import { redirect } from 'next/navigation';
import { getDb } from '@/db/client';
import { AppError } from '@/lib/errors';
import { organisationById } from '@/lib/dal/organisations';
import { actorOfSession, sessionWithOwner } from '@/lib/dal/sessions';
import { getAuth } from './auth';
import type { Actor } from './actor';
import { readSessionCookie, usableAsRead } from './session-fast-path';
import { can, isRole, type Action, type Resource } from './permissions';

/**
 * Resolves the signed-in actor from request headers, or null; a banned or role-less user is nobody.
 * The plain case (a validly signed cookie naming a live session that needs no refresh) is one
 * read; every other case goes through better-auth, which also clears or renews the cookie.
 */
export async function actorFromHeaders(requestHeaders: Headers): Promise<Actor | null> {
  const context = await getAuth().$context;
  const cookie = readSessionCookie(requestHeaders.get('cookie'), context.authCookies.sessionToken.name, context.secret);
  if (cookie.kind === 'none') return null;
  if (cookie.kind === 'signed') {
    const found = await sessionWithOwner(getDb(), cookie.token);
    if (found && usableAsRead(found, context.sessionConfig, Date.now())) return actorOfSession(found);
  }
  return actorThroughBetterAuth(requestHeaders);
}

async function actorThroughBetterAuth(requestHeaders: Headers): Promise<Actor | null> {
  const found = await getAuth().api.getSession({ headers: requestHeaders });
  if (!found) return null;
  const { user, session } = found;
  if (user.banned || !isRole(user.role)) return null;
  const org = await organisationById(getDb(), user.organisationId as string);
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
