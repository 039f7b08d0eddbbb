// The HMAC-SHA256 signatures of the UploadThing protocol: over request bodies (callbacks) and over URLs
// (presigned ingest URLs and signed file URLs), both as `hmac-sha256=<hex>` keyed with the api key.
import { createHmac, timingSafeEqual } from 'node:crypto';

const PREFIX = 'hmac-sha256=';
const SIGNATURE_PARAM = '&signature=';

export function signPayload(payload: string, apiKey: string): string {
  return `${PREFIX}${createHmac('sha256', apiKey).update(payload).digest('hex')}`;
}

export function verifyPayload(payload: string, signature: string | null | undefined, apiKey: string): boolean {
  if (!signature?.startsWith(PREFIX)) return false;
  const hex = signature.slice(PREFIX.length);
  if (!/^[0-9a-f]{64}$/i.test(hex)) return false;
  return timingSafeEqual(Buffer.from(hex, 'hex'), createHmac('sha256', apiKey).update(payload).digest());
}

/**
 * Signs a URL the way the SDK does: `expires` (epoch ms) first, then each value percent-encoded once
 * by hand and once more by URLSearchParams, then the signature over everything before it.
 */
export function signUrl(url: string, apiKey: string, o: { ttlSeconds: number; data?: Record<string, string | number | null | undefined>; nowMs?: number }): string {
  const parsed = new URL(url);
  parsed.searchParams.append('expires', String((o.nowMs ?? Date.now()) + o.ttlSeconds * 1000));
  for (const [name, value] of Object.entries(o.data ?? {})) {
    if (value !== null && value !== undefined) parsed.searchParams.append(name, encodeURIComponent(value));
  }
  parsed.searchParams.append('signature', signPayload(parsed.toString(), apiKey));
  return parsed.href;
}

export type SignedUrlCheck =
  | { ok: true; expiresAtMs: number; params: Map<string, string> }
  | { ok: false; reason: 'unsigned' | 'bad-signature' | 'expired' };

/**
 * Checks a signed URL as it arrived (scheme, host, path and raw query) and returns its parameters
 * decoded back to the values that were signed.
 */
export function verifySignedUrl(fullUrl: string, apiKey: string, nowMs = Date.now()): SignedUrlCheck {
  const at = fullUrl.lastIndexOf(SIGNATURE_PARAM);
  if (at < 0 || !fullUrl.includes('?')) return { ok: false, reason: 'unsigned' };
  const signed = fullUrl.slice(0, at);
  const rawSignature = fullUrl.slice(at + SIGNATURE_PARAM.length);
  // Anything after the signature would be unsigned.
  if (rawSignature.includes('&') || rawSignature.includes('#')) return { ok: false, reason: 'bad-signature' };
  let signature: string;
  try {
    signature = decodeURIComponent(rawSignature);
  } catch {
    return { ok: false, reason: 'bad-signature' };
  }
  if (!verifyPayload(signed, signature, apiKey)) return { ok: false, reason: 'bad-signature' };

  const search = new URL(signed).searchParams;
  const expiresAtMs = Number(search.get('expires'));
  if (!Number.isFinite(expiresAtMs) || expiresAtMs <= nowMs) return { ok: false, reason: 'expired' };
  const params = new Map<string, string>();
  for (const [name, value] of search) {
    if (name === 'expires') continue;
    try {
      params.set(name, decodeURIComponent(value));
    } catch {
      return { ok: false, reason: 'bad-signature' };
    }
  }
  return { ok: true, expiresAtMs, params };
}
