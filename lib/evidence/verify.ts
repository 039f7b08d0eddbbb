import { createHash } from 'node:crypto';
import { fileTypeFromBuffer } from 'file-type';
import sharp from 'sharp';
import { cleanFileName } from './file-name';
import { evidenceTypes, extensionOf, formatBytes, kindRules, maxBytesOf, typeForExtension, typeList, type AttachmentKind, type EvidenceType } from './kinds';

/**
 * Evidence is accepted by what its bytes are, never by what the browser or the file name says.
 * A file passes when all of these hold:
 *
 * 1. its name is clean (see file-name.ts) and its extension is one the kind accepts;
 * 2. it is not empty and not over the kind's size limit;
 * 3. its content is recognised by its magic bytes as a type the kind accepts, and that type is the one
 *    its extension names. A PNG named `.pdf` is refused rather than renamed: a file whose name and
 *    content disagree is either a mistake the uploader should see or a polyglot meant to be read one
 *    way by one program and another way by the next;
 * 4. text (CSV, plain text) has no magic bytes, so it is accepted only when nothing is recognised AND it
 *    is valid UTF-8 AND holds no NUL byte;
 * 5. no polyglot markers: HTML or script tags (a browser that sniffs the content would run them), content after the format's end marker (PDF after its last `%%EOF`, PNG after `IEND`,
 *    WebP past its RIFF length — the usual place to hide a second file), and in PDFs the names of active
 *    content (JavaScript, launch actions, embedded files, rich media). PDF names compressed inside
 *    object streams are not seen by this check; storage serves every file as a download with `nosniff`,
 *    so this is a second line, not the only one;
 * 6. images decode, and are no larger than 50 megapixels (a small file can inflate to gigabytes).
 */
export type VerifiedEvidence = {
  fileName: string;
  contentType: EvidenceType;
  sizeBytes: number;
  sha256: string;
  image: { width: number; height: number } | null;
};

export type Verification = { ok: true; file: VerifiedEvidence } | { ok: false; reason: string };

const MAX_IMAGE_PIXELS = 50_000_000;

