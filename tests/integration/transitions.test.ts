import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startMailCatcher } from '@/lib/mail/catcher';
import type { ErrorCode } from '@/lib/errors';
import type { TransitionName } from '@/lib/cases/lifecycle';
import type { ActorKey, World } from './support/lifecycle';

// env() reads SMTP_URL once: the catcher must listen and the variables be set before the app is loaded.
const catcher = await startMailCatcher({ smtpPort: 0, httpPort: 0 });
process.env.SMTP_URL = `smtp://127.0.0.1:${catcher.smtpPort}`;
process.env.MAIL_CATCHER_URL = `http://127.0.0.1:${catcher.httpPort}`;

const { and, eq } = await import('drizzle-orm');
const { getDb } = await import('@/db/client');
const { calibrationCheck, disputeCase, measurementSet, reading, sample } = await import('@/db/schema');
const { runTransition } = await import('@/lib/dal/case-transition');
const { verifyAuditChain } = await import('@/lib/audit/verify');
const { resetMailTransport } = await import('@/lib/mail/transport');
const L = await import('./support/lifecycle');
const { HOUR } = L;

let world: World;

type Fixture = 'open' | 'awaiting_sample' | 'retest' | 'review' | 'decided' | 'withdrawn' | 'demoOpen';
const fixtures = {} as Record<Fixture, string>;

function caughtFor(number: string, template: string) {
  return catcher.messages.filter((m) => m.subject.startsWith(`${number}:`) && m.template === template);
}

function recipientsOf(number: string, template: string): string[] {
  return caughtFor(number, template).flatMap((m) => m.to).sort();
}

async function expectChainIntact() {
  expect(await verifyAuditChain(getDb())).toMatchObject({ ok: true });
}

/** The next Friday 10:00 UTC: five working days from a Friday land exactly a week later. */
function nextFridayMorning(): Date {
  const d = new Date();
  d.setUTCHours(10, 0, 0, 0);
  do d.setUTCDate(d.getUTCDate() + 1);
  while (d.getUTCDay() !== 5);
  return d;
}

beforeAll(async () => {
  world = await L.setUpWorld();
  fixtures.open = (await L.freshCaseIn(world, 'open')).id;
  fixtures.awaiting_sample = (await L.freshCaseIn(world, 'awaiting_sample')).id;
  fixtures.retest = (await L.freshCaseIn(world, 'retest')).id;
  fixtures.review = (await L.freshCaseIn(world, 'review')).id;
  const demo = await getDb().select().from(disputeCase).where(eq(disputeCase.supplierOrganisationId, world.org.supplier));
  fixtures.decided = demo.find((c) => c.status === 'decided')!.id;
  fixtures.withdrawn = demo.find((c) => c.status === 'withdrawn')!.id;
  // The seeded open case already names the laboratory, so the lab can see it and be refused for its role.
  fixtures.demoOpen = demo.find((c) => c.status === 'open' && c.labOrganisationId === world.org.lab)!.id;
});

afterAll(async () => {
  resetMailTransport();
  await catcher.close();
});

describe('dispatch', () => {
  it('moves an open case to awaiting the sample, assigns the laboratory and records one custody event and one audit event', async () => {
    const c = await L.freshCaseIn(world, 'open');
    expect(c.labOrganisationId).toBeNull();
    const before = await L.snapshot(c.id);
    const seq = await L.lastAuditSeq();
    const now = new Date();

    const outcome = await runTransition(getDb(), world.actors.plant, c.id, 'dispatch', await L.inputs.dispatch(world, c.id, { answer: 'Instrument checked that morning.' }), { origin: 'web 192.0.2.10', now });

    expect(outcome).toEqual({ caseId: c.id, number: c.number, from: 'open', to: 'awaiting_sample', transition: 'dispatch' });
    const after = await L.caseRow(c.id);
    expect(after.status).toBe('awaiting_sample');
    expect(after.labOrganisationId).toBe(world.org.lab);
    expect(after.updatedAt.getTime()).toBe(now.getTime());

    const custody = await L.custodyOfCase(c.id);
    expect(custody.length).toBe(before.custody + 1);
    const dispatched = custody.filter((e) => e.kind === 'dispatched');
    expect(dispatched).toHaveLength(1);
    expect(dispatched[0]).toMatchObject({
      sampleId: c.fresh.retainedSampleId,
      at: now,
      organisationId: world.org.plant,
      actorUserId: world.actors.plant.userId,
      location: 'Cool box 7 with data logger, by courier',
      tempTenthMilliC: 42_000,
      sealIntact: true,
      frozen: false,
      note: 'Instrument checked that morning.',
    });

    const events = await L.auditSince(seq);
    expect(events).toHaveLength(1);
    expect(events[0]).toMatchObject({
      action: 'case.transitioned',
      objectType: 'case',
      objectId: c.id,
      caseId: c.id,
      actorUserId: world.actors.plant.userId,
      actorOrganisationId: world.org.plant,
      origin: 'web 192.0.2.10',
      change: { from: 'open', to: 'awaiting_sample', transition: 'dispatch', detail: { sealNumber: c.fresh.sealNumber, sampleCode: c.fresh.retainedCode } },
    });
    expect((await L.snapshot(c.id)).measurementSets).toBe(before.measurementSets);
    await expectChainIntact();
  });

  it("mails the laboratory's users that the sample is on its way, and the supplier and board that it was dispatched", async () => {
    const c = await L.freshCaseIn(world, 'open');
    await runTransition(getDb(), world.actors.plant, c.id, 'dispatch', await L.inputs.dispatch(world, c.id));

    const toLab = caughtFor(c.number, 'case-dispatched').filter((m) => m.to.includes(world.actors.lab.email));
    expect(toLab).toHaveLength(1);
    expect(toLab[0].to).toEqual([world.actors.lab.email]);
    expect(toLab[0].subject).toBe(`${c.number}: a retained sample is on its way to you`);
    expect(toLab[0].text).toContain(c.fresh.retainedCode);
    expect(recipientsOf(c.number, 'case-dispatched')).toEqual(
      [world.actors.lab.email, world.actors.supplier.email, world.actors.arbiter.email, world.actors.arbiter2.email].sort(),
    );
    // The plant made the change and the administrator is no party: neither is told.
    expect(recipientsOf(c.number, 'case-dispatched')).not.toContain(world.actors.plant.email);
    expect(recipientsOf(c.number, 'case-dispatched')).not.toContain(world.actors.admin.email);
    const rows = (await L.mailOfCase(c.id)).filter((m) => m.template === 'case-dispatched');
    expect(rows.map((r) => r.status)).toEqual(['sent', 'sent', 'sent']);
  });
});

