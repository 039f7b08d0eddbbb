import { sql } from 'drizzle-orm';
import { check, index, integer, pgTable, text, timestamp, unique, uuid, type AnyPgColumn } from 'drizzle-orm/pg-core';
import { sample } from './samples';
import { organisation } from './organisations';
import { instrument, calibrationCheck } from './instruments';
import { user } from './auth';
import { disputeCase } from './cases';
import type { MeasurementPurpose, Preparation, ResultBasis, ReadingFlag } from '../../lib/enums';

export { measurementPurposes, preparations, resultBases, readingFlags, type MeasurementPurpose, type Preparation, type ResultBasis, type ReadingFlag } from '../../lib/enums';

/** The readings of one sample by one laboratory on one instrument, and the final result derived from them. */
export const measurementSet = pgTable(
  'measurement_set',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    sampleId: uuid('sample_id')
      .notNull()
      .references(() => sample.id),
    caseId: uuid('case_id').references((): AnyPgColumn => disputeCase.id),
    organisationId: uuid('organisation_id')
      .notNull()
      .references(() => organisation.id),
    instrumentId: uuid('instrument_id')
      .notNull()
      .references(() => instrument.id),
    calibrationCheckId: uuid('calibration_check_id').references(() => calibrationCheck.id),
    // Set when the set was recorded on an instrument without a passing check in force, as the scheme
    // may allow: the warning travels with the readings so the board weighs them knowingly.
    calibrationWarning: text('calibration_warning'),
    purpose: text('purpose').$type<MeasurementPurpose>().notNull(),
    analystName: text('analyst_name').notNull(),
    testedAt: timestamp('tested_at', { withTimezone: true }).notNull(),
    sampleTempTenthMilliC: integer('sample_temp_tenth_milli_c'),
    preparation: text('preparation').$type<Preparation>().notNull().default('none'),
    resultTenthMilliC: integer('result_tenth_milli_c'),
    resultBasis: text('result_basis').$type<ResultBasis>(),
    readingsUsed: integer('readings_used'),
    createdBy: text('created_by').references(() => user.id),
    submittedAt: timestamp('submitted_at', { withTimezone: true }),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    index('measurement_set_sample_idx').on(t.sampleId),
    index('measurement_set_case_idx').on(t.caseId),
    check('measurement_purpose_check', sql`${t.purpose} in ('intake', 'retest', 'further_test')`),
    check('measurement_preparation_check', sql`${t.preparation} in ('none', 'prewarmed')`),
    check('measurement_result_range', sql`${t.resultTenthMilliC} is null or ${t.resultTenthMilliC} between -10000 and 0`),
    check(
      'measurement_result_basis_check',
      sql`${t.resultBasis} is null or ${t.resultBasis} in ('mean_of_2', 'mean_of_4', 'median_of_4')`,
    ),
  ],
);

export const reading = pgTable(
  'reading',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    measurementSetId: uuid('measurement_set_id')
      .notNull()
      .references(() => measurementSet.id),
    position: integer('position').notNull(),
    valueTenthMilliC: integer('value_tenth_milli_c').notNull(),
    flag: text('flag').$type<ReadingFlag>().notNull().default('none'),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    unique('reading_position_unique').on(t.measurementSetId, t.position),
    // A freezing point of milk lies between −1.000 °C and 0.000 °C.
    check('reading_value_range', sql`${t.valueTenthMilliC} between -10000 and 0`),
    check('reading_position_positive', sql`${t.position} >= 1`),
    check('reading_flag_check', sql`${t.flag} in ('none', 'early_crystallisation', 'no_crystallisation')`),
  ],
);
