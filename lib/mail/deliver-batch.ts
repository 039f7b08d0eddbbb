import nodemailer from 'nodemailer';
import type { QueuedContent } from './queued-content';
import { renderQueued } from './render-queued';

/** A claimed message as the hand-over needs it: rendered already, or the content to render. */
export type BatchMessage = { id: string; to: string[]; subject: string; template: string; html: string | null; text: string | null; content: QueuedContent | null };

/**
 * What became of one message: the relay's answer, and for a failed one its rendered parts, kept for
 * the retry (null when it could not be rendered, so the retry never sends an empty message).
 */
export type BatchOutcome = { id: string; template: string } & (
  | { status: 'sent'; sentAt: string; messageId: string }
  | { status: 'failed'; error: string; html: string | null; text: string | null }
);

export type RelaySettings = { smtpUrl: string; from: string };

/**
 * Renders what is not rendered yet and hands the batch to the relay on one pooled connection,
 * closed at the end. No database here: it runs off the request thread, and the caller records the
 * outcomes in one statement. A failure is an outcome, never thrown, so one bad address does not
 * hold back the rest of the batch.
 */
export async function deliverBatch(messages: BatchMessage[], relay: RelaySettings): Promise<BatchOutcome[]> {
  const url = new URL(relay.smtpUrl);
  // One connection for the batch: relays often hold back their greeting on each new connection.
  url.searchParams.set('pool', 'true');
  url.searchParams.set('maxConnections', '1');
  const transport = nodemailer.createTransport(url.toString(), { from: relay.from });
  const outcomes: BatchOutcome[] = [];
  try {
    for (const message of messages) {
      let rendered = message.html !== null && message.text !== null ? { html: message.html, text: message.text } : null;
      try {
        if (!rendered) {
          if (!message.content) throw new Error('The message has neither rendered parts nor content to render.');
          rendered = await renderQueued(message.content);
        }
        const info = await transport.sendMail({ to: message.to, subject: message.subject, ...rendered, headers: { 'X-Countersample-Template': message.template } });
        outcomes.push({ id: message.id, template: message.template, status: 'sent', sentAt: new Date().toISOString(), messageId: String(info.messageId) });
      } catch (error) {
        const reason = error instanceof Error ? error.message : String(error);
        outcomes.push({ id: message.id, template: message.template, html: rendered?.html ?? null, text: rendered?.text ?? null, status: 'failed', error: reason.slice(0, 500) });
      }
    }
  } finally {
    transport.close();
  }
  return outcomes;
}
