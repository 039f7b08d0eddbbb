import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startMailCatcher } from '@/lib/mail/catcher';
import type { CaseRow, World } from './support/lifecycle';

// env() reads SMTP_URL once: the catcher must listen and the variables be set before the app is loaded.
const catcher = await startMailCatcher({ smtpPort: 0, httpPort: 0 });
process.env.SMTP_URL = `smtp://127.0.0.1:${catcher.smtpPort}`;
process.env.MAIL_CATCHER_URL = `http://127.0.0.1:${catcher.httpPort}`;

const { eq, inArray } = await import('drizzle-orm');
const { getDb } = await import('@/db/client');
const { disputeCase, reminderSent } = await import('@/db/schema');
const { sendDueReminders } = await import('@/lib/dal/reminders');
const { runTransition } = await import('@/lib/dal/case-transition');
const { resetMailTransport } = await import('@/lib/mail/transport');
const L = await import('./support/lifecycle');
const { HOUR, MINUTE } = L;

let world: World;

const at = (base: Date | null, offsetMs: number) => new Date(base!.getTime() + offsetMs);

/** The reminders of one case as the catcher received them: which kind, and who got each message. */
function remindersOf(c: Pick<CaseRow, 'number'>) {
  return catcher.messages
    .filter((m) => m.subject.startsWith(`${c.number}:`) && m.template?.startsWith('reminder-'))
    .map((m) => ({ template: m.template, due: m.subject.includes(': overdue:') ? 'overdue' : m.subject.includes(': due soon:') ? 'soon' : 'unknown', to: [...m.to].sort() }));
}

async function claimedFor(caseIds: string[]) {
  return getDb().select().from(reminderSent).where(inArray(reminderSent.caseId, caseIds));
}

beforeAll(async () => {
  world = await L.setUpWorld();
});

afterAll(async () => {
  resetMailTransport();
  await catcher.close();
});

describe('the dispatch deadline', () => {
  it('reminds the plant once when dispatch draws near and once when it is overdue, never twice', async () => {
    const c = await L.freshCaseIn(world, 'open');
    const due = c.dispatchDueAt!;
    const plant = [world.actors.plant.email];

    await sendDueReminders(getDb(), at(due, -3 * HOUR));
    expect(remindersOf(c), 'three hours ahead is outside the two-hour horizon').toEqual([]);

    const first = await sendDueReminders(getDb(), at(due, -90 * MINUTE));
    expect(first.sent).toBeGreaterThanOrEqual(1);
    expect(remindersOf(c)).toEqual([{ template: 'reminder-dispatch', due: 'soon', to: plant }]);
    const [message] = catcher.messages.filter((m) => m.subject.startsWith(`${c.number}:`) && m.template === 'reminder-dispatch');
    expect(message.subject).toBe(`${c.number}: due soon: dispatch the retained sample`);

    const again = await sendDueReminders(getDb(), at(due, -90 * MINUTE));
    expect(again.sent).toBe(0);
    await sendDueReminders(getDb(), at(due, -30 * MINUTE));
    expect(remindersOf(c)).toHaveLength(1);

    await sendDueReminders(getDb(), at(due, MINUTE));
    expect(remindersOf(c)).toEqual([
      { template: 'reminder-dispatch', due: 'soon', to: plant },
      { template: 'reminder-dispatch', due: 'overdue', to: plant },
    ]);
    expect(catcher.messages.find((m) => m.subject === `${c.number}: overdue: dispatch the retained sample`)).toBeDefined();
    const afterOverdue = await sendDueReminders(getDb(), at(due, MINUTE));
    expect(afterOverdue.sent).toBe(0);
    await sendDueReminders(getDb(), at(due, 6 * HOUR));
    expect(remindersOf(c)).toHaveLength(2);

    const claimed = await claimedFor([c.id]);
    expect(claimed.map((r) => r.kind).sort()).toEqual(['dispatch:overdue', 'dispatch:soon']);
    expect(claimed.every((r) => r.dueAt.getTime() === due.getTime())).toBe(true);
    const rows = (await L.mailOfCase(c.id)).filter((m) => m.template === 'reminder-dispatch');
    expect(rows.map((r) => r.status)).toEqual(['sent', 'sent']);
  });

  it('sends each reminder once when two runs overlap', async () => {
    const c = await L.freshCaseIn(world, 'open');
    const now = at(c.dispatchDueAt, -HOUR);
    await Promise.all([sendDueReminders(getDb(), now), sendDueReminders(getDb(), now), sendDueReminders(getDb(), now)]);
    expect(remindersOf(c)).toEqual([{ template: 'reminder-dispatch', due: 'soon', to: [world.actors.plant.email] }]);
    expect(await claimedFor([c.id])).toHaveLength(1);
  });
});

