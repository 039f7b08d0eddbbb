import { createHash } from 'node:crypto';
import { spawn } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { createGzip } from 'node:zlib';
import { PGlite } from '@electric-sql/pglite';
import { eq } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { getDb } from '@/db/client';
import { attachment, disputeCase, user } from '@/db/schema';
import { writeBackupArchive } from '@/lib/backup/create';
import { databaseFacts, type MigrationsJournal } from '@/lib/backup/inspect';
import { DATABASE_ENTRY, MANIFEST_ENTRY } from '@/lib/backup/manifest';
import { restoreArchive, verifyArchive } from '@/lib/backup/restore';
import { dumpClosedFolder, dumpOpenDatabase } from '@/lib/backup/snapshot';
import { tableStats } from '@/lib/backup/table-stats';
import { readTar, tarEnd, tarHeader, tarPadding } from '@/lib/backup/tar';
import { FileStore } from '@/lib/upload-service/store';
import { demoUser, seedDemoForTests } from './helpers';

// Backup and restore of the embedded database and the upload service's files: the demo scenario
// plus stored evidence, written to an archive, restored into a new folder and compared table by
// table and file by file; damaged archives and occupied folders are refused without writing.

const journal = JSON.parse(fs.readFileSync(path.join(process.cwd(), 'db', 'migrations', 'meta', '_journal.json'), 'utf8')) as MigrationsJournal;
const work = fs.mkdtempSync(path.join(os.tmpdir(), 'countersample-backup-test-'));
const sourceDir = path.join(work, 'source', 'pglite');
const uploadsDir = path.join(work, 'source', 'uploads');
const archive = path.join(work, 'backup.tar.gz');
const sha256 = (bytes: Buffer | Uint8Array) => createHash('sha256').update(bytes).digest('hex');

const evidence = [
  { key: 'labsheet000001', name: 'retest-sheet.csv', type: 'text/csv', bytes: Buffer.from('position,value\n1,-0.5190\n2,-0.5196\n') },
  { key: 'photo000000002', name: 'seal.png', type: 'image/png', bytes: Buffer.concat([Buffer.from([0x89, 0x50, 0x4e, 0x47]), Buffer.alloc(70_000, 7)]) },
  { key: 'letter00000003', name: 'letter.pdf', type: 'application/pdf', bytes: Buffer.from('%PDF-1.7 invented test letter') },
];

async function statsOfFolder(dir: string) {
  const client = await PGlite.create(dir);
  try {
    return await tableStats(client);
  } finally {
    await client.close();
  }
}

function filesUnder(dir: string): Map<string, string> {
  const found = new Map<string, string>();
  const walk = (at: string) => {
    for (const entry of fs.readdirSync(at, { withFileTypes: true })) {
      const full = path.join(at, entry.name);
      if (entry.isDirectory()) walk(full);
      else found.set(path.relative(dir, full), sha256(fs.readFileSync(full)));
    }
  };
  walk(dir);
  return found;
}

// The archive is of the embedded database; a PostgreSQL server is backed up with pg_dump.
const embedded = !process.env.DATABASE_URL;

beforeAll(async () => {
  if (!embedded) return;
  await seedDemoForTests();
  const db = getDb();
  const [someCase] = await db.select().from(disputeCase).limit(1);
  const [supplier] = await db.select().from(user).where(eq(user.email, demoUser('supplier').email));
  const store = await FileStore.open(uploadsDir);
  for (const file of evidence) {
    expect(store.reserve(file.key, null)).toBe(true);
    await store.commit({ key: file.key, name: file.name, size: file.bytes.length, type: file.type, customId: null, acl: 'private', contentDisposition: 'attachment', fileHash: createHash('md5').update(file.bytes).digest('hex'), slug: 'evidence' }, file.bytes);
    await db.insert(attachment).values({
      caseId: someCase.id,
      uploadedBy: supplier.id,
      organisationId: someCase.supplierOrganisationId,
      kind: 'other',
      fileName: file.name,
      contentType: file.type,
      sizeBytes: file.bytes.length,
      sha256: sha256(file.bytes),
      storageKey: file.key,
      url: `http://localhost/f/${file.key}`,
    });
  }
  await store.flush();
  // The in-memory test database becomes a data folder on disk, as a server would leave it.
  const tar = await dumpOpenDatabase((db as unknown as { $client: PGlite }).$client);
  const onDisk = await PGlite.create(sourceDir, { loadDataDir: new Blob([new Uint8Array(tar)]) });
  await onDisk.close();
}, 180_000);

