import 'server-only';
import { and, asc, eq, isNull } from 'drizzle-orm';
import { alias } from 'drizzle-orm/pg-core';
import type { Db, DbOrTx } from '@/db/client';
import { attachment, disputeCase, organisation, user, type CaseStatus } from '@/db/schema';
import type { Actor } from '@/lib/auth/actor';
import { can } from '@/lib/auth/permissions';
import { recordAudit } from '@/lib/audit/record';
import { AppError, invalidInput } from '@/lib/errors';
import { formatDateTime } from '@/lib/format/dates';
import type { AttachmentKind, EvidenceType } from '@/lib/evidence/kinds';
import { removeAttachmentSchema, type UploadMetadata } from '@/lib/evidence/schemas';
import { caseVisibility, isBlindFor } from './case-scope';
import { assertCaseNotSealed } from './decision-guard';
import { findVisibleCase } from './cases';
import { actorOfSession, liveSessionOf } from './sessions';

const remover = alias(user, 'remover');
const WITHDRAWN_MESSAGE = 'The dispute was withdrawn, so its file is closed: no evidence can be added or withdrawn.';

/** Why evidence may no longer change on a case in this state, or null while it may. */
export function closedReason(status: CaseStatus): string | null {
  if (status === 'withdrawn') return WITHDRAWN_MESSAGE;
  if (status === 'decided') return 'This case is decided and its record is sealed: no evidence can be added or withdrawn.';
  return null;
}

/**
 * Who a completed upload belongs to. The upload service calls back without the browser's cookies,
 * so the actor is rebuilt from the signed metadata our middleware wrote, and only while that
 * session is still live and the account still holds a role that may upload.
 */
export async function uploaderActor(db: DbOrTx, metadata: UploadMetadata, now = new Date()): Promise<Actor | null> {
  const row = await liveSessionOf(db, metadata, now);
  const actor = row ? actorOfSession(row) : null;
  return actor && actor.organisationId === metadata.organisationId ? actor : null;
}

/** For the upload middleware and again on completion: the actor may add evidence to this case now. */
export async function assertMayUpload(db: DbOrTx, actor: Actor, caseId: string) {
  // An outsider, or a role that cannot read cases, learns nothing about the case's existence.
  const found = await findVisibleCase(db, actor, caseId);
  if (!can(actor.role, 'evidence', 'upload')) throw new AppError('forbidden', 'Your role reads the evidence of a case but does not add to it.');
  const closed = closedReason(found.status);
  if (closed) throw new AppError('conflict', closed);
  return found;
}

export type NewAttachment = {
  caseId: string;
  kind: AttachmentKind;
  caption: string | null;
  fileName: string;
  contentType: EvidenceType;
  sizeBytes: number;
  sha256: string;
  storageKey: string;
  url: string;
  thumbnailKey: string | null;
};

/** The attachment already recorded for a stored file, if any: a repeated completion call is not a second file. */
export async function attachmentByStorageKey(db: DbOrTx, storageKey: string): Promise<{ id: string; fileName: string; sha256: string } | null> {
  const [row] = await db.select({ id: attachment.id, fileName: attachment.fileName, sha256: attachment.sha256 }).from(attachment).where(eq(attachment.storageKey, storageKey));
  return row ?? null;
}

/**
 * Records a checked file and its audit event in one transaction, on the locked case row, so a
 * decision or a withdrawal cannot land between the check and the insert.
 */
