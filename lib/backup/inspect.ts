import { PGlite } from '@electric-sql/pglite';
import { drizzle } from 'drizzle-orm/pglite';
import * as schema from '@/db/schema';
import type { Db } from '@/db/client';
import { verifyAuditChain, type ChainVerdict } from '@/lib/audit/verify';
import type { BackupManifest, TableStats } from './manifest';
import { migrationState, tableStats, type MigrationState } from './table-stats';

export type MigrationsJournal = { entries: { tag: string; when: number }[] };

export type DatabaseFacts = {
  postgresVersion: string;
  migration: MigrationState;
  tables: TableStats[];
  auditChain: BackupManifest['database']['auditChain'];
  attachments: { id: string; sha256: string }[];
};

/** What a manifest says about a database: read from an open PGlite (a snapshot or a restored folder). */
export async function databaseFacts(client: PGlite, journal: MigrationsJournal): Promise<DatabaseFacts> {
  const [{ server_version: postgresVersion }] = (await client.query<{ server_version: string }>('show server_version')).rows;
  const migration = await migrationState(client, journal);
  const tables = await tableStats(client);
  let verdict: ChainVerdict = { ok: true, checked: 0 };
  let attachments: DatabaseFacts['attachments'] = [];
  if (tables.some((t) => t.name === 'public.audit_event')) verdict = await verifyAuditChain(drizzle(client, { schema }) as unknown as Db);
  if (tables.some((t) => t.name === 'public.attachment')) {
    attachments = (await client.query<{ id: string; sha256: string }>('select id::text as id, sha256 from attachment order by id')).rows;
  }
  const auditChain = verdict.ok ? { ok: true, checked: verdict.checked } : { ok: false, checked: verdict.checked, brokenAt: verdict.brokenAt };
  return { postgresVersion, migration, tables, auditChain, attachments };
}

/** Opens a snapshot in memory, reads its facts and lets it go: the snapshot proves it opens. */
export async function snapshotFacts(databaseTar: Buffer, journal: MigrationsJournal): Promise<DatabaseFacts> {
  const client = await PGlite.create({ loadDataDir: new Blob([new Uint8Array(databaseTar)]) });
  try {
    return await databaseFacts(client, journal);
  } finally {
    await client.close();
  }
}
