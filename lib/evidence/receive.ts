import 'server-only';
import type { Db } from '@/db/client';
import { isAppError } from '@/lib/errors';
import { assertMayUpload, attachmentByStorageKey, insertAttachment, uploaderActor } from '@/lib/dal/attachments';
import { formatBytes, maxBytesOf } from './kinds';
import { uploadMetadataSchema, type UploadOutcome } from './schemas';
import { deleteStoredFiles, readStoredFile, storeServerFile, StorageError } from './storage';
import { makeThumbnail, thumbnailName } from './thumbnail';
import { verifyEvidence } from './verify';

export type CompletedUpload = { file: { key: string; name: string; ufsUrl: string }; metadata: unknown };

const NOTHING_SAVED = 'Nothing was saved; try again.';

/**
 * What happens once the upload service holds a file: read it back, check it by content, hash it,
 * make a preview of images, and record it with its audit event. Every way out that does not record
 * the file deletes what was stored, so a refused or failed upload leaves nothing behind.
 *
 * Never throws: the SDK would swallow the error and the uploader would wait for an answer that never
 * comes. The outcome goes back to the browser as the upload's server data.
 */
export async function receiveUpload(db: Db, upload: CompletedUpload): Promise<UploadOutcome> {
  const { key } = upload.file;
  const fileName = upload.file.name;
  const stored: (string | null)[] = [key];
  const refuse = async (reason: string): Promise<UploadOutcome> => {
    // A repeated completion call for a file that was recorded meanwhile must not delete it.
    const recorded = await attachmentByStorageKey(db, key).catch(() => null);
    if (recorded) return { ok: true, attachmentId: recorded.id, fileName: recorded.fileName, sha256: recorded.sha256 };
    await deleteStoredFiles(stored);
    return { ok: false, fileName, reason };
  };

  try {
    const already = await attachmentByStorageKey(db, key);
    if (already) return { ok: true, attachmentId: already.id, fileName: already.fileName, sha256: already.sha256 };

    const parsed = uploadMetadataSchema.safeParse(upload.metadata);
    if (!parsed.success) return await refuse(`The upload could not be matched to a case. ${NOTHING_SAVED}`);
    const metadata = parsed.data;
    const actor = await uploaderActor(db, metadata);
    if (!actor) return await refuse('Your session ended before the file arrived. Sign in again and upload it again; nothing was saved.');
    await assertMayUpload(db, actor, metadata.caseId);

    const read = await readStoredFile(key, maxBytesOf(metadata.kind));
    if (!read.ok) return await refuse(`The file is over the limit of ${formatBytes(maxBytesOf(metadata.kind))}; nothing was saved.`);
    const checked = await verifyEvidence({ kind: metadata.kind, fileName, bytes: read.bytes });
    if (!checked.ok) return await refuse(`${checked.reason} Nothing was saved.`);
    const file = checked.file;

    let thumbnailKey: string | null = null;
    if (file.image) {
      const preview = await makeThumbnail(read.bytes);
      const saved = await storeServerFile(thumbnailName(file.fileName), preview.bytes, preview.contentType);
      thumbnailKey = saved.key;
      stored.push(thumbnailKey);
    }

    const row = await insertAttachment(
      db,
      actor,
      {
        caseId: metadata.caseId,
        kind: metadata.kind,
        caption: metadata.caption,
        fileName: file.fileName,
        contentType: file.contentType,
        sizeBytes: file.sizeBytes,
        sha256: file.sha256,
        storageKey: key,
        url: upload.file.ufsUrl,
        thumbnailKey,
      },
      { origin: metadata.origin },
    );
    return { ok: true, attachmentId: row.id, fileName: file.fileName, sha256: file.sha256 };
  } catch (error) {
    if (isAppError(error)) return await refuse(`${error.message} Nothing was saved.`);
    if (error instanceof StorageError) {
      console.error(`Evidence upload ${key}: ${error.message} (${(error.cause as Error | undefined)?.message ?? "no cause"})`);
      return await refuse(`The file store could not be reached while the file was checked. ${NOTHING_SAVED}`);
    }
    console.error(`Evidence upload ${key} failed:`, error);
    return await refuse(`Something went wrong on our side while the file was checked. ${NOTHING_SAVED}`);
  }
}
