import { sql } from 'drizzle-orm';
import { check, index, integer, pgTable, text, timestamp, uuid, type AnyPgColumn } from 'drizzle-orm/pg-core';
import { delivery } from './deliveries';
import { measurementSet } from './measurements';
import { schemeRules } from './rules';
import { user } from './auth';
import type { IntakeVerdict } from '../../lib/enums';

export { intakeVerdicts, type IntakeVerdict } from '../../lib/enums';

/**
 * The plant's verdict on a delivery. A correction never edits a row: it adds a new one that
 * supersedes the old, with who, when and why (ISO/IEC 17025 7.5.2).
 */
export const intakeResult = pgTable(
  'intake_result',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    deliveryId: uuid('delivery_id')
      .notNull()
      .references(() => delivery.id),
    measurementSetId: uuid('measurement_set_id')
      .notNull()
      .references(() => measurementSet.id),
    rulesVersionId: uuid('rules_version_id')
      .notNull()
      .references(() => schemeRules.id),
    valueTenthMilliC: integer('value_tenth_milli_c').notNull(),
    limitTenthMilliC: integer('limit_tenth_milli_c').notNull(),
    decisionRule: text('decision_rule').notNull(),
    verdict: text('verdict').$type<IntakeVerdict>().notNull(),
    // Added water in hundredths of a percent (basis points), as the plant estimated it.
    addedWaterBasisPoints: integer('added_water_basis_points').notNull().default(0),
    // Money at stake in minor units of the scheme's currency: a rejected load's value or the deduction.
    amountMinor: integer('amount_minor').notNull().default(0),
    currency: text('currency').notNull(),
    decidedBy: text('decided_by').references(() => user.id),
    decidedAt: timestamp('decided_at', { withTimezone: true }).notNull(),
    notifiedAt: timestamp('notified_at', { withTimezone: true }),
    supersedesId: uuid('supersedes_id').references((): AnyPgColumn => intakeResult.id),
    supersededAt: timestamp('superseded_at', { withTimezone: true }),
    correctionReason: text('correction_reason'),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    index('intake_result_delivery_idx').on(t.deliveryId),
    index('intake_result_verdict_idx').on(t.verdict, t.decidedAt),
    check('intake_verdict_check', sql`${t.verdict} in ('accepted', 'deducted', 'rejected')`),
    check('intake_value_range', sql`${t.valueTenthMilliC} between -10000 and 0`),
    check('intake_amount_nonnegative', sql`${t.amountMinor} >= 0`),
    check('intake_correction_has_reason', sql`${t.supersedesId} is null or ${t.correctionReason} is not null`),
  ],
);