describe('receive', () => {
  it('moves the case to retest with a receipt and a seal check in custody', async () => {
    const c = await L.freshCaseIn(world, 'awaiting_sample');
    const before = await L.snapshot(c.id);
    const seq = await L.lastAuditSeq();
    const now = new Date();

    const outcome = await runTransition(getDb(), world.actors.lab, c.id, 'receive', await L.inputs.receive(world, c.id), { now });

    expect(outcome).toMatchObject({ from: 'awaiting_sample', to: 'retest', transition: 'receive' });
    expect((await L.caseRow(c.id)).status).toBe('retest');
    const custody = await L.custodyOfCase(c.id);
    expect(custody.length).toBe(before.custody + 2);
    const received = custody.find((e) => e.kind === 'received')!;
    expect(received).toMatchObject({ sampleId: c.fresh.retainedSampleId, at: now, organisationId: world.org.lab, location: world.actors.lab.organisationName, tempTenthMilliC: 46_000, sealIntact: true, frozen: false });
    const sealChecked = custody.find((e) => e.kind === 'seal_checked')!;
    expect(sealChecked).toMatchObject({ sealIntact: true, organisationId: world.org.lab });
    expect(sealChecked.note).toContain(c.fresh.sealNumber);

    const events = await L.auditSince(seq);
    expect(events).toHaveLength(1);
    expect(events[0]).toMatchObject({ action: 'case.transitioned', caseId: c.id, actorUserId: world.actors.lab.userId, change: { from: 'awaiting_sample', to: 'retest', transition: 'receive', detail: { sealIntact: true, frozen: false } } });
    await expectChainIntact();
  });

  it('records a seal that does not match as not intact instead of refusing the receipt', async () => {
    const c = await L.freshCaseIn(world, 'awaiting_sample');
    await runTransition(getDb(), world.actors.lab, c.id, 'receive', await L.inputs.receive(world, c.id, { sealNumber: 'LVS-999999' }));
    expect((await L.caseRow(c.id)).status).toBe('retest');
    const custody = await L.custodyOfCase(c.id);
    expect(custody.find((e) => e.kind === 'received')!.sealIntact).toBe(false);
    const check = custody.find((e) => e.kind === 'seal_checked')!;
    expect(check.sealIntact).toBe(false);
    expect(check.note).toContain('LVS-999999');
    expect(check.note).toContain(c.fresh.sealNumber);
  });
});

