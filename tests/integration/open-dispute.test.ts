import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startMailCatcher } from '@/lib/mail/catcher';
import type { World } from './support/lifecycle';

// env() reads SMTP_URL once: the catcher must listen and the variables be set before the app is loaded.
const catcher = await startMailCatcher({ smtpPort: 0, httpPort: 0 });
process.env.SMTP_URL = `smtp://127.0.0.1:${catcher.smtpPort}`;
process.env.MAIL_CATCHER_URL = `http://127.0.0.1:${catcher.httpPort}`;

const { and, count, desc, eq, gt, inArray, isNull, max, ne, notExists, notLike } = await import('drizzle-orm');
const { getDb } = await import('@/db/client');
const { delivery, disputeCase, intakeResult, sample } = await import('@/db/schema');
const { openDispute } = await import('@/lib/dal/open-dispute');
const { runTransition } = await import('@/lib/dal/case-transition');
const { verifyAuditChain } = await import('@/lib/audit/verify');
const { resetMailTransport } = await import('@/lib/mail/transport');
const { POST: openRoute } = await import('@/app/api/v1/cases/route');
const { callRoute } = await import('./helpers');
const L = await import('./support/lifecycle');
const { HOUR, MINUTE } = L;

let world: World;

/** A result of the demo scenario the supplier may still contest, found as the deliveries page would offer it. */
async function contestableResultOf(supplierOrg: string, now = new Date()) {
  const db = getDb();
  const rows = await db
    .select({ id: intakeResult.id, deliveryId: intakeResult.deliveryId, notifiedAt: intakeResult.notifiedAt, verdict: intakeResult.verdict })
    .from(intakeResult)
    .innerJoin(delivery, eq(delivery.id, intakeResult.deliveryId))
    .where(
      and(
        eq(delivery.supplierOrganisationId, supplierOrg),
        notLike(delivery.reference, 'LW-TEST-%'),
        inArray(intakeResult.verdict, ['rejected', 'deducted']),
        gt(intakeResult.notifiedAt, new Date(now.getTime() - 24 * HOUR)),
        isNull(intakeResult.supersededAt),
        notExists(db.select({ id: disputeCase.id }).from(disputeCase).where(and(eq(disputeCase.intakeResultId, intakeResult.id), ne(disputeCase.status, 'withdrawn')))),
      ),
    )
    .orderBy(desc(intakeResult.notifiedAt));
  if (rows.length === 0) throw new Error('The demo has no contestable result for this supplier');
  return rows[0];
}

async function caseCount(): Promise<number> {
  const [row] = await getDb().select({ n: count() }).from(disputeCase);
  return row.n;
}

async function highestSequence(year: number): Promise<number> {
  const [row] = await getDb().select({ s: max(disputeCase.sequence) }).from(disputeCase).where(eq(disputeCase.year, year));
  return Number(row.s ?? 0);
}

function caughtFor(number: string, template: string) {
  return catcher.messages.filter((m) => m.subject.startsWith(`${number}:`) && m.template === template);
}

function post(cookie: string | undefined, body: string | undefined, contentType = 'application/json'): Promise<Response> {
  const headers = new Headers();
  if (cookie) headers.set('cookie', cookie);
  if (body !== undefined) headers.set('content-type', contentType);
  return openRoute(new Request('http://localhost:3000/api/v1/cases', { method: 'POST', headers, body }), { params: Promise.resolve({}) });
}

beforeAll(async () => {
  world = await L.setUpWorld();
});

afterAll(async () => {
  resetMailTransport();
  await catcher.close();
});

