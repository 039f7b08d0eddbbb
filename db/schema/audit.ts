import { bigserial, index, jsonb, pgTable, text, timestamp, uuid } from 'drizzle-orm/pg-core';

/**
 * Append-only and hash-chained: each row stores the hash of the row before it and of its own
 * canonical content, so an edited or deleted row breaks the chain from that point on.
 */
export const auditEvent = pgTable(
  'audit_event',
  {
    seq: bigserial('seq', { mode: 'number' }).primaryKey(),
    at: timestamp('at', { withTimezone: true }).notNull(),
    actorUserId: text('actor_user_id'),
    actorOrganisationId: uuid('actor_organisation_id'),
    action: text('action').notNull(),
    objectType: text('object_type').notNull(),
    objectId: text('object_id').notNull(),
    caseId: uuid('case_id'),
    change: jsonb('change').notNull(),
    origin: text('origin'),
    prevHash: text('prev_hash').notNull(),
    hash: text('hash').notNull().unique(),
  },
  (t) => [index('audit_event_case_idx').on(t.caseId, t.seq), index('audit_event_object_idx').on(t.objectType, t.objectId)],
);
