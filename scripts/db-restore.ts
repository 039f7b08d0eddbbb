import fs from 'node:fs';
import path from 'node:path';
import { parseArgs } from 'node:util';
import { restoreArchive } from '../lib/backup/restore';

// `npm run db:restore FILE [-- --into FOLDER]`: restores a backup archive into a new folder and
// prints the settings that point a server at it. It never writes into a folder that has anything in it.

const { values, positionals } = parseArgs({ allowPositionals: true, options: { into: { type: 'string' } } });
if (positionals.length !== 1) {
  console.error('Usage: npm run db:restore <archive.tar.gz> [-- --into <new folder>]');
  process.exit(1);
}
const stamp = new Date().toISOString().replace(/[-:]/g, '').replace(/\.\d+Z$/, 'Z');
const into = path.resolve(values.into ?? path.join('data', `restored-${stamp}`));
const journal = JSON.parse(fs.readFileSync(path.join(process.cwd(), 'db', 'migrations', 'meta', '_journal.json'), 'utf8'));
const started = Date.now();
try {
  const { manifest, pgliteDir, uploadsDir } = await restoreArchive(path.resolve(positionals[0]), into, journal);
  const rows = manifest.database.tables.reduce((sum, t) => sum + t.rows, 0);
  console.log(
    `Restored the backup of ${manifest.createdAt} (app ${manifest.app.version}, migration ${manifest.database.migration.tag}) in ${((Date.now() - started) / 1000).toFixed(1)} s:\n` +
      `  ${manifest.database.tables.length} tables, ${rows} rows, each matching its hash in the manifest; ${manifest.uploads.files.length} upload files\n\n` +
      `Start the app on it with:\n  PGLITE_DIR=${pgliteDir}\n  UPLOAD_SERVICE_DIR=${uploadsDir}`,
  );
} catch (error) {
  console.error(`Restore refused: ${(error as Error).message}\n${into} was left as it was.`);
  process.exitCode = 1;
}
