import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { demoUsers } from '@/db/seed/demo-names';
import { contentType, garbageCookie, headerName, headerValue, hostileJsonText, nastyJson, nearMissObject, queryPairs, rawBody, LONE_SURROGATE } from './arbitraries';
import { createFuzzContext } from './context';
import { countCase, countOutcome, describeCounts, fuzz, fuzzScale, MIN_CASES_PER_TARGET, snapshotDb, totalFor, type DbSnapshot } from './harness';
import { registry, type FuzzContext } from './registry';
import { buildRequest, loadExport, type RouteCase } from './route-fuzz';
import { targetsOf } from './suite';

/**
 * better-auth's catch-all answers in better-auth's own error format ({ code, message } JSON), not
 * problem details: the route hands the request straight to its handler. What is asserted here is
 * what the library promises and the app relies on: a 4xx with a JSON body for refused input, never
 * a 5xx, and nothing stored. Rate limiting is off in tests (lib/auth/auth.ts), so no table changes.
 */

type AuthHandler = (request: Request) => Promise<Response>;

/** Endpoints that take a body. Writes that could succeed on a plausible body (update-user, sign-out, admin user creation) are left out. */
const postPaths: Record<string, readonly string[]> = {
  '/sign-in/email': ['email', 'password', 'rememberMe', 'callbackURL'],
  '/sign-up/email': ['email', 'password', 'name', 'callbackURL', 'organisationId', 'role'],
  '/request-password-reset': ['email', 'redirectTo'],
  '/reset-password': ['newPassword', 'token'],
  '/change-password': ['currentPassword', 'newPassword', 'revokeOtherSessions'],
  '/admin/set-role': ['userId', 'role'],
  '/admin/ban-user': ['userId', 'banReason', 'banExpiresIn'],
  '/admin/remove-user': ['userId'],
};
const getPaths = ['/get-session', '/list-sessions', '/reset-password/not-a-token', '/verify-email', '/admin/list-users', '/no-such-endpoint', '/ok'];

const demoEmails = demoUsers.map((u) => u.email);

let ctx: FuzzContext & { restoreConsole(): void };
let before: DbSnapshot;

beforeAll(async () => {
  ctx = await createFuzzContext();
  before = await snapshotDb();
});
afterAll(() => ctx?.restoreConsole());

function authCase(method: 'GET' | 'POST', dimension: 'bodies' | 'queries' | 'headers'): fc.Arbitrary<RouteCase & { path: string }> {
  const path = method === 'POST' ? fc.constantFrom(...Object.keys(postPaths)) : fc.oneof(fc.constantFrom(...getPaths), fc.string().filter((s) => !LONE_SURROGATE.test(s)).map((s) => `/${encodeURIComponent(s)}`));
  return path.chain((p) => {
    const fields = postPaths[p] ?? [];
    // Demo addresses only where a wrong password is all they can meet; a reset request for one would send mail.
    const emails = p === '/sign-in/email' ? fc.oneof(nastyJson, fc.constantFrom(...demoEmails)) : nastyJson;
    const value = fc.oneof(nastyJson, fc.uuid(), emails);
    const json = fc.tuple(fc.oneof({ weight: 4, arbitrary: nearMissObject(fields, value) }, { weight: 1, arbitrary: nastyJson }), fc.oneof({ weight: 5, arbitrary: fc.constant('application/json') }, { weight: 1, arbitrary: contentType })).map(([v, type]) => ({ payload: JSON.stringify(v) ?? 'null', contentType: type }));
    const raw = fc.oneof(hostileJsonText(fields).map((payload) => ({ payload, contentType: 'application/json' as string | undefined })), fc.tuple(rawBody, fc.option(contentType, { nil: undefined })).map(([payload, type]) => ({ payload, contentType: type })));
    const body = method === 'POST' ? (dimension === 'bodies' ? fc.oneof({ weight: 3, arbitrary: json }, { weight: 1, arbitrary: raw }) : json) : fc.constant(undefined);
    const headerPairs = fc.array(
      fc.oneof(fc.tuple(headerName, headerValue), fc.tuple(fc.constant('cookie'), garbageCookie(ctx.anyCookie)), fc.tuple(fc.constant('origin'), fc.constantFrom('https://evil.example', 'null', 'http://localhost:3000.evil.example', ''))),
      { minLength: 1, maxLength: 5 },
    ).filter((pairs) => {
      try {
        new Headers(pairs);
        return true;
      } catch {
        return false;
      }
    });
    return fc.record({
      path: fc.constant(p),
      caller: fc.constantFrom(...ctx.callerNames),
      params: fc.constant({}),
      query: dimension === 'queries' ? queryPairs(['token', 'callbackURL', 'redirectTo', 'currentURL', 'disableCookieCache', 'searchValue', 'limit']) : fc.constant([] as [string, string][]),
      headers: dimension === 'headers' ? headerPairs.map((pairs) => [['origin', 'http://localhost:3000'], ...pairs] as [string, string][]) : fc.constant([['origin', 'http://localhost:3000']] as [string, string][]),
      body,
    });
  });
}

