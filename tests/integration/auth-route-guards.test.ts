import { beforeAll, describe, expect, it } from 'vitest';
import { GET, POST } from '@/app/api/auth/[...all]/route';
import { expectProblem, seedDemoForTests } from './helpers';

beforeAll(async () => {
  await seedDemoForTests();
});

const get = (path: string) => GET(new Request(`http://localhost:3000/api/auth${path}`, { headers: { origin: 'http://localhost:3000' } }));

describe('redirect targets better-auth cannot build on', () => {
  // better-auth answered these with a 500 when it appended its error to the target.
  for (const target of [' ', 'x y', '//evil.example', '/\\evil.example', 'http://']) {
    it(`refuses callbackURL=${JSON.stringify(target)} with a 400 problem`, async () => {
      const response = await get(`/verify-email?token=not-a-token&callbackURL=${encodeURIComponent(target)}`);
      const body = await expectProblem(response, 400);
      expect(body.errors).toHaveProperty('callbackURL');
    });
  }

  it('refuses a repeated key when any of its values is unusable', async () => {
    await expectProblem(await get(`/verify-email?token=x&callbackURL=%2Fdesk&callbackURL=%20`), 400);
  });

  it('still hands a usable target to better-auth, which redirects with its error', async () => {
    const response = await get(`/verify-email?token=not-a-token&callbackURL=${encodeURIComponent('/desk')}`);
    expect(response.status).toBe(302);
    expect(response.headers.get('location')).toBe('/desk?error=INVALID_TOKEN');
  });

  it('checks POST requests the same way', async () => {
    const response = await POST(new Request('http://localhost:3000/api/auth/sign-in/email?callbackURL=%20', { method: 'POST', headers: { origin: 'http://localhost:3000', 'content-type': 'application/json' }, body: '{}' }));
    await expectProblem(response, 400);
  });
});

describe('NUL characters, which PostgreSQL text cannot hold', () => {
  const post = (path: string, body: string) =>
    POST(new Request(`http://localhost:3000/api/auth${path}`, { method: 'POST', headers: { origin: 'http://localhost:3000', 'content-type': 'application/json' }, body }));

  // better-auth looked the token up as it came and answered 500 when the database refused it.
  it('refuses a reset token holding one with a 400 problem', async () => {
    await expectProblem(await post('/reset-password', JSON.stringify({ newPassword: 'a-long-enough-password-1', token: 'abc\u0000def' })), 400);
  });

  it('refuses one in a key, in the query and in the path', async () => {
    await expectProblem(await post('/sign-in/email', '{"email\\u0000":"x"}'), 400);
    await expectProblem(await get('/verify-email?token=%00'), 400);
    await expectProblem(await get('/reset-password/abc%00'), 400);
  });

  it('lets ordinary text through to better-auth', async () => {
    const response = await post('/reset-password', JSON.stringify({ newPassword: 'a-long-enough-password-1', token: 'no-such-token' }));
    expect(response.status).toBe(400);
    expect(response.headers.get('content-type')).toMatch(/^application\/json/);
  });
});

