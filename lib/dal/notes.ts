import 'server-only';
import { and, asc, eq, inArray, or, type SQL } from 'drizzle-orm';
import type { Db, DbOrTx } from '@/db/client';
import { disputeCase, note, noteRevision, organisation, user, type NoteVisibility } from '@/db/schema';
import type { Actor } from '@/lib/auth/actor';
import { can } from '@/lib/auth/permissions';
import { recordAudit } from '@/lib/audit/record';
import type { Audience } from '@/lib/cases/lifecycle';
import { noteBodySha256 } from '@/lib/decision/record';
import { AppError, invalidInput } from '@/lib/errors';
import { notifyCaseNote } from '@/lib/mail/case-mails';
import { mailAfterCommit } from '@/lib/mail/outbox';
import { NOTE_EDIT_WINDOW_MS, noteLimits } from '@/lib/notes/limits';
import { noteExcerpt, noteText } from '@/lib/notes/plain-text';
import { editNoteSchema, newNoteSchema, replySchema } from '@/lib/notes/schemas';
import { mentionedIds, withMentionLabels, type NoteDoc } from '@/lib/notes/validate';
import { canonicalJson } from '@/lib/canonical-json';
import { findVisibleCase } from './cases';
import { assertCaseNotSealed } from './decision-guard';
import { isBlindFor } from './case-scope';

type CaseRow = typeof disputeCase.$inferSelect;
type WriteContext = { origin?: string; now?: Date };

export const NOTES_CLOSED_MESSAGE = {
  decided: 'This case is decided and its record is sealed: notes can no longer be written or edited.',
  withdrawn: 'This dispute was withdrawn: notes can no longer be written or edited.',
} as const;

export function notesClosed(status: CaseRow['status']): boolean {
  return status === 'decided' || status === 'withdrawn';
}

/**
 * The notes of a case an actor may read, as a WHERE condition: every shared note and its own
 * organisation's internal ones. A blind laboratory reads only its own organisation's notes, because
 * another party's note may argue about the values it must not see before its retest.
 */
export function noteReadScope(actor: Actor, caseRow: Pick<CaseRow, 'id' | 'retestSubmittedAt'>): SQL {
  const own = eq(note.organisationId, actor.organisationId);
  return and(eq(note.caseId, caseRow.id), isBlindFor(actor, caseRow.retestSubmittedAt) ? own : or(eq(note.visibility, 'parties'), own))!;
}

/** The notes of a case as the actor may see them, oldest first, each with its earlier bodies. */
export async function notesOfCase(db: DbOrTx, actor: Actor, caseRow: Pick<CaseRow, 'id' | 'status' | 'retestSubmittedAt'>, now = new Date()) {
  const rows = await db
    .select({
      id: note.id,
      parentId: note.parentId,
      visibility: note.visibility,
      body: note.body,
      createdAt: note.createdAt,
      editedAt: note.editedAt,
      authorUserId: note.authorUserId,
      authorName: user.name,
      organisationId: note.organisationId,
      organisation: organisation.name,
    })
    .from(note)
    .innerJoin(user, eq(user.id, note.authorUserId))
    .innerJoin(organisation, eq(organisation.id, note.organisationId))
    .where(noteReadScope(actor, caseRow))
    .orderBy(asc(note.createdAt), asc(note.id));
  const ids = rows.map((r) => r.id);
  // Earlier bodies are read only for notes already in scope: whoever may read a note may read its history.
  const revisions = ids.length
    ? await db.select({ noteId: noteRevision.noteId, body: noteRevision.body, replacedAt: noteRevision.replacedAt }).from(noteRevision).where(inArray(noteRevision.noteId, ids)).orderBy(asc(noteRevision.replacedAt))
    : [];
  const open = !notesClosed(caseRow.status);
  return rows.map(({ authorUserId, ...row }) => {
    const mine = authorUserId === actor.userId;
    const editableUntil = new Date(row.createdAt.getTime() + NOTE_EDIT_WINDOW_MS);
    return {
      ...row,
      text: noteText(row.body as NoteDoc),
      mine,
      // Only the author edits, only in the first minutes, only while the case is open.
      editableUntil: mine && open && editableUntil.getTime() > now.getTime() ? editableUntil : null,
      revisions: revisions.filter((r) => r.noteId === row.id).map((r) => ({ body: r.body, replacedAt: r.replacedAt })),
    };
  });
}

