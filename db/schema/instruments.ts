import { sql } from 'drizzle-orm';
import { boolean, check, index, integer, pgTable, text, timestamp, unique, uuid } from 'drizzle-orm/pg-core';
import { organisation } from './organisations';
import { schemeRules } from './rules';
import { user } from './auth';

export const instrument = pgTable(
  'instrument',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    organisationId: uuid('organisation_id')
      .notNull()
      .references(() => organisation.id),
    serialNumber: text('serial_number').notNull(),
    description: text('description').notNull(),
    method: text('method').notNull().default('Thermistor cryoscope, ISO 5764 | IDF 108'),
    active: boolean('active').notNull().default(true),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [unique('instrument_serial_unique').on(t.organisationId, t.serialNumber)],
);

/** A routine check on a sodium chloride standard; the verdict is the decision module's, stored with its inputs. */
export const calibrationCheck = pgTable(
  'calibration_check',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    instrumentId: uuid('instrument_id')
      .notNull()
      .references(() => instrument.id),
    checkedAt: timestamp('checked_at', { withTimezone: true }).notNull(),
    checkedBy: text('checked_by').references(() => user.id),
    analystName: text('analyst_name').notNull(),
    nominalTenthMilliC: integer('nominal_tenth_milli_c').notNull(),
    readingsTenthMilliC: integer('readings_tenth_milli_c').array().notNull(),
    toleranceTenthMilliC: integer('tolerance_tenth_milli_c').notNull(),
    required: integer('required').notNull(),
    within: integer('within').notNull(),
    pass: boolean('pass').notNull(),
    validUntil: timestamp('valid_until', { withTimezone: true }).notNull(),
    rulesVersionId: uuid('rules_version_id').references(() => schemeRules.id),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    index('calibration_check_instrument_idx').on(t.instrumentId, t.checkedAt),
    check('calibration_nominal_range', sql`${t.nominalTenthMilliC} between -10000 and 0`),
    check(
      'calibration_readings_range',
      sql`cardinality(${t.readingsTenthMilliC}) > 0 and -10000 <= all(${t.readingsTenthMilliC}) and 0 >= all(${t.readingsTenthMilliC})`,
    ),
    check('calibration_tolerance_positive', sql`${t.toleranceTenthMilliC} > 0`),
  ],
);
