import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startMailCatcher } from '@/lib/mail/catcher';
import type { World } from './support/lifecycle';

// env() reads SMTP_URL once: the catcher must listen and the variables be set before the app is loaded.
const catcher = await startMailCatcher({ smtpPort: 0, httpPort: 0 });
process.env.SMTP_URL = `smtp://127.0.0.1:${catcher.smtpPort}`;
process.env.MAIL_CATCHER_URL = `http://127.0.0.1:${catcher.httpPort}`;

const { and, count, eq } = await import('drizzle-orm');
const { getDb } = await import('@/db/client');
const { auditEvent, decision, delivery, disputeCase, rateLimit, supplierFarm } = await import('@/db/schema');
const { createUserWithPassword } = await import('@/db/seed/factories');
const { signDecision } = await import('@/lib/dal/decision-sign');
const { decisionPanel } = await import('@/lib/dal/decision-view');
const { caseWorkbench } = await import('@/lib/dal/case-workbench');
const { assertCaseNotSealed } = await import('@/lib/dal/decision-guard');
const { runTransition } = await import('@/lib/dal/case-transition');
const { verifyAuditChain } = await import('@/lib/audit/verify');
const { transitionNames, transitions } = await import('@/lib/cases/lifecycle');
const { resetMailTransport } = await import('@/lib/mail/transport');
const { sha256Hex } = await import('@/lib/canonical-json');
const { SIGNING_MAX_FAILURES } = await import('@/lib/dal/decision-auth');
const { actorOf, signIn, TEST_PASSWORD } = await import('./helpers');
const L = await import('./support/lifecycle');

let world: World;

/** Readings of the referee laboratory that agree with the fresh intake result (−0.5036 °C): the proposal is to uphold. */
const AGREEING_RETEST = [{ value: -0.5038 }, { value: -0.5042 }];

/** A fresh case in review whose retest gives `readings`. */
async function caseInReview(readings = AGREEING_RETEST, supplier: 'supplier' | 'supplier2' = 'supplier') {
  const c = await L.freshCaseIn(world, 'retest', { supplier });
  await runTransition(getDb(), world.actors.lab, c.id, 'submit_retest', L.inputs.submit_retest(world, { readings }));
  return { ...(await L.caseRow(c.id)), fresh: c.fresh };
}

function body(overrides: Record<string, unknown> = {}) {
  return { outcome: 'uphold', reasons: 'Both laboratories agree within the critical difference; the accepted value lies beyond the upper limit.', departureReason: '', confirm: true, password: TEST_PASSWORD, ...overrides };
}

/** Everything a refused signature must leave as it was. */
async function state(caseId: string) {
  const db = getDb();
  const [[decisions], [audit]] = await Promise.all([
    db.select({ n: count() }).from(decision).where(eq(decision.caseId, caseId)),
    db.select({ n: count() }).from(auditEvent),
  ]);
  const snap = await L.snapshot(caseId);
  return { ...snap, decisions: decisions.n, auditAll: audit.n };
}

function caught(number: string) {
  return catcher.messages.filter((m) => m.subject.startsWith(`${number}:`) && m.template === 'case-decided');
}

beforeAll(async () => {
  world = await L.setUpWorld();
});

afterAll(async () => {
  resetMailTransport();
  await catcher.close();
});