describe('submit_retest', () => {
  it.each([
    { readings: [-0.519, -0.5196], result: -5193, basis: 'mean_of_2', used: 2 },
    { readings: [-0.51, -0.515, -0.512, -0.513], result: -5125, basis: 'mean_of_4', used: 4 },
    { readings: [-0.51, -0.515, -0.52, -0.513], result: -5140, basis: 'median_of_4', used: 4 },
  ])('stores the set with the module’s final result ($basis) and moves the case to review', async ({ readings, result, basis, used }) => {
    const c = await L.freshCaseIn(world, 'retest');
    const before = await L.snapshot(c.id);
    const seq = await L.lastAuditSeq();
    const now = nextFridayMorning();
    const body = L.inputs.submit_retest(world, { readings: readings.map((value) => ({ value })), resultTenthMilliC: -4000, result: -0.4 });

    const outcome = await runTransition(getDb(), world.actors.lab, c.id, 'submit_retest', body, { now });

    expect(outcome).toMatchObject({ from: 'retest', to: 'review', transition: 'submit_retest' });
    const after = await L.caseRow(c.id);
    expect(after.status).toBe('review');
    expect(after.retestSubmittedAt?.getTime()).toBe(now.getTime());
    // Five working days from a Friday is the next Friday, across one weekend.
    expect(after.decisionDueAt?.getTime()).toBe(now.getTime() + 7 * 24 * HOUR);

    const sets = await getDb().select().from(measurementSet).where(eq(measurementSet.caseId, c.id));
    expect(sets).toHaveLength(before.measurementSets + 1);
    const set = sets[0];
    // The client's own "result" fields are ignored: the stored result is computed from the readings.
    expect(set).toMatchObject({ purpose: 'retest', sampleId: c.fresh.retainedSampleId, organisationId: world.org.lab, instrumentId: world.labInstrumentId, resultTenthMilliC: result, resultBasis: basis, readingsUsed: used, analystName: 'I. Halloran', preparation: 'none', sampleTempTenthMilliC: 201_000 });
    expect(set.submittedAt?.getTime()).toBe(now.getTime());
    const stored = await getDb().select().from(reading).where(eq(reading.measurementSetId, set.id)).orderBy(reading.position);
    expect(stored.map((r) => [r.position, r.valueTenthMilliC])).toEqual(readings.map((v, i) => [i + 1, Math.round(v * 10_000)]));
    const [check] = await getDb().select().from(calibrationCheck).where(eq(calibrationCheck.id, set.calibrationCheckId!));
    expect(check).toMatchObject({ instrumentId: world.labInstrumentId, pass: true, within: 5, required: 3, readingsTenthMilliC: [-5121, -5118, -5124, -5119, -5122] });

    const opened = (await L.custodyOfCase(c.id)).filter((e) => e.kind === 'opened');
    expect(opened).toHaveLength(1);
    expect(opened[0].at.getTime()).toBe(new Date(body.testedAt as string).getTime());

    const events = await L.auditSince(seq);
    expect(events).toHaveLength(1);
    expect(events[0]).toMatchObject({ action: 'case.transitioned', caseId: c.id, change: { from: 'retest', to: 'review', transition: 'submit_retest', detail: { measurementSetId: set.id, readings: readings.length, used, basis, result: result / 10_000 } } });
    await expectChainIntact();
  });

  it("mails the board's arbiters that the case is ready for review, and not the laboratory", async () => {
    const c = await L.freshCaseIn(world, 'retest');
    await runTransition(getDb(), world.actors.lab, c.id, 'submit_retest', L.inputs.submit_retest(world));
    const toBoard = caughtFor(c.number, 'case-retested').filter((m) => m.to.includes(world.actors.arbiter.email));
    expect(toBoard).toHaveLength(1);
    expect([...toBoard[0].to].sort()).toEqual([world.actors.arbiter.email, world.actors.arbiter2.email].sort());
    expect(toBoard[0].text).toContain('ready for review');
    expect(recipientsOf(c.number, 'case-retested')).toEqual([world.actors.arbiter.email, world.actors.arbiter2.email, world.actors.plant.email, world.actors.supplier.email].sort());
    expect(recipientsOf(c.number, 'case-retested')).not.toContain(world.actors.admin.email);
    expect(recipientsOf(c.number, 'case-retested')).not.toContain(world.actors.lab.email);
  });
});

describe('order_further_test', () => {
  it('sends the case back for a new sample to another laboratory, which starts blind and can finish the round', async () => {
    const c = await L.freshCaseIn(world, 'review');
    const seq = await L.lastAuditSeq();
    const now = new Date();
    const body = L.inputs.order_further_test(world);

    const outcome = await runTransition(getDb(), world.actors.arbiter, c.id, 'order_further_test', body, { now });

    expect(outcome).toMatchObject({ from: 'review', to: 'awaiting_sample', transition: 'order_further_test' });
    const after = await L.caseRow(c.id);
    expect(after).toMatchObject({ status: 'awaiting_sample', labOrganisationId: world.org.otherLab, retestSubmittedAt: null, decisionDueAt: null });
    expect(after.sampleValidUntil?.getTime()).toBe(new Date(body.sampledAt).getTime() + 48 * HOUR);

    const [further] = await getDb().select().from(sample).where(eq(sample.caseId, c.id));
    expect(further).toMatchObject({ code: body.sampleCode, kind: 'referee', sealNumber: body.sealNumber, deliveryId: c.deliveryId });
    const custody = (await L.custodyOfCase(c.id)).filter((e) => e.sampleId === further.id);
    expect(custody.map((e) => e.kind)).toEqual(['sealed', 'dispatched']);
    expect(custody[1].at.getTime()).toBe(now.getTime());

    const events = await L.auditSince(seq);
    expect(events).toHaveLength(1);
    expect(events[0]).toMatchObject({ action: 'case.transitioned', actorUserId: world.actors.arbiter.userId, change: { from: 'review', to: 'awaiting_sample', transition: 'order_further_test', detail: { kind: 'third_laboratory', sampleCode: body.sampleCode } } });

    const { getCaseFile } = await import('@/lib/dal/case-file');
    // The first laboratory keeps reading the case it tested but can no longer act on it; the new one acts.
    await L.expectAppError(runTransition(getDb(), world.actors.lab, c.id, 'receive', await L.inputs.receive(world, c.id)), 'forbidden');
    const formerFile = await getCaseFile(getDb(), world.actors.lab, c.id);
    expect(formerFile.number).toBe(c.number);
    const { caseWorkbench } = await import('@/lib/dal/case-workbench');
    expect((await caseWorkbench(getDb(), world.actors.lab, c.id)).allowed).toEqual([]);
    expect((await caseWorkbench(getDb(), world.actors.otherLab, c.id)).allowed).toContain('receive');
    const blindFile = await getCaseFile(getDb(), world.actors.otherLab, c.id);
    expect(blindFile.blind).toBe(true);
    expect(blindFile.intake).toBeNull();

    await runTransition(getDb(), world.actors.otherLab, c.id, 'receive', await L.inputs.receive(world, c.id));
    await runTransition(getDb(), world.actors.otherLab, c.id, 'submit_retest', L.inputs.submit_retest(world, { instrumentId: world.otherLabInstrumentId }));
    const finished = await L.caseRow(c.id);
    expect(finished.status).toBe('review');
    expect(finished.retestSubmittedAt).not.toBeNull();
    const sets = await getDb().select().from(measurementSet).where(and(eq(measurementSet.caseId, c.id), eq(measurementSet.sampleId, further.id)));
    expect(sets).toHaveLength(1);
    expect(sets[0]).toMatchObject({ purpose: 'further_test', organisationId: world.org.otherLab });
    await expectChainIntact();
  });

  it('takes an authentic herd sample as its own kind', async () => {
    const c = await L.freshCaseIn(world, 'review');
    const body = L.inputs.order_further_test(world, { kind: 'authentic', labOrganisationId: world.org.lab });
    await runTransition(getDb(), world.actors.arbiter, c.id, 'order_further_test', body);
    const [further] = await getDb().select().from(sample).where(eq(sample.caseId, c.id));
    expect(further.kind).toBe('authentic');
    expect((await L.caseRow(c.id)).labOrganisationId).toBe(world.org.lab);
  });
});

