import { index, integer, jsonb, pgTable, text, timestamp, uuid } from 'drizzle-orm/pg-core';
import type { SchemeRules } from '@/lib/rules/schema';

/**
 * Scheme rules are versioned: a new version never edits an old one, and the version in force at a
 * time is the one with the latest `effectiveFrom` not after it. Intake results and cases keep the id
 * of the version they were made under.
 */
export const schemeRules = pgTable(
  'scheme_rules',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    version: integer('version').notNull().unique(),
    effectiveFrom: timestamp('effective_from', { withTimezone: true }).notNull(),
    rules: jsonb('rules').$type<SchemeRules>().notNull(),
    note: text('note'),
    createdBy: text('created_by'),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index('scheme_rules_effective_idx').on(t.effectiveFrom)],
);
