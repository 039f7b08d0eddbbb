import { createHash, createPrivateKey, createPublicKey, sign, verify, type KeyObject } from 'node:crypto';

/**
 * What the server signs: a fixed prefix and the record's SHA-256 in lowercase hex, as UTF-8. Signing
 * the hash rather than the record lets anyone holding a letter check its signature with the published
 * public key alone, without seeing the record; the prefix keeps the signature from meaning anything else.
 */
export const SIGNED_MESSAGE_PREFIX = 'countersample-sealed-record:v1:';
export const SIGNATURE_ALGORITHM = 'Ed25519';

export function signedMessage(recordSha256: string): Buffer {
  return Buffer.from(`${SIGNED_MESSAGE_PREFIX}${recordSha256}`, 'utf8');
}

/** Ed25519 over the signed message; base64. */
export function signRecordHash(privateKey: KeyObject, recordSha256: string): string {
  return sign(null, signedMessage(recordSha256), privateKey).toString('base64');
}

export function verifyRecordSignature(publicKey: KeyObject, recordSha256: string, signatureBase64: string): boolean {
  const signature = Buffer.from(signatureBase64, 'base64');
  // An Ed25519 signature is 64 bytes; anything else is no signature, not a reason to throw.
  if (signature.length !== 64) return false;
  return verify(null, signedMessage(recordSha256), publicKey, signature);
}

/** A short, stable name for a public key: the first 16 hex digits of the SHA-256 of its SPKI form. */
export function keyIdOf(publicKey: KeyObject): string {
  return createHash('sha256').update(publicKey.export({ type: 'spki', format: 'der' })).digest('hex').slice(0, 16);
}

export class SigningKeyError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'SigningKeyError';
  }
}

/**
 * A private key from a setting: PKCS#8 PEM (real or with "\n" written out, as some hosts store it)
 * or the base64 of its DER. Only Ed25519 is accepted.
 */
export function parsePrivateKey(text: string): KeyObject {
  const trimmed = text.trim().replaceAll('\\n', '\n');
  let key: KeyObject;
  try {
    key = trimmed.startsWith('-----BEGIN')
      ? createPrivateKey({ key: trimmed, format: 'pem' })
      : createPrivateKey({ key: Buffer.from(trimmed.replace(/\s+/g, ''), 'base64'), format: 'der', type: 'pkcs8' });
  } catch {
    throw new SigningKeyError('is not a private key: give an Ed25519 key as PKCS#8 PEM or as the base64 of its DER (openssl genpkey -algorithm ed25519)');
  }
  if (key.asymmetricKeyType !== 'ed25519') throw new SigningKeyError(`is a ${key.asymmetricKeyType ?? 'unknown'} key; the decision seal needs an Ed25519 key`);
  return key;
}

export function publicKeyOf(privateKey: KeyObject): KeyObject {
  return createPublicKey(privateKey);
}

/**
 * Public keys from a setting: SPKI PEM blocks, or the base64 of their DER separated by commas or
 * white space. Only Ed25519 is accepted.
 */
export function parsePublicKeys(text: string): KeyObject[] {
  const normalised = text.replaceAll('\\n', '\n');
  const pemBlocks = normalised.match(/-----BEGIN PUBLIC KEY-----[\s\S]+?-----END PUBLIC KEY-----/g) ?? [];
  const rest = normalised.replace(/-----BEGIN PUBLIC KEY-----[\s\S]+?-----END PUBLIC KEY-----/g, ' ');
  const derTexts = rest.split(/[\s,]+/).filter(Boolean);
  const keys: KeyObject[] = [];
  for (const item of [...pemBlocks, ...derTexts]) {
    let key: KeyObject;
    try {
      key = item.startsWith('-----BEGIN') ? createPublicKey({ key: item, format: 'pem' }) : createPublicKey({ key: Buffer.from(item, 'base64'), format: 'der', type: 'spki' });
    } catch {
      throw new SigningKeyError('holds something that is not a public key: give Ed25519 public keys as SPKI PEM or as the base64 of their DER');
    }
    if (key.asymmetricKeyType !== 'ed25519') throw new SigningKeyError(`holds a ${key.asymmetricKeyType ?? 'unknown'} key; decision seals use Ed25519`);
    keys.push(key);
  }
  return keys;
}
