import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { and, count, eq, like } from 'drizzle-orm';
import { startMailCatcher, type CaughtMessage } from '@/lib/mail/catcher';

// The app reads SMTP_URL and MAIL_CATCHER_URL once, on first use of env(): the catcher must be
// listening and the variables set before anything below touches the settings.
const catcher = await startMailCatcher({ smtpPort: 0, httpPort: 0 });
process.env.SMTP_URL = `smtp://127.0.0.1:${catcher.smtpPort}`;
process.env.MAIL_CATCHER_URL = `http://127.0.0.1:${catcher.httpPort}`;

const { getDb } = await import('@/db/client');
const { invitation, rateLimit, session, user } = await import('@/db/schema');
const { getAuth, resetAuthForTests } = await import('@/lib/auth/auth');
const { resetMailTransport } = await import('@/lib/mail/transport');
const { acceptInvitation, createInvitation, findOpenInvitation, revokeInvitation } = await import('@/lib/dal/invitations');
const { acceptInvitationAction } = await import('@/app/(auth)/invitation/[token]/actions');
const { GET: listRoute } = await import('@/app/api/v1/cases/route');
const { GET: authGet, POST: authPost } = await import('@/app/api/auth/[...all]/route');
const { AppError } = await import('@/lib/errors');
const { actorOf, callRoute, cookieHeaderFrom, demoOrganisationOf, demoUser, eventually, seedDemoForTests, signIn, TEST_PASSWORD } = await import('./helpers');

type Actor = Awaited<ReturnType<typeof actorOf>>;
let admin: Actor;

function authRequest(method: 'GET' | 'POST', path: string, options: { body?: unknown; cookie?: string; ip?: string } = {}): Request {
  const headers = new Headers({ origin: 'http://localhost:3000' });
  if (options.body !== undefined) headers.set('content-type', 'application/json');
  if (options.cookie) headers.set('cookie', options.cookie);
  if (options.ip) headers.set('x-forwarded-for', options.ip);
  return new Request(`http://localhost:3000/api/auth${path}`, { method, headers, body: options.body === undefined ? undefined : JSON.stringify(options.body) });
}

async function sessionsOf(email: string): Promise<number> {
  const db = getDb();
  const [row] = await db.select({ n: count() }).from(session).innerJoin(user, eq(user.id, session.userId)).where(eq(user.email, email));
  return row.n;
}

async function casesStatus(cookie: string): Promise<number> {
  return (await callRoute(listRoute, '/api/v1/cases', { cookie })).status;
}

function mailTo(address: string, template: string): () => CaughtMessage | undefined {
  return () => [...catcher.messages].reverse().find((m) => m.to.includes(address) && m.template === template);
}

async function expectAppError(promise: Promise<unknown>, code: string): Promise<InstanceType<typeof AppError>> {
  const error = await promise.then(
    () => null,
    (e: unknown) => e,
  );
  expect(error).toBeInstanceOf(AppError);
  expect((error as InstanceType<typeof AppError>).code).toBe(code);
  return error as InstanceType<typeof AppError>;
}

beforeAll(async () => {
  await seedDemoForTests();
  admin = await actorOf(await signIn(demoUser('admin').email));
});

afterAll(async () => {
  resetMailTransport();
  await catcher.close();
});