describe('withdraw', () => {
  it.each(['open', 'awaiting_sample', 'retest', 'review'] as const)('lets the supplier withdraw from %s, stamping withdrawnAt', async (status) => {
    const c = await L.freshCaseIn(world, status);
    const before = await L.snapshot(c.id);
    const seq = await L.lastAuditSeq();
    const now = new Date();

    const outcome = await runTransition(getDb(), world.actors.supplier, c.id, 'withdraw', L.inputs.withdraw(world), { now });

    expect(outcome).toMatchObject({ from: status, to: 'withdrawn', transition: 'withdraw' });
    const after = await L.caseRow(c.id);
    expect(after.status).toBe('withdrawn');
    expect(after.withdrawnAt?.getTime()).toBe(now.getTime());
    const snap = await L.snapshot(c.id);
    expect(snap.custody).toBe(before.custody);
    expect(snap.measurementSets).toBe(before.measurementSets);
    const events = await L.auditSince(seq);
    expect(events).toHaveLength(1);
    expect(events[0]).toMatchObject({ action: 'case.transitioned', actorUserId: world.actors.supplier.userId, change: { from: status, to: 'withdrawn', transition: 'withdraw', detail: { reason: 'Settled directly with the plant after a herd check.' } } });
    const told = recipientsOf(c.number, 'case-withdrawn');
    expect(told).toContain(world.actors.plant.email);
    expect(told).toContain(world.actors.arbiter.email);
    // The laboratory is told only once it is on the case.
    expect(told.includes(world.actors.lab.email)).toBe(status !== 'open');
    await expectChainIntact();
  });

  it('answers 200 with the outcome through the route and records the API origin', async () => {
    const c = await L.freshCaseIn(world, 'open');
    const seq = await L.lastAuditSeq();
    const response = await L.postTransition(world, 'supplier', c.id, 'withdraw', L.inputs.withdraw(world));
    expect(response.status).toBe(200);
    expect(await response.json()).toEqual({ caseId: c.id, number: c.number, from: 'open', to: 'withdrawn', transition: 'withdraw' });
    expect((await L.caseRow(c.id)).status).toBe('withdrawn');
    const events = await L.auditSince(seq);
    expect(events).toHaveLength(1);
    expect(events[0].origin).toBe('api unknown address');
  });
});