export type CaseNote = Awaited<ReturnType<typeof notesOfCase>>[number];

/** The notes of one case the actor may read; someone else's case answers 404. */
export async function listVisibleNotes(db: DbOrTx, actor: Actor, caseId: string, now = new Date()): Promise<CaseNote[]> {
  if (!can(actor.role, 'note', 'read')) throw new AppError('not_found', 'That case was not found.');
  return notesOfCase(db, actor, await visibleCase(db, actor, caseId), now);
}

/** The people a note may mention: those of the case who will be able to read it. */
async function mentionablePeopleFor(db: DbOrTx, caseRow: CaseRow, visibility: NoteVisibility, actor: Actor) {
  const organisations =
    visibility === 'internal'
      ? [actor.organisationId]
      : [caseRow.supplierOrganisationId, caseRow.plantOrganisationId, caseRow.boardOrganisationId, caseRow.labOrganisationId].filter((id): id is string => id !== null);
  return db
    .select({ id: user.id, name: user.name, organisation: organisation.name })
    .from(user)
    .innerJoin(organisation, eq(organisation.id, user.organisationId))
    .where(and(inArray(user.organisationId, organisations), inArray(user.role, ['supplier', 'plant', 'lab', 'arbiter'])))
    .orderBy(asc(user.name));
}

/** Who the editor offers after “@”: everyone of the case's parties, or the own organisation for an internal note. */
export async function mentionablePeople(db: DbOrTx, actor: Actor, caseId: string) {
  const caseRow = await visibleCase(db, actor, caseId);
  const [shared, internal] = await Promise.all([mentionablePeopleFor(db, caseRow, 'parties', actor), mentionablePeopleFor(db, caseRow, 'internal', actor)]);
  return { parties: shared, internal };
}

/** Checks each mention names someone who may read the note, and writes their name as the server knows it. */
async function resolveMentions(db: DbOrTx, caseRow: CaseRow, visibility: NoteVisibility, actor: Actor, body: NoteDoc): Promise<{ body: NoteDoc; count: number }> {
  const ids = mentionedIds(body);
  if (ids.length === 0) return { body, count: 0 };
  const people = await mentionablePeopleFor(db, caseRow, visibility, actor);
  const names = new Map(people.filter((p) => ids.includes(p.id)).map((p) => [p.id, p.name]));
  if (names.size !== ids.length) {
    throw new AppError('invalid', 'The note needs attention.', {
      fieldErrors: {
        body: [visibility === 'internal' ? 'An internal note can mention only people of your own organisation.' : 'A note can mention only people of the parties to this case.'],
      },
    });
  }
  return { body: withMentionLabels(body, names), count: ids.length };
}

const isUuid = (value: unknown): value is string => typeof value === 'string' && /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i.test(value);

/** The case if the actor may see it; a malformed id is as missing as someone else's case. */
async function visibleCase(db: DbOrTx, actor: Actor, caseId: string): Promise<CaseRow> {
  if (!isUuid(caseId)) throw new AppError('not_found', 'That case was not found.');
  return findVisibleCase(db, actor, caseId);
}

async function writableCase(db: DbOrTx, actor: Actor, caseId: string): Promise<CaseRow> {
  // Outsiders, administrators included, learn nothing: the case is simply not there for them.
  const caseRow = await visibleCase(db, actor, caseId);
  if (!can(actor.role, 'note', 'write')) throw new AppError('forbidden', 'Your role cannot write notes on a case.');
  return caseRow;
}

