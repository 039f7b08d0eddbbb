import { beforeAll, describe, expect, it } from 'vitest';
import { can, isRole, roleNames, roles, statement, type Role } from '@/lib/auth/permissions';
import { GET as listRoute } from '@/app/api/v1/cases/route';
import { GET as caseRoute } from '@/app/api/v1/cases/[caseId]/route';
import { GET as authGet, POST as authPost } from '@/app/api/auth/[...all]/route';
import { POST as transitionRoute } from '@/app/api/v1/cases/[caseId]/transitions/[transition]/route';
import { POST as assessmentsRoute } from '@/app/api/v1/assessments/route';
import { GET as openApiRoute } from '@/app/api/v1/openapi.json/route';
import { POST as openCaseRoute } from '@/app/api/v1/cases/route';
import { transitionNames } from '@/lib/cases/lifecycle';
import { getAuth } from '@/lib/auth/auth';
import { allCases, callRoute, demoKeys, demoOrganisationOf, demoUser, seedDemoForTests, signIn, TEST_PASSWORD, type DemoKey } from './helpers';

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

  it('gives of better-auth’s user administration only looking and barring, to the administrator only', () => {
    // Creating accounts, changing roles, setting passwords and impersonating would each bypass the
    // invitations or the separation of duties, so no role has them.
    const expected: Record<string, Role[]> = {
      'user.list': ['admin'],
      'user.get': ['admin'],
      'user.ban': ['admin'],
      'user.create': [],
      'user.set-role': [],
      'user.set-password': [],
      'user.impersonate': [],
      'user.impersonate-admins': [],
      'user.set-email': [],
      'user.set-phone': [],
      'user.update': [],
      'user.delete': [],
      'session.list': ['admin'],
      'session.revoke': ['admin'],
      'session.delete': [],
    };
    expect(Object.keys(expected).sort()).toEqual(
      (['user', 'session'] as const).flatMap((resource) => (statement[resource] as readonly string[]).map((action) => `${resource}.${action}`)).sort(),
    );
    for (const role of everyone) {
      for (const [key, allowed] of Object.entries(expected)) {
        const [resource, action] = key.split('.');
        expect(roles[role].authorize({ [resource]: [action] } as never).success, `${role} ${key}`).toBe(allowed.includes(role));
      }
    }
  });

  it('refuses unknown roles', () => {
    for (const role of ['', 'Admin', 'superuser', 'board', 'user']) {
      expect(can(role, 'case', 'list')).toBe(false);
      expect(can(role, 'rules', 'read')).toBe(false);
    }
  });

  it('refuses role names that exist on Object.prototype', () => {
    for (const role of ['constructor', 'toString', '__proto__', 'hasOwnProperty']) expect(isRole(role)).toBe(false);
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

  it('POST /api/auth/admin/create-user, set-role, set-user-password and impersonate-user are refused to everyone', async () => {
    const supplierOrg = await demoOrganisationOf('supplier');
    const arbiter = (await (await authCall('arbiter', 'GET', '/get-session')).json()) as { user: { id: string } };
    const calls: [string, unknown][] = [
      ['/admin/create-user', { email: 'shortcut@example.test', password: 'a-long-enough-password', name: 'Shortcut', role: 'arbiter', data: { organisationId: supplierOrg } }],
      ['/admin/set-role', { userId: arbiter.user.id, role: 'admin' }],
      ['/admin/set-user-password', { userId: arbiter.user.id, newPassword: 'taken-over-password-1' }],
      ['/admin/impersonate-user', { userId: arbiter.user.id }],
    ];
    for (const [path, body] of calls) {
      const statuses = await walk((who) => authCall(who, 'POST', path, body));
      expect({ path, statuses }).toEqual({ path, statuses: { admin: 403, plant: 403, lab: 403, arbiter: 403, arbiter2: 403, supplier: 403, supplier2: 403, anonymous: 401 } });
    }
    // Nothing above took effect: no account was made, the arbiter keeps role and password.
    const shortcut = await authCall('admin', 'GET', '/admin/list-users?searchField=email&searchValue=shortcut@example.test');
    expect(((await shortcut.json()) as { users: unknown[] }).users).toEqual([]);
    const still = (await (await authCall('arbiter', 'GET', '/get-session')).json()) as { user: { role: string } };
    expect(still.user.role).toBe('arbiter');
    expect(await signIn(demoUser('arbiter').email)).toMatch(/session_token=/);
  });

  it('POST /api/v1/cases (open a dispute) is the supplier’s alone', async () => {
    // An empty body is refused by every role that may open, before anything is written.
    const statuses = await walk((who) => callRoute(openCaseRoute, '/api/v1/cases', { cookie: cookieOf(who), method: 'POST', body: {} }));
    expectWalk(statuses, { admin: 403, plant: 403, lab: 403, arbiter: 403, arbiter2: 403, supplier: 400, supplier2: 400, anonymous: 401 });
  });

  it('POST /api/v1/cases/{id}/transitions/{name}: outsiders 404, parties without the right 403, the right party 400 for an empty body', async () => {
    const mayMake: Record<string, DemoKey[]> = {
      dispatch: ['plant'],
      receive: ['lab'],
      submit_retest: ['lab'],
      order_further_test: ['arbiter', 'arbiter2'],
      withdraw: ['supplier'],
    };
    expect(Object.keys(mayMake).sort()).toEqual([...transitionNames].sort());
    for (const transition of transitionNames) {
      const params = { caseId: supplierCaseId, transition };
      const statuses = await walk((who) =>
        callRoute(transitionRoute, `/api/v1/cases/${supplierCaseId}/transitions/${transition}`, { cookie: cookieOf(who), method: 'POST', body: {}, params }),
      );
      const expected = Object.fromEntries(
        walkers.map((w) => [w, w === 'anonymous' ? 401 : w === 'admin' || w === 'supplier2' ? 404 : mayMake[transition].includes(w) ? 400 : 403]),
      ) as Record<Who, number>;
      expect({ transition, statuses }).toEqual({ transition, statuses: expected });
    }
  });

  it('POST /api/v1/cases/{id}/transitions/{name} answers 404 for a name that is no transition', async () => {
    for (const transition of ['decide', 'nope', 'DISPATCH']) {
      const params = { caseId: supplierCaseId, transition };
      const statuses = await walk((who) =>
        callRoute(transitionRoute, `/api/v1/cases/${supplierCaseId}/transitions/${transition}`, { cookie: cookieOf(who), method: 'POST', body: {}, params }),
      );
      expect({ transition, statuses }).toEqual({ transition, statuses: { admin: 404, plant: 404, lab: 404, arbiter: 404, arbiter2: 404, supplier: 404, supplier2: 404, anonymous: 401 } });
    }
  });

  it('POST /api/v1/cases/{id}/transitions/{name} answers 404, not 500, for names inherited from Object.prototype', async () => {
    for (const transition of ['constructor', 'toString', '__proto__']) {
      const params = { caseId: supplierCaseId, transition };
      const response = await callRoute(transitionRoute, `/api/v1/cases/${supplierCaseId}/transitions/${transition}`, { cookie: cookieOf('plant'), method: 'POST', body: {}, params });
      expect({ transition, status: response.status }).toEqual({ transition, status: 404 });
    }
  });

  it('POST /api/v1/assessments is open to every signed-in role and checks its body', async () => {
    const statuses = await walk((who) => callRoute(assessmentsRoute, '/api/v1/assessments', { cookie: cookieOf(who), method: 'POST', body: {} }));
    expectWalk(statuses, { admin: 400, plant: 400, lab: 400, arbiter: 400, arbiter2: 400, supplier: 400, supplier2: 400, anonymous: 401 });
  });

  it('GET /api/v1/openapi.json is public', async () => {
    const statuses = await walk((who) => callRoute(openApiRoute, '/api/v1/openapi.json', { cookie: cookieOf(who) }));
    expectWalk(statuses, { admin: 200, plant: 200, lab: 200, arbiter: 200, arbiter2: 200, supplier: 200, supplier2: 200, anonymous: 200 });
  });

  it('POST /api/auth/admin/ban-user is the administrator’s, and a banned person’s session stops working', async () => {
    const target = (await (await authCall('arbiter2', 'GET', '/get-session')).json()) as { user: { id: string } };
    const parties = walkers.filter((w) => w !== 'admin' && w !== 'arbiter2');
    for (const who of parties) {
      expect((await authCall(who, 'POST', '/admin/ban-user', { userId: target.user.id })).status, who).toBe(who === 'anonymous' ? 401 : 403);
    }
    expect((await callRoute(listRoute, '/api/v1/cases', { cookie: cookies.arbiter2 })).status).toBe(200);
    expect((await authCall('admin', 'POST', '/admin/ban-user', { userId: target.user.id, banReason: 'integration test' })).status).toBe(200);
    expect((await callRoute(listRoute, '/api/v1/cases', { cookie: cookies.arbiter2 })).status).toBe(401);
    const again = await getAuth().api.signInEmail({ body: { email: demoUser('arbiter2').email, password: TEST_PASSWORD }, asResponse: true });
    expect(again.status).toBe(403);
  });
});
