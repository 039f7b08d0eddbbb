import { publicSigningKey } from '@/lib/decision/public-key';
import { jsonResponse } from '@/lib/http/json-response';

export const dynamic = 'force-dynamic';

/** The public half of the key that seals decisions, so anyone can check a letter's signature. */
export function GET(): Response {
  return jsonResponse(publicSigningKey(), { headers: { 'cache-control': 'public, max-age=300' } });
}