// Tags that make a browser treat content as a page; lower case, matched without regard to case.
const markers = (list: string[]) => list.map((m) => Buffer.from(m, 'latin1'));
const MARKUP_MARKERS = markers(['<script', '<html', '<!doctype html', '<iframe', '<svg', '<object', '<embed', '<body', '<head']);
// Compressed image and PDF data is close to random bytes, where a short tag turns up by chance (`<svg` about
// once in 64 photos of 8 MiB). Binary files are searched in full for the long tags only, and for all of
// them in the first 1445 bytes: the most a browser reads when it sniffs content.
const LONG_MARKUP_MARKERS = markers(['<script', '<iframe', '<!doctype']);
const SNIFF_WINDOW_BYTES = 1445;
const PDF_ACTIVE_NAMES = [/\/JavaScript\b/, /\/JS[\s(<[/]/, /\/Launch\b/, /\/EmbeddedFiles?\b/, /\/RichMedia\b/];

const refuse = (reason: string): Verification => ({ ok: false, reason });

export function sha256Hex(bytes: Uint8Array): string {
  return createHash('sha256').update(bytes).digest('hex');
}

function typeLabel(mime: string): string {
  return (evidenceTypes as Record<string, { label: string }>)[mime]?.label ?? mime;
}

function lowerLatin1(bytes: Uint8Array): Buffer {
  // Byte-wise ASCII lower case, so positions and non-ASCII bytes stay as they are.
  const copy = Buffer.from(bytes);
  for (let i = 0; i < copy.length; i++) if (copy[i] >= 0x41 && copy[i] <= 0x5a) copy[i] += 0x20;
  return copy;
}

function markupFound(bytes: Uint8Array, binary: boolean): boolean {
  const lower = lowerLatin1(bytes);
  if (!binary) return MARKUP_MARKERS.some((marker) => lower.includes(marker));
  const head = lower.subarray(0, SNIFF_WINDOW_BYTES);
  return MARKUP_MARKERS.some((marker) => head.includes(marker)) || LONG_MARKUP_MARKERS.some((marker) => lower.includes(marker));
}

function isUtf8(bytes: Uint8Array): boolean {
  try {
    new TextDecoder('utf-8', { fatal: true }).decode(bytes);
    return true;
  } catch {
    return false;
  }
}

/** Why a PDF may not be taken in, or null. */
function pdfProblem(bytes: Uint8Array): string | null {
  const text = Buffer.from(bytes).toString('latin1');
  const end = text.lastIndexOf('%%EOF');
  if (end < 0) return 'The PDF is incomplete: it has no end-of-file marker. Save or export it again.';
  if (text.slice(end + 5).trim() !== '') return 'The PDF has other content appended after its end; save or export it again as a plain PDF.';
  // Names may hide letters as #xx escapes (/J#61vaScript); undo them before looking.
  const names = text.replace(/#([0-9a-fA-F]{2})/g, (_, hex: string) => String.fromCharCode(parseInt(hex, 16)));
  if (PDF_ACTIVE_NAMES.some((pattern) => pattern.test(names))) {
    return 'The PDF contains scripts, embedded files or launch actions, which are not accepted as evidence. Print it to a new PDF and upload that.';
  }
  return null;
}

const PNG_END = Buffer.from([0x00, 0x00, 0x00, 0x00, 0x49, 0x45, 0x4e, 0x44, 0xae, 0x42, 0x60, 0x82]);

function trailingDataProblem(type: EvidenceType, bytes: Uint8Array): string | null {
  const buffer = Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  if (type === 'image/png' && !buffer.subarray(-PNG_END.length).equals(PNG_END)) {
    return 'The PNG image is truncated or has other content appended after its end; save it again.';
  }
  if (type === 'image/webp' && (buffer.length < 12 || buffer.readUInt32LE(4) + 8 !== buffer.length)) {
    return 'The WebP image is truncated or has other content appended after its end; save it again.';
  }
  return null;
}

async function imageProblem(bytes: Uint8Array): Promise<{ problem: string } | { width: number; height: number }> {
  try {
    // The header alone gives the size; the pixel limit applies when the pixels are decoded below.
    const meta = await sharp(bytes, { failOn: 'error', limitInputPixels: false }).metadata();
    if (!meta.width || !meta.height) return { problem: 'The image has no readable size; save it again.' };
    if (meta.width * meta.height > MAX_IMAGE_PIXELS) return { problem: `The image is ${meta.width} × ${meta.height} pixels, more than 50 megapixels; scale it down.` };
    // Decoding every pixel proves the image is whole, not just its header.
    await sharp(bytes, { failOn: 'error', limitInputPixels: MAX_IMAGE_PIXELS }).stats();
    return { width: meta.width, height: meta.height };
  } catch {
    return { problem: 'The image cannot be read; it may be damaged. Save it again and retry.' };
  }
}

export async function verifyEvidence(input: { kind: AttachmentKind; fileName: string; bytes: Uint8Array }): Promise<Verification> {
  const { kind, bytes } = input;
  const rule = kindRules[kind];
  const named = cleanFileName(input.fileName);
  if (!named.ok) return refuse(named.reason);
  const fileName = named.name;

  const extension = extensionOf(fileName);
  const claimed = typeForExtension(kind, extension);
  if (!claimed) {
    return refuse(
      extension
        ? `Files named .${extension} are not accepted as ${rule.label.toLowerCase()}; accepted: ${typeList(kind)}.`
        : `The file name has no extension; a ${rule.label.toLowerCase()} must be ${typeList(kind)}.`,
    );
  }

  if (bytes.byteLength === 0) return refuse('The file is empty.');
  const limit = maxBytesOf(kind);
  if (bytes.byteLength > limit) return refuse(`The file is ${formatBytes(bytes.byteLength)}, over the limit of ${formatBytes(limit)} for a ${rule.label.toLowerCase()}.`);

  const detected = await fileTypeFromBuffer(bytes);
  if (detected) {
    if (!(rule.types as readonly string[]).includes(detected.mime)) {
      return refuse(`The content of the file is ${detected.ext.toUpperCase()} (${detected.mime}), which is not accepted as ${rule.label.toLowerCase()}; accepted: ${typeList(kind)}.`);
    }
    if (detected.mime !== claimed) {
      return refuse(`The file is named .${extension} but its content is ${typeLabel(detected.mime)}. Rename it or choose the right file.`);
    }
  } else if (claimed.startsWith('text/')) {
    if (bytes.includes(0)) return refuse(`The file is named .${extension} but holds binary data (NUL bytes), so it is not text.`);
    if (!isUtf8(bytes)) return refuse(`The file is named .${extension} but is not valid UTF-8 text. Save it again as UTF-8.`);
  } else {
    return refuse(`The file is named .${extension} but its content is not ${typeLabel(claimed)}: its first bytes are not those of a ${typeLabel(claimed)} file.`);
  }

  const isText = claimed === 'text/csv' || claimed === 'text/plain';
  if (markupFound(bytes, !isText)) return refuse('The file contains web page or script markup, which is not accepted in evidence.');
  const trailing = trailingDataProblem(claimed, bytes);
  if (trailing) return refuse(trailing);
  if (claimed === 'application/pdf') {
    const problem = pdfProblem(bytes);
    if (problem) return refuse(problem);
  }

  let image: VerifiedEvidence['image'] = null;
  if (claimed.startsWith('image/')) {
    const checked = await imageProblem(bytes);
    if ('problem' in checked) return refuse(checked.problem);
    image = checked;
  }

  return { ok: true, file: { fileName, contentType: claimed, sizeBytes: bytes.byteLength, sha256: sha256Hex(bytes), image } };
}
