import 'server-only';
import type { ReactElement } from 'react';
import { and, asc, eq, isNotNull, lt, sql } from 'drizzle-orm';
import { getDb } from '@/db/client';
import { outgoingMail } from '@/db/schema';
import type { Transporter } from 'nodemailer';
import { renderMail } from './render-mail';
import { mailTransport } from './transport';

export type MailAttachment = { filename: string; content: Buffer; contentType: string };

export type OutgoingMessage = {
  to: string[];
  subject: string;
  template: string;
  body: ReactElement;
  caseId?: string;
  attachments?: MailAttachment[];
};

/**
 * Records the message, then hands it to SMTP at once: for messages the user waits for (sign-in links)
 * and those with attachments, which are not kept. Case notices are queued in their change's
 * transaction instead (notifyCase, queueMail). A failed hand-over is recorded, not thrown: the change that caused
 * the mail has already committed, and the scheduled job retries what failed (retryFailedMail).
 */
export async function sendMail(message: OutgoingMessage): Promise<{ id: string; status: 'sent' | 'failed' }> {
  const db = getDb();
  const { html, text } = await renderMail(message.body);
  const [row] = await db
    .insert(outgoingMail)
    // Claimed by this call from the start, so the delivery worker leaves it alone unless this process dies in the hand-over.
    .values({ to: message.to, subject: message.subject, template: message.template, caseId: message.caseId, html, text, hasAttachments: !!message.attachments?.length, claimedAt: new Date() })
    .returning({ id: outgoingMail.id });
  return handOver(row.id, { to: message.to, subject: message.subject, template: message.template, html, text, attachments: message.attachments });
}

type Rendered = { to: string[]; subject: string; template: string; html: string; text: string; attachments?: MailAttachment[] };

export async function handOver(id: string, message: Rendered, transport: Transporter = mailTransport()): Promise<{ id: string; status: 'sent' | 'failed' }> {
  const db = getDb();
  try {
    const info = await transport.sendMail({
      to: message.to,
      subject: message.subject,
      html: message.html,
      text: message.text,
      attachments: message.attachments,
      headers: { 'X-Countersample-Template': message.template },
    });
    await db
      .update(outgoingMail)
      .set({ status: 'sent', sentAt: new Date(), messageId: info.messageId, attempts: sql`${outgoingMail.attempts} + 1` })
      .where(eq(outgoingMail.id, id));
    return { id, status: 'sent' };
  } catch (error) {
    const reason = error instanceof Error ? error.message : String(error);
    console.error(`Mail ${id} (${message.template}) could not be handed to SMTP: ${reason}`);
    await db
      .update(outgoingMail)
      .set({ status: 'failed', lastError: reason.slice(0, 500), attempts: sql`${outgoingMail.attempts} + 1` })
      .where(eq(outgoingMail.id, id));
    return { id, status: 'failed' };
  }
}

const MAX_ATTEMPTS = 5;
/** A message still queued this long after a worker claimed it lost its hand-over (the process died in it). */
export const STUCK_QUEUED_MS = 15 * 60_000;

/**
 * Hands failed messages to SMTP again, oldest first, up to five attempts each. (Messages left queued
 * by a process that died are the delivery worker's: deliverQueuedMail takes them once their claim is
 * stale.) A message that had attachments is not retried (they are not kept); it stays failed and is
 * listed for the administrator.
 */
export async function retryFailedMail(limit = 200): Promise<{ retried: number; sent: number }> {
  const db = getDb();
  const rows = await db
    .select()
    .from(outgoingMail)
    .where(
      and(
        eq(outgoingMail.status, 'failed'),
        lt(outgoingMail.attempts, MAX_ATTEMPTS),
        eq(outgoingMail.hasAttachments, false),
        isNotNull(outgoingMail.html),
      ),
    )
    .orderBy(asc(outgoingMail.createdAt))
    .limit(limit);
  let sent = 0;
  for (const row of rows) {
    const result = await handOver(row.id, { to: row.to, subject: row.subject, template: row.template, html: row.html ?? '', text: row.text ?? '' });
    if (result.status === 'sent') sent++;
  }
  return { retried: rows.length, sent };
}
