import { PGlite } from '@electric-sql/pglite';
import { takeLock } from '@/db/client';

/** What a snapshot needs of the client: PGlite's own, or the server's one to the database thread. */
export type OpenDatabase = {
  transaction<T>(callback: (tx: { exec(sql: string): Promise<unknown> }) => Promise<T>): Promise<T>;
  dumpDataDir(compression: 'none'): Promise<Blob>;
};

/**
 * A physical snapshot of an open PGlite database, as PGlite's own tarball of its data folder.
 * Every statement, in or out of a transaction, waits for PGlite's transaction lock, and the dump
 * itself only for the query lock: holding the first while dumping means no transaction is half
 * done in the files we read. The checkpoint first writes every committed page, so a restore opens
 * without replaying the log.
 */
export async function dumpOpenDatabase(client: OpenDatabase): Promise<Buffer> {
  const blob = await client.transaction(async (tx) => {
    await tx.exec('checkpoint');
    return client.dumpDataDir('none');
  });
  return Buffer.from(await blob.arrayBuffer());
}

/** Opens a data folder no server holds (taking its lock, as the server would) and dumps it. */
export async function dumpClosedFolder(dataDir: string): Promise<Buffer> {
  const release = takeLock(dataDir);
  try {
    const client = await PGlite.create(dataDir);
    try {
      return await dumpOpenDatabase(client);
    } finally {
      await client.close();
    }
  } finally {
    release();
  }
}
