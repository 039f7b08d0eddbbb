import { beforeAll, describe, expect, it } from 'vitest';
import { can, roleNames, roles, statement, type Role } from '@/lib/auth/permissions';
import { GET as listRoute } from '@/app/api/v1/cases/route';
import { GET as caseRoute } from '@/app/api/v1/cases/[caseId]/route';
import { GET as authGet, POST as authPost } from '@/app/api/auth/[...all]/route';
import { allCases, callRoute, demoKeys, demoOrganisationOf, demoUser, seedDemoForTests, signIn, type DemoKey } from './helpers';

/**
 * The documented matrix, written out by hand on purpose: each line says which roles may do it.
 * It is compared with `can()` in both directions, so a grant added or lost in the code fails here.
 */
const everyone: Role[] = ['supplier', 'plant', 'lab', 'arbiter', 'admin'];
const matrix: Record<string, Role[]> = {
  'case.list': ['supplier', 'plant', 'lab', 'arbiter'],
  'case.read': ['supplier', 'plant', 'lab', 'arbiter'],
  'case.open': ['supplier'],
  'case.withdraw': ['supplier'],
  'case.answer': ['plant'],
  'case.dispatch': ['plant'],
  'case.receive': ['lab'],
  'case.retest': ['lab'],
  'case.review': ['arbiter'],
  'case.order_further_test': ['arbiter'],
  'case.decide': ['arbiter'],
  'delivery.list': ['supplier', 'plant'],
  'delivery.read': ['supplier', 'plant'],
  'delivery.record': ['plant'],
  'intake.record': ['plant'],
  'intake.correct': ['plant'],
  'instrument.read': ['plant', 'lab', 'admin'],
  'instrument.manage': ['plant', 'lab', 'admin'],
  'instrument.check': ['plant', 'lab'],
  'evidence.read': ['supplier', 'plant', 'lab', 'arbiter'],
  'evidence.upload': ['supplier', 'plant', 'lab'],
  'evidence.remove': [],
  'note.read': ['supplier', 'plant', 'lab', 'arbiter'],
  'note.write': ['supplier', 'plant', 'lab', 'arbiter'],
  'organisation.read': ['admin'],
  'organisation.manage': ['admin'],
  'invitation.create': ['admin'],
  'invitation.revoke': ['admin'],
  'rules.read': everyone,
  'rules.edit': ['admin'],
  'outbox.read': ['admin'],
  'assessment.run': everyone,
};

const appResources = Object.keys(statement).filter((r) => r !== 'user' && r !== 'session') as (keyof typeof statement)[];

describe('the permission matrix', () => {
  it('lists every action the code declares, and nothing else', () => {
    const declared = appResources.flatMap((resource) => (statement[resource] as readonly string[]).map((action) => `${resource}.${action}`));
    expect(Object.keys(matrix).sort()).toEqual(declared.sort());
    expect([...roleNames].sort()).toEqual([...everyone].sort());
  });

  for (const role of everyone) {
    it(`gives ${role} exactly its documented permissions`, () => {
      const granted: string[] = [];
      for (const key of Object.keys(matrix)) {
        const [resource, action] = key.split('.') as [never, never];
        if (can(role, resource, action)) granted.push(key);
      }
      const expected = Object.entries(matrix)
        .filter(([, allowed]) => allowed.includes(role))
        .map(([key]) => key);
      expect(granted.sort()).toEqual(expected.sort());
    });
  }

  it('keeps the administrator out of every case action (separation of duties)', () => {
    for (const action of statement.case) expect(can('admin', 'case', action)).toBe(false);
  });

  it('never lets a party decide, nor the arbiter act as a party', () => {
    for (const role of ['supplier', 'plant', 'lab'] as const) expect(can(role, 'case', 'decide')).toBe(false);
    for (const action of ['open', 'withdraw', 'answer', 'dispatch', 'receive', 'retest'] as const) expect(can('arbiter', 'case', action)).toBe(false);
  });

  it('gives better-auth’s user and session administration to the administrator only', () => {
    for (const role of everyone) {
      const listUsers = roles[role].authorize({ user: ['list'] }).success;
      const revokeSessions = roles[role].authorize({ session: ['revoke'] }).success;
      expect(listUsers).toBe(role === 'admin');
      expect(revokeSessions).toBe(role === 'admin');
    }
  });

  it('refuses unknown roles', () => {
    for (const role of ['', 'Admin', 'superuser', 'board', 'user']) {
      expect(can(role, 'case', 'list')).toBe(false);
      expect(can(role, 'rules', 'read')).toBe(false);
    }
  });

  // KNOWN BUG (reported): isRole() uses `value in roles`, so names on Object.prototype count as
  // roles and can() throws instead of refusing. Turn this into `it(...)` once isRole uses Object.hasOwn.
  it.fails('refuses role names that exist on Object.prototype', () => {
    for (const role of ['constructor', 'toString', '__proto__', 'hasOwnProperty']) expect(can(role, 'case', 'list')).toBe(false);
  });
});

