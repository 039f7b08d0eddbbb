// Generates the benchmarks' scale dataset on demand; it is never committed.
//   npm run bench:data              the embedded folder data/scale/pglite (kept if complete)
//   npm run bench:data -- --force   start over
// With DATABASE_URL set it fills that PostgreSQL database instead (an incomplete one is emptied first).
import fs from 'node:fs';
import path from 'node:path';
import { sql } from 'drizzle-orm';

const force = process.argv.includes('--force');
process.env.APP_ENV ??= 'demo';
const usePostgres = Boolean(process.env.DATABASE_URL);

const { readScaleManifest, scaleDataDir, scaleManifestFile } = await import('./scale-generate');
if (!usePostgres) {
  if (!process.env.PGLITE_DIR) process.env.PGLITE_DIR = scaleDataDir();
  const dir = process.env.PGLITE_DIR;
  const isDefault = path.resolve(dir) === scaleDataDir();
  if (isDefault && !force && readScaleManifest() && fs.existsSync(dir)) {
    console.log(`The scale dataset is already in ${path.relative(process.cwd(), dir)} (--force to make it again).`);
    process.exit(0);
  }
  if (fs.existsSync(`${path.resolve(dir)}.lock`)) {
    const holder = Number(fs.readFileSync(`${path.resolve(dir)}.lock`, 'utf8'));
    try {
      process.kill(holder, 0);
      console.error(`${dir} is open in process ${holder}; stop it first.`);
      process.exit(1);
    } catch {
      // A stale lock: nobody has the folder open.
    }
  }
  // A folder without its manifest is a generation that did not finish.
  fs.rmSync(dir, { recursive: true, force: true });
  if (isDefault) fs.rmSync(scaleManifestFile(), { force: true });
}

const { closeDb, getDb } = await import('../db/client');
const { migrate, forgetMigration } = await import('../db/migrate');
const { env } = await import('../lib/env');
const { generateScaleData, hasScaleData } = await import('./scale-generate');

try {
  await migrate();
  const db = getDb();
  if (usePostgres) {
    const complete = await hasScaleData(db);
    if (complete && !force) {
      console.log('The scale dataset is already in the PostgreSQL database (--force to make it again).');
      process.exit(0);
    }
    const [{ organisations }] = (await db.execute(sql`select count(*)::int as organisations from organisation`)).rows as { organisations: number }[];
    if (organisations > 0) {
      console.log('Emptying the PostgreSQL database first (it holds an incomplete or older dataset).');
      await db.execute(sql`drop schema public cascade`);
      await db.execute(sql`create schema public`);
      await db.execute(sql`drop schema if exists drizzle cascade`);
      forgetMigration();
      await migrate();
    }
  }
  const manifest = await generateScaleData(db, { password: env().DEMO_PASSWORD });
  if (!usePostgres && path.resolve(process.env.PGLITE_DIR!) === scaleDataDir()) {
    fs.writeFileSync(scaleManifestFile(), `${JSON.stringify(manifest, null, 2)}\n`);
  }
  console.log(`Scale dataset generated in ${manifest.seconds.toFixed(1)} s.`);
} finally {
  await closeDb();
}