describe('signing a decision', () => {
  it('seals an upheld decision that follows the proposal: the record, the signature block, the settlement, the state and the audit trail', async () => {
    const c = await caseInReview();
    const seq = await L.lastAuditSeq();
    const now = new Date();

    const outcome = await signDecision(getDb(), world.actors.arbiter, c.id, body(), { origin: 'web 192.0.2.7', now });

    expect(outcome).toMatchObject({ caseId: c.id, number: c.number, outcome: 'uphold', supersedesId: null });
    expect(outcome.recordSha256).toMatch(/^[0-9a-f]{64}$/);
    const after = await L.caseRow(c.id);
    expect(after.status).toBe('decided');
    expect(after.decidedAt?.getTime()).toBe(now.getTime());

    const [row] = await getDb().select().from(decision).where(eq(decision.caseId, c.id));
    expect(row).toMatchObject({
      id: outcome.decisionId,
      outcome: 'uphold',
      followedProposal: true,
      departureReason: null,
      signerUserId: world.actors.arbiter.userId,
      signerName: world.actors.arbiter.name,
      signatureMeaning: 'binding decision',
      reauthenticationMethod: 'password',
      recordSha256: outcome.recordSha256,
      supersedesId: null,
    });
    expect(row.signedAt.getTime()).toBe(now.getTime());
    expect(row.recordSignature).toMatch(/^[A-Za-z0-9+/]{86}==$/);
    expect(row.signingKeyId).toMatch(/^[0-9a-f]{16}$/);
    expect((row.proposal as { assessment: { outcome: string } }).assessment.outcome).toBe('uphold');
    // Hand-worked example: the fresh load is 9,000 l rejected at intake at 0.46 EUR/l = €4,140.00,
    // which stays withheld; the losing party (the supplier) bears the €180.00 referee fee.
    expect(row.settlement).toMatchObject({
      outcome: 'uphold',
      currency: 'EUR',
      withheldAtIntake: { amountMinor: 414_000, arithmetic: '9,000 l × 0.46 EUR/l = €4,140.00' },
      balance: { amountMinor: 0, payer: null },
      refereeFee: { amountMinor: 18_000, borneBy: 'supplier', rule: 'losing_party' },
    });

    const events = await L.auditSince(seq);
    const actions = events.map((e) => e.action);
    expect(actions.slice(0, 2)).toEqual(['case.transitioned', 'decision.sealed']);
    expect(events[0]).toMatchObject({ actorUserId: world.actors.arbiter.userId, origin: 'web 192.0.2.7', change: { from: 'review', to: 'decided', transition: 'decide', detail: { decisionId: row.id, outcome: 'uphold', followedProposal: true } } });
    expect(events[1]).toMatchObject({ objectType: 'decision', objectId: row.id, change: { recordSha256: row.recordSha256, signingKeyId: row.signingKeyId, signatureMeaning: 'binding decision', reauthenticationMethod: 'password', supersedesId: null } });
    // The letter issued after the commit is recorded with its own hash.
    expect(events.filter((e) => e.action === 'decision.letter_issued')).toHaveLength(1);
    expect(JSON.stringify(events)).not.toContain(TEST_PASSWORD);
    expect(await verifyAuditChain(getDb())).toMatchObject({ ok: true });
  });

  it('records a departure from the proposal with its reason, and the settlement of the outcome chosen', async () => {
    const c = await caseInReview();
    await signDecision(getDb(), world.actors.arbiter2, c.id, body({ outcome: 'reverse', departureReason: 'The herd records show this farm has read below −0.520 °C for a year.' }));
    const [row] = await getDb().select().from(decision).where(eq(decision.caseId, c.id));
    expect(row).toMatchObject({ outcome: 'reverse', followedProposal: false, departureReason: 'The herd records show this farm has read below −0.520 °C for a year.', signerName: world.actors.arbiter2.name });
    // Hand-worked example: reversed, the plant pays back the €4,140.00 withheld for the rejected
    // 9,000 l × 0.46 EUR/l, and as the losing party bears the €180.00 fee.
    expect(row.settlement).toMatchObject({ balance: { amountMinor: 414_000, payer: 'plant', payee: 'supplier' }, refereeFee: { amountMinor: 18_000, borneBy: 'plant' } });
  });

  it('works out an adjustment from the accepted added water when the arbiter chooses it', async () => {
    const c = await caseInReview();
    await signDecision(getDb(), world.actors.arbiter, c.id, body({ outcome: 'adjust', departureReason: 'The contract pays a rejected load by its measured added water.' }));
    const [row] = await getDb().select().from(decision).where(eq(decision.caseId, c.id));
    const proposal = row.proposal as { assessment: { acceptedValue: number; addedWater: { percent: number } } };
    // Accepted value (−0.50355 + −0.504) / 2 = −0.503775 °C; added water (0.520 − 0.503775) / 0.520 = 3.12 %.
    expect(proposal.assessment.acceptedValue).toBeCloseTo(-0.503775, 6);
    expect(Math.round(proposal.assessment.addedWater.percent * 100)).toBe(312);
    // Hand-worked example: 9,000 l × 3.12 % × 0.46 EUR/l = €129.17 (129.168 rounded); of the €4,140.00
    // withheld the plant owes €4,140.00 − €129.17 = €4,010.83, and as the party owing the balance bears the fee.
    expect(row.settlement).toMatchObject({
      correctedDeduction: { addedWaterBasisPoints: 312, amountMinor: 12_917, arithmetic: '9,000 l × 3.12 % × 0.46 EUR/l = €129.17' },
      balance: { amountMinor: 401_083, payer: 'plant', payee: 'supplier' },
      refereeFee: { borneBy: 'plant' },
    });
  });

  it('mails the supplier, the plant, the laboratory and the board the decision with the letter attached', async () => {
    const c = await caseInReview();
    await signDecision(getDb(), world.actors.arbiter, c.id, body());
    const messages = caught(c.number);
    expect(messages.flatMap((m) => m.to).sort()).toEqual([world.actors.arbiter.email, world.actors.arbiter2.email, world.actors.lab.email, world.actors.plant.email, world.actors.supplier.email].sort());
    expect(messages.flatMap((m) => m.to)).not.toContain(world.actors.admin.email);
    const [issued] = await getDb().select().from(auditEvent).where(and(eq(auditEvent.caseId, c.id), eq(auditEvent.action, 'decision.letter_issued')));
    const letterSha256 = (issued.change as { letterSha256: string }).letterSha256;
    for (const message of messages) {
      expect(message.subject).toBe(`${c.number}: the board’s binding decision (intake result upheld)`);
      expect(message.attachments).toHaveLength(1);
      const [pdf] = message.attachments;
      expect(pdf.contentType).toBe('application/pdf');
      expect(pdf.filename).toMatch(new RegExp(`^${c.number}-decision-[0-9a-f]{8}\\.pdf$`));
      const bytes = Buffer.from(pdf.contentBase64, 'base64');
      expect(bytes.subarray(0, 5).toString()).toBe('%PDF-');
      // The attached file is the letter as issued, so the verification page recognises it.
      expect(sha256Hex(bytes)).toBe(letterSha256);
      expect(message.text).toContain('Record SHA-256');
    }
    const rows = await L.mailOfCase(c.id);
    expect(rows.filter((r) => r.template === 'case-decided').map((r) => [r.status, r.hasAttachments])).toEqual([['sent', true], ['sent', true], ['sent', true], ['sent', true]]);
  });
});