afterAll(() => {
  fs.rmSync(work, { recursive: true, force: true });
});

describe.skipIf(!embedded)('backup and restore of the embedded database', () => {
  it('round-trips the demo data and the stored files: every table and every file the same', async () => {
    const before = await statsOfFolder(sourceDir);
    const databaseTar = await dumpClosedFolder(sourceDir);
    const { manifest } = await writeBackupArchive({ databaseTar, source: 'direct', uploadsDir, appVersion: '0.0.0-test', journal, outFile: archive });

    expect(manifest.database.tables).toEqual(before);
    expect(manifest.database.tables.find((t) => t.name === 'public.attachment')?.rows).toBe(evidence.length);
    expect(manifest.database.tables.find((t) => t.name === 'public.dispute_case')?.rows).toBeGreaterThan(0);
    expect(manifest.database.migration.tag).toBe(journal.entries.at(-1)?.tag);
    expect(manifest.database.auditChain.ok).toBe(true);
    expect(manifest.uploads.missingAttachments).toEqual([]);
    expect(manifest.uploads.files.map((f) => f.path).sort()).toEqual(['index.jsonl', ...evidence.map((e) => `files/${e.key}`)].sort());
    expect(fs.existsSync(`${archive}.partial`)).toBe(false);

    const into = path.join(work, 'restored-ok');
    const restored = await restoreArchive(archive, into, journal);
    expect(await statsOfFolder(restored.pgliteDir)).toEqual(before);
    expect(filesUnder(restored.uploadsDir)).toEqual(filesUnder(uploadsDir));
    for (const file of evidence) expect(sha256(fs.readFileSync(path.join(restored.uploadsDir, 'files', file.key)))).toBe(sha256(file.bytes));

    // The restored folder is a working database: its audit chain verifies, and the upload service opens its files.
    const client = await PGlite.create(restored.pgliteDir);
    const facts = await databaseFacts(client, journal);
    await client.close();
    expect(facts.auditChain).toEqual({ ok: true, checked: manifest.database.auditChain.checked });
    const reopened = await FileStore.open(restored.uploadsDir);
    expect(reopened.list().map((f) => f.key).sort()).toEqual(evidence.map((e) => e.key).sort());
  });

  it('leaves out a file being uploaded while the backup runs, and notes evidence whose file is missing', async () => {
    const dir = path.join(work, 'uploads-in-flight');
    fs.cpSync(uploadsDir, dir, { recursive: true });
    // Bytes already in place but not yet in the index: the upload has not answered success.
    fs.writeFileSync(path.join(dir, 'files', 'unfinished00001'), 'half an upload');
    fs.rmSync(path.join(dir, 'files', evidence[2].key));
    const out = path.join(work, 'in-flight.tar.gz');
    const { manifest } = await writeBackupArchive({ databaseTar: await dumpClosedFolder(sourceDir), source: 'direct', uploadsDir: dir, appVersion: '0.0.0-test', journal, outFile: out });
    const paths = manifest.uploads.files.map((f) => f.path);
    expect(paths).not.toContain('files/unfinished00001');
    expect(paths).not.toContain(`files/${evidence[2].key}`);
    expect(manifest.uploads.missingAttachments.map((a) => a.sha256)).toEqual([sha256(evidence[2].bytes)]);
  });

  it('refuses a damaged archive and writes nothing', async () => {
    const bytes = fs.readFileSync(archive);
    const flipped = Buffer.from(bytes);
    flipped[Math.floor(bytes.length / 2)] ^= 0xff;
    const cases = { flipped, truncated: bytes.subarray(0, Math.floor(bytes.length * 0.7)), garbage: Buffer.from('not an archive at all') };
    for (const [name, content] of Object.entries(cases)) {
      const file = path.join(work, `${name}.tar.gz`);
      fs.writeFileSync(file, content);
      const into = path.join(work, `restored-${name}`);
      await expect(restoreArchive(file, into, journal), name).rejects.toThrow(/archive/i);
      expect(fs.existsSync(into), name).toBe(false);
    }
  });

  it('refuses an archive whose entries do not match the manifest, even when the compression is intact', async () => {
    // Re-pack the archive with one changed byte in the database snapshot and the original manifest.
    const entries: { name: string; body: Buffer }[] = [];
    const { createGunzip } = await import('node:zlib');
    for await (const entry of readTar(fs.createReadStream(archive).pipe(createGunzip()) as AsyncIterable<Buffer>)) {
      const parts: Buffer[] = [];
      for await (const piece of entry.body) parts.push(piece);
      entries.push({ name: entry.name, body: Buffer.concat(parts) });
    }
    expect(entries.map((e) => e.name).at(0)).toBe(DATABASE_ENTRY);
    expect(entries.map((e) => e.name).at(-1)).toBe(MANIFEST_ENTRY);
    entries[0].body[entries[0].body.length - 100] ^= 0x01;
    const file = path.join(work, 'tampered.tar.gz');
    await new Promise<void>((resolve, reject) => {
      const gzip = createGzip();
      gzip.pipe(fs.createWriteStream(file)).once('close', resolve).once('error', reject);
      for (const e of entries) {
        gzip.write(tarHeader(e.name, e.body.length, new Date()));
        gzip.write(e.body);
        gzip.write(tarPadding(e.body.length));
      }
      gzip.end(tarEnd);
    });
    await expect(verifyArchive(file, journal)).rejects.toThrow(`${DATABASE_ENTRY} does not match its SHA-256`);
    const into = path.join(work, 'restored-tampered');
    await expect(restoreArchive(file, into, journal)).rejects.toThrow(/damaged/);
    expect(fs.existsSync(into)).toBe(false);
  });

  it('refuses to restore into a folder that has anything in it, and leaves it as it was', async () => {
    const into = path.join(work, 'occupied');
    fs.mkdirSync(into);
    fs.writeFileSync(path.join(into, 'keep.txt'), 'mine');
    await expect(restoreArchive(archive, into, journal)).rejects.toThrow(/not empty/);
    expect(fs.readdirSync(into)).toEqual(['keep.txt']);
    expect(fs.readFileSync(path.join(into, 'keep.txt'), 'utf8')).toBe('mine');
  });

  it('refuses an archive from a newer version of the app, whose migration it does not know', async () => {
    const older: MigrationsJournal = { entries: journal.entries.slice(0, -1) };
    await expect(verifyArchive(archive, older)).rejects.toThrow(/does not know/);
  });

  it('will not open a folder that a live process holds, and takes over a stale lock', async () => {
    const lock = `${path.resolve(sourceDir)}.lock`;
    const holder = spawn(process.execPath, ['-e', 'setTimeout(() => {}, 60000)'], { stdio: 'ignore' });
    try {
      fs.writeFileSync(lock, String(holder.pid));
      await expect(dumpClosedFolder(sourceDir)).rejects.toThrow(`in use by process ${holder.pid}`);
    } finally {
      holder.kill('SIGKILL');
      await new Promise((resolve) => holder.once('exit', resolve));
    }
    // The holder is gone: its lock is stale and the dump takes it over, then lets go.
    expect(fs.readFileSync(lock, 'utf8')).toBe(String(holder.pid));
    const tar = await dumpClosedFolder(sourceDir);
    expect(tar.length).toBeGreaterThan(0);
    expect(fs.existsSync(lock)).toBe(false);
  });
});
