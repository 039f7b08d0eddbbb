import { createHash } from 'node:crypto';
import sharp from 'sharp';
import { beforeAll, describe, expect, it } from 'vitest';
import { verifyEvidence, type Verification } from '@/lib/evidence/verify';
import { maxBytesOf } from '@/lib/evidence/kinds';
import { goodCsv, minimalPdf, sampleImage } from './samples';

let png: Buffer;
let jpeg: Buffer;
let webp: Buffer;

beforeAll(async () => {
  [png, jpeg, webp] = await Promise.all([sampleImage('png'), sampleImage('jpeg'), sampleImage('webp')]);
});

function expectRefused(result: Verification, pattern: RegExp): void {
  expect(result.ok).toBe(false);
  if (!result.ok) expect(result.reason).toMatch(pattern);
}

function expectAccepted(result: Verification) {
  if (!result.ok) throw new Error(`refused: ${result.reason}`);
  return result.file;
}

const sha256 = (bytes: Uint8Array) => createHash('sha256').update(bytes).digest('hex');

describe('evidence accepted by content', () => {
  it('takes a minimal PDF as a lab sheet, with the SHA-256 of its bytes', async () => {
    const pdf = minimalPdf();
    const file = expectAccepted(await verifyEvidence({ kind: 'lab_sheet', fileName: 'retest-sheet.pdf', bytes: pdf }));
    expect(file).toMatchObject({ fileName: 'retest-sheet.pdf', contentType: 'application/pdf', sizeBytes: pdf.length, image: null });
    expect(file.sha256).toBe(sha256(pdf));
    expect(file.sha256).toMatch(/^[0-9a-f]{64}$/);
  });

  it('takes a PNG, a JPEG and a WebP made by an image encoder as photos, and reads their size', async () => {
    for (const [bytes, name, type] of [
      [png, 'seal.png', 'image/png'],
      [jpeg, 'seal.JPG', 'image/jpeg'],
      [webp, 'cool-box.webp', 'image/webp'],
    ] as const) {
      const file = expectAccepted(await verifyEvidence({ kind: 'photo', fileName: name, bytes }));
      expect(file.contentType).toBe(type);
      expect(file.image).toEqual({ width: 640, height: 480 });
      expect(file.sha256).toBe(sha256(bytes));
    }
  });

  it('takes a UTF-8 CSV with no magic bytes as a lab sheet, BOM and accents included', async () => {
    expectAccepted(await verifyEvidence({ kind: 'lab_sheet', fileName: 'readings.csv', bytes: goodCsv }));
    const withBom = Buffer.concat([Buffer.from([0xef, 0xbb, 0xbf]), Buffer.from('échantillon;mesure\nR-1;-0,5123\n', 'utf8')]);
    expect(expectAccepted(await verifyEvidence({ kind: 'lab_sheet', fileName: 'relevés.csv', bytes: withBom })).contentType).toBe('text/csv');
  });

  it('takes plain text as correspondence', async () => {
    const letter = Buffer.from('Dear board,\nthe cool box arrived at 09:40 with its seal intact.\n', 'utf8');
    expect(expectAccepted(await verifyEvidence({ kind: 'correspondence', fileName: 'letter.txt', bytes: letter })).contentType).toBe('text/plain');
  });
});

