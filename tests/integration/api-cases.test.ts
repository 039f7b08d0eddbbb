import { beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { getDb } from '@/db/client';
import { delivery, disputeCase } from '@/db/schema';
import { GET as listRoute } from '@/app/api/v1/cases/route';
import { GET as caseRoute } from '@/app/api/v1/cases/[caseId]/route';
import { createOrganisation } from '@/db/seed/factories';
import type { CaseListPage } from '@/lib/dal/cases';
import type { CaseFile } from '@/lib/dal/case-file';
import { allCases, callRoute, demoOrganisationOf, expectProblem, seedDemoForTests, signIn, demoUser, type DemoKey } from './helpers';

type CaseRow = Awaited<ReturnType<typeof allCases>>[number];

const cookies = {} as Record<DemoKey, string>;
let cases: CaseRow[];
let otherLabId: string;
let otherBoardId: string;
let movedToOtherLab: CaseRow;
let movedToOtherBoard: CaseRow;

async function list(key: DemoKey | null, query = ''): Promise<Response> {
  return callRoute(listRoute, `/api/v1/cases${query}`, { cookie: key ? cookies[key] : undefined });
}

async function listBody(key: DemoKey, query = ''): Promise<CaseListPage> {
  const response = await list(key, query);
  expect(response.status).toBe(200);
  return (await response.json()) as CaseListPage;
}

async function fetchCase(key: DemoKey | null, caseId: string): Promise<Response> {
  return callRoute(caseRoute, `/api/v1/cases/${caseId}`, { cookie: key ? cookies[key] : undefined, params: { caseId } });
}

/** Every page of the list, so visibility checks do not depend on the default page size. */
async function everyCaseId(key: DemoKey): Promise<string[]> {
  const ids: string[] = [];
  for (let page = 1; ; page++) {
    const body = await listBody(key, `?pageSize=100&page=${page}`);
    ids.push(...body.items.map((i) => i.id));
    if (ids.length >= body.total || body.items.length === 0) return ids;
  }
}

const byStatus = (status: string) => {
  const found = cases.find((c) => c.status === status);
  if (!found) throw new Error(`The demo has no ${status} case`);
  return found;
};

beforeAll(async () => {
  await seedDemoForTests();
  // The demo has one laboratory and one board, so every case is theirs; a second of each, holding
  // one case, is what makes "only its own" checkable.
  const db = getDb();
  otherLabId = (await createOrganisation(db, { name: 'Second Referee Laboratory (test)', kind: 'lab' })).id;
  otherBoardId = (await createOrganisation(db, { name: 'Second Quality Board (test)', kind: 'board' })).id;
  const seeded = await allCases();
  // A case the demo laboratory never received a sample of: a laboratory that did keeps reading it.
  movedToOtherLab = seeded.find((c) => c.status === 'open')!;
  movedToOtherBoard = seeded.find((c) => c.status === 'withdrawn')!;
  await db.update(disputeCase).set({ labOrganisationId: otherLabId }).where(eq(disputeCase.id, movedToOtherLab.id));
  await db.update(disputeCase).set({ boardOrganisationId: otherBoardId }).where(eq(disputeCase.id, movedToOtherBoard.id));
  cases = await allCases();
  for (const key of ['admin', 'plant', 'lab', 'arbiter', 'supplier', 'supplier2'] as const) cookies[key] = await signIn(demoUser(key).email);
});

describe('without a session', () => {
  it('answers the list with 401 problem details', async () => {
    const problem = await expectProblem(await list(null), 401);
    expect(problem.code).toBe('unauthenticated');
  });

  it('answers a case with 401 problem details, even for an existing id', async () => {
    const problem = await expectProblem(await fetchCase(null, cases[0].id), 401);
    expect(problem.code).toBe('unauthenticated');
  });

  it('treats a forged session cookie as no session', async () => {
    const response = await callRoute(listRoute, '/api/v1/cases', { cookie: 'better-auth.session_token=forged.value' });
    await expectProblem(response, 401);
  });
});

describe('who sees which cases', () => {
  it('shows a supplier only the cases of its own organisation', async () => {
    for (const key of ['supplier', 'supplier2'] as const) {
      const orgId = await demoOrganisationOf(key);
      const expected = cases.filter((c) => c.supplierOrganisationId === orgId).map((c) => c.id);
      expect(expected.length).toBeGreaterThan(0);
      expect((await everyCaseId(key)).sort()).toEqual(expected.sort());
    }
  });

  it('gives the two demo suppliers disjoint sets', async () => {
    const first = new Set(await everyCaseId('supplier'));
    const second = await everyCaseId('supplier2');
    expect(second.filter((id) => first.has(id))).toEqual([]);
  });

  it('shows the plant the cases against its own intake', async () => {
    const orgId = await demoOrganisationOf('plant');
    const expected = cases.filter((c) => c.plantOrganisationId === orgId).map((c) => c.id);
    expect(expected.length).toBe(cases.length);
    expect((await everyCaseId('plant')).sort()).toEqual(expected.sort());
  });

  it('shows the laboratory only the cases assigned to it', async () => {
    const orgId = await demoOrganisationOf('lab');
    const expected = cases.filter((c) => c.labOrganisationId === orgId).map((c) => c.id);
    const seen = await everyCaseId('lab');
    expect(seen.sort()).toEqual(expected.sort());
    expect(seen).not.toContain(movedToOtherLab.id);
    expect(seen.length).toBe(cases.length - 1);
  });

  it("shows the arbiter only its board's cases", async () => {
    const orgId = await demoOrganisationOf('arbiter');
    const expected = cases.filter((c) => c.boardOrganisationId === orgId).map((c) => c.id);
    const seen = await everyCaseId('arbiter');
    expect(seen.sort()).toEqual(expected.sort());
    expect(seen).not.toContain(movedToOtherBoard.id);
  });

  it('refuses the list to the administrator with 403 and hides every case with 404', async () => {
    const problem = await expectProblem(await list('admin'), 403);
    expect(problem.code).toBe('forbidden');
    for (const c of cases) await expectProblem(await fetchCase('admin', c.id), 404);
  });

  it('opens a visible case file and answers 404 for a case of another supplier', async () => {
    const ownOrg = await demoOrganisationOf('supplier');
    const own = cases.find((c) => c.supplierOrganisationId === ownOrg)!;
    const foreign = cases.find((c) => c.supplierOrganisationId !== ownOrg)!;

    const ok = await fetchCase('supplier', own.id);
    expect(ok.status).toBe(200);
    const file = (await ok.json()) as CaseFile;
    expect(file.id).toBe(own.id);
    expect(file.number).toBe(own.number);

    const hidden = await expectProblem(await fetchCase('supplier', foreign.id), 404);
    const missing = await expectProblem(await fetchCase('supplier', crypto.randomUUID()), 404);
    // Someone else's case must be indistinguishable from one that does not exist.
    expect(hidden.detail).toBe(missing.detail);
    expect(hidden.title).toBe(missing.title);
  });

  it("answers 404 to the laboratory and the arbiter for cases moved to another lab or board", async () => {
    await expectProblem(await fetchCase('lab', movedToOtherLab.id), 404);
    await expectProblem(await fetchCase('arbiter', movedToOtherBoard.id), 404);
    expect((await fetchCase('plant', movedToOtherLab.id)).status).toBe(200);
  });

  it('answers 404 for a malformed id', async () => {
    for (const bad of ['not-a-uuid', '123', `${cases[0].id}x`, "' or 1=1 --"]) {
      const problem = await expectProblem(await fetchCase('plant', bad), 404);
      expect(problem.code).toBe('not_found');
    }
  });
});

describe('query validation', () => {
  it.each([
    ['?page=0', 'page'],
    ['?page=abc', 'page'],
    ['?pageSize=1000', 'pageSize'],
    ['?status=bogus', 'status'],
    ['?status=review,bogus', 'status'],
    ['?sort=price', 'sort'],
  ])('answers %s with 400 naming %s', async (query, field) => {
    const problem = await expectProblem(await list('plant', query), 400);
    expect(problem.code).toBe('invalid');
    expect(problem.errors).toBeDefined();
    const fields = Object.keys(problem.errors!);
    expect(fields.some((f) => f === field || f.startsWith(`${field}.`))).toBe(true);
    // Only the bad parameter is named.
    expect(fields.every((f) => f === field || f.startsWith(`${field}.`))).toBe(true);
  });

  it('names every bad field at once', async () => {
    const problem = await expectProblem(await list('plant', '?page=0&pageSize=1000&status=bogus'), 400);
    const fields = Object.keys(problem.errors!).map((f) => f.split('.')[0]);
    expect(new Set(fields)).toEqual(new Set(['page', 'pageSize', 'status']));
  });
});

describe('filters and paging', () => {
  it('filters by one status and by several', async () => {
    const review = await listBody('plant', '?status=review');
    const expected = cases.filter((c) => c.status === 'review');
    expect(review.total).toBe(expected.length);
    expect(review.items.map((i) => i.id).sort()).toEqual(expected.map((c) => c.id).sort());

    const live = await listBody('plant', '?status=open,awaiting_sample,retest');
    const expectedLive = cases.filter((c) => ['open', 'awaiting_sample', 'retest'].includes(c.status));
    expect(expectedLive.length).toBeGreaterThan(1);
    expect(live.total).toBe(expectedLive.length);
    expect(live.items.every((i) => ['open', 'awaiting_sample', 'retest'].includes(i.status))).toBe(true);
  });

  it('keeps the status filter inside the caller’s scope', async () => {
    const supplier2Org = await demoOrganisationOf('supplier2');
    const body = await listBody('supplier2', '?status=review,awaiting_sample,open');
    const expected = cases.filter((c) => c.supplierOrganisationId === supplier2Org && ['review', 'awaiting_sample', 'open'].includes(c.status));
    expect(body.total).toBe(expected.length);
    expect(body.items.map((i) => i.id).sort()).toEqual(expected.map((c) => c.id).sort());
  });

  it('searches by case number and by farm name', async () => {
    const target = byStatus('review');
    const byNumber = await listBody('plant', `?q=${encodeURIComponent(target.number)}`);
    expect(byNumber.total).toBe(1);
    expect(byNumber.items[0].id).toBe(target.id);

    const farmName = byNumber.items[0].farmName;
    const byFarm = await listBody('plant', `?q=${encodeURIComponent(farmName.toUpperCase())}`);
    expect(byFarm.items.map((i) => i.id)).toContain(target.id);
    expect(byFarm.items.every((i) => i.farmName === farmName || i.supplierName.includes(farmName) || i.deliveryReference.includes(farmName))).toBe(true);

    const nothing = await listBody('plant', '?q=no-such-farm-anywhere');
    expect(nothing.total).toBe(0);
    expect(nothing.items).toEqual([]);
  });

  it('searches by delivery reference and sorts by the time the delivery was received', async () => {
    const rows = await getDb().select({ id: disputeCase.id, deliveryId: disputeCase.deliveryId }).from(disputeCase);
    const deliveries = await getDb().select({ id: delivery.id, reference: delivery.reference, receivedAt: delivery.receivedAt }).from(delivery);
    const deliveryOf = new Map(rows.map((r) => [r.id, deliveries.find((d) => d.id === r.deliveryId)!]));

    const target = byStatus('review');
    const reference = deliveryOf.get(target.id)!.reference;
    const byReference = await listBody('plant', `?q=${encodeURIComponent(reference.toLowerCase())}`);
    expect(byReference.items.map((i) => i.id)).toEqual([target.id]);
    expect(byReference.items[0].deliveryReference).toBe(reference);

    const sorted = await listBody('plant', '?pageSize=100&sort=deliveredAt&order=asc');
    const expected = [...sorted.items].sort((a, b) => deliveryOf.get(a.id)!.receivedAt.getTime() - deliveryOf.get(b.id)!.receivedAt.getTime() || b.number.localeCompare(a.number));
    expect(sorted.items.map((i) => i.id)).toEqual(expected.map((i) => i.id));
    expect(sorted.items.map((i) => i.deliveredAt)).toEqual(expected.map((i) => deliveryOf.get(i.id)!.receivedAt.toISOString()));
  });

  it('refuses a case whose copy of its delivery’s reference, farm or time of receipt differs from the delivery', async () => {
    const target = byStatus('review');
    for (const change of [{ deliveryReference: 'D-EDITED' }, { deliveredAt: new Date('2020-01-01T00:00:00Z') }]) {
      const refused = await getDb().update(disputeCase).set(change).where(eq(disputeCase.id, target.id)).catch((error: unknown) => error);
      expect(refused).toMatchObject({ cause: { code: '23503', constraint: 'dispute_case_delivery_facts_fk' } });
    }
  });

  it('treats LIKE wildcards in the search text literally', async () => {
    const body = await listBody('plant', `?q=${encodeURIComponent('%')}`);
    expect(body.total).toBe(0);
  });

  it('pages through every case exactly once with a constant total', async () => {
    const pageSize = 2;
    const seen: string[] = [];
    const first = await listBody('plant', `?pageSize=${pageSize}&page=1`);
    expect(first.total).toBe(cases.length);
    expect(first.pageSize).toBe(pageSize);
    const pages = Math.ceil(first.total / pageSize);
    for (let page = 1; page <= pages; page++) {
      const body = await listBody('plant', `?pageSize=${pageSize}&page=${page}&sort=number&order=asc`);
      expect(body.page).toBe(page);
      expect(body.total).toBe(cases.length);
      expect(body.items.length).toBe(page < pages ? pageSize : cases.length - pageSize * (pages - 1));
      seen.push(...body.items.map((i) => i.number));
    }
    expect(seen).toEqual(cases.map((c) => c.number).sort());
    const beyond = await listBody('plant', `?pageSize=${pageSize}&page=${pages + 1}`);
    expect(beyond.items).toEqual([]);
    expect(beyond.total).toBe(cases.length);
  });
});

describe('the blind retest', () => {
  it('hides the intake value, verdict and amount from the laboratory until its retest is in', async () => {
    const body = await listBody('lab', '?pageSize=100');
    const plantView = await listBody('plant', '?pageSize=100');
    for (const status of ['awaiting_sample', 'retest'] as const) {
      const target = byStatus(status);
      const item = body.items.find((i) => i.id === target.id)!;
      expect(item, `lab sees the ${status} case`).toBeDefined();
      expect(item.valueTenthMilliC).toBeNull();
      expect(item.verdict).toBeNull();
      expect(item.amountMinor).toBeNull();
      // The plant's view of the same case carries them: the nulls above are the blind rule, not missing data.
      const plantItem = plantView.items.find((i) => i.id === target.id)!;
      expect(plantItem.valueTenthMilliC).not.toBeNull();
      expect(plantItem.verdict).not.toBeNull();
    }
    const reviewed = body.items.find((i) => i.id === byStatus('review').id)!;
    expect(reviewed.valueTenthMilliC).toEqual(expect.any(Number));
    expect(reviewed.verdict).toMatch(/^(deducted|rejected|accepted)$/);
    expect(reviewed.amountMinor).toEqual(expect.any(Number));
  });

  it('keeps the intake and the supplier’s account out of the blind case file', async () => {
    for (const status of ['awaiting_sample', 'retest'] as const) {
      const target = byStatus(status);
      const response = await fetchCase('lab', target.id);
      expect(response.status).toBe(200);
      const file = (await response.json()) as CaseFile;
      expect(file.blind).toBe(true);
      expect(file.intake).toBeNull();
      expect(file.explanation).toBeNull();
      expect(file.remedy).toBeNull();
      expect(file.measurementSets.some((s) => s.purpose === 'intake')).toBe(false);
      // Nor may an intake reading leak through the readings of any set it does get.
      expect(JSON.stringify(file)).not.toContain('"purpose":"intake"');

      const plantFile = (await (await fetchCase('plant', target.id)).json()) as CaseFile;
      expect(plantFile.blind).toBe(false);
      expect(plantFile.intake).not.toBeNull();
      expect(plantFile.explanation).toEqual(expect.any(String));
      expect(plantFile.measurementSets.some((s) => s.purpose === 'intake')).toBe(true);
    }
  });

  it('opens the full file to the laboratory once the retest is submitted', async () => {
    const target = byStatus('review');
    const file = (await (await fetchCase('lab', target.id)).json()) as CaseFile;
    expect(file.blind).toBe(false);
    expect(file.intake).not.toBeNull();
    expect(file.intake!.valueTenthMilliC).toEqual(expect.any(Number));
    expect(file.explanation).toEqual(expect.any(String));
    expect(file.measurementSets.map((s) => s.purpose).sort()).toEqual(['intake', 'retest']);
  });
});
