import { countAttempt, throttlingEnabled } from './window-counter';

/**
 * The verification page is public. A record hash cannot be guessed, but each check reads and
 * re-verifies a sealed record, so one address gets a bounded number of checks per window.
 */
export const LETTER_CHECKS_PER_WINDOW = 30;
export const LETTER_CHECK_WINDOW_MS = 10 * 60_000;

export const tooManyLetterChecks = 'Too many checks from your network in a short time. Try again in ten minutes.';

function clientAddress(headers: Headers): string {
  return headers.get('x-forwarded-for')?.split(',')[0]?.trim() || headers.get('x-real-ip')?.trim() || 'unknown';
}

/** Counts one check from the request's address; false once it is over the limit. */
export async function letterCheckAllowed(headers: Headers, now = Date.now()): Promise<boolean> {
  if (!throttlingEnabled()) return true;
  const count = await countAttempt(`letter-check:${clientAddress(headers).slice(0, 100)}`, LETTER_CHECK_WINDOW_MS, now);
  return count <= LETTER_CHECKS_PER_WINDOW;
}
