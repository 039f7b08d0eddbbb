import fs from 'node:fs';
import path from 'node:path';
import { parseArgs } from 'node:util';
import { lockHolder } from '../db/client';
import { writeBackupArchive } from '../lib/backup/create';
import { readBackupEndpoint } from '../lib/backup/endpoint';
import { POSTGRES_BACKUP_RECIPE } from '../lib/backup/postgres-recipe';
import { fetchServerSnapshot } from '../lib/backup/remote';
import { dumpClosedFolder } from '../lib/backup/snapshot';
import { env } from '../lib/env';

// `npm run db:backup [-- --out FILE] [--url http://127.0.0.1:PORT]`: one archive of the embedded
// database and the uploaded files. With no server on the folder it opens the folder itself; with
// one, it asks that server, since a second process must never open a PGlite folder.

const { values } = parseArgs({ options: { out: { type: 'string' }, url: { type: 'string' }, uploads: { type: 'string' } } });
const settings = env();
if (settings.DATABASE_URL) {
  console.log(POSTGRES_BACKUP_RECIPE);
  process.exit(2);
}
const dataDir = settings.PGLITE_DIR;
if (dataDir.startsWith('memory://')) {
  console.error('PGLITE_DIR is an in-memory database; there is nothing on disk to back up.');
  process.exit(1);
}
if (!fs.existsSync(dataDir)) {
  console.error(`There is no embedded database in ${path.resolve(dataDir)} (PGLITE_DIR).`);
  process.exit(1);
}

const started = Date.now();
const stamp = new Date().toISOString().replace(/[-:]/g, '').replace(/\.\d+Z$/, 'Z');
const outFile = path.resolve(values.out ?? path.join('data', 'backups', `countersample-${stamp}.tar.gz`));
const uploadsDir = path.resolve(values.uploads ?? settings.UPLOAD_SERVICE_DIR);
const journal = JSON.parse(fs.readFileSync(path.join(process.cwd(), 'db', 'migrations', 'meta', '_journal.json'), 'utf8'));
const appVersion = (JSON.parse(fs.readFileSync(path.join(process.cwd(), 'package.json'), 'utf8')) as { version: string }).version;

try {
  const holder = lockHolder(dataDir);
  let databaseTar: Buffer;
  let source: 'direct' | 'server';
  if (holder) {
    const endpoint = readBackupEndpoint(dataDir);
    if (!endpoint || endpoint.pid !== holder) {
      throw new Error(`Process ${holder} holds ${path.resolve(dataDir)} but has published no backup endpoint (a script, or an older server?). Wait for it to finish, or stop it, and run the backup again.`);
    }
    const url = values.url ?? (endpoint.port ? `http://127.0.0.1:${endpoint.port}` : null);
    if (!url) throw new Error(`The server (process ${holder}) did not record its port; give its address with --url http://127.0.0.1:PORT.`);
    console.log(`A server (process ${holder}) holds the database; asking it for a snapshot at ${url}.`);
    databaseTar = await fetchServerSnapshot(url, endpoint.token);
    source = 'server';
  } else {
    databaseTar = await dumpClosedFolder(dataDir);
    source = 'direct';
  }
  const { manifest, sizeBytes } = await writeBackupArchive({ databaseTar, source, uploadsDir, appVersion, journal, outFile });
  const rows = manifest.database.tables.reduce((sum, t) => sum + t.rows, 0);
  console.log(
    `Backup written: ${outFile} (${(sizeBytes / 1e6).toFixed(1)} MB, ${((Date.now() - started) / 1000).toFixed(1)} s)\n` +
      `  database: ${manifest.database.tables.length} tables, ${rows} rows, migration ${manifest.database.migration.tag}, audit chain ${manifest.database.auditChain.ok ? `intact (${manifest.database.auditChain.checked} events)` : `BROKEN at event #${manifest.database.auditChain.brokenAt}`}\n` +
      `  uploads: ${manifest.uploads.files.length} files from ${uploadsDir}`,
  );
  if (manifest.uploads.missingAttachments.length) {
    console.warn(`warning: ${manifest.uploads.missingAttachments.length} evidence files named in the database are not in ${uploadsDir}: ${manifest.uploads.missingAttachments.map((a) => a.id).join(', ')}`);
  }
  if (!manifest.database.auditChain.ok) process.exitCode = 3;
} catch (error) {
  console.error(`Backup failed: ${(error as Error).message}`);
  process.exitCode = 1;
}
