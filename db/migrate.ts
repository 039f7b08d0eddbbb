import path from 'node:path';
import { migrate as migratePglite } from 'drizzle-orm/pglite/migrator';
import { migrate as migratePg } from 'drizzle-orm/node-postgres/migrator';
import { databaseKind, getDb } from './client';

const migrationsFolder = path.join(process.cwd(), 'db', 'migrations');

const globalForMigrate = globalThis as unknown as { __countersampleMigrated?: Promise<void> };

/** Applies the committed migrations once per process; both engines read the same files. */
export function migrate(): Promise<void> {
  globalForMigrate.__countersampleMigrated ??= (async () => {
    const db = getDb();
    if (databaseKind() === 'pglite') await migratePglite(db, { migrationsFolder });
    else await migratePg(db as never, { migrationsFolder });
  })();
  return globalForMigrate.__countersampleMigrated;
}

export function forgetMigration(): void {
  globalForMigrate.__countersampleMigrated = undefined;
}
