import { z } from 'zod';

/** Bump when the archive's layout changes; restore refuses versions it does not know. */
export const BACKUP_FORMAT_VERSION = 1;
export const MANIFEST_ENTRY = 'manifest.json';
export const DATABASE_ENTRY = 'database/pglite-data.tar';
export const UPLOADS_PREFIX = 'uploads/';

const sha256Hex = z.string().regex(/^[0-9a-f]{64}$/, 'must be a SHA-256 in hex');

export const tableStatsSchema = z.object({
  name: z.string().min(1),
  rows: z.number().int().nonnegative(),
  sha256: sha256Hex,
});
export type TableStats = z.infer<typeof tableStatsSchema>;

/** A relative path inside the archive: no absolute paths, no way out of the folder it lands in. */
const safeRelativePath = z
  .string()
  .min(1)
  .refine((p) => !p.startsWith('/') && !p.includes('\\') && !p.includes('\0') && p.split('/').every((part) => part !== '' && part !== '.' && part !== '..'), 'must be a plain relative path');

export const uploadFileSchema = z.object({
  path: safeRelativePath,
  sizeBytes: z.number().int().nonnegative(),
  sha256: sha256Hex,
});
export type UploadFile = z.infer<typeof uploadFileSchema>;

export const manifestSchema = z.object({
  format: z.literal('countersample-backup'),
  formatVersion: z.literal(BACKUP_FORMAT_VERSION),
  createdAt: z.iso.datetime(),
  app: z.object({ version: z.string().min(1) }),
  // How the snapshot was taken: the folder opened directly, or asked of the server holding it.
  source: z.enum(['direct', 'server']),
  database: z.object({
    engine: z.literal('pglite'),
    entry: z.literal(DATABASE_ENTRY),
    sizeBytes: z.number().int().positive(),
    sha256: sha256Hex,
    postgresVersion: z.string().min(1),
    migration: z.object({ tag: z.string().nullable(), appliedCount: z.number().int().nonnegative(), createdAtMs: z.number().int().nullable() }),
    tables: z.array(tableStatsSchema).min(1),
    auditChain: z.object({ ok: z.boolean(), checked: z.number().int().nonnegative(), brokenAt: z.number().int().optional() }),
  }),
  uploads: z.object({
    files: z.array(uploadFileSchema),
    // Evidence rows of the snapshot whose file (by SHA-256) is not in the archive.
    missingAttachments: z.array(z.object({ id: z.string(), sha256: z.string() })),
  }),
});
export type BackupManifest = z.infer<typeof manifestSchema>;

export function parseManifest(bytes: Buffer): BackupManifest {
  let json: unknown;
  try {
    json = JSON.parse(bytes.toString('utf8'));
  } catch {
    throw new Error('The archive’s manifest is not valid JSON.');
  }
  const parsed = manifestSchema.safeParse(json);
  if (!parsed.success) {
    throw new Error(`The archive’s manifest is not one this version can restore: ${parsed.error.issues.map((i) => `${i.path.join('.') || '(manifest)'} ${i.message}`).join('; ')}.`);
  }
  const paths = new Set<string>();
  for (const file of parsed.data.uploads.files) {
    if (paths.has(file.path)) throw new Error(`The archive’s manifest lists ${file.path} twice.`);
    paths.add(file.path);
  }
  return parsed.data;
}
