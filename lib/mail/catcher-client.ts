import 'server-only';
import { env } from '@/lib/env';
import type { CaughtMessage } from './catcher';

export type CaughtSummary = Omit<CaughtMessage, 'attachments'> & { attachments: { filename: string; contentType: string; size: number }[] };

/** Reads the local mail catcher for the Outbox page; null when the catcher is not running. */
export async function fetchCaughtMail(): Promise<CaughtSummary[] | null> {
  try {
    const response = await fetch(`${env().MAIL_CATCHER_URL}/messages`, { cache: 'no-store', signal: AbortSignal.timeout(2000) });
    if (!response.ok) return null;
    return (await response.json()) as CaughtSummary[];
  } catch {
    return null;
  }
}
