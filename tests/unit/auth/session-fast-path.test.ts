import { serializeSignedCookie } from 'better-call';
import { describe, expect, it } from 'vitest';
import { readSessionCookie, usableAsRead } from '@/lib/auth/session-fast-path';

const NAME = 'better-auth.session_token';
const SECRET = 'a-test-secret-that-is-long-enough-for-hmac-0123456789';

/** The cookie header a browser sends back after better-auth's own signing (better-call's serializer). */
async function signedCookie(token: string, secret = SECRET): Promise<string> {
  const setCookie = await serializeSignedCookie(NAME, token, secret, {});
  return setCookie.split(';')[0];
}

describe('readSessionCookie', () => {
  it('accepts exactly what better-auth signs, and returns its token', async () => {
    const cookie = await signedCookie('Zq3tK8vN2mPw7xYb1cRd4eFg5hJk6LmN');
    expect(readSessionCookie(cookie, NAME, SECRET)).toEqual({ kind: 'signed', token: 'Zq3tK8vN2mPw7xYb1cRd4eFg5hJk6LmN' });
    expect(readSessionCookie(`theme=dark; ${cookie}; other=1`, NAME, SECRET)).toEqual({ kind: 'signed', token: 'Zq3tK8vN2mPw7xYb1cRd4eFg5hJk6LmN' });
  });

  it('says there is no session when the cookie is absent or empty', () => {
    expect(readSessionCookie(null, NAME, SECRET)).toEqual({ kind: 'none' });
    expect(readSessionCookie('theme=dark', NAME, SECRET)).toEqual({ kind: 'none' });
    expect(readSessionCookie(`${NAME}=`, NAME, SECRET)).toEqual({ kind: 'none' });
  });

  it('never accepts a cookie signed with another secret, a changed token or a changed signature', async () => {
    const cookie = await signedCookie('token-one');
    const value = decodeURIComponent(cookie.slice(NAME.length + 1));
    const [token, signature] = [value.slice(0, value.lastIndexOf('.')), value.slice(value.lastIndexOf('.') + 1)];
    expect(readSessionCookie(await signedCookie('token-one', `${SECRET}x`), NAME, SECRET).kind).toBe('unusual');
    expect(readSessionCookie(`${NAME}=${encodeURIComponent(`token-two.${signature}`)}`, NAME, SECRET).kind).toBe('unusual');
    const flipped = signature[0] === 'A' ? `B${signature.slice(1)}` : `A${signature.slice(1)}`;
    expect(readSessionCookie(`${NAME}=${encodeURIComponent(`${token}.${flipped}`)}`, NAME, SECRET).kind).toBe('unusual');
    expect(readSessionCookie(`${NAME}=${encodeURIComponent(token)}`, NAME, SECRET).kind).toBe('unusual');
    expect(readSessionCookie(`${NAME}=${encodeURIComponent(`${token}.${signature.replace(/=$/, '')}`)}`, NAME, SECRET).kind).toBe('unusual');
  });

  it('reads the first of two cookies of the same name, as better-auth does', async () => {
    const first = await signedCookie('first-token');
    const second = await signedCookie('second-token');
    expect(readSessionCookie(`${first}; ${second}`, NAME, SECRET)).toEqual({ kind: 'signed', token: 'first-token' });
  });
});

describe('usableAsRead', () => {
  // Twelve hours of life, renewed once an hour has passed, as the product configures better-auth.
  const timing = { expiresIn: 12 * 3600, updateAge: 3600 };
  const now = Date.parse('2026-12-03T12:00:00Z');

  it('uses a session signed in less than an hour ago', () => {
    const expiresAt = new Date(now + 12 * 3600_000 - 59 * 60_000);
    expect(usableAsRead({ expiresAt, banned: false }, timing, now)).toBe(true);
    expect(usableAsRead({ expiresAt, banned: null }, timing, now)).toBe(true);
  });

  it('leaves to better-auth a session due for renewal, from the exact moment it is due', () => {
    const dueNow = new Date(now + 12 * 3600_000 - 3600_000);
    expect(usableAsRead({ expiresAt: dueNow, banned: false }, timing, now)).toBe(false);
    expect(usableAsRead({ expiresAt: new Date(dueNow.getTime() + 1), banned: false }, timing, now)).toBe(true);
  });

  it('leaves to better-auth an expired session and a banned user', () => {
    expect(usableAsRead({ expiresAt: new Date(now), banned: false }, timing, now)).toBe(false);
    expect(usableAsRead({ expiresAt: new Date(now - 1), banned: false }, timing, now)).toBe(false);
    expect(usableAsRead({ expiresAt: new Date(now + 12 * 3600_000 - 60_000), banned: true }, timing, now)).toBe(false);
  });
});