export async function insertAttachment(db: Db, actor: Actor, input: NewAttachment, context: { origin?: string } = {}): Promise<{ id: string }> {
  if (!can(actor.role, 'evidence', 'upload')) throw new AppError('forbidden', 'Your role reads the evidence of a case but does not add to it.');
  return db.transaction(async (tx) => {
    const [locked] = await tx
      .select({ id: disputeCase.id, status: disputeCase.status })
      .from(disputeCase)
      .where(and(eq(disputeCase.id, input.caseId), caseVisibility(actor)))
      .for('update');
    if (!locked) throw new AppError('not_found', 'That case was not found.');
    await assertCaseNotSealed(tx, locked.id);
    const closed = closedReason(locked.status);
    if (closed) throw new AppError('conflict', closed);

    const [row] = await tx
      .insert(attachment)
      .values({ ...input, uploadedBy: actor.userId, organisationId: actor.organisationId })
      .returning({ id: attachment.id });
    await recordAudit(
      tx,
      { actorUserId: actor.userId, actorOrganisationId: actor.organisationId, origin: context.origin },
      {
        action: 'evidence.uploaded',
        objectType: 'attachment',
        objectId: row.id,
        caseId: input.caseId,
        change: {
          kind: input.kind,
          detail: {
            fileName: input.fileName,
            caption: input.caption,
            contentType: input.contentType,
            sizeBytes: input.sizeBytes,
            sha256: input.sha256,
            storageKey: input.storageKey,
            thumbnailKey: input.thumbnailKey,
          },
        },
      },
    );
    return row;
  });
}

/** The board keeps every file, removed or not: it decides on the whole record. */
function keepsRemovedFiles(actor: Actor): boolean {
  return actor.role === 'arbiter';
}

/**
 * The evidence of a case the caller has already found visible, as the Case file shows it. Blind, the
 * laboratory sees only its own organisation's files (another party's lab sheet may show the intake
 * readings). A removed file stays listed, struck through, for everyone who could see it; only the
 * board may still open it or its preview.
 */
export async function attachmentsOfCase(db: DbOrTx, actor: Actor, found: { id: string; status: CaseStatus; retestSubmittedAt: Date | null }) {
  const blind = isBlindFor(actor, found.retestSubmittedAt);
  const rows = await db
    .select({
      id: attachment.id,
      kind: attachment.kind,
      caption: attachment.caption,
      fileName: attachment.fileName,
      contentType: attachment.contentType,
      sizeBytes: attachment.sizeBytes,
      sha256: attachment.sha256,
      createdAt: attachment.createdAt,
      removedAt: attachment.removedAt,
      removalReason: attachment.removalReason,
      removedByName: remover.name,
      uploaderName: user.name,
      organisationId: attachment.organisationId,
      organisation: organisation.name,
      thumbnailKey: attachment.thumbnailKey,
    })
    .from(attachment)
    .innerJoin(user, eq(user.id, attachment.uploadedBy))
    .innerJoin(organisation, eq(organisation.id, attachment.organisationId))
    .leftJoin(remover, eq(remover.id, attachment.removedBy))
    .where(and(eq(attachment.caseId, found.id), blind ? eq(attachment.organisationId, actor.organisationId) : undefined))
    .orderBy(asc(attachment.createdAt), asc(attachment.id));
  const open = closedReason(found.status) === null;
  const mayUpload = can(actor.role, 'evidence', 'upload');
  return rows.map(({ thumbnailKey, ...row }) => {
    const readable = row.removedAt === null || keepsRemovedFiles(actor);
    return {
      ...row,
      downloadable: readable,
      hasThumbnail: readable && thumbnailKey !== null,
      // A party withdraws only what its own organisation put in, and only while the case is open.
      removable: open && mayUpload && row.removedAt === null && row.organisationId === actor.organisationId,
    };
  });
}

export type CaseAttachment = Awaited<ReturnType<typeof attachmentsOfCase>>[number];

/**
 * The storage key behind a download link, after the same checks as the Case file: an outsider, a
 * blind laboratory asking for another party's file, or a malformed id all answer 404.
 */