async function judgeAuth(method: string, path: string, response: Response, label: string): Promise<void> {
  const text = await response.text();
  const where = `${label} → ${response.status} ${text.slice(0, 300)}`;
  expect(response.status, where).toBeLessThan(500);
  if (method === 'POST') {
    // No enumeration: a reset request for an address nobody has is answered like one for a real account.
    const resetNoOp = path === '/request-password-reset' && response.status === 200;
    if (!resetNoOp) {
      expect(response.status, where).toBeGreaterThanOrEqual(400);
    }
  }
  if (text.length > 0 && /json/.test(response.headers.get('content-type') ?? '')) expect(() => JSON.parse(text), where).not.toThrow();
  if (response.status >= 400 && text.length > 0) expect(response.headers.get('content-type') ?? '', where).toMatch(/json/);
}

const runs = { bodies: 700, queries: 150, headers: 250 };
const getRuns = { queries: 600, headers: 400 };

for (const target of targetsOf('auth')) {
  const method = target.exportName as 'GET' | 'POST';
  describe(target.id, () => {
    const planned = Object.entries(method === 'POST' ? runs : getRuns) as ['bodies' | 'queries' | 'headers', number][];
    for (const [dimension, numRuns] of planned) {
      it(`${dimension}: ${numRuns} generated cases`, { timeout: 240_000 }, async () => {
        const handler = await loadExport<AuthHandler>(target);
        await fuzz(`${target.id} ${dimension}`, authCase(method, dimension), numRuns, async (rc) => {
          ctx.consoleErrors(); // whatever an earlier, failed case left behind is not this one's
          const { request } = buildRequest(target, rc, ctx, `/api/auth${rc.path}`);
          const label = `${method} /api/auth${rc.path} as ${rc.caller} query=${JSON.stringify(rc.query).slice(0, 200)} headers=${JSON.stringify(rc.headers.map(([n, v]) => [n, v.slice(0, 60)]))} body=${typeof rc.body?.payload === 'string' ? rc.body.payload.slice(0, 200) : rc.body ? '[bytes]' : ''}`;
          const response = await handler(request);
          expect(ctx.consoleErrors(), `${label}: logged an unexpected error`).toEqual([]);
          countOutcome(target.id, String(response.status));
          await judgeAuth(method, rc.path, response, label);
          countCase(target.id, dimension);
        });
      });
    }
    it('left every table as it was', async () => {
      expect(await snapshotDb()).toEqual(before);
    });
  });
}

it(`ran at least ${MIN_CASES_PER_TARGET} cases against each auth target`, () => {
  const ids = targetsOf('auth').map((t) => t.id);
  expect(ids.length).toBe(Object.values(registry).filter((s) => s.group === 'auth').length);
  const summary = describeCounts(ids);
  console.info(`Bad-input fuzzing of better-auth (seed ${process.env.FUZZ_SEED ?? 'default'}, scale ${fuzzScale}):\n${summary}`);
  for (const id of ids) expect(totalFor(id), summary).toBeGreaterThanOrEqual(MIN_CASES_PER_TARGET * Math.min(1, fuzzScale));
});

