import { clearAttempts, countAttempt } from '@/lib/throttle/window-counter';

/**
 * Failed sign-ins are also counted per account, in the database: a client address can be forged in
 * X-Forwarded-For, an e-mail address under attack cannot. A successful sign-in clears the count.
 */
export const ACCOUNT_MAX_FAILURES = 10;
export const ACCOUNT_WINDOW_MS = 15 * 60_000;

const keyFor = (email: string) => `account-sign-in:${email.trim().toLowerCase()}`;

/** Counts one attempt; true when the account has had too many in the window and must wait. */
export async function accountAttemptBlocked(email: string, now = Date.now()): Promise<boolean> {
  return (await countAttempt(keyFor(email), ACCOUNT_WINDOW_MS, now)) > ACCOUNT_MAX_FAILURES;
}

export async function clearAccountAttempts(email: string): Promise<void> {
  await clearAttempts(keyFor(email));
}
