// The letter carries its record hash in its metadata, as plain ASCII, so a file that is no longer
// byte-identical to the letter issued can still say which record it claims to be. Pure: it runs in the
// browser on the reader's own file, and on the server.

export const RECORD_MARKER = 'countersample-record-sha256:';
export const MAX_LETTER_BYTES = 10 * 1024 * 1024;

const pattern = new RegExp(`${RECORD_MARKER}([0-9a-f]{64})`);

/** The record hash a PDF names in its metadata, or null. */
export function embeddedRecordHash(bytes: Uint8Array): string | null {
  // Latin-1 maps every byte to one character, so the ASCII marker is found wherever it lies.
  const text = new TextDecoder('latin1').decode(bytes);
  return pattern.exec(text)?.[1] ?? null;
}