describe('refusals change nothing', () => {
  const refusals: [TransitionName, Fixture, ActorKey, ErrorCode][] = [
    ['dispatch', 'open', 'supplier2', 'not_found'],
    ['dispatch', 'open', 'otherArbiter', 'not_found'],
    // No laboratory is named before dispatch, so the referee laboratory is still an outsider.
    ['dispatch', 'open', 'lab', 'not_found'],
    // The administrator is no party to any case: it sees none (separation of duties).
    ['dispatch', 'open', 'admin', 'not_found'],
    ['dispatch', 'open', 'supplier', 'forbidden'],
    ['dispatch', 'open', 'arbiter', 'forbidden'],
    ['dispatch', 'demoOpen', 'lab', 'forbidden'],
    ['dispatch', 'awaiting_sample', 'plant', 'conflict'],
    ['dispatch', 'review', 'plant', 'conflict'],
    ['dispatch', 'decided', 'plant', 'conflict'],
    ['dispatch', 'withdrawn', 'plant', 'conflict'],
    ['receive', 'awaiting_sample', 'otherLab', 'not_found'],
    ['receive', 'awaiting_sample', 'supplier2', 'not_found'],
    ['receive', 'awaiting_sample', 'admin', 'not_found'],
    ['receive', 'awaiting_sample', 'supplier', 'forbidden'],
    ['receive', 'awaiting_sample', 'plant', 'forbidden'],
    ['receive', 'awaiting_sample', 'arbiter', 'forbidden'],
    ['receive', 'demoOpen', 'lab', 'conflict'],
    ['receive', 'retest', 'lab', 'conflict'],
    ['submit_retest', 'retest', 'otherLab', 'not_found'],
    ['submit_retest', 'retest', 'supplier2', 'not_found'],
    ['submit_retest', 'retest', 'admin', 'not_found'],
    ['submit_retest', 'retest', 'plant', 'forbidden'],
    ['submit_retest', 'retest', 'supplier', 'forbidden'],
    ['submit_retest', 'retest', 'arbiter', 'forbidden'],
    ['submit_retest', 'awaiting_sample', 'lab', 'conflict'],
    ['submit_retest', 'review', 'lab', 'conflict'],
    ['order_further_test', 'review', 'otherArbiter', 'not_found'],
    ['order_further_test', 'review', 'supplier2', 'not_found'],
    ['order_further_test', 'review', 'admin', 'not_found'],
    ['order_further_test', 'review', 'supplier', 'forbidden'],
    ['order_further_test', 'review', 'plant', 'forbidden'],
    ['order_further_test', 'review', 'lab', 'forbidden'],
    ['order_further_test', 'retest', 'arbiter', 'conflict'],
    ['order_further_test', 'decided', 'arbiter', 'conflict'],
    ['withdraw', 'open', 'supplier2', 'not_found'],
    ['withdraw', 'open', 'admin', 'not_found'],
    ['withdraw', 'open', 'plant', 'forbidden'],
    ['withdraw', 'retest', 'lab', 'forbidden'],
    ['withdraw', 'open', 'arbiter', 'forbidden'],
    ['withdraw', 'decided', 'supplier', 'conflict'],
    ['withdraw', 'withdrawn', 'supplier', 'conflict'],
  ];
  const status: Record<ErrorCode, number> = { not_found: 404, forbidden: 403, conflict: 409 } as Record<ErrorCode, number>;

  it.each(refusals)('%s on the %s case by %s → %s, through the data layer and the route', async (name, fixture, key, code) => {
    const caseId = fixtures[fixture];
    const body = await L.validInput(world, name, caseId);
    const before = await L.snapshot(caseId);

    await L.expectAppError(runTransition(getDb(), world.actors[key], caseId, name, body), code);
    const problem = await L.expectProblem(await L.postTransition(world, key, caseId, name, body), status[code]);
    expect(problem.code).toBe(code);
    if (code === 'not_found') {
      // Someone else's case must answer exactly like one that does not exist.
      const missing = crypto.randomUUID();
      const absent = await L.expectProblem(await L.postTransition(world, key, missing, name, body), 404);
      expect(problem.detail).toBe(absent.detail);
    }

    expect(await L.snapshot(caseId)).toEqual(before);
  });

  it('answers 401 without a session, 404 for an unknown transition or a malformed id, 415 for a body that is not JSON', async () => {
    const caseId = fixtures.open;
    const before = await L.snapshot(caseId);
    const body = await L.inputs.dispatch(world, caseId);
    const { callRoute } = await import('./helpers');
    const { POST } = await import('@/app/api/v1/cases/[caseId]/transitions/[transition]/route');

    const anonymous = await callRoute(POST, `/api/v1/cases/${caseId}/transitions/dispatch`, { method: 'POST', body, params: { caseId, transition: 'dispatch' } });
    expect((await L.expectProblem(anonymous, 401)).code).toBe('unauthenticated');
    expect((await L.expectProblem(await L.postTransition(world, 'plant', caseId, 'decide', body), 404)).code).toBe('not_found');
    expect((await L.expectProblem(await L.postTransition(world, 'plant', 'not-a-uuid', 'dispatch', body), 404)).code).toBe('not_found');

    const asForm = new Request(`http://localhost:3000/api/v1/cases/${caseId}/transitions/dispatch`, {
      method: 'POST',
      headers: { cookie: world.cookies.plant, 'content-type': 'application/x-www-form-urlencoded' },
      body: new URLSearchParams(Object.entries(body).map(([k, v]) => [k, String(v)])).toString(),
    });
    const unsupported = await L.expectProblem(await POST(asForm, { params: Promise.resolve({ caseId, transition: 'dispatch' }) }), 415);
    expect(unsupported.code).toBe('unsupported_media_type');

    const broken = new Request(`http://localhost:3000/api/v1/cases/${caseId}/transitions/dispatch`, { method: 'POST', headers: { cookie: world.cookies.plant, 'content-type': 'application/json' }, body: '{"sealNumber": ' });
    expect((await L.expectProblem(await POST(broken, { params: Promise.resolve({ caseId, transition: 'dispatch' }) }), 400)).code).toBe('invalid');

    expect(await L.snapshot(caseId)).toEqual(before);
  });

  // Names inherited from Object.prototype are no transitions.
  it.each(['constructor', 'toString', 'hasOwnProperty'])('answers 404 for the inherited property name %s, not 500', async (name) => {
    const caseId = fixtures.open;
    const before = await L.snapshot(caseId);
    const problem = await L.expectProblem(await L.postTransition(world, 'plant', caseId, name, await L.inputs.dispatch(world, caseId)), 404);
    expect(problem.code).toBe('not_found');
    expect(await L.snapshot(caseId)).toEqual(before);
  });
});