/** Refuses a write to a closed case; call inside the transaction with the case row locked. */
async function assertNotesOpen(tx: DbOrTx, caseId: string): Promise<void> {
  await assertCaseNotSealed(tx, caseId);
  const [row] = await tx.select({ status: disputeCase.status }).from(disputeCase).where(eq(disputeCase.id, caseId));
  if (row && notesClosed(row.status)) throw new AppError('conflict', NOTES_CLOSED_MESSAGE[row.status as keyof typeof NOTES_CLOSED_MESSAGE]);
}

const audiences: Audience[] = ['supplier', 'plant', 'lab', 'board'];
function organisationOf(caseRow: CaseRow, audience: Audience): string | null {
  return { supplier: caseRow.supplierOrganisationId, plant: caseRow.plantOrganisationId, lab: caseRow.labOrganisationId, board: caseRow.boardOrganisationId }[audience];
}

/** The other parties who may read a shared note now: never the author's own, never a laboratory still testing blind. */
function otherReaders(caseRow: CaseRow, actor: Actor): Audience[] {
  return audiences.filter((audience) => {
    const organisationId = organisationOf(caseRow, audience);
    if (!organisationId || organisationId === actor.organisationId) return false;
    return !(audience === 'lab' && caseRow.retestSubmittedAt === null);
  });
}

export type WrittenNote = { id: string; caseId: string; parentId: string | null; visibility: NoteVisibility };

async function insertNote(db: Db, actor: Actor, caseRow: CaseRow, input: { body: NoteDoc; visibility: NoteVisibility; parentId: string | null }, context: WriteContext): Promise<WrittenNote> {
  const now = context.now ?? new Date();
  const { body, count } = await resolveMentions(db, caseRow, input.visibility, actor, input.body);
  const written = await db.transaction(async (tx) => {
    // Locked, so a decision or withdrawal cannot land between the check and the write.
    await tx.select({ id: disputeCase.id }).from(disputeCase).where(eq(disputeCase.id, caseRow.id)).for('update');
    await assertNotesOpen(tx, caseRow.id);
    const [row] = await tx
      .insert(note)
      .values({ caseId: caseRow.id, parentId: input.parentId, authorUserId: actor.userId, organisationId: actor.organisationId, visibility: input.visibility, body, createdAt: now })
      .returning({ id: note.id, caseId: note.caseId, parentId: note.parentId, visibility: note.visibility });
    await recordAudit(tx, { actorUserId: actor.userId, actorOrganisationId: actor.organisationId, origin: context.origin, at: now }, {
      action: 'note.created',
      objectType: 'note',
      objectId: row.id,
      caseId: caseRow.id,
      change: { visibility: row.visibility, parentId: row.parentId, bodySha256: noteBodySha256(body), mentions: count },
    });
    if (row.visibility === 'parties') {
      await notifyCaseNote(tx, caseRow, otherReaders(caseRow, actor), {
        authorName: actor.name,
        organisationName: actor.organisationName,
        isReply: row.parentId !== null,
        excerpt: noteExcerpt(body, 600),
      });
    }
    return row;
  });
  // Queued with the note; a mail that fails is recorded on the outbox and never undoes the note.
  if (written.visibility === 'parties') await mailAfterCommit();
  return written;
}

/** Starts a thread on a case. A shared note e-mails the other parties; an internal one, nobody. */
export async function createNote(db: Db, actor: Actor, caseId: string, rawInput: unknown, context: WriteContext = {}): Promise<WrittenNote> {
  const caseRow = await writableCase(db, actor, caseId);
  const parsed = newNoteSchema.safeParse(rawInput);
  if (!parsed.success) throw invalidInput(parsed.error, 'The note needs attention.');
  return insertNote(db, actor, caseRow, { body: parsed.data.body, visibility: parsed.data.visibility, parentId: null }, context);
}

