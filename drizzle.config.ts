import { defineConfig } from 'drizzle-kit';

// Generation only reads the schema; migrations are applied by the app itself (db/migrate.ts)
// so that PGlite and a PostgreSQL server get exactly the same files.
export default defineConfig({
  dialect: 'postgresql',
  schema: './db/schema/index.ts',
  out: './db/migrations',
  strict: true,
});