describe('bad input answers 400 naming the field, and changes nothing', () => {
  type Bad = { title: string; name: TransitionName; fixture: Fixture; by: ActorKey; body: (caseId: string) => Promise<Record<string, unknown>> | Record<string, unknown>; field: string; message?: RegExp };
  const bad: Bad[] = [
    { title: 'dispatch with another seal number', name: 'dispatch', fixture: 'open', by: 'plant', body: (id) => L.inputs.dispatch(world, id, { sealNumber: 'LVS-000000' }), field: 'sealNumber', message: /sealed as LVS-T/ },
    { title: 'dispatch to an organisation that is no laboratory', name: 'dispatch', fixture: 'open', by: 'plant', body: (id) => L.inputs.dispatch(world, id, { labOrganisationId: world.org.supplier }), field: 'labOrganisationId' },
    { title: 'dispatch without a courier', name: 'dispatch', fixture: 'open', by: 'plant', body: (id) => L.inputs.dispatch(world, id, { courier: '  ' }), field: 'courier' },
    { title: 'dispatch at 80 °C', name: 'dispatch', fixture: 'open', by: 'plant', body: (id) => L.inputs.dispatch(world, id, { temperature: 80 }), field: 'temperature' },
    { title: 'dispatch with a broken seal', name: 'dispatch', fixture: 'open', by: 'plant', body: (id) => L.inputs.dispatch(world, id, { sealIntact: false }), field: 'sealIntact' },
    { title: 'receive with a temperature in words', name: 'receive', fixture: 'awaiting_sample', by: 'lab', body: (id) => L.inputs.receive(world, id, { temperature: 'cold' }), field: 'temperature' },
    { title: 'a retest whose first two readings differ by more than r, with only two readings', name: 'submit_retest', fixture: 'retest', by: 'lab', body: () => L.inputs.submit_retest(world, { readings: [{ value: -0.51 }, { value: -0.515 }] }), field: 'readings', message: /^2 more readings needed/ },
    { title: 'a retest whose first two readings differ, with three readings', name: 'submit_retest', fixture: 'retest', by: 'lab', body: () => L.inputs.submit_retest(world, { readings: [{ value: -0.51 }, { value: -0.515 }, { value: -0.512 }] }), field: 'readings', message: /^1 more reading needed/ },
    { title: 'a failing calibration check (2 of 5 within tolerance)', name: 'submit_retest', fixture: 'retest', by: 'lab', body: () => L.inputs.submit_retest(world, { calibrationReadings: [-0.5121, -0.5118, -0.52, -0.521, -0.505] }), field: 'calibrationReadings', message: /^2 of 5 readings within tolerance; 3 needed/ },
    { title: 'a retest on another laboratory’s instrument', name: 'submit_retest', fixture: 'retest', by: 'lab', body: () => L.inputs.submit_retest(world, { instrumentId: world.otherLabInstrumentId }), field: 'instrumentId' },
    { title: 'a reading with five decimals', name: 'submit_retest', fixture: 'retest', by: 'lab', body: () => L.inputs.submit_retest(world, { readings: [{ value: -0.51234 }, { value: -0.5123 }] }), field: 'readings.0.value', message: /four decimals/ },
    { title: 'a single reading', name: 'submit_retest', fixture: 'retest', by: 'lab', body: () => L.inputs.submit_retest(world, { readings: [{ value: -0.5123 }] }), field: 'readings', message: /at least two/ },
    { title: 'a retest dated tomorrow', name: 'submit_retest', fixture: 'retest', by: 'lab', body: () => L.inputs.submit_retest(world, { testedAt: new Date(Date.now() + 24 * HOUR).toISOString() }), field: 'testedAt' },
    { title: 'a retest dated before the sample was received', name: 'submit_retest', fixture: 'retest', by: 'lab', body: () => L.inputs.submit_retest(world, { testedAt: new Date(Date.now() - 3 * HOUR).toISOString() }), field: 'testedAt', message: /received at/ },
    { title: 'a further test with a sample code in use', name: 'order_further_test', fixture: 'review', by: 'arbiter', body: async () => L.inputs.order_further_test(world, { sampleCode: (await getDb().select({ code: sample.code }).from(sample).where(eq(sample.kind, 'retained')).limit(1))[0].code }), field: 'sampleCode' },
    { title: 'a further test at the plant', name: 'order_further_test', fixture: 'review', by: 'arbiter', body: () => L.inputs.order_further_test(world, { labOrganisationId: world.org.plant }), field: 'labOrganisationId' },
    { title: 'a further test of an unknown kind', name: 'order_further_test', fixture: 'review', by: 'arbiter', body: () => L.inputs.order_further_test(world, { kind: 'guesswork' }), field: 'kind' },
    { title: 'a withdrawal without a reason', name: 'withdraw', fixture: 'open', by: 'supplier', body: () => L.inputs.withdraw(world, { reason: 'no' }), field: 'reason', message: /at least 5/ },
  ];

  it.each(bad)('$title → fieldErrors.$field', async ({ name, fixture, by, body, field, message }) => {
    const caseId = fixtures[fixture];
    const input = await body(caseId);
    const before = await L.snapshot(caseId);

    const error = await L.expectAppError(runTransition(getDb(), world.actors[by], caseId, name, input), 'invalid');
    expect(Object.keys(error.fieldErrors ?? {})).toEqual([field]);
    if (message) expect(error.fieldErrors![field].join(' ')).toMatch(message);

    const problem = await L.expectProblem(await L.postTransition(world, by, caseId, name, input), 400);
    expect(problem.code).toBe('invalid');
    expect(Object.keys(problem.errors ?? {})).toEqual([field]);

    expect(await L.snapshot(caseId)).toEqual(before);
  });
});

