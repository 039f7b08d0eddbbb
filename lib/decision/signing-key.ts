import 'server-only';
import fs from 'node:fs';
import path from 'node:path';
import { generateKeyPairSync, type KeyObject } from 'node:crypto';
import { env, type Env } from '@/lib/env';
import { keyIdOf, parsePrivateKey, parsePublicKeys, publicKeyOf, SigningKeyError } from './signature';

export type PublicKeyEntry = { keyId: string; publicKey: KeyObject; publicKeyPem: string };

export type SigningKey = {
  privateKey: KeyObject;
  publicKey: KeyObject;
  keyId: string;
  publicKeyPem: string;
  /** Where it came from, for the operator; never the key itself. */
  source: 'setting' | 'development key file' | 'ephemeral test key';
  /** Keys that sealed earlier decisions; they verify, they no longer sign. */
  retired: PublicKeyEntry[];
};

function entryOf(publicKey: KeyObject): PublicKeyEntry {
  return { keyId: keyIdOf(publicKey), publicKey, publicKeyPem: publicKey.export({ type: 'spki', format: 'pem' }).toString() };
}

function retiredKeys(text: string | undefined, currentKeyId: string): PublicKeyEntry[] {
  if (!text) return [];
  let keys: KeyObject[];
  try {
    keys = parsePublicKeys(text);
  } catch (error) {
    if (error instanceof SigningKeyError) throw new SigningKeyError(`DECISION_RETIRED_PUBLIC_KEYS ${error.message}`);
    throw error;
  }
  const seen = new Set([currentKeyId]);
  return keys.map(entryOf).filter((entry) => !seen.has(entry.keyId) && seen.add(entry.keyId));
}

/** The key that verifies a decision sealed under `keyId`: the current one or a retired one. */
export function verificationKey(key: SigningKey, keyId: string): PublicKeyEntry | null {
  if (keyId === key.keyId) return { keyId: key.keyId, publicKey: key.publicKey, publicKeyPem: key.publicKeyPem };
  return key.retired.find((entry) => entry.keyId === keyId) ?? null;
}

/** Where a development or demo server keeps the key it made for itself (the data folder is not committed). */
export function developmentKeyFile(): string {
  return path.join(process.cwd(), 'data', 'decision-signing-key.pem');
}

function fromPrivateKey(privateKey: KeyObject, source: SigningKey['source'], retiredText?: string): SigningKey {
  const { keyId, publicKey, publicKeyPem } = entryOf(publicKeyOf(privateKey));
  return { privateKey, publicKey, keyId, publicKeyPem, source, retired: retiredKeys(retiredText, keyId) };
}

function newPrivateKeyPem(): string {
  return generateKeyPairSync('ed25519').privateKey.export({ type: 'pkcs8', format: 'pem' }).toString();
}

/**
 * Reads the development key, or makes it on first start. Written to a temporary file and linked into
 * place, so two processes starting at once agree on one key instead of overwriting each other's.
 */
export function readOrCreateKeyFile(file: string): KeyObject {
  if (!fs.existsSync(file)) {
    fs.mkdirSync(path.dirname(file), { recursive: true });
    const temporary = `${file}.${process.pid}.${Date.now()}.tmp`;
    fs.writeFileSync(temporary, newPrivateKeyPem(), { mode: 0o600, flag: 'wx' });
    try {
      fs.linkSync(temporary, file);
    } catch (error) {
      if ((error as NodeJS.ErrnoException).code !== 'EEXIST') throw error;
    } finally {
      fs.unlinkSync(temporary);
    }
  }
  try {
    return parsePrivateKey(fs.readFileSync(file, 'utf8'));
  } catch (error) {
    if (error instanceof SigningKeyError) throw new SigningKeyError(`The development signing key in ${path.relative(process.cwd(), file)} ${error.message}; delete it to have a new one made.`);
    throw error;
  }
}

/**
 * The key that seals decisions. Production must name one (DECISION_SIGNING_KEY); development and demo
 * make one under data/ on first start and keep it, so letters stay verifiable across restarts; tests
 * use a key of their own process.
 */
export function loadSigningKey(settings: Pick<Env, 'APP_ENV' | 'DECISION_SIGNING_KEY'> & Partial<Pick<Env, 'DECISION_RETIRED_PUBLIC_KEYS'>>, keyFile: string = developmentKeyFile()): SigningKey {
  const retired = settings.DECISION_RETIRED_PUBLIC_KEYS;
  if (settings.DECISION_SIGNING_KEY) {
    let privateKey: KeyObject;
    try {
      privateKey = parsePrivateKey(settings.DECISION_SIGNING_KEY);
    } catch (error) {
      if (error instanceof SigningKeyError) throw new SigningKeyError(`DECISION_SIGNING_KEY ${error.message}`);
      throw error;
    }
    return fromPrivateKey(privateKey, 'setting', retired);
  }
  if (settings.APP_ENV === 'production') {
    throw new SigningKeyError('DECISION_SIGNING_KEY must be set in production: an Ed25519 private key as PKCS#8 PEM or base64 DER (openssl genpkey -algorithm ed25519).');
  }
  if (settings.APP_ENV === 'test') return fromPrivateKey(generateKeyPairSync('ed25519').privateKey, 'ephemeral test key', retired);
  return fromPrivateKey(readOrCreateKeyFile(keyFile), 'development key file', retired);
}

const globalForKey = globalThis as unknown as { __countersampleSigningKey?: SigningKey };

/** The signing key of this process, loaded once. */
export function signingKey(): SigningKey {
  globalForKey.__countersampleSigningKey ??= loadSigningKey(env());
  return globalForKey.__countersampleSigningKey;
}
