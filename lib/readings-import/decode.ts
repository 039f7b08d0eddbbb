import { MAX_FILE_BYTES } from './layout';

export type Decoded = { ok: true; text: string; hadBom: boolean } | { ok: false; message: string };

const kB = (bytes: number) => `${Math.ceil(bytes / 1024)} kB`;

/**
 * The file's bytes as text. A CSV of readings is UTF-8 (a byte-order mark is allowed and dropped);
 * anything with NUL bytes is a binary file, such as a spreadsheet or an instrument's own format.
 */
export function decodeCsvBytes(bytes: Uint8Array): Decoded {
  if (bytes.byteLength === 0) return { ok: false, message: 'The file is empty.' };
  if (bytes.byteLength > MAX_FILE_BYTES) {
    return { ok: false, message: `The file is ${kB(bytes.byteLength)}; a readings file is at most ${kB(MAX_FILE_BYTES)}. Export only the readings of this one sample.` };
  }
  if (bytes.includes(0)) {
    return { ok: false, message: 'This is not a text file (it holds binary data). Save the readings as CSV (comma- or semicolon-separated text) and choose that file.' };
  }
  let text: string;
  try {
    text = new TextDecoder('utf-8', { fatal: true, ignoreBOM: true }).decode(bytes);
  } catch {
    return { ok: false, message: 'The file is not UTF-8 text. Save it again as “CSV UTF-8” and choose it once more.' };
  }
  const hadBom = text.charCodeAt(0) === 0xfeff;
  if (hadBom) text = text.slice(1);
  // Control characters other than tab and line breaks do not occur in a text export.
  if (/[\u0001-\u0008\u000b\u000c\u000e-\u001f]/.test(text)) {
    return { ok: false, message: 'This is not a text file (it holds control characters). Save the readings as CSV and choose that file.' };
  }
  if (text.trim() === '') return { ok: false, message: 'The file holds no readings: it is blank.' };
  return { ok: true, text, hadBom };
}
