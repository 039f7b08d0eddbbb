import { sql } from 'drizzle-orm';
import { getDb, type DbOrTx } from '@/db/client';

/**
 * A fixed-window counter in the database (better-auth's rate_limit table), so that every server
 * instance counts the same attempts and a restart forgets nothing.
 */
export async function countAttempt(key: string, windowMs: number, now = Date.now(), db: DbOrTx = getDb()): Promise<number> {
  const windowStart = now - windowMs;
  const result = await db.execute<{ count: number }>(sql`
    insert into rate_limit (id, key, count, last_request) values (${crypto.randomUUID()}, ${key}, 1, ${now})
    on conflict (key) do update set
      count = case when rate_limit.last_request < ${windowStart} then 1 else rate_limit.count + 1 end,
      last_request = case when rate_limit.last_request < ${windowStart} then ${now} else rate_limit.last_request end
    returning count`);
  const rows = 'rows' in result ? (result.rows as { count: number }[]) : (result as unknown as { count: number }[]);
  return Number(rows[0]?.count ?? 0);
}

export async function clearAttempts(key: string, db: DbOrTx = getDb()): Promise<void> {
  await db.execute(sql`delete from rate_limit where key = ${key}`);
}

/** Throttles apply everywhere but in the test suite, where a test that wants them says so. */
export function throttlingEnabled(): boolean {
  return process.env.APP_ENV !== 'test' || process.env.COUNTERSAMPLE_RATE_LIMIT === 'on';
}
