import 'server-only';
import { databaseKind, getDb } from '@/db/client';
import { AppError } from '@/lib/errors';
import { bearerMatches, looksLoopback } from './endpoint';
import { dumpOpenDatabase, type OpenDatabase } from './snapshot';

/** The server's side of `npm run db:backup`: a snapshot of the database this process holds open. */
export async function serveBackupSnapshot(request: Request): Promise<Response> {
  if (!looksLoopback(request.headers)) throw new AppError('forbidden', 'Backups are only served to this machine.');
  if (!bearerMatches(request.headers.get('authorization'))) {
    throw new AppError('unauthenticated', 'A backup request needs the token this server wrote beside its data folder.');
  }
  if (databaseKind() !== 'pglite') throw new AppError('conflict', 'This server uses PostgreSQL; back it up with pg_dump.');
  const client = (getDb() as unknown as { $client: OpenDatabase }).$client;
  const tar = await dumpOpenDatabase(client);
  return new Response(new Uint8Array(tar), {
    headers: { 'content-type': 'application/x-tar', 'content-length': String(tar.length), 'cache-control': 'no-store' },
  });
}
