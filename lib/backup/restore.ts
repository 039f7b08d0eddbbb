import { createHash } from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { pipeline } from 'node:stream/promises';
import { createGunzip } from 'node:zlib';
import { PGlite } from '@electric-sql/pglite';
import { databaseFacts, type MigrationsJournal } from './inspect';
import { DATABASE_ENTRY, MANIFEST_ENTRY, parseManifest, UPLOADS_PREFIX, type BackupManifest } from './manifest';
import { compareTableStats } from './table-stats';
import { readTar } from './tar';

const MAX_MANIFEST_BYTES = 64 * 1024 * 1024;

/** The archive's entries as a stream, gunzipped; gzip's own checksum catches damage on the way. */
async function* archiveEntries(file: string) {
  const gunzip = createGunzip();
  const feeding = pipeline(fs.createReadStream(file), gunzip);
  feeding.catch(() => undefined);
  try {
    yield* readTar(gunzip as AsyncIterable<Buffer>);
    await feeding;
  } finally {
    gunzip.destroy();
  }
}

function expectedEntries(manifest: BackupManifest): Map<string, { sizeBytes: number; sha256: string }> {
  const expected = new Map<string, { sizeBytes: number; sha256: string }>();
  expected.set(DATABASE_ENTRY, { sizeBytes: manifest.database.sizeBytes, sha256: manifest.database.sha256 });
  for (const f of manifest.uploads.files) expected.set(UPLOADS_PREFIX + f.path, { sizeBytes: f.sizeBytes, sha256: f.sha256 });
  return expected;
}

/**
 * Reads the whole archive once and checks it against its manifest: every listed entry present,
 * whole and with its SHA-256, nothing unlisted, the manifest well-formed and last. Writes nothing.
 */
export async function verifyArchive(file: string, journal: MigrationsJournal): Promise<BackupManifest> {
  if (!fs.existsSync(file)) throw new Error(`There is no archive at ${file}.`);
  const seen = new Map<string, { sizeBytes: number; sha256: string }>();
  let manifestBytes: Buffer | null = null;
  for await (const entry of archiveEntries(file)) {
    if (manifestBytes) throw new Error('The archive has entries after its manifest.');
    if (seen.has(entry.name)) throw new Error(`The archive holds ${entry.name} twice.`);
    if (entry.name === MANIFEST_ENTRY) {
      if (entry.sizeBytes > MAX_MANIFEST_BYTES) throw new Error('The archive’s manifest is implausibly large.');
      const parts: Buffer[] = [];
      for await (const piece of entry.body) parts.push(piece);
      manifestBytes = Buffer.concat(parts);
      continue;
    }
    const hash = createHash('sha256');
    let size = 0;
    for await (const piece of entry.body) {
      hash.update(piece);
      size += piece.length;
    }
    seen.set(entry.name, { sizeBytes: size, sha256: hash.digest('hex') });
  }
  if (!manifestBytes) throw new Error('The archive has no manifest: it is not a Countersample backup, or it was cut short.');
  const manifest = parseManifest(manifestBytes);

  const problems: string[] = [];
  for (const [name, want] of expectedEntries(manifest)) {
    const got = seen.get(name);
    if (!got) problems.push(`${name} is missing`);
    else if (got.sizeBytes !== want.sizeBytes || got.sha256 !== want.sha256) problems.push(`${name} does not match its SHA-256 in the manifest`);
    seen.delete(name);
  }
  for (const extra of seen.keys()) problems.push(`${extra} is not listed in the manifest`);
  if (problems.length) throw new Error(`The archive is damaged: ${problems.join('; ')}.`);

  const known = journal.entries.map((e) => e.tag);
  if (!manifest.database.migration.tag || !known.includes(manifest.database.migration.tag)) {
    throw new Error(`The archive’s database is at migration ${manifest.database.migration.tag ?? '(none)'}, which this version of the app does not know: restore it with the version that made it (${manifest.app.version}) or newer.`);
  }
  return manifest;
}