describe('the sample validity deadline', () => {
  it('reminds the laboratory and the plant while the sample is awaited, and no longer about dispatch', async () => {
    const c = await L.freshCaseIn(world, 'awaiting_sample');
    const valid = c.sampleValidUntil!;
    expect(valid.getTime()).toBe(c.fresh.collectedAt.getTime() + 48 * HOUR);

    // The dispatch deadline has passed by now, but the sample went out: nothing about dispatch.
    await sendDueReminders(getDb(), at(valid, -13 * HOUR));
    expect(remindersOf(c)).toEqual([]);

    await sendDueReminders(getDb(), at(valid, -11 * HOUR));
    expect(remindersOf(c)).toEqual([
      { template: 'reminder-sample_validity', due: 'soon', to: [world.actors.lab.email] },
      { template: 'reminder-sample_validity', due: 'soon', to: [world.actors.plant.email] },
    ]);
    await sendDueReminders(getDb(), at(valid, -11 * HOUR));
    expect(remindersOf(c)).toHaveLength(2);

    await sendDueReminders(getDb(), at(valid, 10 * MINUTE));
    await sendDueReminders(getDb(), at(valid, 20 * MINUTE));
    const overdue = remindersOf(c).filter((r) => r.due === 'overdue');
    expect(overdue.map((r) => r.to)).toEqual([[world.actors.lab.email], [world.actors.plant.email]]);
    expect(remindersOf(c).some((r) => r.template === 'reminder-dispatch')).toBe(false);
  });

  it('reminds only the laboratory once it holds the sample', async () => {
    const c = await L.freshCaseIn(world, 'retest');
    await sendDueReminders(getDb(), at(c.sampleValidUntil, -6 * HOUR));
    expect(remindersOf(c)).toEqual([{ template: 'reminder-sample_validity', due: 'soon', to: [world.actors.lab.email] }]);
  });

  it('reminds again for the new sample of a further test, which has its own validity', async () => {
    const c = await L.freshCaseIn(world, 'review');
    await runTransition(getDb(), world.actors.arbiter, c.id, 'order_further_test', L.inputs.order_further_test(world, { labOrganisationId: world.org.lab }));
    const moved = await L.caseRow(c.id);
    expect(moved.sampleValidUntil!.getTime()).not.toBe(c.sampleValidUntil!.getTime());
    await sendDueReminders(getDb(), at(moved.sampleValidUntil, -HOUR));
    expect(remindersOf(c)).toEqual([
      { template: 'reminder-sample_validity', due: 'soon', to: [world.actors.lab.email] },
      { template: 'reminder-sample_validity', due: 'soon', to: [world.actors.plant.email] },
    ]);
  });
});

describe('the decision deadline', () => {
  it("reminds the board's arbiters, not its administrator, a day ahead and once overdue", async () => {
    const c = await L.freshCaseIn(world, 'review');
    const due = c.decisionDueAt!;
    const arbiters = [world.actors.arbiter.email, world.actors.arbiter2.email].sort();

    await sendDueReminders(getDb(), at(due, -25 * HOUR));
    expect(remindersOf(c)).toEqual([]);
    await sendDueReminders(getDb(), at(due, -23 * HOUR));
    expect(remindersOf(c)).toEqual([{ template: 'reminder-decision', due: 'soon', to: arbiters }]);
    await sendDueReminders(getDb(), at(due, -2 * HOUR));
    await sendDueReminders(getDb(), at(due, MINUTE));
    await sendDueReminders(getDb(), at(due, HOUR));
    expect(remindersOf(c)).toEqual([
      { template: 'reminder-decision', due: 'soon', to: arbiters },
      { template: 'reminder-decision', due: 'overdue', to: arbiters },
    ]);
    expect(remindersOf(c).flatMap((r) => r.to)).not.toContain(world.actors.admin.email);
  });
});

describe('closed cases', () => {
  it('sends nothing for decided or withdrawn cases, whatever their old deadlines', async () => {
    const withdrawn = await L.freshCaseIn(world, 'withdrawn');
    const closed = await getDb().select().from(disputeCase).where(inArray(disputeCase.status, ['decided', 'withdrawn']));
    expect(closed.filter((c) => c.status === 'decided').length).toBeGreaterThanOrEqual(2);
    expect(closed.map((c) => c.id)).toContain(withdrawn.id);
    // Each has deadlines the job would act on if it did not look at the state.
    expect(closed.every((c) => c.dispatchDueAt !== null)).toBe(true);
    expect(closed.some((c) => c.decisionDueAt !== null)).toBe(true);

    for (const offset of [HOUR, 3 * 24 * HOUR, 60 * 24 * HOUR]) await sendDueReminders(getDb(), at(withdrawn.dispatchDueAt, offset));

    expect(await claimedFor(closed.map((c) => c.id))).toEqual([]);
    for (const c of closed) expect(remindersOf(c), c.number).toEqual([]);
    // The same runs did remind live cases, so the silence above is the state rule at work.
    const live = await getDb().select().from(disputeCase).where(eq(disputeCase.status, 'open'));
    expect((await claimedFor(live.map((c) => c.id))).length).toBeGreaterThan(0);
  });
});
