import { sql } from 'drizzle-orm';
import { boolean, check, index, integer, pgTable, text, timestamp, uuid, type AnyPgColumn } from 'drizzle-orm/pg-core';
import { delivery } from './deliveries';
import { organisation } from './organisations';
import { user } from './auth';
import { disputeCase } from './cases';
import type { SampleKind, CustodyEventKind } from '../../lib/enums';

export { sampleKinds, custodyEventKinds, type SampleKind, type CustodyEventKind } from '../../lib/enums';

export const sample = pgTable(
  'sample',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    deliveryId: uuid('delivery_id')
      .notNull()
      .references(() => delivery.id),
    // Set for samples taken for a dispute (a further test, an authentic herd sample).
    caseId: uuid('case_id').references((): AnyPgColumn => disputeCase.id),
    code: text('code').notNull().unique(),
    kind: text('kind').$type<SampleKind>().notNull(),
    sealNumber: text('seal_number'),
    preservative: text('preservative'),
    storage: text('storage'),
    sampledAt: timestamp('sampled_at', { withTimezone: true }).notNull(),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    index('sample_delivery_idx').on(t.deliveryId),
    index('sample_case_idx').on(t.caseId),
    check('sample_kind_check', sql`${t.kind} in ('routine', 'retained', 'counter', 'referee', 'authentic')`),
  ],
);

export const custodyEvent = pgTable(
  'custody_event',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    sampleId: uuid('sample_id')
      .notNull()
      .references(() => sample.id),
    kind: text('kind').$type<CustodyEventKind>().notNull(),
    at: timestamp('at', { withTimezone: true }).notNull(),
    actorUserId: text('actor_user_id').references(() => user.id),
    organisationId: uuid('organisation_id')
      .notNull()
      .references(() => organisation.id),
    location: text('location'),
    tempTenthMilliC: integer('temp_tenth_milli_c'),
    sealIntact: boolean('seal_intact'),
    frozen: boolean('frozen'),
    note: text('note'),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    index('custody_event_sample_idx').on(t.sampleId, t.at),
    check(
      'custody_event_kind_check',
      sql`${t.kind} in ('sealed', 'stored', 'dispatched', 'received', 'seal_checked', 'opened', 'disposed')`,
    ),
    check('custody_event_temp_range', sql`${t.tempTenthMilliC} is null or ${t.tempTenthMilliC} between -300000 and 500000`),
  ],
);
