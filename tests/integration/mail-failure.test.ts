import net from 'node:net';
import { afterAll, beforeAll, describe, expect, it, vi, type MockInstance } from 'vitest';
import type { World } from './support/lifecycle';

// A port that was free a moment ago and is closed now: every SMTP hand-over is refused. env() caches
// SMTP_URL on first use, so this file has the unreachable relay to itself.
const closedPort = await new Promise<number>((resolve, reject) => {
  const server = net.createServer();
  server.once('error', reject);
  server.listen(0, '127.0.0.1', () => {
    const { port } = server.address() as net.AddressInfo;
    server.close(() => resolve(port));
  });
});
process.env.SMTP_URL = `smtp://127.0.0.1:${closedPort}`;

const { eq } = await import('drizzle-orm');
const { getDb } = await import('@/db/client');
const { measurementSet, reminderSent } = await import('@/db/schema');
const { openDispute } = await import('@/lib/dal/open-dispute');
const { runTransition } = await import('@/lib/dal/case-transition');
const { sendDueReminders } = await import('@/lib/dal/reminders');
const { verifyAuditChain } = await import('@/lib/audit/verify');
const { resetMailTransport } = await import('@/lib/mail/transport');
const L = await import('./support/lifecycle');
const { HOUR } = L;

let world: World;
let errorLog: MockInstance<typeof console.error>;

async function expectAllFailed(caseId: string, template: string, expected: number) {
  const rows = (await L.mailOfCase(caseId)).filter((m) => m.template === template);
  expect(rows).toHaveLength(expected);
  for (const row of rows) {
    expect(row.status).toBe('failed');
    expect(row.attempts).toBe(1);
    expect(row.sentAt).toBeNull();
    expect(row.lastError ?? '').not.toBe('');
  }
}

beforeAll(async () => {
  world = await L.setUpWorld();
  // Each refused hand-over is logged; the log is checked below rather than printed.
  errorLog = vi.spyOn(console, 'error').mockImplementation(() => {});
});

afterAll(() => {
  errorLog.mockRestore();
  resetMailTransport();
});

describe('when the mail relay refuses every message', () => {
  it('still opens the dispute, and records its mail as failed', async () => {
    const fresh = await L.createIntakeResult(world);
    const created = await openDispute(getDb(), world.actors.supplier, L.disputeBody(fresh.intakeResultId));
    expect((await L.caseRow(created.id)).status).toBe('open');
    // One message each to the plant and to the board.
    await expectAllFailed(created.id, 'case-opened', 2);
    const logged = errorLog.mock.calls.map((call) => String(call[0])).filter((line) => line.includes('(case-opened) could not be handed to SMTP'));
    expect(logged).toHaveLength(2);
  });

  it('keeps the dispatch, its custody event and its audit event; the mail is recorded as failed', async () => {
    const c = await L.freshCaseIn(world, 'open');
    const seq = await L.lastAuditSeq();
    const before = await L.snapshot(c.id);

    const outcome = await runTransition(getDb(), world.actors.plant, c.id, 'dispatch', await L.inputs.dispatch(world, c.id));

    expect(outcome.to).toBe('awaiting_sample');
    const after = await L.caseRow(c.id);
    expect(after.status).toBe('awaiting_sample');
    expect(after.labOrganisationId).toBe(world.org.lab);
    expect((await L.snapshot(c.id)).custody).toBe(before.custody + 1);
    expect(await L.auditSince(seq)).toHaveLength(1);
    // Lab, supplier and board are told; each hand-over failed and says so.
    await expectAllFailed(c.id, 'case-dispatched', 3);
    expect(await verifyAuditChain(getDb())).toMatchObject({ ok: true });
  });

  it('keeps a submitted retest and its measurement set', async () => {
    const c = await L.freshCaseIn(world, 'retest');
    await runTransition(getDb(), world.actors.lab, c.id, 'submit_retest', L.inputs.submit_retest(world));
    const after = await L.caseRow(c.id);
    expect(after.status).toBe('review');
    expect(after.retestSubmittedAt).not.toBeNull();
    expect(await getDb().select().from(measurementSet).where(eq(measurementSet.caseId, c.id))).toHaveLength(1);
    await expectAllFailed(c.id, 'case-retested', 3);
  });

  it('records a reminder whose mail failed as failed mail, and the job run itself does not fail', async () => {
    const c = await L.freshCaseIn(world, 'open');
    const run = await sendDueReminders(getDb(), new Date(c.dispatchDueAt!.getTime() - HOUR));
    expect(run.sent).toBeGreaterThanOrEqual(1);
    expect(await getDb().select().from(reminderSent).where(eq(reminderSent.caseId, c.id))).toHaveLength(1);
    await expectAllFailed(c.id, 'reminder-dispatch', 1);
  });

  it('retries the failed messages once the relay answers again, and leaves them sent', async () => {
    const { retryFailedMail } = await import('@/lib/mail/send');
    const { outgoingMail } = await import('@/db/schema');
    const { startMailCatcher } = await import('@/lib/mail/catcher');
    const failedBefore = await getDb().select().from(outgoingMail).where(eq(outgoingMail.status, 'failed'));
    expect(failedBefore.length).toBeGreaterThan(0);
    // The relay comes back on the same port.
    const catcher = await startMailCatcher({ smtpPort: closedPort, httpPort: 0 });
    try {
      resetMailTransport();
      const result = await retryFailedMail(500);
      expect(result.retried).toBe(failedBefore.length);
      expect(result.sent).toBe(failedBefore.length);
      expect(catcher.messages).toHaveLength(failedBefore.length);
      const subjects = new Set(failedBefore.map((m) => m.subject));
      for (const message of catcher.messages) expect(subjects.has(message.subject)).toBe(true);
      const after = await getDb().select().from(outgoingMail).where(eq(outgoingMail.status, 'failed'));
      expect(after).toEqual([]);
      // A second run finds nothing left to retry.
      expect((await retryFailedMail(500)).retried).toBe(0);

      // A hand-over cut short by a crash leaves the message queued and claimed: taken again once the claim is clearly stale, not before.
      const { deliverQueuedMail } = await import('@/lib/mail/outbox');
      const claimedAt = new Date(Date.now() - 2 * 60_000);
      const [stuck] = await getDb()
        .insert(outgoingMail)
        .values({ to: ['plant@demo.countersample.test'], subject: 'A notice whose hand-over was cut short', template: 'case-notice', html: '<p>Sample dispatched.</p>', text: 'Sample dispatched.', createdAt: claimedAt, claimedAt })
        .returning();
      expect((await deliverQueuedMail()).claimed).toBe(0);
      const later = new Date(claimedAt.getTime() + 16 * 60_000);
      expect(await deliverQueuedMail(() => later)).toEqual({ claimed: 1, sent: 1 });
      const [delivered] = await getDb().select().from(outgoingMail).where(eq(outgoingMail.id, stuck.id));
      expect(delivered.status).toBe('sent');
    } finally {
      await catcher.close();
    }
  });
});
