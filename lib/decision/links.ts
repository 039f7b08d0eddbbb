import 'server-only';
import { env } from '@/lib/env';

/** Where a letter's reader checks it, and the key it was signed with; both are public. */
export function verificationLinks(recordSha256: string) {
  const base = env().BETTER_AUTH_URL.replace(/\/+$/, '');
  return { verifyUrl: `${base}/verify?hash=${recordSha256}`, publicKeyUrl: `${base}/.well-known/countersample-signing-key` };
}