describe('opening a dispute', () => {
  it('opens the supplier’s contestable rejected delivery as the next case number, with its deadlines, audit event and mail', async () => {
    const result = await contestableResultOf(world.org.supplier);
    const now = new Date();
    const year = now.getUTCFullYear();
    const highest = await highestSequence(year);
    const seq = await L.lastAuditSeq();

    const created = await openDispute(getDb(), world.actors.supplier, L.disputeBody(result.id), { now, origin: 'web 198.51.100.7' });

    expect(created.number).toBe(`CS-${year}-${String(highest + 1).padStart(4, '0')}`);
    expect(created.number).toMatch(/^CS-\d{4}-\d{4}$/);
    expect(created).toMatchObject({
      status: 'open',
      year,
      sequence: highest + 1,
      intakeResultId: result.id,
      deliveryId: result.deliveryId,
      supplierOrganisationId: world.org.supplier,
      plantOrganisationId: world.org.plant,
      boardOrganisationId: world.org.board,
      labOrganisationId: null,
      grounds: ['instrument'],
      openedBy: world.actors.supplier.userId,
      retestSubmittedAt: null,
      decisionDueAt: null,
    });
    expect(created.openedAt.getTime()).toBe(now.getTime());
    expect(created.dispatchDueAt?.getTime()).toBe(now.getTime() + 4 * HOUR);
    const [retained] = await getDb().select().from(sample).where(and(eq(sample.deliveryId, result.deliveryId), eq(sample.kind, 'retained')));
    expect(created.sampleValidUntil?.getTime()).toBe(retained.sampledAt.getTime() + 48 * HOUR);

    const events = await L.auditSince(seq);
    expect(events).toHaveLength(1);
    expect(events[0]).toMatchObject({ action: 'case.opened', objectId: created.id, caseId: created.id, actorUserId: world.actors.supplier.userId, origin: 'web 198.51.100.7', change: { number: created.number, status: 'open' } });
    expect(await verifyAuditChain(getDb())).toMatchObject({ ok: true });

    const mail = caughtFor(created.number, 'case-opened');
    expect(mail.flatMap((m) => m.to).sort()).toEqual([world.actors.arbiter.email, world.actors.arbiter2.email, world.actors.plant.email].sort());
    expect(mail.every((m) => m.subject === `${created.number}: a supplier contests an intake result`)).toBe(true);
    expect(mail[0].text).toContain('Dispatch due by');
    expect(mail[0].text).toContain(world.actors.supplier.organisationName);
  });

  it('refuses a second dispute on the same result with conflict naming the live case, and changes nothing', async () => {
    const fresh = await L.createIntakeResult(world);
    const first = await openDispute(getDb(), world.actors.supplier, L.disputeBody(fresh.intakeResultId));
    const cases = await caseCount();
    const seq = await L.lastAuditSeq();
    const mails = catcher.messages.length;

    const error = await L.expectAppError(openDispute(getDb(), world.actors.supplier, L.disputeBody(fresh.intakeResultId)), 'conflict');
    expect(error.message).toContain(first.number);
    expect(await caseCount()).toBe(cases);
    expect(await L.lastAuditSeq()).toBe(seq);
    expect(catcher.messages.length).toBe(mails);
  });

  it('refuses after the contest window with conflict naming the closing time', async () => {
    const result = await contestableResultOf(world.org.supplier2);
    const closesAt = new Date(result.notifiedAt!.getTime() + 24 * HOUR);
    const cases = await caseCount();

    const error = await L.expectAppError(openDispute(getDb(), world.actors.supplier2, L.disputeBody(result.id), { now: new Date(result.notifiedAt!.getTime() + 25 * HOUR) }), 'conflict');

    expect(error.message).toMatch(/contest window/i);
    // The closing time as shown everywhere: day, year and the UTC clock time.
    expect(error.message).toContain(`${closesAt.getUTCFullYear()}, ${closesAt.toISOString().slice(11, 16)} UTC`);
    expect(error.message).toContain(String(closesAt.getUTCDate()));
    expect(await caseCount()).toBe(cases);
  });

  it('keeps the window open up to its last minute and closed a minute after', async () => {
    const fresh = await L.createIntakeResult(world);
    const closesAt = fresh.notifiedAt!.getTime() + 24 * HOUR;
    await L.expectAppError(openDispute(getDb(), world.actors.supplier, L.disputeBody(fresh.intakeResultId), { now: new Date(closesAt + MINUTE) }), 'conflict');
    const opened = await openDispute(getDb(), world.actors.supplier, L.disputeBody(fresh.intakeResultId), { now: new Date(closesAt - MINUTE) });
    expect(opened.status).toBe('open');
  });

  it('refuses an accepted delivery with conflict', async () => {
    const [accepted] = await getDb()
      .select({ id: intakeResult.id })
      .from(intakeResult)
      .innerJoin(delivery, eq(delivery.id, intakeResult.deliveryId))
      .where(and(eq(delivery.supplierOrganisationId, world.org.supplier), eq(intakeResult.verdict, 'accepted')))
      .orderBy(desc(intakeResult.decidedAt))
      .limit(1);
    const cases = await caseCount();
    const error = await L.expectAppError(openDispute(getDb(), world.actors.supplier, L.disputeBody(accepted.id)), 'conflict');
    expect(error.message).toMatch(/accepted/);
    expect(await caseCount()).toBe(cases);
  });

  it('refuses a result the supplier was not told of, and one corrected since', async () => {
    const unnotified = await L.createIntakeResult(world, { notified: false });
    expect((await L.expectAppError(openDispute(getDb(), world.actors.supplier, L.disputeBody(unnotified.intakeResultId)), 'conflict')).message).toMatch(/not been told/);
    const corrected = await L.createIntakeResult(world, { superseded: true });
    expect((await L.expectAppError(openDispute(getDb(), world.actors.supplier, L.disputeBody(corrected.intakeResultId)), 'conflict')).message).toMatch(/corrected/);
  });

  it('answers not_found for another supplier’s result, exactly as for one that does not exist', async () => {
    const foreign = await contestableResultOf(world.org.supplier2);
    const cases = await caseCount();
    const hidden = await L.expectAppError(openDispute(getDb(), world.actors.supplier, L.disputeBody(foreign.id)), 'not_found');
    const missing = await L.expectAppError(openDispute(getDb(), world.actors.supplier, L.disputeBody(crypto.randomUUID())), 'not_found');
    expect(hidden.message).toBe(missing.message);
    expect(await caseCount()).toBe(cases);
  });

  it.each(['plant', 'lab', 'arbiter', 'admin'] as const)('refuses the %s role with forbidden', async (key) => {
    const fresh = await L.createIntakeResult(world);
    const cases = await caseCount();
    await L.expectAppError(openDispute(getDb(), world.actors[key], L.disputeBody(fresh.intakeResultId)), 'forbidden');
    expect(await caseCount()).toBe(cases);
  });

  it('lets the supplier open again once its earlier dispute on the result was withdrawn', async () => {
    const fresh = await L.createIntakeResult(world);
    const first = await openDispute(getDb(), world.actors.supplier, L.disputeBody(fresh.intakeResultId));
    await runTransition(getDb(), world.actors.supplier, first.id, 'withdraw', L.inputs.withdraw(world));
    const second = await openDispute(getDb(), world.actors.supplier, L.disputeBody(fresh.intakeResultId));
    expect(second.id).not.toBe(first.id);
    expect(second.status).toBe('open');
    expect(second.sequence).toBe(first.sequence + 1);
  });
});

