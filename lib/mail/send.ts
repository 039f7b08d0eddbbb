import 'server-only';
import type { ReactElement } from 'react';
import { render } from '@react-email/components';
import { eq, sql } from 'drizzle-orm';
import { getDb } from '@/db/client';
import { outgoingMail } from '@/db/schema';
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
 * Records the message, then hands it to SMTP. A failed hand-over is recorded, not thrown: the change
 * that caused the mail has already committed, and the scheduled job retries what failed.
 */
export async function sendMail(message: OutgoingMessage): Promise<{ id: string; status: 'sent' | 'failed' }> {
  const db = getDb();
  const [row] = await db
    .insert(outgoingMail)
    .values({ to: message.to, subject: message.subject, template: message.template, caseId: message.caseId })
    .returning({ id: outgoingMail.id });
  const [html, text] = await Promise.all([render(message.body), render(message.body, { plainText: true })]);
  try {
    const info = await mailTransport().sendMail({
      to: message.to,
      subject: message.subject,
      html,
      text,
      attachments: message.attachments,
      headers: { 'X-Countersample-Template': message.template },
    });
    await db
      .update(outgoingMail)
      .set({ status: 'sent', sentAt: new Date(), messageId: info.messageId, attempts: sql`${outgoingMail.attempts} + 1` })
      .where(eq(outgoingMail.id, row.id));
    return { id: row.id, status: 'sent' };
  } catch (error) {
    const reason = error instanceof Error ? error.message : String(error);
    console.error(`Mail ${row.id} (${message.template}) could not be handed to SMTP: ${reason}`);
    await db
      .update(outgoingMail)
      .set({ status: 'failed', lastError: reason.slice(0, 500), attempts: sql`${outgoingMail.attempts} + 1` })
      .where(eq(outgoingMail.id, row.id));
    return { id: row.id, status: 'failed' };
  }
}
