import { sql } from 'drizzle-orm';
import { check, index, pgTable, text, timestamp, uuid } from 'drizzle-orm/pg-core';
import type { OrganisationKind } from '../../lib/enums';

export { organisationKinds, type OrganisationKind } from '../../lib/enums';

export const organisation = pgTable(
  'organisation',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    name: text('name').notNull().unique(),
    kind: text('kind').$type<OrganisationKind>().notNull(),
    contactEmail: text('contact_email'),
    address: text('address'),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [check('organisation_kind_check', sql`${t.kind} in ('plant', 'supplier', 'lab', 'board')`)],
);

/** A farm delivering milk; it belongs to one supplier organisation (a farm or a producer group). */
export const supplierFarm = pgTable(
  'supplier_farm',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    organisationId: uuid('organisation_id')
      .notNull()
      .references(() => organisation.id),
    name: text('name').notNull(),
    herdCode: text('herd_code').notNull().unique(),
    contactEmail: text('contact_email'),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index('supplier_farm_organisation_idx').on(t.organisationId)],
);

export const invitation = pgTable(
  'invitation',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    email: text('email').notNull(),
    name: text('name').notNull(),
    organisationId: uuid('organisation_id')
      .notNull()
      .references(() => organisation.id),
    role: text('role').notNull(),
    // Only the SHA-256 of the token is stored: a database reader cannot accept an invitation.
    tokenHash: text('token_hash').notNull().unique(),
    invitedBy: text('invited_by').notNull(),
    expiresAt: timestamp('expires_at', { withTimezone: true }).notNull(),
    acceptedAt: timestamp('accepted_at', { withTimezone: true }),
    revokedAt: timestamp('revoked_at', { withTimezone: true }),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    index('invitation_email_idx').on(t.email),
    check('invitation_role_check', sql`${t.role} in ('supplier', 'plant', 'lab', 'arbiter', 'admin')`),
  ],
);