/**
 * Replies in a thread. The reply is read by whoever reads the thread: its visibility is the thread's,
 * so a shared answer can never hang under an internal note. Threads are one level deep: a reply to a
 * reply joins the same thread.
 */
export async function replyToNote(db: Db, actor: Actor, caseId: string, parentId: string, rawInput: unknown, context: WriteContext = {}): Promise<WrittenNote> {
  const caseRow = await writableCase(db, actor, caseId);
  const [parent] =
    isUuid(parentId)
      ? await db.select({ id: note.id, parentId: note.parentId, visibility: note.visibility }).from(note).where(and(eq(note.id, parentId), noteReadScope(actor, caseRow)))
      : [];
  if (!parent) throw new AppError('not_found', 'That note was not found.');
  const parsed = replySchema.safeParse(rawInput);
  if (!parsed.success) throw invalidInput(parsed.error, 'The reply needs attention.');
  if (parsed.data.visibility && parsed.data.visibility !== parent.visibility) {
    throw new AppError('invalid', 'The reply needs attention.', {
      fieldErrors: { visibility: [parent.visibility === 'internal' ? 'This thread is internal to your organisation, so its replies are too.' : 'This thread is shared with every party, so its replies are too.'] },
    });
  }
  return insertNote(db, actor, caseRow, { body: parsed.data.body, visibility: parent.visibility, parentId: parent.parentId ?? parent.id }, context);
}

/**
 * Edits a note: only its author, only within the first minutes, only while the case is open. The
 * body it had is kept as a revision, which whoever may read the note may read.
 */
export async function editNote(db: Db, actor: Actor, caseId: string, noteId: string, rawInput: unknown, context: WriteContext = {}): Promise<{ id: string; changed: boolean }> {
  const caseRow = await writableCase(db, actor, caseId);
  const now = context.now ?? new Date();
  const [current] =
    isUuid(noteId)
      ? await db.select({ id: note.id, authorUserId: note.authorUserId, createdAt: note.createdAt, visibility: note.visibility }).from(note).where(and(eq(note.id, noteId), noteReadScope(actor, caseRow)))
      : [];
  if (!current) throw new AppError('not_found', 'That note was not found.');
  if (current.authorUserId !== actor.userId) throw new AppError('forbidden', 'Only the author can edit a note. Write a reply instead.');
  if (now.getTime() - current.createdAt.getTime() > NOTE_EDIT_WINDOW_MS) {
    throw new AppError('conflict', `A note can be edited for ${noteLimits.editWindowMinutes} minutes after it was posted, and that time is over. Write a reply instead.`);
  }
  const parsed = editNoteSchema.safeParse(rawInput);
  if (!parsed.success) throw invalidInput(parsed.error, 'The note needs attention.');
  const { body } = await resolveMentions(db, caseRow, current.visibility, actor, parsed.data.body);

  return db.transaction(async (tx) => {
    await tx.select({ id: disputeCase.id }).from(disputeCase).where(eq(disputeCase.id, caseRow.id)).for('update');
    await assertNotesOpen(tx, caseRow.id);
    const [locked] = await tx.select({ body: note.body }).from(note).where(eq(note.id, current.id)).for('update');
    if (canonicalJson(locked.body) === canonicalJson(body)) return { id: current.id, changed: false };
    const [revision] = await tx.insert(noteRevision).values({ noteId: current.id, body: locked.body, replacedAt: now, replacedBy: actor.userId }).returning({ id: noteRevision.id });
    await tx.update(note).set({ body, editedAt: now }).where(eq(note.id, current.id));
    await recordAudit(tx, { actorUserId: actor.userId, actorOrganisationId: actor.organisationId, origin: context.origin, at: now }, {
      action: 'note.edited',
      objectType: 'note',
      objectId: current.id,
      caseId: caseRow.id,
      change: { visibility: current.visibility, revisionId: revision.id, previousSha256: noteBodySha256(locked.body), bodySha256: noteBodySha256(body) },
    });
    return { id: current.id, changed: true };
  });
}
