import { sql } from 'drizzle-orm';
import { bigint, check, index, jsonb, pgTable, text, timestamp, uuid, type AnyPgColumn } from 'drizzle-orm/pg-core';
import { disputeCase } from './cases';
import { organisation } from './organisations';
import { user } from './auth';
import type { AttachmentKind, NoteVisibility } from '../../lib/enums';

export { attachmentKinds, noteVisibilities, type AttachmentKind, type NoteVisibility } from '../../lib/enums';

/** A file of evidence. Never overwritten; a removal is recorded, and the file stays retrievable for the board. */
export const attachment = pgTable(
  'attachment',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    caseId: uuid('case_id')
      .notNull()
      .references(() => disputeCase.id),
    uploadedBy: text('uploaded_by')
      .notNull()
      .references(() => user.id),
    organisationId: uuid('organisation_id')
      .notNull()
      .references(() => organisation.id),
    kind: text('kind').$type<AttachmentKind>().notNull(),
    caption: text('caption'),
    fileName: text('file_name').notNull(),
    contentType: text('content_type').notNull(),
    sizeBytes: bigint('size_bytes', { mode: 'number' }).notNull(),
    sha256: text('sha256').notNull(),
    storageKey: text('storage_key').notNull().unique(),
    url: text('url').notNull(),
    thumbnailKey: text('thumbnail_key'),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    removedAt: timestamp('removed_at', { withTimezone: true }),
    removedBy: text('removed_by').references(() => user.id),
    // Why a party withdrew its file; the board reads it beside the struck-through entry.
    removalReason: text('removal_reason'),
  },
  (t) => [
    index('attachment_case_idx').on(t.caseId, t.createdAt),
    check(
      'attachment_kind_check',
      sql`${t.kind} in ('lab_sheet', 'photo', 'calibration_certificate', 'correspondence', 'other')`,
    ),
    check('attachment_sha256_format', sql`${t.sha256} ~ '^[0-9a-f]{64}$'`),
    check('attachment_size_positive', sql`${t.sizeBytes} > 0`),
    // A removal is all of who, when and why, or nothing.
    check(
      'attachment_removal_complete',
      sql`(${t.removedAt} is null and ${t.removedBy} is null and ${t.removalReason} is null) or (${t.removedAt} is not null and ${t.removedBy} is not null and ${t.removalReason} is not null)`,
    ),
  ],
);

/** A threaded note; the body is Tiptap JSON, validated against the editor's schema on write. */
export const note = pgTable(
  'note',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    caseId: uuid('case_id')
      .notNull()
      .references(() => disputeCase.id),
    parentId: uuid('parent_id').references((): AnyPgColumn => note.id),
    authorUserId: text('author_user_id')
      .notNull()
      .references(() => user.id),
    organisationId: uuid('organisation_id')
      .notNull()
      .references(() => organisation.id),
    visibility: text('visibility').$type<NoteVisibility>().notNull(),
    body: jsonb('body').notNull(),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    editedAt: timestamp('edited_at', { withTimezone: true }),
  },
  (t) => [
    index('note_case_idx').on(t.caseId, t.createdAt),
    check('note_visibility_check', sql`${t.visibility} in ('parties', 'internal')`),
  ],
);

/** The body a note had before each edit. */
export const noteRevision = pgTable(
  'note_revision',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    noteId: uuid('note_id')
      .notNull()
      .references(() => note.id),
    body: jsonb('body').notNull(),
    replacedAt: timestamp('replaced_at', { withTimezone: true }).notNull().defaultNow(),
    replacedBy: text('replaced_by')
      .notNull()
      .references(() => user.id),
  },
  (t) => [index('note_revision_note_idx').on(t.noteId)],
);
