import { expect } from 'vitest';
import { eq } from 'drizzle-orm';
import { getDb } from '@/db/client';
import { disputeCase, organisation, user } from '@/db/schema';
import { demoOrganisations, demoUsers } from '@/db/seed/demo-names';
import { seedDemo } from '@/db/seed/demo';
import { getAuth } from '@/lib/auth/auth';
import { actorFromHeaders } from '@/lib/auth/session';
import type { Actor } from '@/lib/auth/actor';

/** Every demo account gets this password in the tests; it only has to pass the 12-character rule. */
export const TEST_PASSWORD = 'integration-password-7731';

export type DemoKey = (typeof demoUsers)[number]['key'];
export const demoKeys = demoUsers.map((u) => u.key) as DemoKey[];

export function demoUser(key: DemoKey) {
  const found = demoUsers.find((u) => u.key === key);
  if (!found) throw new Error(`No demo user ${key}`);
  return found;
}

export async function seedDemoForTests(): Promise<void> {
  const result = await seedDemo(getDb(), { password: TEST_PASSWORD });
  // A file that finds the scenario already there would test someone else's leftovers.
  if (!result.seeded) throw new Error('The demo scenario was already present in a fresh test database');
}

/** Signs in through better-auth and returns the value to send as the `cookie` header. */
export async function signIn(email: string, password = TEST_PASSWORD): Promise<string> {
  const response = await getAuth().api.signInEmail({ body: { email, password }, asResponse: true });
  if (response.status !== 200) throw new Error(`Sign-in of ${email} answered ${response.status}: ${await response.text()}`);
  return cookieHeaderFrom(response);
}

export function cookieHeaderFrom(response: Response): string {
  // A response may clear a cookie and set it again; the browser keeps the last value of each name.
  const jar = new Map<string, string>();
  for (const header of response.headers.getSetCookie()) {
    const pair = header.split(';')[0];
    const at = pair.indexOf('=');
    const name = pair.slice(0, at);
    const value = pair.slice(at + 1);
    if (value) jar.set(name, value);
    else jar.delete(name);
  }
  if (jar.size === 0) throw new Error('The response set no cookie');
  return [...jar].map(([name, value]) => `${name}=${value}`).join('; ');
}

export async function actorOf(cookie: string): Promise<Actor> {
  const actor = await actorFromHeaders(new Headers({ cookie }));
  if (!actor) throw new Error('The cookie does not name a live session');
  return actor;
}

type RouteHandler<P> = (request: Request, context: { params: Promise<P> }) => Promise<Response>;

/** Calls a route handler the way Next.js does: a Request and a promise of the path parameters. */
export function callRoute<P = Record<string, never>>(
  handler: RouteHandler<P>,
  path: string,
  options: { cookie?: string; params?: P; method?: string; body?: unknown } = {},
): Promise<Response> {
  const headers = new Headers();
  if (options.cookie) headers.set('cookie', options.cookie);
  if (options.body !== undefined) headers.set('content-type', 'application/json');
  const request = new Request(new URL(path, 'http://localhost:3000'), {
    method: options.method ?? 'GET',
    headers,
    body: options.body === undefined ? undefined : JSON.stringify(options.body),
  });
  return handler(request, { params: Promise.resolve(options.params ?? ({} as P)) });
}

/** Asserts an RFC 9457 answer and returns its body. */
export async function expectProblem(response: Response, status: number) {
  expect(response.status).toBe(status);
  expect(response.headers.get('content-type')).toMatch(/^application\/problem\+json/);
  const body = (await response.json()) as { type: string; title: string; status: number; detail: string; code: string; errors?: Record<string, string[]> };
  expect(body.status).toBe(status);
  expect(typeof body.title).toBe('string');
  expect(body.title.length).toBeGreaterThan(0);
  expect(typeof body.detail).toBe('string');
  expect(body.detail.length).toBeGreaterThan(0);
  return body;
}

export async function organisationIdByName(name: string): Promise<string> {
  const [row] = await getDb().select({ id: organisation.id }).from(organisation).where(eq(organisation.name, name));
  if (!row) throw new Error(`No organisation ${name}`);
  return row.id;
}

export async function demoOrganisationOf(key: DemoKey): Promise<string> {
  const [row] = await getDb().select({ organisationId: user.organisationId }).from(user).where(eq(user.email, demoUser(key).email));
  return row.organisationId;
}

export async function allCases() {
  return getDb()
    .select({
      id: disputeCase.id,
      number: disputeCase.number,
      status: disputeCase.status,
      supplierOrganisationId: disputeCase.supplierOrganisationId,
      plantOrganisationId: disputeCase.plantOrganisationId,
      labOrganisationId: disputeCase.labOrganisationId,
      boardOrganisationId: disputeCase.boardOrganisationId,
    })
    .from(disputeCase);
}

export const supplierOrganisationNames = demoOrganisations.suppliers.map((s) => s.name);

/** Polls until `probe` returns a value: mail leaves the app asynchronously. */
export async function eventually<T>(probe: () => T | undefined | Promise<T | undefined>, what: string, timeoutMs = 10_000): Promise<T> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const value = await probe();
    if (value !== undefined) return value;
    if (Date.now() > deadline) throw new Error(`Timed out waiting for ${what}`);
    await new Promise((resolve) => setTimeout(resolve, 50));
  }
}
