import { sql } from 'drizzle-orm';
import { check, foreignKey, index, integer, pgTable, text, timestamp, uniqueIndex, uuid } from 'drizzle-orm/pg-core';
import { delivery } from './deliveries';
import { intakeResult } from './intake';
import { organisation, supplierFarm } from './organisations';
import { schemeRules } from './rules';
import { user } from './auth';
import type { CaseStatus, DisputeGround } from '../../lib/enums';

export { caseStatuses, disputeGrounds, type CaseStatus, type DisputeGround } from '../../lib/enums';

/** A dispute against one intake result. The four organisation columns are what every query scopes by. */
export const disputeCase = pgTable(
  'dispute_case',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    number: text('number').notNull().unique(),
    year: integer('year').notNull(),
    sequence: integer('sequence').notNull(),
    deliveryId: uuid('delivery_id')
      .notNull()
      .references(() => delivery.id),
    // The delivery's reference, farm and time of receipt, which case lists search and sort by: copied
    // so a list reads the cases alone rather than joining 73,000 deliveries to keep fifty. A delivery
    // is never edited, and the foreign key below holds the copy to it.
    deliveryReference: text('delivery_reference').notNull(),
    farmId: uuid('farm_id')
      .notNull()
      .references(() => supplierFarm.id),
    deliveredAt: timestamp('delivered_at', { withTimezone: true }).notNull(),
    intakeResultId: uuid('intake_result_id')
      .notNull()
      .references(() => intakeResult.id),
    supplierOrganisationId: uuid('supplier_organisation_id')
      .notNull()
      .references(() => organisation.id),
    plantOrganisationId: uuid('plant_organisation_id')
      .notNull()
      .references(() => organisation.id),
    labOrganisationId: uuid('lab_organisation_id').references(() => organisation.id),
    boardOrganisationId: uuid('board_organisation_id')
      .notNull()
      .references(() => organisation.id),
    rulesVersionId: uuid('rules_version_id')
      .notNull()
      .references(() => schemeRules.id),
    status: text('status').$type<CaseStatus>().notNull().default('open'),
    grounds: text('grounds').array().$type<DisputeGround[]>().notNull(),
    explanation: text('explanation').notNull(),
    remedy: text('remedy').notNull(),
    openedBy: text('opened_by')
      .notNull()
      .references(() => user.id),
    openedAt: timestamp('opened_at', { withTimezone: true }).notNull().defaultNow(),
    dispatchDueAt: timestamp('dispatch_due_at', { withTimezone: true }),
    sampleValidUntil: timestamp('sample_valid_until', { withTimezone: true }),
    retestSubmittedAt: timestamp('retest_submitted_at', { withTimezone: true }),
    decisionDueAt: timestamp('decision_due_at', { withTimezone: true }),
    decidedAt: timestamp('decided_at', { withTimezone: true }),
    withdrawnAt: timestamp('withdrawn_at', { withTimezone: true }),
    updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    uniqueIndex('dispute_case_year_sequence_unique').on(t.year, t.sequence),
    // One live dispute per intake result; a withdrawn one does not block a new one while the window is open.
    uniqueIndex('dispute_case_live_result_unique').on(t.intakeResultId).where(sql`${t.status} <> 'withdrawn'`),
    index('dispute_case_supplier_idx').on(t.supplierOrganisationId, t.status),
    index('dispute_case_plant_idx').on(t.plantOrganisationId, t.status),
    index('dispute_case_lab_idx').on(t.labOrganisationId, t.status),
    index('dispute_case_board_idx').on(t.boardOrganisationId, t.status),
    index('dispute_case_opened_idx').on(t.openedAt),
    foreignKey({
      name: 'dispute_case_delivery_facts_fk',
      columns: [t.deliveryId, t.deliveryReference, t.farmId, t.deliveredAt],
      foreignColumns: [delivery.id, delivery.reference, delivery.farmId, delivery.receivedAt],
    }),
    check(
      'dispute_case_status_check',
      sql`${t.status} in ('open', 'awaiting_sample', 'retest', 'review', 'decided', 'withdrawn')`,
    ),
    check('dispute_case_grounds_present', sql`cardinality(${t.grounds}) > 0`),
    check('dispute_case_number_format', sql`${t.number} ~ '^CS-[0-9]{4}-[0-9]{4,}$'`),
  ],
);

/** One row per reminder sent, so the scheduled job never sends the same one twice. */
export const reminderSent = pgTable(
  'reminder_sent',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    caseId: uuid('case_id')
      .notNull()
      .references(() => disputeCase.id),
    kind: text('kind').notNull(),
    dueAt: timestamp('due_at', { withTimezone: true }).notNull(),
    sentAt: timestamp('sent_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex('reminder_sent_unique').on(t.caseId, t.kind, t.dueAt)],
);
