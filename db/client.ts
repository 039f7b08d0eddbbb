import fs from 'node:fs';
import path from 'node:path';
import { PGlite } from '@electric-sql/pglite';
import { drizzle as drizzlePglite, type PgliteDatabase } from 'drizzle-orm/pglite';
import { drizzle as drizzlePg } from 'drizzle-orm/node-postgres';
import pg from 'pg';
import * as schema from './schema';
import { DrizzlePGlite } from './drizzle-pglite';
import { RemotePGlite } from './thread/pglite-remote';
import { env } from '@/lib/env';

/** The one database type the app codes against; PGlite and node-postgres expose the same query API. */
export type Db = PgliteDatabase<typeof schema>;
export type Tx = Parameters<Parameters<Db['transaction']>[0]>[0];
/** A database or an open transaction: data-access functions accept either. */
export type DbOrTx = Db | Tx;

type Handle = { db: Db; close: () => Promise<void>; kind: 'pglite' | 'postgres' };

const globalForDb = globalThis as unknown as { __countersampleDb?: Handle };

/**
 * PGlite has no lock of its own: two processes on one folder both "work" and lose writes.
 * A lock file with our pid refuses a second process, and a stale lock (dead pid) is taken over.
 */
export function takeLock(dataDir: string): () => void {
  const lockPath = `${path.resolve(dataDir)}.lock`;
  fs.mkdirSync(path.dirname(lockPath), { recursive: true });
  for (let attempt = 0; attempt < 2; attempt++) {
    try {
      fs.writeFileSync(lockPath, String(process.pid), { flag: 'wx' });
      const release = () => {
        try {
          if (fs.readFileSync(lockPath, 'utf8') === String(process.pid)) fs.unlinkSync(lockPath);
        } catch {
          // Already gone.
        }
      };
      process.once('exit', release);
      return release;
    } catch (error) {
      if ((error as NodeJS.ErrnoException).code !== 'EEXIST') throw error;
      const holder = Number(fs.readFileSync(lockPath, 'utf8'));
      if (holder === process.pid) return () => {};
      if (Number.isInteger(holder) && holder > 0 && isAlive(holder)) {
        throw new Error(
          `The embedded database in ${dataDir} is in use by process ${holder}. Stop it first, or use a PostgreSQL server (DATABASE_URL) for several processes.`,
        );
      }
      fs.unlinkSync(lockPath);
    }
  }
  throw new Error(`Could not lock the embedded database in ${dataDir}.`);
}

/** The live process that holds the folder's lock, if any (a stale lock names none). */
export function lockHolder(dataDir: string): number | null {
  let holder: number;
  try {
    holder = Number(fs.readFileSync(`${path.resolve(dataDir)}.lock`, 'utf8'));
  } catch {
    return null;
  }
  return Number.isInteger(holder) && holder > 0 && holder !== process.pid && isAlive(holder) ? holder : null;
}

function isAlive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch (error) {
    return (error as NodeJS.ErrnoException).code === 'EPERM';
  }
}

/**
 * Inside the Next.js server the embedded database runs on a thread of its own (DB_THREAD=off keeps
 * it on the request thread). Scripts and tests run the TypeScript sources, whose thread entry only
 * the server's bundler builds, so they open it in their own thread.
 */
function threadWanted(): boolean {
  return process.env.NEXT_RUNTIME === 'nodejs' && process.env.DB_THREAD !== 'off';
}

function open(): Handle {
  if (process.env.NEXT_PHASE === 'phase-production-build') {
    throw new Error('The database was touched during `next build`; routes that read it must be dynamic.');
  }
  const settings = env();
  if (settings.DATABASE_URL) {
    const pool = new pg.Pool({ connectionString: settings.DATABASE_URL, max: 10 });
    const db = drizzlePg(pool, { schema }) as unknown as Db;
    return { db, kind: 'postgres', close: () => pool.end() };
  }
  const dataDir = settings.PGLITE_DIR;
  const inMemory = dataDir.startsWith('memory://');
  const release = inMemory ? () => {} : takeLock(dataDir);
  if (!inMemory) fs.mkdirSync(dataDir, { recursive: true });
  const sharedBuffers = settings.PGLITE_SHARED_BUFFERS;
  const client = !inMemory && threadWanted() ? new RemotePGlite({ dataDir, sharedBuffers }) : new DrizzlePGlite(inMemory ? undefined : dataDir, { sharedBuffers });
  const db = drizzlePglite({ client: client as PGlite, schema });
  return {
    db,
    kind: 'pglite',
    close: async () => {
      await client.close();
      release();
    },
  };
}

/** The process-wide database, opened on first use (never at import: `next build` imports route modules). */
export function getDb(): Db {
  globalForDb.__countersampleDb ??= open();
  return globalForDb.__countersampleDb.db;
}

export function databaseKind(): Handle['kind'] {
  globalForDb.__countersampleDb ??= open();
  return globalForDb.__countersampleDb.kind;
}

export async function closeDb(): Promise<void> {
  const handle = globalForDb.__countersampleDb;
  globalForDb.__countersampleDb = undefined;
  await handle?.close();
}

export { schema };