describe('concurrency', () => {
  it('lets exactly one of two simultaneous dispatches through; the other gets conflict', async () => {
    const c = await L.freshCaseIn(world, 'open');
    const body = await L.inputs.dispatch(world, c.id);
    const seq = await L.lastAuditSeq();
    const before = await L.snapshot(c.id);

    const results = await Promise.allSettled([runTransition(getDb(), world.actors.plant, c.id, 'dispatch', body), runTransition(getDb(), world.actors.plant, c.id, 'dispatch', body)]);

    expect(results.filter((r) => r.status === 'fulfilled')).toHaveLength(1);
    const rejected = results.filter((r): r is PromiseRejectedResult => r.status === 'rejected');
    expect(rejected).toHaveLength(1);
    expect(rejected[0].reason).toMatchObject({ name: 'AppError', code: 'conflict' });
    expect((await L.caseRow(c.id)).status).toBe('awaiting_sample');
    expect(await L.auditSince(seq)).toHaveLength(1);
    const after = await L.snapshot(c.id);
    expect(after.custody).toBe(before.custody + 1);
    expect(caughtFor(c.number, 'case-dispatched').filter((m) => m.to.includes(world.actors.lab.email))).toHaveLength(1);
    await expectChainIntact();
  });

  it('stores one measurement set when the laboratory submits the same retest twice at once', async () => {
    const c = await L.freshCaseIn(world, 'retest');
    const body = L.inputs.submit_retest(world);
    const seq = await L.lastAuditSeq();
    const results = await Promise.allSettled([runTransition(getDb(), world.actors.lab, c.id, 'submit_retest', body), runTransition(getDb(), world.actors.lab, c.id, 'submit_retest', body)]);
    expect(results.map((r) => r.status).sort()).toEqual(['fulfilled', 'rejected']);
    expect((results.find((r) => r.status === 'rejected') as PromiseRejectedResult).reason).toMatchObject({ code: 'conflict' });
    expect((await L.snapshot(c.id)).measurementSets).toBe(1);
    expect(await L.auditSince(seq)).toHaveLength(1);
  });

  // Both parties saw the case open; whichever commits second finds it moved on and gets 409, on
  // either engine (a withdrawal would otherwise still be allowed after a dispatch).
  it('settles a withdrawal racing a dispatch on one winner, with the state and custody of that winner only', async () => {
    const c = await L.freshCaseIn(world, 'open');
    const dispatchBody = await L.inputs.dispatch(world, c.id);
    const seq = await L.lastAuditSeq();
    const before = await L.snapshot(c.id);

    const [withdrawal, dispatch] = await Promise.allSettled([
      runTransition(getDb(), world.actors.supplier, c.id, 'withdraw', L.inputs.withdraw(world), { expectedStatus: 'open' }),
      runTransition(getDb(), world.actors.plant, c.id, 'dispatch', dispatchBody, { expectedStatus: 'open' }),
    ]);

    expect([withdrawal.status, dispatch.status].sort()).toEqual(['fulfilled', 'rejected']);
    const loser = (withdrawal.status === 'rejected' ? withdrawal : dispatch) as PromiseRejectedResult;
    expect(loser.reason).toMatchObject({ code: 'conflict' });
    const after = await L.caseRow(c.id);
    const events = await L.auditSince(seq);
    expect(events).toHaveLength(1);
    const custody = (await L.snapshot(c.id)).custody;
    if (withdrawal.status === 'fulfilled') {
      expect(after.status).toBe('withdrawn');
      expect(after.labOrganisationId).toBeNull();
      expect(custody).toBe(before.custody);
      expect(events[0].change).toMatchObject({ transition: 'withdraw' });
    } else {
      expect(after.status).toBe('awaiting_sample');
      expect(after.withdrawnAt).toBeNull();
      expect(custody).toBe(before.custody + 1);
      expect(events[0].change).toMatchObject({ transition: 'dispatch' });
    }
    await expectChainIntact();
  });
});