describe('simultaneous openings', () => {
  it('gives two suppliers opening at the same moment distinct, consecutive numbers', async () => {
    const [a, b] = [await L.createIntakeResult(world, { supplier: 'supplier' }), await L.createIntakeResult(world, { supplier: 'supplier2' })];
    const highest = await highestSequence(new Date().getUTCFullYear());
    const [first, second] = await Promise.all([
      openDispute(getDb(), world.actors.supplier, L.disputeBody(a.intakeResultId)),
      openDispute(getDb(), world.actors.supplier2, L.disputeBody(b.intakeResultId)),
    ]);
    expect(first.number).not.toBe(second.number);
    expect([first.sequence, second.sequence].sort((x, y) => x - y)).toEqual([highest + 1, highest + 2]);
    expect(first.supplierOrganisationId).toBe(world.org.supplier);
    expect(second.supplierOrganisationId).toBe(world.org.supplier2);
  });

  it('numbers five simultaneous openings without a gap or a repeat', async () => {
    const results = [];
    for (let i = 0; i < 5; i++) results.push(await L.createIntakeResult(world, { supplier: i % 2 ? 'supplier2' : 'supplier' }));
    const highest = await highestSequence(new Date().getUTCFullYear());
    const opened = await Promise.all(results.map((r, i) => openDispute(getDb(), world.actors[i % 2 ? 'supplier2' : 'supplier'], L.disputeBody(r.intakeResultId))));
    expect(opened.map((c) => c.sequence).sort((x, y) => x - y)).toEqual([1, 2, 3, 4, 5].map((n) => highest + n));
    expect(new Set(opened.map((c) => c.number)).size).toBe(5);
    expect(await verifyAuditChain(getDb())).toMatchObject({ ok: true });
  });

  it('opens one case when the same result is contested twice at once', async () => {
    const fresh = await L.createIntakeResult(world);
    const cases = await caseCount();
    const outcomes = await Promise.allSettled([
      openDispute(getDb(), world.actors.supplier, L.disputeBody(fresh.intakeResultId)),
      openDispute(getDb(), world.actors.supplier, L.disputeBody(fresh.intakeResultId)),
    ]);
    expect(outcomes.map((o) => o.status).sort()).toEqual(['fulfilled', 'rejected']);
    expect((outcomes.find((o) => o.status === 'rejected') as PromiseRejectedResult).reason).toMatchObject({ name: 'AppError', code: 'conflict' });
    expect(await caseCount()).toBe(cases + 1);
  });
});