describe('sign-in', () => {
  it('opens a session with the right password', async () => {
    const before = await sessionsOf(demoUser('plant').email);
    const response = await getAuth().api.signInEmail({ body: { email: demoUser('plant').email, password: TEST_PASSWORD }, asResponse: true });
    expect(response.status).toBe(200);
    const cookie = cookieHeaderFrom(response);
    expect(cookie).toMatch(/session_token=/);
    expect(await sessionsOf(demoUser('plant').email)).toBe(before + 1);
    expect(await casesStatus(cookie)).toBe(200);
  });

  it('refuses a wrong password and an unknown address alike, and opens no session', async () => {
    const email = demoUser('lab').email;
    const before = await sessionsOf(email);
    const wrong = await getAuth().api.signInEmail({ body: { email, password: 'not-the-right-password' }, asResponse: true });
    const unknown = await getAuth().api.signInEmail({ body: { email: 'nobody@demo.countersample.test', password: 'not-the-right-password' }, asResponse: true });
    expect(wrong.status).toBe(401);
    expect(unknown.status).toBe(401);
    expect(wrong.headers.getSetCookie().some((c) => /session_token=[^;]+/.test(c))).toBe(false);
    // Same answer for both, so the form cannot be used to find out who has an account.
    expect((await wrong.json()).code).toBe((await unknown.json()).code);
    expect(await sessionsOf(email)).toBe(before);
  });

  it('refuses open sign-up and creates no account', async () => {
    const email = 'walk-in@example.test';
    const response = await authPost(authRequest('POST', '/sign-up/email', { body: { email, password: 'a-long-enough-password', name: 'Walk In' } }));
    expect(response.status).toBeGreaterThanOrEqual(400);
    expect(response.status).toBeLessThan(500);
    expect((await response.json()).code).toBe('EMAIL_PASSWORD_SIGN_UP_DISABLED');
    expect(await getDb().select().from(user).where(eq(user.email, email))).toEqual([]);
  });

  it('ends the session at sign-out: the old cookie no longer opens the API', async () => {
    const cookie = await signIn(demoUser('arbiter').email);
    expect(await casesStatus(cookie)).toBe(200);
    const before = await sessionsOf(demoUser('arbiter').email);
    const out = await authPost(authRequest('POST', '/sign-out', { cookie, body: {} }));
    expect(out.status).toBe(200);
    expect(await casesStatus(cookie)).toBe(401);
    expect(await sessionsOf(demoUser('arbiter').email)).toBe(before - 1);
    const sessionNow = await authGet(authRequest('GET', '/get-session', { cookie }));
    expect(await sessionNow.json()).toBeNull();
  });
});

