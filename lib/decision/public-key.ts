import 'server-only';
import { SIGNATURE_ALGORITHM, SIGNED_MESSAGE_PREFIX } from './signature';
import { signingKey } from './signing-key';

/** What the well-known address publishes: the public key, its id, and exactly what was signed. */
export function publicSigningKey() {
  const key = signingKey();
  return {
    algorithm: SIGNATURE_ALGORITHM,
    keyId: key.keyId,
    publicKeyPem: key.publicKeyPem,
    publicKeySpkiBase64: key.publicKey.export({ type: 'spki', format: 'der' }).toString('base64'),
    signedMessage: `The UTF-8 bytes of "${SIGNED_MESSAGE_PREFIX}" followed by the record's SHA-256 in lowercase hex, as printed on the decision letter.`,
    signatureEncoding: 'base64',
    // Keys that sealed earlier decisions; a letter names the key id it was signed with.
    retiredKeys: key.retired.map((entry) => ({ keyId: entry.keyId, publicKeyPem: entry.publicKeyPem, publicKeySpkiBase64: entry.publicKey.export({ type: 'spki', format: 'der' }).toString('base64') })),
    recordHash: 'SHA-256 of the RFC 8785 canonical JSON of the sealed case record',
  };
}