describe('POST /api/v1/cases', () => {
  it('answers 201 with the new case and its Location', async () => {
    const fresh = await L.createIntakeResult(world, { supplier: 'supplier2' });
    const response = await callRoute(openRoute, '/api/v1/cases', { cookie: world.cookies.supplier2, method: 'POST', body: L.disputeBody(fresh.intakeResultId) });
    expect(response.status).toBe(201);
    const body = (await response.json()) as { id: string; number: string; status: string };
    expect(body).toMatchObject({ status: 'open', number: expect.stringMatching(/^CS-\d{4}-\d{4}$/) });
    expect(response.headers.get('location')).toBe(`/api/v1/cases/${body.id}`);
    const stored = await L.caseRow(body.id);
    expect(stored).toMatchObject({ number: body.number, intakeResultId: fresh.intakeResultId, supplierOrganisationId: world.org.supplier2 });
    const [event] = (await L.auditSince(0)).filter((e) => e.caseId === body.id);
    expect(event.origin).toBe('api unknown address');
  });

  it.each([
    ['no grounds', { grounds: [] }, ['grounds']],
    ['a ground that does not exist', { grounds: ['weather'] }, ['grounds.0']],
    ['a short explanation', { explanation: 'Too warm.' }, ['explanation']],
    ['a missing remedy', { remedy: undefined }, ['remedy']],
    ['no grounds and a short explanation', { grounds: [], explanation: 'Too warm.' }, ['explanation', 'grounds']],
    ['a result id that is no uuid', { intakeResultId: 'LW-20261201-UL-112' }, ['intakeResultId']],
  ] as const)('answers 400 for %s, naming the fields', async (_title, change, fields) => {
    const fresh = await L.createIntakeResult(world);
    const cases = await caseCount();
    const response = await callRoute(openRoute, '/api/v1/cases', { cookie: world.cookies.supplier, method: 'POST', body: { ...L.disputeBody(fresh.intakeResultId), ...change } });
    const problem = await L.expectProblem(response, 400);
    expect(problem.code).toBe('invalid');
    expect(Object.keys(problem.errors ?? {}).sort()).toEqual([...fields].sort());
    expect(await caseCount()).toBe(cases);
  });

  it('answers 415 for a body that is not JSON, 400 for broken JSON, 401 without a session', async () => {
    const fresh = await L.createIntakeResult(world);
    const cases = await caseCount();
    const json = JSON.stringify(L.disputeBody(fresh.intakeResultId));
    expect((await L.expectProblem(await post(world.cookies.supplier, json, 'text/plain'), 415)).code).toBe('unsupported_media_type');
    expect((await L.expectProblem(await post(world.cookies.supplier, `intakeResultId=${fresh.intakeResultId}`, 'application/x-www-form-urlencoded'), 415)).code).toBe('unsupported_media_type');
    expect((await L.expectProblem(await post(world.cookies.supplier, '{"intakeResultId":', 'application/json'), 400)).code).toBe('invalid');
    expect((await L.expectProblem(await post(undefined, json), 401)).code).toBe('unauthenticated');
    expect(await caseCount()).toBe(cases);
  });

  it('answers 409 for a closed window, 404 for a foreign result and 403 for the plant', async () => {
    const fresh = await L.createIntakeResult(world, { at: new Date(Date.now() - 30 * HOUR) });
    const cases = await caseCount();
    expect((await L.expectProblem(await post(world.cookies.supplier, JSON.stringify(L.disputeBody(fresh.intakeResultId))), 409)).code).toBe('conflict');
    expect((await L.expectProblem(await post(world.cookies.supplier2, JSON.stringify(L.disputeBody(fresh.intakeResultId))), 404)).code).toBe('not_found');
    expect((await L.expectProblem(await post(world.cookies.plant, JSON.stringify(L.disputeBody(fresh.intakeResultId))), 403)).code).toBe('forbidden');
    expect(await caseCount()).toBe(cases);
  });
});