describe('invitations', () => {
  const password = 'a-fresh-password-for-the-lab';

  async function invite(email: string, role: 'lab' | 'supplier' | 'arbiter' = 'lab', organisationKey: 'lab' | 'supplier' = 'lab') {
    const organisationId = await demoOrganisationOf(organisationKey);
    const { invitation: row, mailStatus } = await createInvitation(getDb(), admin, { email, name: 'Invited Person', role, organisationId });
    expect(mailStatus).toBe('sent');
    const mail = await eventually(mailTo(email, 'invitation'), `the invitation mail to ${email}`);
    const match = mail.text.match(/\/invitation\/([A-Za-z0-9_-]{20,})/);
    expect(match, 'the mail carries an invitation link').not.toBeNull();
    return { row, token: match![1], mail };
  }

  it('sends a link that makes an account, signs in, and cannot be used twice', async () => {
    const email = 'new.analyst@example.test';
    const { token, mail } = await invite(email);
    expect(mail.subject).toContain('invitation');
    expect(mail.text).toContain('http://localhost:3000/invitation/');
    // Only the hash is stored: the token in the mail is not in the database.
    const rows = await getDb().select().from(invitation).where(eq(invitation.email, email));
    expect(rows).toHaveLength(1);
    expect(rows[0].tokenHash).not.toBe(token);
    expect(JSON.stringify(rows)).not.toContain(token);

    expect(await findOpenInvitation(getDb(), token)).toMatchObject({ email, role: 'lab' });
    await acceptInvitation(getDb(), { token, name: 'Nia Brathay', password });

    const actor = await actorOf(await signIn(email, password));
    expect(actor).toMatchObject({ email, name: 'Nia Brathay', role: 'lab', organisationId: await demoOrganisationOf('lab') });
    expect(await findOpenInvitation(getDb(), token)).toBeNull();

    await expectAppError(acceptInvitation(getDb(), { token, name: 'Someone Else', password: 'another-long-password' }), 'gone');
    const [{ n }] = await getDb().select({ n: count() }).from(user).where(eq(user.email, email));
    expect(n).toBe(1);
  });

  it('refuses an expired invitation', async () => {
    const email = 'late.comer@example.test';
    const { row, token } = await invite(email);
    await getDb().update(invitation).set({ expiresAt: new Date(Date.now() - 1000) }).where(eq(invitation.id, row.id));
    expect(await findOpenInvitation(getDb(), token)).toBeNull();
    await expectAppError(acceptInvitation(getDb(), { token, name: 'Late Comer', password }), 'gone');
    expect(await getDb().select().from(user).where(eq(user.email, email))).toEqual([]);
  });

  it('refuses a revoked invitation, and a replaced one', async () => {
    const email = 'changed.mind@example.test';
    const first = await invite(email);
    const second = await invite(email);
    // A new invitation to the same address retires the earlier link.
    await expectAppError(acceptInvitation(getDb(), { token: first.token, name: 'Changed Mind', password }), 'gone');

    await revokeInvitation(getDb(), admin, second.row.id);
    await expectAppError(acceptInvitation(getDb(), { token: second.token, name: 'Changed Mind', password }), 'gone');
    expect(await getDb().select().from(user).where(eq(user.email, email))).toEqual([]);
  });

  it('refuses a role that does not belong in the organisation, naming the role field', async () => {
    const error = await expectAppError(
      createInvitation(getDb(), admin, { email: 'misplaced@example.test', name: 'Misplaced', role: 'arbiter', organisationId: await demoOrganisationOf('supplier') }),
      'invalid',
    );
    expect(Object.keys(error.fieldErrors ?? {})).toEqual(['role']);
    expect(await getDb().select().from(invitation).where(eq(invitation.email, 'misplaced@example.test'))).toEqual([]);
  });

  it('lets only the administrator invite', async () => {
    const supplier = await actorOf(await signIn(demoUser('supplier').email));
    await expectAppError(
      createInvitation(getDb(), supplier, { email: 'friend@example.test', name: 'Friend', role: 'supplier', organisationId: supplier.organisationId }),
      'forbidden',
    );
  });

  it('refuses an address that already has an account', async () => {
    const error = await expectAppError(
      createInvitation(getDb(), admin, { email: demoUser('lab').email.toUpperCase(), name: 'Twin', role: 'lab', organisationId: await demoOrganisationOf('lab') }),
      'conflict',
    );
    expect(error.fieldErrors).toHaveProperty('email');
  });

  it('refuses a password under 12 characters on the acceptance form and keeps the link open', async () => {
    const email = 'short.password@example.test';
    const { token } = await invite(email);
    const form = new FormData();
    for (const [key, value] of Object.entries({ token, name: 'Short Password', password: 'elevenchars', confirm: 'elevenchars' })) form.set(key, value);
    const state = await acceptInvitationAction(null, form);
    expect(state?.ok).toBe(false);
    expect(state?.fieldErrors?.password?.join(' ')).toMatch(/12 characters/);
    expect(await findOpenInvitation(getDb(), token)).not.toBeNull();
    expect(await getDb().select().from(user).where(eq(user.email, email))).toEqual([]);
  });

  it('refuses a password under 12 characters in the data layer too', async () => {
    // better-auth's admin createUser, which the data layer calls, does not enforce the minimum itself.
    const email = 'short.dal@example.test';
    const { token } = await invite(email);
    const error = await expectAppError(acceptInvitation(getDb(), { token, name: 'Short Dal', password: 'elevenchars' }), 'invalid');
    expect(error.fieldErrors).toHaveProperty('password');
    expect(await findOpenInvitation(getDb(), token)).not.toBeNull();
    expect(await getDb().select().from(user).where(eq(user.email, email))).toEqual([]);
  });
});

describe('password reset', () => {
  const email = demoUser('supplier2').email;
  const newPassword = 'a-brand-new-password-2026';

  async function requestReset(address: string): Promise<Response> {
    return authPost(authRequest('POST', '/request-password-reset', { body: { email: address, redirectTo: '/reset-password' } }));
  }

  it('mails a link whose token sets a new password and ends every old session', async () => {
    const oldSession = await signIn(email);
    expect(await casesStatus(oldSession)).toBe(200);

    const sentBefore = catcher.messages.length;
    expect((await requestReset(email)).status).toBe(200);
    const mail = await eventually(mailTo(email, 'password-reset'), 'the reset mail');
    expect(catcher.messages.length).toBeGreaterThan(sentBefore);
    const link = mail.text.match(/https?:\/\/\S+\/api\/auth\/reset-password\/([A-Za-z0-9_-]+)\?callbackURL=\S*/);
    expect(link, 'the mail carries a reset link').not.toBeNull();
    const [url, token] = [link![0], link![1]];

    // The link itself sends the browser to the app's form with the token.
    const followed = await authGet(new Request(url));
    expect(followed.status).toBe(302);
    expect(followed.headers.get('location')).toBe(`http://localhost:3000/reset-password?token=${token}`);

    const tooShort = await authPost(authRequest('POST', '/reset-password', { body: { token, newPassword: 'short-pass' } }));
    expect(tooShort.status).toBe(400);
    expect((await tooShort.json()).code).toBe('PASSWORD_TOO_SHORT');

    const reset = await authPost(authRequest('POST', '/reset-password', { body: { token, newPassword } }));
    expect(reset.status).toBe(200);

    expect(await casesStatus(oldSession)).toBe(401);
    expect(await sessionsOf(email)).toBe(0);
    const oldPassword = await getAuth().api.signInEmail({ body: { email, password: TEST_PASSWORD }, asResponse: true });
    expect(oldPassword.status).toBe(401);
    expect(await casesStatus(await signIn(email, newPassword))).toBe(200);

    const again = await authPost(authRequest('POST', '/reset-password', { body: { token, newPassword: 'yet-another-long-password' } }));
    expect(again.status).toBe(400);
  });

  it('answers an unknown address like a known one and sends nothing', async () => {
    const before = catcher.messages.length;
    const response = await requestReset('no-such-person@demo.countersample.test');
    expect(response.status).toBe(200);
    await new Promise((resolve) => setTimeout(resolve, 300));
    expect(catcher.messages.length).toBe(before);
  });
});

