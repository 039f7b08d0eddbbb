import { sql } from 'drizzle-orm';
import { getDb } from '@/db/client';

/**
 * Failed sign-ins are also counted per account, in the database: a client address can be forged in
 * X-Forwarded-For, an e-mail address under attack cannot. A successful sign-in clears the count.
 */
export const ACCOUNT_MAX_FAILURES = 10;
export const ACCOUNT_WINDOW_MS = 15 * 60_000;

const keyFor = (email: string) => `account-sign-in:${email.trim().toLowerCase()}`;

/** Counts one attempt; true when the account has had too many in the window and must wait. */
export async function accountAttemptBlocked(email: string, now = Date.now()): Promise<boolean> {
  const key = keyFor(email);
  const windowStart = now - ACCOUNT_WINDOW_MS;
  const result = await getDb().execute<{ count: number }>(sql`
    insert into rate_limit (id, key, count, last_request) values (${crypto.randomUUID()}, ${key}, 1, ${now})
    on conflict (key) do update set
      count = case when rate_limit.last_request < ${windowStart} then 1 else rate_limit.count + 1 end,
      last_request = case when rate_limit.last_request < ${windowStart} then ${now} else rate_limit.last_request end
    returning count`);
  const rows = 'rows' in result ? (result.rows as { count: number }[]) : (result as unknown as { count: number }[]);
  return Number(rows[0]?.count ?? 0) > ACCOUNT_MAX_FAILURES;
}

export async function clearAccountAttempts(email: string): Promise<void> {
  await getDb().execute(sql`delete from rate_limit where key = ${keyFor(email)}`);
}
