import 'server-only';
import { sql } from 'drizzle-orm';
import type { DbOrTx } from '@/db/client';
import { getDb } from '@/db/client';
import { outgoingMail } from '@/db/schema';
import type { QueuedContent } from './queued-content';
import type { BatchMessage, BatchOutcome } from './deliver-batch';
import { deliverBatchOffThread } from './delivery-thread';
import { deliveryWait } from './delivery-timing';
import { STUCK_QUEUED_MS } from './send';

export type QueuedMessage = { to: string[]; subject: string; template: string; caseId?: string; content: QueuedContent };

/**
 * Records messages in the caller's transaction: they exist exactly when the change they tell of
 * committed, so neither a crash nor a rollback leaves a notice without its change or a change
 * without its notice. Nothing is rendered or sent here; call mailAfterCommit once committed.
 */
export async function queueMail(tx: DbOrTx, messages: QueuedMessage[]): Promise<void> {
  if (messages.length === 0) return;
  await tx.insert(outgoingMail).values(messages.map((m) => ({ to: m.to, subject: m.subject, template: m.template, caseId: m.caseId, content: m.content })));
}

const BATCH = 50;

/**
 * Takes up to one batch of queued messages for this worker. SKIP LOCKED lets several server
 * instances on one PostgreSQL server share the queue; a claim older than STUCK_QUEUED_MS was lost
 * with its process (killed between claim and hand-over) and is taken again, so a message may then
 * go out twice, which is better than a party never hearing of a step.
 */
async function claimBatch(now: Date): Promise<BatchMessage[]> {
  const stale = new Date(now.getTime() - STUCK_QUEUED_MS);
  const result = await getDb().execute<Record<string, unknown>>(sql`
    update ${outgoingMail} set claimed_at = ${now.toISOString()}
    where id in (
      select id from ${outgoingMail}
      where status = 'queued' and has_attachments = false and (html is not null or content is not null)
        and (claimed_at is null or claimed_at < ${stale.toISOString()})
      order by queue_order
      limit ${BATCH}
      for update skip locked
    )
    returning id, "to", subject, template, html, text, content, queue_order`);
  // RETURNING follows the update's plan, not the subquery's order.
  const rows = [...result.rows].sort((a, b) => Number(a.queue_order) - Number(b.queue_order));
  return rows.map((r) => ({
    id: r.id as string,
    to: r.to as string[],
    subject: r.subject as string,
    template: r.template as string,
    html: (r.html as string | null) ?? null,
    text: (r.text as string | null) ?? null,
    content: typeof r.content === 'string' ? (JSON.parse(r.content) as QueuedContent) : ((r.content as QueuedContent | null) ?? null),
  }));
}

/**
 * Records what became of a batch in one statement. A failed message keeps its rendered parts, so it
 * is retried as it was first written; a sent one keeps what it said as its content, and storing its
 * html as well would cost the embedded database more than all the rest of the delivery.
 */
async function recordOutcomes(outcomes: BatchOutcome[]): Promise<void> {
  if (outcomes.length === 0) return;
  const rows = outcomes.map((o) =>
    o.status === 'sent'
      ? { id: o.id, status: o.status, html: null, text: null, sent_at: o.sentAt, message_id: o.messageId, error: null }
      : { id: o.id, status: o.status, html: o.html, text: o.text, sent_at: null, message_id: null, error: o.error },
  );
  await getDb().execute(sql`
    update ${outgoingMail} as m set
      status = r.status, html = coalesce(r.html, m.html), text = coalesce(r.text, m.text), attempts = m.attempts + 1,
      sent_at = coalesce(r.sent_at, m.sent_at), message_id = coalesce(r.message_id, m.message_id), last_error = coalesce(r.error, m.last_error)
    from jsonb_to_recordset(${JSON.stringify(rows)}::jsonb) as r(id uuid, status text, html text, text text, sent_at timestamptz, message_id text, error text)
    where m.id = r.id`);
  for (const o of outcomes) if (o.status === 'failed') console.error(`Mail ${o.id} (${o.template}) could not be handed to SMTP: ${o.error}`);
}

/**
 * Renders and hands over every queued message, batch by batch, until none is left. Rendering and
 * SMTP run on the mail thread; this thread only claims a batch and records its outcomes, two
 * statements for up to BATCH messages.
 */
export async function deliverQueuedMail(now: () => Date = () => new Date()): Promise<{ claimed: number; sent: number }> {
  let claimed = 0;
  let sent = 0;
  for (;;) {
    const batch = await claimBatch(now());
    if (batch.length === 0) return { claimed, sent };
    claimed += batch.length;
    const outcomes = await deliverBatchOffThread(batch);
    await recordOutcomes(outcomes);
    sent += outcomes.filter((o) => o.status === 'sent').length;
    if (batch.length < BATCH) return { claimed, sent };
  }
}

const globalForOutbox = globalThis as unknown as { __countersampleOutbox?: { running: Promise<void> | null; again: boolean; lastCommitAt: number } };

/**
 * Starts delivery in the background, or asks a running delivery to look again when it is done: one
 * worker per process, so bursts of commits do not start a worker each. It waits for a pause in the
 * commits first (lib/mail/delivery-timing.ts). Returns that run.
 */
export function deliverQueuedSoon(): Promise<void> {
  const state = (globalForOutbox.__countersampleOutbox ??= { running: null, again: false, lastCommitAt: 0 });
  state.lastCommitAt = Date.now();
  if (state.running) {
    state.again = true;
    return state.running;
  }
  state.running = (async () => {
    do {
      state.again = false;
      try {
        if (process.env.MAIL_DELIVERY !== 'inline') {
          const wokenAt = Date.now();
          for (let wait = deliveryWait(wokenAt, wokenAt, state.lastCommitAt); wait > 0; wait = deliveryWait(Date.now(), wokenAt, state.lastCommitAt)) {
            await new Promise((resolve) => setTimeout(resolve, wait));
          }
        }
        await deliverQueuedMail();
      } catch (error) {
        // The messages stay queued; the next commit or the scheduled job delivers them.
        console.error('Mail delivery stopped:', error);
        return;
      }
    } while (state.again);
  })().finally(() => {
    state.running = null;
  });
  return state.running;
}

/**
 * Called after a commit that queued mail. The request does not wait for delivery, except where
 * MAIL_DELIVERY=inline (the integration tests, which read the catcher right after the call).
 */
export async function mailAfterCommit(): Promise<void> {
  const run = deliverQueuedSoon();
  if (process.env.MAIL_DELIVERY === 'inline') await run;
}

/** Waits until no delivery is running in this process: for tests and for an orderly shutdown. */
export async function mailSettled(): Promise<void> {
  while (globalForOutbox.__countersampleOutbox?.running) await globalForOutbox.__countersampleOutbox.running;
}
