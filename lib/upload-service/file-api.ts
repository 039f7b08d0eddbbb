// The server-side file API (`POST /v6/*`) that UTApi calls, answering in the shapes its schemas decode.
import { z } from 'zod';
import { AppError, fieldErrorsFromZod } from '../errors';
import { signUrl } from './signature';
import { FILE_KEY_PATTERN, type FileStore, type StoredFile } from './store';

export type FileApiContext = { store: FileStore; origin: string; appId: string; apiKey: string };

const fileKey = z.string().regex(FILE_KEY_PATTERN, 'is not a file key');
const customId = z.string().min(1).max(128);
const acl = z.enum(['public-read', 'private']);
const MAX_SIGNED_URL_SECONDS = 7 * 24 * 3600;

const keysOrCustomIds = z.union([z.object({ fileKeys: z.array(fileKey).max(1000) }), z.object({ customIds: z.array(customId).max(1000) })]);
const oneFile = z.union([z.object({ fileKey }), z.object({ customId })]);

export const fileApiSchemas = {
  deleteFiles: keysOrCustomIds,
  getFileUrl: keysOrCustomIds,
  listFiles: z.object({ limit: z.number().int().min(1).max(5000).optional(), offset: z.number().int().min(0).optional() }),
  renameFiles: z.object({ updates: z.array(z.intersection(oneFile, z.object({ newName: z.string().min(1).max(1024) }))).max(1000) }),
  updateACL: z.object({ updates: z.array(z.intersection(oneFile, z.object({ acl }))).max(1000) }),
  requestFileAccess: z.intersection(oneFile, z.object({ expiresIn: z.number().int().min(1).max(MAX_SIGNED_URL_SECONDS).optional() })),
  getUsageInfo: z.object({}).passthrough(),
} as const;

export type FileApiEndpoint = keyof typeof fileApiSchemas;

export function isFileApiEndpoint(name: string): name is FileApiEndpoint {
  return Object.hasOwn(fileApiSchemas, name);
}

export function fileUrls(ctx: { origin: string; appId: string }, key: string) {
  return { url: `${ctx.origin}/f/${key}`, appUrl: `${ctx.origin}/a/${ctx.appId}/${key}`, ufsUrl: `${ctx.origin}/a/${ctx.appId}/${key}` };
}

function parse<S extends z.ZodType>(schema: S, body: unknown): z.infer<S> {
  const parsed = schema.safeParse(body);
  if (!parsed.success) throw new AppError('invalid', 'The request body does not have the expected shape.', { fieldErrors: fieldErrorsFromZod(parsed.error) });
  return parsed.data;
}

function lookup(ctx: FileApiContext, ref: { fileKey: string } | { customId: string }): StoredFile | undefined {
  return 'fileKey' in ref ? ctx.store.get(ref.fileKey) : ctx.store.byCustomId(ref.customId);
}

/** Every reference must name a stored file, or nothing changes. */
function lookupAll<T extends { fileKey: string } | { customId: string }>(ctx: FileApiContext, refs: T[]): { ref: T; file: StoredFile }[] {
  const found = refs.map((ref) => ({ ref, file: lookup(ctx, ref) }));
  const missing = found.filter((f) => !f.file).map((f) => ('fileKey' in f.ref ? f.ref.fileKey : f.ref.customId));
  if (missing.length) throw new AppError('not_found', `No stored file for ${missing.join(', ')}.`);
  return found as { ref: T; file: StoredFile }[];
}

function keysOf(ctx: FileApiContext, body: z.infer<typeof keysOrCustomIds>): string[] {
  if ('fileKeys' in body) return body.fileKeys;
  return body.customIds.flatMap((id) => ctx.store.byCustomId(id)?.key ?? []);
}

export async function runFileApi(ctx: FileApiContext, endpoint: FileApiEndpoint, body: unknown): Promise<unknown> {
  switch (endpoint) {
    case 'deleteFiles': {
      const deletedCount = await ctx.store.delete(keysOf(ctx, parse(fileApiSchemas.deleteFiles, body)));
      return { success: true, deletedCount };
    }
    case 'getFileUrl': {
      const keys = keysOf(ctx, parse(fileApiSchemas.getFileUrl, body)).filter((key) => ctx.store.get(key));
      return { data: keys.map((key) => ({ key, url: fileUrls(ctx, key).ufsUrl })) };
    }
    case 'listFiles': {
      const { limit = 500, offset = 0 } = parse(fileApiSchemas.listFiles, body);
      const all = ctx.store.list();
      const page = all.slice(offset, offset + limit);
      return {
        hasMore: offset + page.length < all.length,
        files: page.map((f) => ({ id: f.id, customId: f.customId, key: f.key, name: f.name, size: f.size, status: 'Uploaded', uploadedAt: f.uploadedAtMs })),
      };
    }
    case 'renameFiles': {
      const { updates } = parse(fileApiSchemas.renameFiles, body);
      for (const { ref, file } of lookupAll(ctx, updates)) await ctx.store.update(file.key, { name: ref.newName });
      return { success: true };
    }
    case 'updateACL': {
      const { updates } = parse(fileApiSchemas.updateACL, body);
      for (const { ref, file } of lookupAll(ctx, updates)) await ctx.store.update(file.key, { acl: ref.acl });
      return { success: true };
    }
    case 'requestFileAccess': {
      const request = parse(fileApiSchemas.requestFileAccess, body);
      const [{ file }] = lookupAll(ctx, [request]);
      const signed = signUrl(fileUrls(ctx, file.key).ufsUrl, ctx.apiKey, { ttlSeconds: request.expiresIn ?? 3600 });
      return { url: signed, ufsUrl: signed };
    }
    case 'getUsageInfo': {
      const totalBytes = ctx.store.list().reduce((sum, f) => sum + f.size, 0);
      return { totalBytes, appTotalBytes: totalBytes, filesUploaded: ctx.store.list().length, limitBytes: Number.MAX_SAFE_INTEGER };
    }
  }
}
