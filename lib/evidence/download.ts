import 'server-only';
import { z } from 'zod';
import { getDb } from '@/db/client';
import type { Actor } from '@/lib/auth/actor';
import { attachmentForDownload } from '@/lib/dal/attachments';
import { AppError } from '@/lib/errors';
import { parseParams } from '@/lib/http/api';
import { signedFileUrl, StorageError, DOWNLOAD_LINK_SECONDS } from './storage';

export const downloadParamsSchema = z.object({ caseId: z.uuid(), attachmentId: z.uuid() });

/**
 * A 303 to a signed link on the file store, valid for two minutes. The store serves it as a download
 * with `nosniff` and a sandboxing CSP; this answer itself is never cached, so a link is minted for
 * each request after the checks.
 */
export async function redirectToStoredFile(actor: Actor, params: unknown, variant: 'original' | 'thumbnail'): Promise<Response> {
  const { caseId, attachmentId } = parseParams(params, downloadParamsSchema, 'That file');
  const { key } = await attachmentForDownload(getDb(), actor, caseId, attachmentId, variant);
  let location: string;
  try {
    location = await signedFileUrl(key, DOWNLOAD_LINK_SECONDS);
  } catch (error) {
    if (error instanceof StorageError) throw new AppError('unavailable', 'The file store cannot hand out the file just now; try again in a minute.');
    throw error;
  }
  return new Response(null, {
    status: 303,
    headers: { location, 'cache-control': 'private, no-store', 'referrer-policy': 'no-referrer', 'x-content-type-options': 'nosniff' },
  });
}