function isEmptyOrAbsent(folder: string): boolean {
  if (!fs.existsSync(folder)) return true;
  return fs.statSync(folder).isDirectory() && fs.readdirSync(folder).length === 0;
}

function syncTree(folder: string): void {
  for (const entry of fs.readdirSync(folder, { withFileTypes: true })) {
    const full = path.join(folder, entry.name);
    if (entry.isDirectory()) syncTree(full);
    else if (entry.isFile()) {
      const fd = fs.openSync(full, 'r');
      fs.fsyncSync(fd);
      fs.closeSync(fd);
    }
  }
  const fd = fs.openSync(folder, 'r');
  fs.fsyncSync(fd);
  fs.closeSync(fd);
}

export type RestoreResult = { manifest: BackupManifest; pgliteDir: string; uploadsDir: string };

/**
 * Restores an archive into a new folder (`pglite/` and `uploads/` inside it). The archive is
 * verified in full before anything is written; the restored database is then opened and compared
 * with the manifest table by table. On any failure the folder is removed again.
 */
export async function restoreArchive(file: string, into: string, journal: MigrationsJournal): Promise<RestoreResult> {
  const target = path.resolve(into);
  if (!isEmptyOrAbsent(target)) throw new Error(`${target} is not empty; a restore only writes into a new or empty folder.`);
  const manifest = await verifyArchive(file, journal);
  if (!isEmptyOrAbsent(target)) throw new Error(`${target} is not empty; a restore only writes into a new or empty folder.`);

  const existed = fs.existsSync(target);
  const pgliteDir = path.join(target, 'pglite');
  const uploadsDir = path.join(target, 'uploads');
  const expected = expectedEntries(manifest);
  try {
    fs.mkdirSync(uploadsDir, { recursive: true });
    let databaseTar: Buffer | null = null;
    for await (const entry of archiveEntries(file)) {
      if (entry.name === MANIFEST_ENTRY) continue;
      const want = expected.get(entry.name);
      if (!want) throw new Error(`${entry.name} is not listed in the manifest.`);
      const hash = createHash('sha256');
      if (entry.name === DATABASE_ENTRY) {
        const parts: Buffer[] = [];
        for await (const piece of entry.body) {
          hash.update(piece);
          parts.push(piece);
        }
        databaseTar = Buffer.concat(parts);
      } else {
        // Paths were checked by the manifest's schema: plain relative paths, no way out of the folder.
        const destination = path.join(uploadsDir, entry.name.slice(UPLOADS_PREFIX.length));
        fs.mkdirSync(path.dirname(destination), { recursive: true });
        const out = await fs.promises.open(destination, 'wx', 0o600);
        try {
          for await (const piece of entry.body) {
            hash.update(piece);
            await out.write(piece);
          }
          await out.sync();
        } finally {
          await out.close();
        }
      }
      // Read a second time: the file could have changed since it was verified.
      if (hash.digest('hex') !== want.sha256) throw new Error(`${entry.name} changed since the archive was verified.`);
    }
    if (!databaseTar) throw new Error('The archive lost its database since it was verified.');

    const client = await PGlite.create(pgliteDir, { loadDataDir: new Blob([new Uint8Array(databaseTar)]) });
    try {
      const facts = await databaseFacts(client, journal);
      const problems = compareTableStats(manifest.database.tables, facts.tables);
      if (problems.length) throw new Error(`The restored database differs from the snapshot: ${problems.join('; ')}.`);
    } finally {
      await client.close();
    }
    // PGlite itself never syncs its files; the restored copy is put on disk before we say it is done.
    syncTree(target);
    return { manifest, pgliteDir, uploadsDir };
  } catch (error) {
    if (existed) for (const child of fs.readdirSync(target)) fs.rmSync(path.join(target, child), { recursive: true, force: true });
    else fs.rmSync(target, { recursive: true, force: true });
    throw error;
  }
}
