import { sql } from 'drizzle-orm';
import { check, index, integer, pgTable, text, timestamp, unique, uuid } from 'drizzle-orm/pg-core';
import { organisation, supplierFarm } from './organisations';

/** One load received from one farm. The supplier organisation is kept on the row so every query can scope by it. */
export const delivery = pgTable(
  'delivery',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    reference: text('reference').notNull().unique(),
    plantOrganisationId: uuid('plant_organisation_id')
      .notNull()
      .references(() => organisation.id),
    supplierOrganisationId: uuid('supplier_organisation_id')
      .notNull()
      .references(() => organisation.id),
    farmId: uuid('farm_id')
      .notNull()
      .references(() => supplierFarm.id),
    collectedAt: timestamp('collected_at', { withTimezone: true }).notNull(),
    receivedAt: timestamp('received_at', { withTimezone: true }).notNull(),
    volumeLitres: integer('volume_litres').notNull(),
    tanker: text('tanker').notNull(),
    compartment: text('compartment').notNull(),
    receiptTempTenthMilliC: integer('receipt_temp_tenth_milli_c').notNull(),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    index('delivery_supplier_received_idx').on(t.supplierOrganisationId, t.receivedAt),
    index('delivery_plant_received_idx').on(t.plantOrganisationId, t.receivedAt),
    index('delivery_farm_received_idx').on(t.farmId, t.receivedAt),
    // What a case copies of its delivery, so the case's foreign key can hold the copy to the original.
    unique('delivery_case_facts_unique').on(t.id, t.reference, t.farmId, t.receivedAt),
    check('delivery_volume_positive', sql`${t.volumeLitres} > 0`),
    check('delivery_received_after_collected', sql`${t.receivedAt} >= ${t.collectedAt}`),
    // A load on receipt is between frozen and warm from the cow: −2 °C … 40 °C.
    check('delivery_receipt_temp_range', sql`${t.receiptTempTenthMilliC} between -20000 and 400000`),
  ],
);