describe('the password at signing', () => {
  it('refuses a wrong password as a field error and changes nothing', async () => {
    const c = await caseInReview();
    const before = await state(c.id);
    const error = await L.expectAppError(signDecision(getDb(), world.actors.arbiter, c.id, body({ password: 'not-the-password-at-all' })), 'invalid');
    expect(error.fieldErrors).toEqual({ password: ['The password is not correct.'] });
    expect(await state(c.id)).toEqual(before);
    expect(caught(c.number)).toEqual([]);
    // The right one then signs.
    await signDecision(getDb(), world.actors.arbiter, c.id, body());
    expect((await L.caseRow(c.id)).status).toBe('decided');
  });

  it(`locks signing for an account after ${SIGNING_MAX_FAILURES} wrong passwords, even with the right one, in the database`, async () => {
    const db = getDb();
    await createUserWithPassword(db, { email: 'arbiter3@board.countersample.test', name: 'Wenna Tolcarne', role: 'arbiter', organisationId: world.org.board, password: TEST_PASSWORD });
    const actor = await actorOf(await signIn('arbiter3@board.countersample.test'));
    const c = await caseInReview();
    const before = await state(c.id);
    for (let i = 0; i < SIGNING_MAX_FAILURES; i++) await L.expectAppError(signDecision(db, actor, c.id, body({ password: `wrong-password-${i}` })), 'invalid');
    const locked = await L.expectAppError(signDecision(db, actor, c.id, body()), 'rate_limited');
    expect(locked.message).toMatch(/15 minutes/);
    expect(await state(c.id)).toEqual(before);
    const [row] = await db.select().from(rateLimit).where(eq(rateLimit.key, `decision-signing:${actor.userId}`));
    expect(row.count).toBe(SIGNING_MAX_FAILURES + 1);
    // Another arbiter is not held up by it.
    await signDecision(db, world.actors.arbiter, c.id, body());
    expect((await L.caseRow(c.id)).status).toBe('decided');
  });
});

