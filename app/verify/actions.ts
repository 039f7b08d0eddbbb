'use server';

import { headers } from 'next/headers';
import { getDb } from '@/db/client';
import { letterCheckAllowed, tooManyLetterChecks } from '@/lib/throttle/letter-checks';
import { publicVerification } from '@/lib/dal/decision-verify';
import { sha256Hex } from '@/lib/canonical-json';
import { embeddedRecordHash, MAX_LETTER_BYTES } from '@/lib/decision/letter/marker';
import type { LetterCheck } from '@/components/decision/verification-result';

export type LetterCheckState = { ok: true; check: LetterCheck } | { ok: false; message: string } | null;

const hex64 = /^[0-9a-f]{64}$/;

/**
 * Checks a letter file. The browser normally hashes the file itself and sends only the hashes, so
 * the letter never leaves the reader's machine; without Web Crypto it sends the file, which is hashed
 * here and not kept.
 */
export async function checkLetter(formData: FormData): Promise<LetterCheckState> {
  try {
    if (!(await letterCheckAllowed(await headers()))) return { ok: false, message: tooManyLetterChecks };
    let fileSha256 = String(formData.get('fileSha256') ?? '').toLowerCase();
    let embedded = String(formData.get('embeddedRecordSha256') ?? '').toLowerCase() || null;
    const file = formData.get('file');
    if (!hex64.test(fileSha256)) {
      if (!(file instanceof File) || file.size === 0) return { ok: false, message: 'Choose the letter’s PDF file.' };
      if (file.size > MAX_LETTER_BYTES) return { ok: false, message: 'That file is larger than any decision letter (10 MB at most).' };
      const bytes = Buffer.from(await file.arrayBuffer());
      fileSha256 = sha256Hex(bytes);
      embedded = embeddedRecordHash(bytes);
    }
    if (embedded !== null && !hex64.test(embedded)) embedded = null;
    const db = getDb();
    const byFile = await publicVerification(db, { letterSha256: fileSha256 });
    const byEmbeddedHash = !byFile.found && embedded ? await publicVerification(db, { recordSha256: embedded }) : null;
    return { ok: true, check: { fileSha256, byFile, embeddedRecordSha256: embedded, byEmbeddedHash } };
  } catch (error) {
    console.error('Letter verification failed:', error);
    return { ok: false, message: 'Something went wrong on our side; try again in a moment.' };
  }
}
