import { sql } from 'drizzle-orm';
import { boolean, check, index, jsonb, pgTable, text, timestamp, uuid, type AnyPgColumn } from 'drizzle-orm/pg-core';
import { disputeCase } from './cases';
import { user } from './auth';
import type { DecisionOutcome } from '../../lib/enums';

export { decisionOutcomes, type DecisionOutcome } from '../../lib/enums';

/** A binding decision. Rows are never updated; a correction is a new decision that supersedes this one. */
export const decision = pgTable(
  'decision',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    caseId: uuid('case_id')
      .notNull()
      .references(() => disputeCase.id),
    outcome: text('outcome').$type<DecisionOutcome>().notNull(),
    reasons: text('reasons').notNull(),
    followedProposal: boolean('followed_proposal').notNull(),
    departureReason: text('departure_reason'),
    proposal: jsonb('proposal').notNull(),
    settlement: jsonb('settlement').notNull(),
    signerUserId: text('signer_user_id')
      .notNull()
      .references(() => user.id),
    signerName: text('signer_name').notNull(),
    signedAt: timestamp('signed_at', { withTimezone: true }).notNull(),
    signatureMeaning: text('signature_meaning').notNull(),
    reauthenticatedAt: timestamp('reauthenticated_at', { withTimezone: true }).notNull(),
    reauthenticationMethod: text('reauthentication_method').notNull(),
    recordSha256: text('record_sha256'),
    recordSignature: text('record_signature'),
    signingKeyId: text('signing_key_id'),
    supersedesId: uuid('supersedes_id').references((): AnyPgColumn => decision.id),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    index('decision_case_idx').on(t.caseId),
    check('decision_outcome_check', sql`${t.outcome} in ('uphold', 'reverse', 'adjust', 'further_test')`),
    check('decision_departure_has_reason', sql`${t.followedProposal} or ${t.departureReason} is not null`),
  ],
);