describe('the form’s rules, on the server', () => {
  it.each([
    { title: 'no reasons', overrides: { reasons: 'short' }, field: 'reasons' },
    { title: 'a departure without its reason', overrides: { outcome: 'reverse', departureReason: '' }, field: 'departureReason' },
    { title: 'an outcome that does not exist', overrides: { outcome: 'dismiss' }, field: 'outcome' },
    { title: 'no confirmation of the signature’s meaning', overrides: { confirm: false }, field: 'confirm' },
    { title: 'no password', overrides: { password: '' }, field: 'password' },
  ])('refuses $title with a field error and changes nothing', async ({ overrides, field }) => {
    const c = await caseInReview();
    const before = await state(c.id);
    const error = await L.expectAppError(signDecision(getDb(), world.actors.arbiter, c.id, body(overrides)), 'invalid');
    expect(Object.keys(error.fieldErrors ?? {})).toEqual([field]);
    expect(await state(c.id)).toEqual(before);
  });

  it('routes a further test to the further-test transition instead of sealing anything', async () => {
    // The default retest disagrees with the intake by more than the critical difference: the proposal is a further test.
    const c = await L.freshCaseIn(world, 'review');
    const panel = await decisionPanel(getDb(), world.actors.arbiter, c.id);
    expect(panel.form?.proposalOutcome).toBe('further_test');
    const before = await state(c.id);
    const error = await L.expectAppError(signDecision(getDb(), world.actors.arbiter, c.id, body({ outcome: 'further_test' })), 'invalid');
    expect(error.fieldErrors?.outcome?.[0]).toMatch(/Order a further test/);
    expect(await state(c.id)).toEqual(before);
    await runTransition(getDb(), world.actors.arbiter, c.id, 'order_further_test', L.inputs.order_further_test(world));
    expect((await L.caseRow(c.id)).status).toBe('awaiting_sample');
    expect(await state(c.id)).toMatchObject({ decisions: 0 });
  });

  it('shows the arbiter the proposal and the settlement of each outcome before signing', async () => {
    const c = await caseInReview();
    const { form, decisions } = await decisionPanel(getDb(), world.actors.arbiter, c.id);
    expect(decisions).toEqual([]);
    expect(form).toMatchObject({ proposalOutcome: 'uphold', signerName: world.actors.arbiter.name, meaning: 'binding decision', blockedBecause: null });
    expect(form!.settlements.uphold).toEqual({ lines: expect.arrayContaining(['Withheld at intake: 9,000 l × 0.46 EUR/l = €4,140.00.']) });
    expect(form!.settlements.reverse).toEqual({ lines: expect.arrayContaining(['The intake result is reversed: the plant pays the supplier the €4,140.00 withheld at intake.']) });
    for (const key of ['plant', 'supplier', 'lab'] as const) expect((await decisionPanel(getDb(), world.actors[key], c.id)).form).toBeNull();
  });
});

