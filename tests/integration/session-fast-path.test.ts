import { eq } from 'drizzle-orm';
import { afterEach, beforeAll, describe, expect, it, vi } from 'vitest';
import { getDb } from '@/db/client';
import { session, user } from '@/db/schema';
import { getAuth } from '@/lib/auth/auth';
import { actorFromHeaders } from '@/lib/auth/session';
import { demoUser, seedDemoForTests, signIn } from './helpers';

// The product's session settings (lib/auth/auth.ts): twelve hours of life, renewed after an hour.
const EXPIRES_IN_MS = 12 * 3600_000;
const UPDATE_AGE_MS = 3600_000;

beforeAll(async () => {
  await seedDemoForTests();
});

afterEach(() => {
  vi.restoreAllMocks();
});

const headersOf = (cookie: string) => new Headers({ cookie });
const tokenOf = (cookie: string) => {
  const value = decodeURIComponent(cookie.split('; ').find((c) => c.startsWith('better-auth.session_token='))!.split('=').slice(1).join('='));
  return value.slice(0, value.lastIndexOf('.'));
};
const sessionRow = async (cookie: string) => (await getDb().select().from(session).where(eq(session.token, tokenOf(cookie))))[0];
const spyOnBetterAuth = () => vi.spyOn(getAuth().api, 'getSession');

describe('resolving the actor of a request', () => {
  it('reads a fresh session in one query, giving the same person better-auth gives', async () => {
    const cookie = await signIn(demoUser('lab').email);
    const viaBetterAuth = await getAuth().api.getSession({ headers: headersOf(cookie) });
    const spy = spyOnBetterAuth();
    const actor = await actorFromHeaders(headersOf(cookie));
    expect(spy).not.toHaveBeenCalled();
    expect(actor).toMatchObject({ userId: viaBetterAuth!.user.id, sessionId: viaBetterAuth!.session.id, email: demoUser('lab').email, role: 'lab' });
    expect(actor!.organisationName.length).toBeGreaterThan(0);
  });

  it('is nobody without a session cookie, without asking better-auth', async () => {
    const spy = spyOnBetterAuth();
    expect(await actorFromHeaders(new Headers())).toBeNull();
    expect(await actorFromHeaders(headersOf('theme=dark'))).toBeNull();
    expect(spy).not.toHaveBeenCalled();
  });

  it('leaves a tampered cookie to better-auth, which refuses it', async () => {
    const cookie = await signIn(demoUser('plant').email);
    const tampered = cookie.replace(/session_token=([^;.]+)/, (_m, token: string) => `session_token=${token.slice(0, -1)}${token.endsWith('A') ? 'B' : 'A'}`);
    expect(tampered).not.toBe(cookie);
    const spy = spyOnBetterAuth();
    expect(await actorFromHeaders(headersOf(tampered))).toBeNull();
    expect(spy).toHaveBeenCalledTimes(1);
    expect(await getAuth().api.getSession({ headers: headersOf(tampered) })).toBeNull();
  });

  it('is nobody once the session is signed out, and better-auth is asked', async () => {
    const cookie = await signIn(demoUser('supplier').email);
    await getDb().delete(session).where(eq(session.token, tokenOf(cookie)));
    const spy = spyOnBetterAuth();
    expect(await actorFromHeaders(headersOf(cookie))).toBeNull();
    expect(spy).toHaveBeenCalledTimes(1);
  });

  it('lets better-auth end an expired session: nobody, and the row is gone', async () => {
    const cookie = await signIn(demoUser('supplier2').email);
    await getDb().update(session).set({ expiresAt: new Date(Date.now() - 1000) }).where(eq(session.token, tokenOf(cookie)));
    expect(await actorFromHeaders(headersOf(cookie))).toBeNull();
    expect(await sessionRow(cookie)).toBeUndefined();
  });

  it('lets better-auth renew a session due for it: the person is found and the expiry moves on', async () => {
    const cookie = await signIn(demoUser('arbiter').email);
    const due = new Date(Date.now() + EXPIRES_IN_MS - UPDATE_AGE_MS - 60_000);
    await getDb().update(session).set({ expiresAt: due }).where(eq(session.token, tokenOf(cookie)));
    const spy = spyOnBetterAuth();
    const actor = await actorFromHeaders(headersOf(cookie));
    expect(spy).toHaveBeenCalledTimes(1);
    expect(actor?.email).toBe(demoUser('arbiter').email);
    expect((await sessionRow(cookie)).expiresAt.getTime()).toBeGreaterThan(due.getTime() + 30 * 60_000);
  });

  it('is nobody for a banned user whose session is still in the table', async () => {
    const cookie = await signIn(demoUser('arbiter2').email);
    const row = await sessionRow(cookie);
    await getDb().update(user).set({ banned: true }).where(eq(user.id, row.userId));
    try {
      expect(await actorFromHeaders(headersOf(cookie))).toBeNull();
    } finally {
      await getDb().update(user).set({ banned: false }).where(eq(user.id, row.userId));
    }
    expect((await actorFromHeaders(headersOf(cookie)))?.email).toBe(demoUser('arbiter2').email);
  });
});
