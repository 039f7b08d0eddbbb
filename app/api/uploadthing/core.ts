import { createUploadthing, UploadThingError, UTFiles } from 'uploadthing/server';
import { z } from 'zod';
import { getDb } from '@/db/client';
import { actorFromHeaders } from '@/lib/auth/session';
import { assertMayUpload } from '@/lib/dal/attachments';
import { isAppError, type ErrorCode } from '@/lib/errors';
import { requestOrigin } from '@/lib/http/origin';
import { cleanFileName } from '@/lib/evidence/file-name';
import { attachmentKinds, extensionOf, formatBytes, kindRules, maxBytesOf, typeForExtension, typeList, type AttachmentKind } from '@/lib/evidence/kinds';
import { uploadInputSchema, type UploadMetadata, type UploadOutcome } from '@/lib/evidence/schemas';
import { receiveUpload } from '@/lib/evidence/receive';
import { storeReachable } from '@/lib/evidence/storage';
import { STORE_UNREACHABLE } from '@/lib/evidence/upload-errors';

// The route's own refusals reach the browser as the error's message; a bad input names the field.
const f = createUploadthing({
  errorFormatter: (error) => {
    const cause = error.cause;
    if (cause instanceof z.ZodError) return { message: cause.issues[0]?.message ?? 'The upload’s details are not valid.' };
    return { message: error.message };
  },
});

const sdkCode: Partial<Record<ErrorCode, 'NOT_FOUND' | 'FORBIDDEN' | 'BAD_REQUEST' | 'TOO_LARGE'>> = {
  not_found: 'NOT_FOUND',
  forbidden: 'FORBIDDEN',
  unauthenticated: 'FORBIDDEN',
  payload_too_large: 'TOO_LARGE',
};

function refusal(message: string, code: 'NOT_FOUND' | 'FORBIDDEN' | 'BAD_REQUEST' | 'TOO_LARGE' = 'BAD_REQUEST'): UploadThingError {
  return new UploadThingError({ code, message });
}

/**
 * Browsers declare a CSV file's type from the operating system; with a spreadsheet program installed
 * that is often Excel's type. The declared type only picks the route's limits: the name's extension is
 * checked below and the content on completion.
 */
function declaredTypes(kind: AttachmentKind): string[] {
  const types: string[] = [...kindRules[kind].types];
  if (types.includes('text/csv')) types.push('application/vnd.ms-excel');
  return types;
}

function routeConfig(kind: AttachmentKind) {
  const rule = kindRules[kind];
  const limits = { maxFileSize: rule.maxSize, maxFileCount: rule.maxCount, minFileCount: 1, acl: 'private', contentDisposition: 'attachment' } as const;
  return Object.fromEntries(declaredTypes(kind).map((type) => [type, limits])) as Parameters<typeof f>[0];
}

/** The names the files will be stored and shown under, or a refusal naming the first bad file. */
function checkedNames(kind: AttachmentKind, files: readonly { name: string; size: number }[]): string[] {
  const rule = kindRules[kind];
  if (files.length > rule.maxCount) throw refusal(`Send at most ${rule.maxCount} files as ${rule.label.toLowerCase()} at a time.`);
  return files.map((file) => {
    const named = cleanFileName(file.name);
    if (!named.ok) throw refusal(`${file.name.slice(0, 80)}: ${named.reason}`);
    const extension = extensionOf(named.name);
    if (!typeForExtension(kind, extension)) throw refusal(`${named.name}: a ${rule.label.toLowerCase()} must be ${typeList(kind)}.`);
    if (file.size <= 0) throw refusal(`${named.name} is empty.`);
    if (file.size > maxBytesOf(kind)) throw refusal(`${named.name} is ${formatBytes(file.size)}, over the limit of ${formatBytes(maxBytesOf(kind))}.`, 'TOO_LARGE');
    return named.name;
  });
}

function evidenceRoute(kind: AttachmentKind) {
  return f(routeConfig(kind), { awaitServerData: true, presignedURLTTL: 600 })
    .input(uploadInputSchema)
    .middleware(async ({ req, input, files }) => {
      const actor = await actorFromHeaders(req.headers);
      if (!actor) throw refusal('Your session has ended. Sign in again; nothing was uploaded.', 'FORBIDDEN');
      if (input.kind !== kind) throw refusal('The kind of evidence does not match the upload; reload the page and try again.');
      try {
        await assertMayUpload(getDb(), actor, input.caseId);
      } catch (error) {
        if (isAppError(error)) throw refusal(error.message, sdkCode[error.code] ?? 'BAD_REQUEST');
        throw error;
      }
      const names = checkedNames(kind, files);
      if (!(await storeReachable())) throw new UploadThingError({ code: 'UPLOAD_FAILED', message: STORE_UNREACHABLE });
      const metadata: UploadMetadata = {
        caseId: input.caseId,
        kind,
        caption: input.caption,
        userId: actor.userId,
        sessionId: actor.sessionId,
        organisationId: actor.organisationId,
        origin: requestOrigin(req.headers, 'web'),
      };
      // The cleaned name is the one the file store keeps and serves in its download header.
      return { ...metadata, [UTFiles]: files.map((file, i) => ({ ...file, name: names[i] })) };
    })
    .onUploadComplete(async ({ file, metadata }): Promise<UploadOutcome> => receiveUpload(getDb(), { file, metadata }));
}

/** One route per kind of evidence, each with its own accepted types, size and count limits. */
export const evidenceRouter = Object.fromEntries(attachmentKinds.map((kind) => [kind, evidenceRoute(kind)])) as Record<AttachmentKind, ReturnType<typeof evidenceRoute>>;

export type EvidenceRouter = typeof evidenceRouter;