describe('two arbiters signing at once', () => {
  it('lets exactly one win; the other gets conflict and nothing of theirs is stored', async () => {
    const c = await caseInReview();
    const seq = await L.lastAuditSeq();
    const results = await Promise.allSettled([
      signDecision(getDb(), world.actors.arbiter, c.id, body()),
      signDecision(getDb(), world.actors.arbiter2, c.id, body({ outcome: 'reverse', departureReason: 'A different view of the same record, signed at the same moment.' })),
    ]);
    expect(results.map((r) => r.status).sort()).toEqual(['fulfilled', 'rejected']);
    const loser = results.find((r): r is PromiseRejectedResult => r.status === 'rejected')!;
    expect(loser.reason).toMatchObject({ name: 'AppError', code: 'conflict' });
    const winner = results.find((r) => r.status === 'fulfilled') as PromiseFulfilledResult<{ decisionId: string; outcome: string }>;
    const rows = await getDb().select().from(decision).where(eq(decision.caseId, c.id));
    expect(rows.map((r) => [r.id, r.outcome])).toEqual([[winner.value.decisionId, winner.value.outcome]]);
    const events = await L.auditSince(seq);
    expect(events.filter((e) => e.action === 'decision.sealed')).toHaveLength(1);
    expect(events.filter((e) => e.action === 'case.transitioned')).toHaveLength(1);
    expect(caught(c.number).filter((m) => m.to.includes(world.actors.supplier.email))).toHaveLength(1);
    expect(await verifyAuditChain(getDb())).toMatchObject({ ok: true });
  });
});

describe('separation of duties', () => {
  it('answers the administrator, another board’s arbiter and the other supplier 404, like a missing case', async () => {
    const c = await caseInReview();
    const before = await state(c.id);
    const missing = await L.expectAppError(signDecision(getDb(), world.actors.arbiter, crypto.randomUUID(), body()), 'not_found');
    for (const key of ['admin', 'otherArbiter', 'supplier2', 'otherLab'] as const) {
      const error = await L.expectAppError(signDecision(getDb(), world.actors[key], c.id, body()), 'not_found');
      expect(error.message).toBe(missing.message);
    }
    expect(await state(c.id)).toEqual(before);
  });

  it('refuses the parties of the case 403: no supplier, plant or laboratory decides', async () => {
    const c = await caseInReview();
    const before = await state(c.id);
    for (const key of ['supplier', 'plant', 'lab'] as const) await L.expectAppError(signDecision(getDb(), world.actors[key], c.id, body()), 'forbidden');
    expect(await state(c.id)).toEqual(before);
  });

  it('refuses an arbiter account that belongs to a party’s organisation, and an arbiter of the board who is a party’s contact', async () => {
    const db = getDb();
    const c = await caseInReview();
    const before = await state(c.id);
    // An arbiter account in the supplier's own organisation is not on the board: the case is not theirs to see.
    await createUserWithPassword(db, { email: 'arbiter@upper-larch.countersample.test', name: 'Idris Farrant', role: 'arbiter', organisationId: world.org.supplier, password: TEST_PASSWORD });
    const inParty = await actorOf(await signIn('arbiter@upper-larch.countersample.test'));
    await L.expectAppError(signDecision(db, inParty, c.id, body()), 'not_found');

    // A board member whose address is the farm's own contact: the farmer of the contested load.
    const [farm] = await db.select({ email: supplierFarm.contactEmail, name: supplierFarm.name }).from(delivery).innerJoin(supplierFarm, eq(supplierFarm.id, delivery.farmId)).where(eq(delivery.id, c.deliveryId));
    await createUserWithPassword(db, { email: farm.email!, name: 'Farmer on the board', role: 'arbiter', organisationId: world.org.board, password: TEST_PASSWORD });
    const farmer = await actorOf(await signIn(farm.email!));
    const refused = await L.expectAppError(signDecision(db, farmer, c.id, body()), 'forbidden');
    expect(refused.message).toContain(farm.name);
    const panel = await decisionPanel(db, farmer, c.id);
    expect(panel.form?.blockedBecause).toContain(farm.name);
    expect(await state(c.id)).toEqual(before);
    // A fellow arbiter with no such tie signs.
    await signDecision(db, world.actors.arbiter2, c.id, body());
    expect((await L.caseRow(c.id)).status).toBe('decided');
  });
});