describe('rate limiting', () => {
  beforeAll(() => {
    process.env.COUNTERSAMPLE_RATE_LIMIT = 'on';
    resetAuthForTests();
  });

  afterAll(() => {
    delete process.env.COUNTERSAMPLE_RATE_LIMIT;
    resetAuthForTests();
  });

  async function attempt(email: string, ip: string, password = 'not-the-right-password'): Promise<number> {
    const response = await getAuth().handler(authRequest('POST', '/sign-in/email', { body: { email, password }, ip }));
    return response.status;
  }

  it('answers repeated wrong sign-ins from one address with 429 and keeps the count in the database', async () => {
    const ip = '203.0.113.7';
    // Several accounts, so that only the per-address limit can be what stops them.
    const targets = [demoUser('plant').email, demoUser('lab').email, demoUser('supplier').email];
    const statuses: number[] = [];
    for (let i = 0; i < 15; i++) statuses.push(await attempt(targets[i % targets.length], ip));
    expect(statuses.slice(0, 10).every((s) => s === 401)).toBe(true);
    expect(statuses.slice(10).every((s) => s === 429)).toBe(true);
    // While blocked, even the right password is refused from that address.
    expect(await attempt(demoUser('plant').email, ip, TEST_PASSWORD)).toBe(429);

    const rows = await getDb().select().from(rateLimit).where(and(like(rateLimit.key, `%${ip}%`), like(rateLimit.key, '%sign-in%')));
    expect(rows).toHaveLength(1);
    expect(rows[0].count).toBeGreaterThanOrEqual(10);
  });

  it('still lets the same people in from another address', async () => {
    expect(await attempt(demoUser('lab').email, '198.51.100.23', TEST_PASSWORD)).toBe(200);
  });

  it('limits one account however many addresses the guesses come from', async () => {
    // X-Forwarded-For is whatever the client sends: a new address per guess must not reset the count.
    const email = demoUser('arbiter2').email;
    const statuses: number[] = [];
    for (let i = 1; i <= 15; i++) statuses.push(await attempt(email, `192.0.2.${i}`));
    expect(statuses.slice(0, 10).every((s) => s === 401)).toBe(true);
    expect(statuses.slice(10).every((s) => s === 429)).toBe(true);
    // Blocked for the account, even with the right password from a fresh address.
    expect(await attempt(email, '192.0.2.200', TEST_PASSWORD)).toBe(429);
    const rows = await getDb().select().from(rateLimit).where(like(rateLimit.key, `%${email}%`));
    expect(rows).toHaveLength(1);
  });

  it('clears an account’s count at a successful sign-in', async () => {
    const email = demoUser('admin').email;
    for (let i = 1; i <= 9; i++) expect(await attempt(email, `192.0.2.${100 + i}`)).toBe(401);
    expect(await attempt(email, '192.0.2.150', TEST_PASSWORD)).toBe(200);
    const rows = await getDb().select().from(rateLimit).where(like(rateLimit.key, `%${email}%`));
    expect(rows).toEqual([]);
    for (let i = 1; i <= 9; i++) expect(await attempt(email, `192.0.2.${160 + i}`)).toBe(401);
  });
});
