import { createHmac, timingSafeEqual } from 'node:crypto';
import { parseCookies } from 'better-call';

/** What a request's cookies say about its session, before any database read. */
export type SessionCookie =
  | { kind: 'none' }
  | { kind: 'signed'; token: string }
  // Present but not in the exact form we sign: better-auth judges it.
  | { kind: 'unusual' };

/**
 * Reads the session cookie and checks its signature. better-auth signs it as
 * `token.base64(HMAC-SHA256(secret, token))`; recomputing that with Node's synchronous HMAC costs
 * microseconds, where better-auth's endpoint takes milliseconds. Only the exact canonical form is
 * accepted here; anything else is left to better-auth, so this can never admit what it would refuse.
 */
export function readSessionCookie(cookieHeader: string | null, cookieName: string, secret: string): SessionCookie {
  if (!cookieHeader) return { kind: 'none' };
  // better-auth's own cookie parser, so a duplicated or quoted cookie reads the same both ways.
  const value = parseCookies(cookieHeader).get(cookieName);
  if (!value) return { kind: 'none' };
  const dot = value.lastIndexOf('.');
  if (dot < 1) return { kind: 'unusual' };
  const token = value.slice(0, dot);
  const given = Buffer.from(value.slice(dot + 1));
  const expected = Buffer.from(createHmac('sha256', secret).update(token).digest('base64'));
  return given.length === expected.length && timingSafeEqual(given, expected) ? { kind: 'signed', token } : { kind: 'unusual' };
}

export type SessionTiming = { expiresIn: number; updateAge: number };

/**
 * Whether a session read from the database can be used as it is. better-auth does more than read
 * when a session has expired (deletes it, clears the cookie) or is due for refresh (moves its
 * expiry, sets the cookie again); those requests, and any banned user, go through better-auth.
 * Times are better-auth's: seconds in the settings, a Date on the row.
 */
export function usableAsRead(row: { expiresAt: Date; banned: boolean | null }, timing: SessionTiming, now: number): boolean {
  const expiresAt = row.expiresAt.getTime();
  if (!(expiresAt > now)) return false;
  const dueForRefresh = expiresAt - timing.expiresIn * 1000 + timing.updateAge * 1000 <= now;
  return !dueForRefresh && !row.banned;
}