describe('evidence refused', () => {
  it('refuses an empty file', async () => {
    expectRefused(await verifyEvidence({ kind: 'lab_sheet', fileName: 'empty.pdf', bytes: new Uint8Array(0) }), /empty/);
  });

  it('refuses a file over its kind’s limit, before looking at the content', async () => {
    const limit = maxBytesOf('photo');
    const oversized = Buffer.concat([jpeg, Buffer.alloc(limit - jpeg.length + 1)]);
    expect(oversized.length).toBe(limit + 1);
    expectRefused(await verifyEvidence({ kind: 'photo', fileName: 'big.jpg', bytes: oversized }), /over the limit of 8 MiB/);
  });

  it('refuses wrong magic bytes: a “PDF” that is a Windows program', async () => {
    const exe = Buffer.concat([Buffer.from('MZ'), Buffer.alloc(200, 0x90)]);
    expectRefused(await verifyEvidence({ kind: 'lab_sheet', fileName: 'sheet.pdf', bytes: exe }), /content of the file is EXE/);
  });

  it('refuses a “PDF” whose first bytes are not a PDF’s at all', async () => {
    expectRefused(await verifyEvidence({ kind: 'lab_sheet', fileName: 'sheet.pdf', bytes: Buffer.from('just some words that are no PDF', 'utf8') }), /not PDF/);
  });

  it('refuses a polyglot by name: PNG content named .pdf', async () => {
    expectRefused(await verifyEvidence({ kind: 'lab_sheet', fileName: 'sheet.pdf', bytes: png }), /named \.pdf but its content is PNG/);
  });

  it('refuses a PDF that carries an HTML page and a script in its header', async () => {
    const pdf = minimalPdf('<html><body><script>alert(document.cookie)</script></body></html>\n');
    expectRefused(await verifyEvidence({ kind: 'lab_sheet', fileName: 'sheet.pdf', bytes: pdf }), /web page or script markup/);
  });

  it('refuses a PDF with a JavaScript action, also when the name is hidden behind #xx escapes', async () => {
    const plain = minimalPdf('5 0 obj\n<< /S /JavaScript /JS (app.alert(1)) >>\nendobj\n');
    expectRefused(await verifyEvidence({ kind: 'lab_sheet', fileName: 'a.pdf', bytes: plain }), /scripts, embedded files or launch actions/);
    const escaped = minimalPdf('5 0 obj\n<< /S /J#61vaScript /J#53 (app.alert(1)) >>\nendobj\n');
    expectRefused(await verifyEvidence({ kind: 'lab_sheet', fileName: 'b.pdf', bytes: escaped }), /scripts, embedded files or launch actions/);
  });

  it('refuses a PDF with a second file appended after its end, and a PDF with no end at all', async () => {
    const appended = Buffer.concat([minimalPdf(), Buffer.from('PK\u0003\u0004 hidden archive', 'latin1')]);
    expectRefused(await verifyEvidence({ kind: 'lab_sheet', fileName: 'a.pdf', bytes: appended }), /appended after its end/);
    const truncated = minimalPdf().subarray(0, 200);
    expectRefused(await verifyEvidence({ kind: 'lab_sheet', fileName: 'b.pdf', bytes: truncated }), /no end-of-file marker/);
  });

  it('refuses a PNG with data after its IEND chunk', async () => {
    expectRefused(await verifyEvidence({ kind: 'photo', fileName: 'seal.png', bytes: Buffer.concat([png, Buffer.from('<?php echo 1; ?>')]) }), /appended after its end/);
  });

  it('refuses a JPEG whose header is right but whose image is cut short', async () => {
    expectRefused(await verifyEvidence({ kind: 'photo', fileName: 'seal.jpg', bytes: jpeg.subarray(0, 400) }), /cannot be read/);
  });

  it('refuses a CSV with NUL bytes', async () => {
    const withNul = Buffer.concat([goodCsv, Buffer.from([0x00, 0x41, 0x42])]);
    expectRefused(await verifyEvidence({ kind: 'lab_sheet', fileName: 'readings.csv', bytes: withNul }), /NUL bytes/);
  });

  it('refuses a CSV that is not valid UTF-8', async () => {
    const latin1 = Buffer.from('échantillon;mesure\n', 'latin1');
    expectRefused(await verifyEvidence({ kind: 'lab_sheet', fileName: 'readings.csv', bytes: latin1 }), /not valid UTF-8/);
  });

  it('refuses a “CSV” that is an HTML page', async () => {
    const page = Buffer.from('<!DOCTYPE html><html><script>fetch("/api")</script></html>', 'utf8');
    expectRefused(await verifyEvidence({ kind: 'lab_sheet', fileName: 'readings.csv', bytes: page }), /markup/);
  });

  it('refuses a type the kind does not take: a CSV as a photo, a PDF as a photo', async () => {
    expectRefused(await verifyEvidence({ kind: 'photo', fileName: 'readings.csv', bytes: goodCsv }), /not accepted as photo; accepted: JPEG, PNG or WebP/);
    expectRefused(await verifyEvidence({ kind: 'photo', fileName: 'sheet.pdf', bytes: minimalPdf() }), /not accepted as photo/);
  });

  it('refuses a name with a folder path (path traversal) and one without an extension', async () => {
    expectRefused(await verifyEvidence({ kind: 'lab_sheet', fileName: '../../etc/passwd.pdf', bytes: minimalPdf() }), /folder path/);
    expectRefused(await verifyEvidence({ kind: 'lab_sheet', fileName: 'C:\\reports\\sheet.pdf', bytes: minimalPdf() }), /folder path/);
    expectRefused(await verifyEvidence({ kind: 'lab_sheet', fileName: 'sheet', bytes: minimalPdf() }), /no extension/);
  });

  it('refuses an image above 50 megapixels, even when the file is small', async () => {
    // Mostly one colour, so it compresses to little; decoded it would be about 200 MB.
    const huge = await sharp({ create: { width: 8000, height: 8000, channels: 3, background: { r: 200, g: 200, b: 200 } } }).png({ compressionLevel: 9 }).toBuffer();
    expect(huge.length).toBeLessThan(maxBytesOf('photo'));
    expectRefused(await verifyEvidence({ kind: 'photo', fileName: 'huge.png', bytes: huge }), /more than 50 megapixels/);
  });
});