export async function attachmentForDownload(db: DbOrTx, actor: Actor, caseId: string, attachmentId: string, variant: 'original' | 'thumbnail') {
  const found = await findVisibleCase(db, actor, caseId);
  if (!can(actor.role, 'evidence', 'read')) throw new AppError('not_found', 'That file was not found.');
  const blind = isBlindFor(actor, found.retestSubmittedAt);
  const [row] = await db
    .select({
      fileName: attachment.fileName,
      storageKey: attachment.storageKey,
      thumbnailKey: attachment.thumbnailKey,
      removedAt: attachment.removedAt,
      removerName: remover.name,
    })
    .from(attachment)
    .leftJoin(remover, eq(remover.id, attachment.removedBy))
    .where(and(eq(attachment.id, attachmentId), eq(attachment.caseId, found.id), blind ? eq(attachment.organisationId, actor.organisationId) : undefined));
  if (!row) throw new AppError('not_found', 'That file was not found.');
  if (row.removedAt && !keepsRemovedFiles(actor)) {
    throw new AppError('gone', `${row.fileName} was withdrawn from the case by ${row.removerName ?? 'its uploader'} on ${formatDateTime(row.removedAt)}; only the board can still open it.`);
  }
  const key = variant === 'thumbnail' ? row.thumbnailKey : row.storageKey;
  if (!key) throw new AppError('not_found', 'This file has no preview.');
  return { key, fileName: row.fileName };
}

/**
 * Withdraws a file from the case: nothing is deleted or overwritten. The row keeps the file with who
 * removed it, when and why, and the audit trail records the same.
 */
export async function removeAttachment(db: Db, actor: Actor, rawInput: unknown, context: { origin?: string; now?: Date } = {}) {
  const parsed = removeAttachmentSchema.safeParse(rawInput);
  if (!parsed.success) throw invalidInput(parsed.error);
  const { caseId, attachmentId, reason } = parsed.data;
  const now = context.now ?? new Date();
  return db.transaction(async (tx) => {
    const [locked] = await tx
      .select({ id: disputeCase.id, status: disputeCase.status, retestSubmittedAt: disputeCase.retestSubmittedAt })
      .from(disputeCase)
      .where(and(eq(disputeCase.id, caseId), caseVisibility(actor)))
      .for('update');
    if (!locked || !can(actor.role, 'case', 'read')) throw new AppError('not_found', 'That case was not found.');
    const blind = isBlindFor(actor, locked.retestSubmittedAt);
    const [file] = await tx
      .select({ id: attachment.id, kind: attachment.kind, fileName: attachment.fileName, sha256: attachment.sha256, organisationId: attachment.organisationId, removedAt: attachment.removedAt })
      .from(attachment)
      .where(and(eq(attachment.id, attachmentId), eq(attachment.caseId, locked.id), blind ? eq(attachment.organisationId, actor.organisationId) : undefined));
    if (!file) throw new AppError('not_found', 'That file was not found.');
    if (!can(actor.role, 'evidence', 'upload') || file.organisationId !== actor.organisationId) {
      throw new AppError('forbidden', 'Only the organisation that added a file can withdraw it.');
    }
    await assertCaseNotSealed(tx, locked.id);
    const closed = closedReason(locked.status);
    if (closed) throw new AppError('conflict', closed);
    if (file.removedAt) throw new AppError('conflict', `${file.fileName} was already withdrawn on ${formatDateTime(file.removedAt)}.`);

    const updated = await tx
      .update(attachment)
      .set({ removedAt: now, removedBy: actor.userId, removalReason: reason })
      .where(and(eq(attachment.id, file.id), isNull(attachment.removedAt)))
      .returning({ id: attachment.id });
    if (updated.length !== 1) throw new AppError('conflict', `${file.fileName} was withdrawn a moment ago by someone else.`);
    await recordAudit(
      tx,
      { actorUserId: actor.userId, actorOrganisationId: actor.organisationId, origin: context.origin, at: now },
      { action: 'evidence.removed', objectType: 'attachment', objectId: file.id, caseId: locked.id, change: { kind: file.kind, detail: { fileName: file.fileName, sha256: file.sha256, reason } } },
    );
    return { id: file.id, fileName: file.fileName, caseId: locked.id };
  });
}