describe('a sealed case is read-only everywhere', () => {
  const rightActor = { dispatch: 'plant', receive: 'lab', submit_retest: 'lab', order_further_test: 'arbiter', withdraw: 'supplier' } as const;
  let sealedId: string;

  beforeAll(async () => {
    const c = await caseInReview();
    await signDecision(getDb(), world.actors.arbiter, c.id, body());
    sealedId = c.id;
  });

  it('lists every transition, each from states that exclude “decided”', () => {
    expect(Object.keys(rightActor).sort()).toEqual([...transitionNames].sort());
    for (const name of transitionNames) expect(transitions[name].from).not.toContain('decided');
  });

  it.each(Object.entries(rightActor))('refuses %s by the party that may make it with 409, through the data layer and the route, changing nothing', async (name, key) => {
    const transition = name as keyof typeof rightActor;
    const input = await L.validInput(world, transition, sealedId);
    const before = await state(sealedId);
    await L.expectAppError(runTransition(getDb(), world.actors[key], sealedId, transition, input), 'conflict');
    const problem = await L.expectProblem(await L.postTransition(world, key, sealedId, transition, input), 409);
    expect(problem.code).toBe('conflict');
    expect(await state(sealedId)).toEqual(before);
  });

  it('refuses a second signature with 409 and changes nothing', async () => {
    const before = await state(sealedId);
    await L.expectAppError(signDecision(getDb(), world.actors.arbiter2, sealedId, body()), 'conflict');
    expect(await state(sealedId)).toEqual(before);
  });

  it('offers the parties no form and the board only a correction of the decision in force, and the guard for other writers refuses it', async () => {
    for (const key of ['supplier', 'plant', 'lab', 'arbiter', 'arbiter2'] as const) {
      expect((await caseWorkbench(getDb(), world.actors[key], sealedId)).allowed).toEqual([]);
    }
    for (const key of ['supplier', 'plant', 'lab'] as const) expect((await decisionPanel(getDb(), world.actors[key], sealedId)).form).toBeNull();
    const [inForce] = await getDb().select({ id: decision.id, outcome: decision.outcome }).from(decision).where(eq(decision.caseId, sealedId));
    for (const key of ['arbiter', 'arbiter2'] as const) {
      expect((await decisionPanel(getDb(), world.actors[key], sealedId)).form?.correcting).toEqual({ decisionId: inForce.id, outcome: inForce.outcome });
    }
    await L.expectAppError(assertCaseNotSealed(getDb(), sealedId), 'conflict');
    const open = await caseInReview();
    await expect(assertCaseNotSealed(getDb(), open.id)).resolves.toBeUndefined();
  });

  it('keeps the seeded demo decisions sealed through the same path', async () => {
    const rows = await getDb().select({ number: disputeCase.number, recordSha256: decision.recordSha256, method: decision.reauthenticationMethod }).from(decision).innerJoin(disputeCase, eq(disputeCase.id, decision.caseId)).where(eq(disputeCase.supplierOrganisationId, world.org.supplier));
    const seeded = rows.filter((r) => r.method === 'none (demo seed)');
    expect(seeded.length).toBeGreaterThan(0);
    for (const r of seeded) expect(r.recordSha256).toMatch(/^[0-9a-f]{64}$/);
  });
});
