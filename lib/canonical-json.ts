import canonicalize from 'canonicalize';
import { createHash } from 'node:crypto';

/** JSON in RFC 8785 canonical form: the same value always gives the same bytes, so its hash is stable. */
export function canonicalJson(value: unknown): string {
  const text = canonicalize(value);
  if (text === undefined) throw new TypeError('Value cannot be expressed as canonical JSON');
  return text;
}

export function sha256Hex(text: string | Buffer): string {
  return createHash('sha256').update(text).digest('hex');
}