// ---------------------------------------------------------------------------------------------

type Who = DemoKey | 'anonymous';
const walkers: Who[] = [...demoKeys, 'anonymous'];
const cookies = {} as Record<DemoKey, string>;
const cookieOf = (who: Who) => (who === 'anonymous' ? undefined : cookies[who]);

let supplierCaseId: string;
let supplier2CaseId: string;

/** Calls the better-auth catch-all route as a browser on the app's own origin would. */
function authCall(who: Who, method: 'GET' | 'POST', path: string, body?: unknown): Promise<Response> {
  const headers = new Headers({ origin: 'http://localhost:3000' });
  const cookie = cookieOf(who);
  if (cookie) headers.set('cookie', cookie);
  if (body !== undefined) headers.set('content-type', 'application/json');
  const request = new Request(`http://localhost:3000/api/auth${path}`, { method, headers, body: body === undefined ? undefined : JSON.stringify(body) });
  return method === 'GET' ? authGet(request) : authPost(request);
}

function expectWalk(actual: Record<string, number>, expected: Record<Who, number>) {
  expect(actual).toEqual(expected);
}

async function walk(call: (who: Who) => Promise<Response>): Promise<Record<string, number>> {
  const statuses: Record<string, number> = {};
  for (const who of walkers) statuses[who] = (await call(who)).status;
  return statuses;
}

beforeAll(async () => {
  await seedDemoForTests();
  for (const key of demoKeys) cookies[key] = await signIn(demoUser(key).email);
  const cases = await allCases();
  const supplierOrg = await demoOrganisationOf('supplier');
  const supplier2Org = await demoOrganisationOf('supplier2');
  supplierCaseId = cases.find((c) => c.supplierOrganisationId === supplierOrg && c.status === 'review')!.id;
  supplier2CaseId = cases.find((c) => c.supplierOrganisationId === supplier2Org && c.status === 'retest')!.id;
});

