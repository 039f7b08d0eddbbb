import net from 'node:net';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { World } from './support/lifecycle';

// This file proves what production does: the request returns once the change has committed, and
// the mail goes out afterwards. Every other file delivers inline to read the catcher at once.
process.env.MAIL_DELIVERY = 'background';

// The relay sits behind a gate: while it is closed, a hand-over cannot even start its SMTP greeting.
const { startMailCatcher } = await import('@/lib/mail/catcher');
const catcher = await startMailCatcher({ smtpPort: 0, httpPort: 0 });
let gateOpen = false;
const waiting: (() => void)[] = [];
const gate = net.createServer((client) => {
  const connect = () => {
    const upstream = net.connect(catcher.smtpPort, '127.0.0.1');
    client.pipe(upstream).pipe(client);
    const end = () => {
      client.destroy();
      upstream.destroy();
    };
    client.once('close', end);
    upstream.once('close', end);
  };
  if (gateOpen) connect();
  else waiting.push(connect);
});
await new Promise<void>((resolve) => gate.listen(0, '127.0.0.1', resolve));
process.env.SMTP_URL = `smtp://127.0.0.1:${(gate.address() as net.AddressInfo).port}`;

const { eq, inArray } = await import('drizzle-orm');
const { getDb } = await import('@/db/client');
const { outgoingMail } = await import('@/db/schema');
const { runTransition } = await import('@/lib/dal/case-transition');
const { queueMail, mailSettled } = await import('@/lib/mail/outbox');
const { resetMailTransport } = await import('@/lib/mail/transport');
const L = await import('./support/lifecycle');

let world: World;

function openGate() {
  gateOpen = true;
  for (const connect of waiting.splice(0)) connect();
}

beforeAll(async () => {
  world = await L.setUpWorld();
  openGate();
  await mailSettled();
});

afterAll(async () => {
  openGate();
  await mailSettled();
  resetMailTransport();
  await new Promise((resolve) => gate.close(resolve));
  await catcher.close();
});

describe('mail queued with the change, delivered after it', () => {
  it('answers a transition while its notices are still queued, then delivers them', async () => {
    const c = await L.freshCaseIn(world, 'open');
    await mailSettled();
    gateOpen = false;
    const caught = catcher.messages.length;

    const outcome = await runTransition(getDb(), world.actors.plant, c.id, 'dispatch', await L.inputs.dispatch(world, c.id));

    expect(outcome.to).toBe('awaiting_sample');
    expect((await L.caseRow(c.id)).status).toBe('awaiting_sample');
    const queued = (await L.mailOfCase(c.id)).filter((m) => m.template === 'case-dispatched');
    // The laboratory, the supplier and the board; none handed over yet, because the relay is held.
    expect(queued).toHaveLength(3);
    expect(queued.map((m) => m.status)).toEqual(['queued', 'queued', 'queued']);
    expect(queued.every((m) => m.html === null && m.content !== null)).toBe(true);
    expect(catcher.messages.length).toBe(caught);

    openGate();
    await mailSettled();
    const delivered = (await L.mailOfCase(c.id)).filter((m) => m.template === 'case-dispatched');
    expect(delivered.map((m) => m.status)).toEqual(['sent', 'sent', 'sent']);
    // A sent notice keeps what it said as its content; only a failed one keeps html for its retry.
    expect(delivered.every((m) => m.attempts === 1 && m.sentAt !== null && m.content !== null && m.html === null)).toBe(true);
    // What each party receives is what was queued for it (each audience has its own wording).
    const caughtNow = catcher.messages.slice(caught).map((m) => `${m.subject}|${[...m.to].sort().join(',')}`).sort();
    expect(caughtNow).toEqual(delivered.map((m) => `${m.subject}|${[...m.to].sort().join(',')}`).sort());
    const html = catcher.messages.slice(caught).map((m) => m.html ?? '');
    expect(html.every((h) => h.includes(`/cases/${c.id}`))).toBe(true);
  });

  it('sends each message of a burst of transitions exactly once', async () => {
    const cases = await Promise.all(Array.from({ length: 6 }, () => L.freshCaseIn(world, 'open')));
    await mailSettled();
    const caught = catcher.messages.length;
    const inputs = await Promise.all(cases.map((c) => L.inputs.dispatch(world, c.id)));
    await Promise.all(cases.map((c, i) => runTransition(getDb(), world.actors.plant, c.id, 'dispatch', inputs[i])));
    await mailSettled();

    const rows = await getDb().select().from(outgoingMail).where(inArray(outgoingMail.caseId, cases.map((c) => c.id)));
    const dispatched = rows.filter((m) => m.template === 'case-dispatched');
    expect(dispatched).toHaveLength(cases.length * 3);
    expect(dispatched.every((m) => m.status === 'sent' && m.attempts === 1)).toBe(true);
    const received = catcher.messages.slice(caught).filter((m) => m.template === 'case-dispatched');
    const keys = received.map((m) => `${m.subject}|${[...m.to].sort().join(',')}`);
    expect(new Set(keys).size).toBe(keys.length);
    expect(keys).toHaveLength(dispatched.length);
  });

  it('writes no message when the transaction that queued it rolls back', async () => {
    const subject = `A notice of a change that never happened ${L.unique()}`;
    await expect(
      getDb().transaction(async (tx) => {
        await queueMail(tx, [{ to: ['plant@demo.countersample.test'], subject, template: 'case-notice', content: { layout: 'case-notice', props: { greeting: 'Hello,', headline: 'Nothing', lines: [], url: 'http://127.0.0.1/', actionLabel: 'Open' } } }]);
        throw new Error('the change failed');
      }),
    ).rejects.toThrow('the change failed');
    expect(await getDb().select().from(outgoingMail).where(eq(outgoingMail.subject, subject))).toEqual([]);
  });

  it('keeps a refused transition free of mail', async () => {
    const c = await L.freshCaseIn(world, 'open');
    await mailSettled();
    const before = (await L.mailOfCase(c.id)).length;
    await L.expectAppError(runTransition(getDb(), world.actors.plant, c.id, 'receive', { sealNumber: 'X', sealIntact: true, frozen: false, temperature: 4, condition: 'ok' }), 'forbidden');
    expect((await L.mailOfCase(c.id)).length).toBe(before);
  });
});
