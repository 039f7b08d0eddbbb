import { createHash } from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { createGzip } from 'node:zlib';
import { snapshotFacts, type MigrationsJournal } from './inspect';
import { BACKUP_FORMAT_VERSION, DATABASE_ENTRY, MANIFEST_ENTRY, UPLOADS_PREFIX, type BackupManifest, type UploadFile } from './manifest';
import { tarEnd, tarHeader, tarPadding, writeChunk } from './tar';
import { readUploadsIndex, UPLOADS_FILES, UPLOADS_INDEX } from './uploads';

export type BackupInput = {
  /** PGlite's tarball of the data folder, taken first: every upload it refers to is already stored. */
  databaseTar: Buffer;
  source: BackupManifest['source'];
  uploadsDir: string;
  appVersion: string;
  journal: MigrationsJournal;
  outFile: string;
  now?: Date;
};

export type BackupResult = { file: string; manifest: BackupManifest; sizeBytes: number };

const sha256 = (bytes: Buffer) => createHash('sha256').update(bytes).digest('hex');

/**
 * Writes one gzip-compressed tar: the database snapshot, the upload index as read, each file it
 * lists, and last the manifest with every entry's SHA-256. It is written under a temporary name
 * and renamed when complete, so a file with the final name is always a whole archive.
 */
export async function writeBackupArchive(input: BackupInput): Promise<BackupResult> {
  const now = input.now ?? new Date();
  const facts = await snapshotFacts(input.databaseTar, input.journal);
  if (!facts.migration.tag) throw new Error('The database has no applied migration this version knows; it cannot be backed up as a Countersample database.');
  const uploads = await readUploadsIndex(input.uploadsDir);

  if (fs.existsSync(input.outFile)) throw new Error(`${input.outFile} exists already; a backup never replaces a file.`);
  fs.mkdirSync(path.dirname(path.resolve(input.outFile)), { recursive: true });
  const partial = `${input.outFile}.partial`;
  const fileOut = fs.createWriteStream(partial, { flags: 'wx', mode: 0o600 });
  const gzip = createGzip({ level: 6 });
  gzip.pipe(fileOut);
  const finished = new Promise<void>((resolve, reject) => {
    fileOut.once('close', resolve);
    fileOut.once('error', reject);
    gzip.once('error', reject);
  });

  const files: UploadFile[] = [];
  const warnings: string[] = [];
  try {
    await writeChunk(gzip, tarHeader(DATABASE_ENTRY, input.databaseTar.length, now));
    await writeChunk(gzip, input.databaseTar);
    await writeChunk(gzip, tarPadding(input.databaseTar.length));

    if (uploads.indexBytes) {
      await writeChunk(gzip, tarHeader(UPLOADS_PREFIX + UPLOADS_INDEX, uploads.indexBytes.length, now));
      await writeChunk(gzip, uploads.indexBytes);
      await writeChunk(gzip, tarPadding(uploads.indexBytes.length));
      files.push({ path: UPLOADS_INDEX, sizeBytes: uploads.indexBytes.length, sha256: sha256(uploads.indexBytes) });
    }
    for (const listed of uploads.files) {
      const relative = `${UPLOADS_FILES}/${listed.key}`;
      const source = path.join(input.uploadsDir, UPLOADS_FILES, listed.key);
      let stat: fs.Stats;
      try {
        stat = await fs.promises.stat(source);
      } catch {
        // Deleted since the index was read; the service drops index lines whose bytes are gone.
        warnings.push(`${relative} was removed while the backup ran; it is not in the archive`);
        continue;
      }
      await writeChunk(gzip, tarHeader(UPLOADS_PREFIX + relative, stat.size, stat.mtime));
      const sha = createHash('sha256');
      const md5 = createHash('md5');
      let copied = 0;
      for await (const chunk of fs.createReadStream(source, { start: 0, end: Math.max(stat.size - 1, 0) }) as AsyncIterable<Buffer>) {
        const piece = stat.size === 0 ? Buffer.alloc(0) : chunk.subarray(0, stat.size - copied);
        sha.update(piece);
        md5.update(piece);
        copied += piece.length;
        await writeChunk(gzip, piece);
      }
      if (copied !== stat.size) throw new Error(`${source} shrank while it was copied; files of the upload service are never rewritten, so its storage needs a look.`);
      const md5Hex = md5.digest('hex');
      if (listed.md5 && listed.md5 !== md5Hex) throw new Error(`${source} does not match the hash its index recorded: the stored file is damaged.`);
      await writeChunk(gzip, tarPadding(stat.size));
      files.push({ path: relative, sizeBytes: stat.size, sha256: sha.digest('hex') });
    }

    const stored = new Set(files.map((f) => f.sha256));
    const missingAttachments = facts.attachments.filter((a) => !stored.has(a.sha256));
    const manifest: BackupManifest = {
      format: 'countersample-backup',
      formatVersion: BACKUP_FORMAT_VERSION,
      createdAt: now.toISOString(),
      app: { version: input.appVersion },
      source: input.source,
      database: {
        engine: 'pglite',
        entry: DATABASE_ENTRY,
        sizeBytes: input.databaseTar.length,
        sha256: sha256(input.databaseTar),
        postgresVersion: facts.postgresVersion,
        migration: facts.migration,
        tables: facts.tables,
        auditChain: facts.auditChain,
      },
      uploads: { files, missingAttachments },
    };
    const manifestBytes = Buffer.from(`${JSON.stringify(manifest, null, 2)}\n`);
    await writeChunk(gzip, tarHeader(MANIFEST_ENTRY, manifestBytes.length, now));
    await writeChunk(gzip, manifestBytes);
    await writeChunk(gzip, tarPadding(manifestBytes.length));
    await writeChunk(gzip, tarEnd);
    gzip.end();
    await finished;

    const handle = await fs.promises.open(partial, 'r');
    await handle.sync();
    await handle.close();
    await fs.promises.link(partial, input.outFile);
    await fs.promises.rm(partial);
    for (const warning of warnings) console.warn(`warning: ${warning}`);
    return { file: input.outFile, manifest, sizeBytes: fs.statSync(input.outFile).size };
  } catch (error) {
    gzip.destroy();
    fileOut.destroy();
    await fs.promises.rm(partial, { force: true });
    throw error;
  }
}
