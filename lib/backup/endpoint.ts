import { randomBytes, timingSafeEqual } from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { z } from 'zod';

// A server that holds an embedded data folder answers backup requests from the same machine.
// At start it writes a random token, readable by its own user only, beside the folder; the backup
// script reads it, so only someone who may read that folder can ask for a snapshot.

export const BACKUP_ROUTE = '/api/internal/backup';

const endpointSchema = z.object({ pid: z.number().int().positive(), port: z.number().int().positive().nullable(), token: z.string().regex(/^[0-9a-f]{64}$/) });
export type BackupEndpoint = z.infer<typeof endpointSchema>;

export function endpointFile(dataDir: string): string {
  return `${path.resolve(dataDir)}.backup-endpoint.json`;
}

const globalForEndpoint = globalThis as unknown as { __countersampleBackupToken?: string };

/** Writes a fresh token for this server process; called once at server start. */
export function publishBackupEndpoint(dataDir: string, port: number | null): void {
  const token = randomBytes(32).toString('hex');
  const file = endpointFile(dataDir);
  fs.rmSync(file, { force: true });
  // Created with owner-only permissions from the first byte; `wx` refuses a file slipped in meanwhile.
  fs.writeFileSync(file, JSON.stringify({ pid: process.pid, port, token } satisfies BackupEndpoint), { mode: 0o600, flag: 'wx' });
  globalForEndpoint.__countersampleBackupToken = token;
  process.once('exit', () => {
    try {
      if (readBackupEndpoint(dataDir)?.token === token) fs.rmSync(file, { force: true });
    } catch {
      // Already gone or unreadable: nothing of ours to remove.
    }
  });
}

export function readBackupEndpoint(dataDir: string): BackupEndpoint | null {
  let text: string;
  try {
    text = fs.readFileSync(endpointFile(dataDir), 'utf8');
  } catch (error) {
    if ((error as NodeJS.ErrnoException).code === 'ENOENT') return null;
    throw error;
  }
  const parsed = endpointSchema.safeParse(JSON.parse(text));
  return parsed.success ? parsed.data : null;
}

/** True when the request carries this process's token, compared in constant time. */
export function bearerMatches(authorization: string | null): boolean {
  const token = globalForEndpoint.__countersampleBackupToken;
  const given = authorization?.match(/^Bearer ([0-9a-f]{64})$/)?.[1];
  if (!token || !given) return false;
  return timingSafeEqual(Buffer.from(given), Buffer.from(token));
}

const loopbackHost = /^(localhost|127(\.\d{1,3}){3}|\[::1\])(:\d+)?$/i;
const loopbackAddress = /^(127(\.\d{1,3}){3}|::1|::ffff:127(\.\d{1,3}){3})$/i;

/**
 * Whether the request came from this machine as far as the server can tell: a loopback Host, and
 * a loopback address in every X-Forwarded-For hop (Next.js fills it with the socket's address when
 * absent; a proxy in front adds the real client). A header can be forged, so this is a second
 * fence only; the token is the lock.
 */
export function looksLoopback(headers: Headers): boolean {
  const host = headers.get('host') ?? '';
  if (!loopbackHost.test(host)) return false;
  const forwarded = headers.get('x-forwarded-for');
  if (!forwarded) return false;
  return forwarded.split(',').every((hop) => loopbackAddress.test(hop.trim()));
}

/** At server start: publish a token when this process holds an embedded data folder. */
export function publishForThisServer(settings: { DATABASE_URL?: string; PGLITE_DIR: string }): void {
  if (settings.DATABASE_URL || settings.PGLITE_DIR.startsWith('memory://')) return;
  const port = Number(process.env.PORT);
  publishBackupEndpoint(settings.PGLITE_DIR, Number.isInteger(port) && port > 0 ? port : null);
}
