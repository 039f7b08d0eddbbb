import { afterAll, beforeAll } from 'vitest';
import { sql } from 'drizzle-orm';

process.env.APP_ENV = 'test';
if (!process.env.DATABASE_URL) process.env.PGLITE_DIR = 'memory://';
// A call that queues mail returns once it is delivered, so a test reads the catcher right after it.
// The outbox test sets this to 'background' to prove the request does not wait.
process.env.MAIL_DELIVERY ??= 'inline';

beforeAll(async () => {
  const { getDb } = await import('@/db/client');
  const { migrate } = await import('@/db/migrate');
  if (process.env.DATABASE_URL) {
    // Each file starts from an empty database on the shared server.
    await getDb().execute(sql.raw('drop schema if exists public cascade; drop schema if exists drizzle cascade; create schema public;'));
  }
  await migrate();
});

afterAll(async () => {
  const { mailSettled } = await import('@/lib/mail/outbox');
  await mailSettled();
  const { closeDb } = await import('@/db/client');
  const { forgetMigration } = await import('@/db/migrate');
  const { resetAuthForTests } = await import('@/lib/auth/auth');
  await closeDb();
  forgetMigration();
  resetAuthForTests();
});