describe('every route, every role', () => {
  it('GET /api/v1/cases', async () => {
    const statuses = await walk((who) => callRoute(listRoute, '/api/v1/cases', { cookie: cookieOf(who) }));
    expectWalk(statuses, { admin: 403, plant: 200, lab: 200, arbiter: 200, arbiter2: 200, supplier: 200, supplier2: 200, anonymous: 401 });
  });

  it("GET /api/v1/cases/{id} of the first supplier's case", async () => {
    const statuses = await walk((who) => callRoute(caseRoute, `/api/v1/cases/${supplierCaseId}`, { cookie: cookieOf(who), params: { caseId: supplierCaseId } }));
    expectWalk(statuses, { admin: 404, plant: 200, lab: 200, arbiter: 200, arbiter2: 200, supplier: 200, supplier2: 404, anonymous: 401 });
  });

  it("GET /api/v1/cases/{id} of the second supplier's case", async () => {
    const statuses = await walk((who) => callRoute(caseRoute, `/api/v1/cases/${supplier2CaseId}`, { cookie: cookieOf(who), params: { caseId: supplier2CaseId } }));
    expectWalk(statuses, { admin: 404, plant: 200, lab: 200, arbiter: 200, arbiter2: 200, supplier: 404, supplier2: 200, anonymous: 401 });
  });

  it('GET /api/v1/cases/{id} with an unknown and a malformed id', async () => {
    for (const caseId of [crypto.randomUUID(), 'CS-2026-0001']) {
      const statuses = await walk((who) => callRoute(caseRoute, `/api/v1/cases/${caseId}`, { cookie: cookieOf(who), params: { caseId } }));
      expectWalk(statuses, { admin: 404, plant: 404, lab: 404, arbiter: 404, arbiter2: 404, supplier: 404, supplier2: 404, anonymous: 401 });
    }
  });

  it('GET /api/auth/get-session answers each person with their own session, and nobody with none', async () => {
    for (const who of walkers) {
      const response = await authCall(who, 'GET', '/get-session');
      expect(response.status).toBe(200);
      const body = (await response.json()) as { user: { email: string } } | null;
      if (who === 'anonymous') expect(body).toBeNull();
      else expect(body?.user.email).toBe(demoUser(who).email);
    }
  });

  it('POST /api/auth/sign-up/email is refused to everyone', async () => {
    const statuses = await walk((who) => authCall(who, 'POST', '/sign-up/email', { email: `new-${who}@example.test`, password: 'a-long-enough-password', name: 'New Person' }));
    expectWalk(statuses, { admin: 400, plant: 400, lab: 400, arbiter: 400, arbiter2: 400, supplier: 400, supplier2: 400, anonymous: 400 });
  });

  it('GET /api/auth/admin/list-users is for the administrator only', async () => {
    const statuses = await walk((who) => authCall(who, 'GET', '/admin/list-users'));
    expectWalk(statuses, { admin: 200, plant: 403, lab: 403, arbiter: 403, arbiter2: 403, supplier: 403, supplier2: 403, anonymous: 401 });
  });

  it('POST /api/auth/admin/set-role and create-user are refused to every party', async () => {
    const parties: Who[] = walkers.filter((w) => w !== 'admin');
    const target = (await (await authCall('supplier', 'GET', '/get-session')).json()) as { user: { id: string } };
    for (const who of parties) {
      const setRole = await authCall(who, 'POST', '/admin/set-role', { userId: target.user.id, role: 'arbiter' });
      expect(setRole.status, `${who} set-role`).toBe(who === 'anonymous' ? 401 : 403);
      const create = await authCall(who, 'POST', '/admin/create-user', { email: `made-by-${who}@example.test`, password: 'a-long-enough-password', name: 'Made', role: 'arbiter' });
      expect(create.status, `${who} create-user`).toBe(who === 'anonymous' ? 401 : 403);
    }
    // Nobody was promoted by the attempts above.
    const after = (await (await authCall('supplier', 'GET', '/get-session')).json()) as { user: { role: string } };
    expect(after.user.role).toBe('supplier');
  });

  // KNOWN BUG (reported): the admin role carries all of better-auth's user powers (adminAc), so over
  // /api/auth/admin/* an administrator can make itself an arbiter, impersonate anyone or create
  // accounts outside the invitation rules. Turn these into `it(...)` once lib/auth/auth.ts restricts them.
  it.fails('does not let the administrator impersonate a party', async () => {
    const target = (await (await authCall('arbiter', 'GET', '/get-session')).json()) as { user: { id: string } };
    const response = await authCall('admin', 'POST', '/admin/impersonate-user', { userId: target.user.id });
    expect(response.status).toBe(403);
  });

  it.fails('does not let the administrator create accounts outside the invitation rules', async () => {
    const supplierOrg = await demoOrganisationOf('supplier');
    const response = await authCall('admin', 'POST', '/admin/create-user', {
      email: 'shortcut@example.test',
      password: 'short',
      name: 'Shortcut',
      role: 'arbiter',
      data: { organisationId: supplierOrg },
    });
    expect(response.status).toBeGreaterThanOrEqual(400);
  });
  // Last: if it succeeds it turns the administrator into an arbiter.
  it.fails('does not let the administrator give itself a case role', async () => {
    const me = (await (await authCall('admin', 'GET', '/get-session')).json()) as { user: { id: string } };
    const response = await authCall('admin', 'POST', '/admin/set-role', { userId: me.user.id, role: 'arbiter' });
    expect(response.status).toBe(403);
  });
});
