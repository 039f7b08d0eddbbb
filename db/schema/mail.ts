import { sql } from 'drizzle-orm';
import { bigserial, boolean, check, index, integer, jsonb, pgTable, text, timestamp, uuid } from 'drizzle-orm/pg-core';
import type { QueuedContent } from '@/lib/mail/queued-content';

export const mailStatuses = ['queued', 'sent', 'failed'] as const;
export type MailStatus = (typeof mailStatuses)[number];

/** Every e-mail the product sends, with its delivery status; a failed one is retried by the scheduled job. */
export const outgoingMail = pgTable(
  'outgoing_mail',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    to: text('to').array().notNull(),
    subject: text('subject').notNull(),
    template: text('template').notNull(),
    caseId: uuid('case_id'),
    status: text('status').$type<MailStatus>().notNull().default('queued'),
    attempts: integer('attempts').notNull().default(0),
    lastError: text('last_error'),
    // The rendered message, kept so a failed hand-over can be retried as it was; attachments are not kept.
    html: text('html'),
    text: text('text'),
    hasAttachments: boolean('has_attachments').notNull().default(false),
    // A message queued inside the transaction of the change it tells of: what to render, until the
    // delivery worker renders it into html and text.
    content: jsonb('content').$type<QueuedContent>(),
    // When a delivery worker took the message; a claim this old with the message still queued was
    // lost with its process, and another worker may take it.
    claimedAt: timestamp('claimed_at', { withTimezone: true }),
    // The order messages were written in, which is the order they go out in: timestamps of one
    // transaction are equal, and clocks of two instances differ.
    queueOrder: bigserial('queue_order', { mode: 'number' }).notNull(),
    messageId: text('message_id'),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    sentAt: timestamp('sent_at', { withTimezone: true }),
  },
  (t) => [
    index('outgoing_mail_status_idx').on(t.status, t.createdAt),
    check('outgoing_mail_status_check', sql`${t.status} in ('queued', 'sent', 'failed')`),
  ],
);