describe('the blind retest, end to end', () => {
  async function listItem(key: ActorKey, caseId: string) {
    const { callRoute } = await import('./helpers');
    const { GET } = await import('@/app/api/v1/cases/route');
    const response = await callRoute(GET, '/api/v1/cases?pageSize=100&status=open,awaiting_sample,retest,review', { cookie: world.cookies[key] });
    expect(response.status).toBe(200);
    const page = (await response.json()) as { items: { id: string; valueTenthMilliC: number | null; verdict: string | null; amountMinor: number | null }[] };
    const item = page.items.find((i) => i.id === caseId);
    expect(item, `${key} lists the case`).toBeDefined();
    return item!;
  }

  async function expectLabBlind(c: Awaited<ReturnType<typeof L.freshCaseIn>>) {
    const { getCaseFile } = await import('@/lib/dal/case-file');
    const { caseWorkbench } = await import('@/lib/dal/case-workbench');
    const file = await getCaseFile(getDb(), world.actors.lab, c.id);
    expect(file.blind).toBe(true);
    expect(file.intake).toBeNull();
    expect(file.explanation).toBeNull();
    expect(file.remedy).toBeNull();
    expect(file.measurementSets.filter((s) => s.purpose === 'intake')).toEqual([]);
    // Not even a reading of the intake set may travel in another field.
    const text = JSON.stringify(file);
    for (const tenths of [-5040, -5031, c.fresh.valueTenthMilliC]) expect(text).not.toContain(`:${tenths}`);
    const bench = await caseWorkbench(getDb(), world.actors.lab, c.id);
    expect(bench.proposal).toBeNull();
    expect(bench.hasRetest).toBe(false);
    const item = await listItem('lab', c.id);
    expect(item).toMatchObject({ valueTenthMilliC: null, verdict: null, amountMinor: null });
  }

  async function expectSeenBy(key: 'plant' | 'supplier' | 'lab', c: Awaited<ReturnType<typeof L.freshCaseIn>>) {
    const { getCaseFile } = await import('@/lib/dal/case-file');
    const { caseWorkbench } = await import('@/lib/dal/case-workbench');
    const file = await getCaseFile(getDb(), world.actors[key], c.id);
    expect(file.blind).toBe(false);
    expect(file.intake).toMatchObject({ valueTenthMilliC: c.fresh.valueTenthMilliC, verdict: c.fresh.verdict });
    expect(file.explanation).toBe(L.disputeBody(c.fresh.intakeResultId).explanation);
    const intakeSet = file.measurementSets.find((s) => s.purpose === 'intake');
    expect(intakeSet?.readings.map((r) => r.valueTenthMilliC)).toEqual([-5040, -5031]);
    const bench = await caseWorkbench(getDb(), world.actors[key], c.id);
    expect(bench.proposal).not.toBeNull();
    expect(bench.proposal!.input.original.readings).toEqual([-0.504, -0.5031]);
    const item = await listItem(key, c.id);
    expect(item.valueTenthMilliC).toBe(c.fresh.valueTenthMilliC);
    expect(item.verdict).toBe(c.fresh.verdict);
  }

  it('hides the intake, the supplier’s account and the proposal from the laboratory until it submits; the plant and supplier are never blind', async () => {
    const c = await L.freshCaseIn(world, 'open');
    await expectSeenBy('plant', c);
    await expectSeenBy('supplier', c);

    await runTransition(getDb(), world.actors.plant, c.id, 'dispatch', await L.inputs.dispatch(world, c.id));
    await expectLabBlind(c);
    await expectSeenBy('plant', c);
    await expectSeenBy('supplier', c);

    await runTransition(getDb(), world.actors.lab, c.id, 'receive', await L.inputs.receive(world, c.id));
    await expectLabBlind(c);
    await expectSeenBy('plant', c);
    await expectSeenBy('supplier', c);
    // Through the route the same rule holds.
    const { callRoute } = await import('./helpers');
    const { GET } = await import('@/app/api/v1/cases/[caseId]/route');
    const routed = await (await callRoute(GET, `/api/v1/cases/${c.id}`, { cookie: world.cookies.lab, params: { caseId: c.id } })).json();
    expect(routed).toMatchObject({ blind: true, intake: null, explanation: null, remedy: null });

    await runTransition(getDb(), world.actors.lab, c.id, 'submit_retest', L.inputs.submit_retest(world));
    await expectSeenBy('lab', c);
    await expectSeenBy('plant', c);
    await expectSeenBy('supplier', c);
    const { getCaseFile } = await import('@/lib/dal/case-file');
    const file = await getCaseFile(getDb(), world.actors.lab, c.id);
    expect(file.measurementSets.map((s) => s.purpose).sort()).toEqual(['intake', 'retest']);
    const { caseWorkbench } = await import('@/lib/dal/case-workbench');
    expect((await caseWorkbench(getDb(), world.actors.lab, c.id)).proposal!.assessment.retest).toMatchObject({ status: 'accepted', value: -0.5193 });
  });

  // The plant's dispatch answer is kept as a custody note and in the audit detail; neither reaches the blind laboratory.
  it('keeps the plant’s dispatch answer, a value-bearing argument, from the blind laboratory', async () => {
    const c = await L.freshCaseIn(world, 'open');
    const answer = 'Our intake result of −0.504 °C stands: the cryoscope passed its morning check.';
    await runTransition(getDb(), world.actors.plant, c.id, 'dispatch', await L.inputs.dispatch(world, c.id, { answer }));
    const { getCaseFile } = await import('@/lib/dal/case-file');
    const file = await getCaseFile(getDb(), world.actors.lab, c.id);
    expect(file.blind).toBe(true);
    expect(JSON.stringify(file)).not.toContain('−0.504 °C stands');
  });

  // After a further test the new laboratory is blind again: no intake set, no earlier retest, no result in the ledger.
  it('keeps the first referee’s retest from a third laboratory that tests blind', async () => {
    const c = await L.freshCaseIn(world, 'review');
    await runTransition(getDb(), world.actors.arbiter, c.id, 'order_further_test', L.inputs.order_further_test(world));
    const { getCaseFile } = await import('@/lib/dal/case-file');
    const file = await getCaseFile(getDb(), world.actors.otherLab, c.id);
    expect(file.blind).toBe(true);
    expect(file.intake).toBeNull();
    expect(file.measurementSets.filter((s) => s.organisationId === world.org.lab)).toEqual([]);
    const text = JSON.stringify(file);
    // The first retest read −0.5190 and −0.5196 (result −0.5193).
    for (const leaked of [':-5190', ':-5196', ':-5193', '-0.5193']) expect(text).not.toContain(leaked);
  });
});

describe('the audit chain after all of the above', () => {
  it('still verifies from the first row to the last', async () => {
    const verdict = await verifyAuditChain(getDb());
    expect(verdict.ok).toBe(true);
    expect(verdict.checked).toBeGreaterThan(40);
  });
});
