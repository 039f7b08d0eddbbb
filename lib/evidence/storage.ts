import 'server-only';
import { UTApi, UTFile } from 'uploadthing/server';
import { uploadThingSdkConfig } from '@/lib/upload-service/settings';

/**
 * The file store, through UploadThing's server SDK, with the validated upload settings (the hosted
 * service in production, the local one otherwise). Made on first use, never at import.
 */
let api: UTApi | undefined;
function utapi(): UTApi {
  api ??= new UTApi(uploadThingSdkConfig());
  return api;
}

export class StorageError extends Error {
  constructor(message: string, options?: { cause?: unknown }) {
    super(message, options);
    this.name = 'StorageError';
  }
}

/** Downloads are handed out as links this short-lived: long enough to start, too short to pass around. */
export const DOWNLOAD_LINK_SECONDS = 120;
const READ_BACK_LINK_SECONDS = 60;
const READ_BACK_TIMEOUT_MS = 30_000;

const REACHABLE_TIMEOUT_MS = 5_000;

/**
 * Whether the file store answers at all. The SDK signs upload links without asking the store, so
 * without this a browser would only find out from a failed transfer; asked first, the uploader is
 * told in words before any file leaves the browser.
 */
export async function storeReachable(): Promise<boolean> {
  let timer: NodeJS.Timeout | undefined;
  const timeout = new Promise<false>((resolve) => {
    timer = setTimeout(() => resolve(false), REACHABLE_TIMEOUT_MS);
  });
  try {
    return await Promise.race([utapi().listFiles({ limit: 1 }).then(() => true as const), timeout]);
  } catch {
    return false;
  } finally {
    clearTimeout(timer);
  }
}

/** A signed link to a private file, valid for the given seconds. */
export async function signedFileUrl(key: string, expiresInSeconds = DOWNLOAD_LINK_SECONDS): Promise<string> {
  try {
    const { ufsUrl } = await utapi().generateSignedURL(key, { expiresIn: expiresInSeconds });
    return ufsUrl;
  } catch (error) {
    throw new StorageError('Could not sign a link to the stored file.', { cause: error });
  }
}

export type StoredBytes = { ok: true; bytes: Uint8Array } | { ok: false; tooLarge: true };

/**
 * Reads a stored file back on the server, to check what was really stored rather than what the
 * browser declared. Stops reading past `maxBytes`, so an oversized file costs no more than the limit.
 */
export async function readStoredFile(key: string, maxBytes: number): Promise<StoredBytes> {
  const url = await signedFileUrl(key, READ_BACK_LINK_SECONDS);
  let response: Response;
  try {
    response = await fetch(url, { signal: AbortSignal.timeout(READ_BACK_TIMEOUT_MS), cache: 'no-store' });
  } catch (error) {
    throw new StorageError('The file store did not answer when the file was read back.', { cause: error });
  }
  if (!response.ok || !response.body) throw new StorageError(`The file store answered ${response.status} when the file was read back.`);
  const declared = Number(response.headers.get('content-length'));
  if (Number.isFinite(declared) && declared > maxBytes) {
    await response.body.cancel();
    return { ok: false, tooLarge: true };
  }
  const chunks: Uint8Array[] = [];
  let total = 0;
  const reader = response.body.getReader();
  try {
    for (;;) {
      const { done, value } = await reader.read();
      if (done) break;
      total += value.byteLength;
      if (total > maxBytes) {
        await reader.cancel();
        return { ok: false, tooLarge: true };
      }
      chunks.push(value);
    }
  } catch (error) {
    throw new StorageError('The file store broke off while the file was read back.', { cause: error });
  }
  return { ok: true, bytes: Buffer.concat(chunks, total) };
}

/** Stores a file the server made itself (a photo's preview), private like the evidence it belongs to. */
export async function storeServerFile(name: string, bytes: Uint8Array, contentType: string): Promise<{ key: string; url: string }> {
  const file = new UTFile([bytes as Uint8Array<ArrayBuffer>], name, { type: contentType });
  const result = await utapi()
    .uploadFiles(file, { acl: 'private', contentDisposition: 'attachment' })
    .catch((error: unknown) => {
      throw new StorageError('The file store did not take the preview.', { cause: error });
    });
  if (result.error || !result.data) throw new StorageError(`The file store refused the preview: ${result.error?.message ?? 'no answer'}.`);
  return { key: result.data.key, url: result.data.ufsUrl };
}

/**
 * Deletes stored files; used for files that were refused or could not be recorded. A failure is
 * reported, not thrown: the caller has already decided the upload failed and says so to the uploader.
 */
export async function deleteStoredFiles(keys: (string | null | undefined)[]): Promise<boolean> {
  const present = keys.filter((key): key is string => !!key);
  if (present.length === 0) return true;
  try {
    const { success } = await utapi().deleteFiles(present);
    if (!success) console.error(`Evidence storage: the file store did not confirm deleting ${present.join(', ')}`);
    return success;
  } catch (error) {
    console.error(`Evidence storage: could not delete ${present.join(', ')}: ${(error as Error).message}`);
    return false;
  }
}
