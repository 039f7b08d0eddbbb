import 'server-only';
import fs from 'node:fs';
import path from 'node:path';
import { generateKeyPairSync, type KeyObject } from 'node:crypto';
import { env, type Env } from '@/lib/env';
import { keyIdOf, parsePrivateKey, publicKeyOf, SigningKeyError } from './signature';

export type SigningKey = {
  privateKey: KeyObject;
  publicKey: KeyObject;
  keyId: string;
  publicKeyPem: string;
  /** Where it came from, for the operator; never the key itself. */
  source: 'setting' | 'development key file' | 'ephemeral test key';
};

/** Where a development or demo server keeps the key it made for itself (the data folder is not committed). */
export function developmentKeyFile(): string {
  return path.join(process.cwd(), 'data', 'decision-signing-key.pem');
}

function fromPrivateKey(privateKey: KeyObject, source: SigningKey['source']): SigningKey {
  const publicKey = publicKeyOf(privateKey);
  return { privateKey, publicKey, keyId: keyIdOf(publicKey), publicKeyPem: publicKey.export({ type: 'spki', format: 'pem' }).toString(), source };
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
export function loadSigningKey(settings: Pick<Env, 'APP_ENV' | 'DECISION_SIGNING_KEY'>, keyFile: string = developmentKeyFile()): SigningKey {
  if (settings.DECISION_SIGNING_KEY) {
    try {
      return fromPrivateKey(parsePrivateKey(settings.DECISION_SIGNING_KEY), 'setting');
    } catch (error) {
      if (error instanceof SigningKeyError) throw new SigningKeyError(`DECISION_SIGNING_KEY ${error.message}`);
      throw error;
    }
  }
  if (settings.APP_ENV === 'production') {
    throw new SigningKeyError('DECISION_SIGNING_KEY must be set in production: an Ed25519 private key as PKCS#8 PEM or base64 DER (openssl genpkey -algorithm ed25519).');
  }
  if (settings.APP_ENV === 'test') return fromPrivateKey(generateKeyPairSync('ed25519').privateKey, 'ephemeral test key');
  return fromPrivateKey(readOrCreateKeyFile(keyFile), 'development key file');
}

const globalForKey = globalThis as unknown as { __countersampleSigningKey?: SigningKey };

/** The signing key of this process, loaded once. */
export function signingKey(): SigningKey {
  globalForKey.__countersampleSigningKey ??= loadSigningKey(env());
  return globalForKey.__countersampleSigningKey;
}
