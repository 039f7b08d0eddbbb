import fs from 'node:fs';
import path from 'node:path';
import { isValidFileKey } from '@/lib/upload-service/store';

// The upload service keeps each file's bytes under `files/<key>`, never overwritten, and an
// append-only `index.jsonl`; a file is stored only once its index line is written. Reading the
// index first and then copying just the files it lists gives a consistent set while uploads go on:
// a file being uploaded meanwhile is not listed yet, and a listed file's bytes never change.

export const UPLOADS_INDEX = 'index.jsonl';
export const UPLOADS_FILES = 'files';

export type UploadsIndexSnapshot = {
  /** The index as read, cut after its last complete line (a torn line never answered success). */
  indexBytes: Buffer | null;
  /** Live files in index order, with the MD5 the service recorded for each. */
  files: { key: string; md5: string }[];
};

type IndexLine = { op?: unknown; key?: unknown; file?: { key?: unknown; fileHash?: unknown } };

export async function readUploadsIndex(uploadsDir: string): Promise<UploadsIndexSnapshot> {
  let raw: Buffer;
  try {
    raw = await fs.promises.readFile(path.join(uploadsDir, UPLOADS_INDEX));
  } catch (error) {
    if ((error as NodeJS.ErrnoException).code === 'ENOENT') return { indexBytes: null, files: [] };
    throw error;
  }
  const lastNewline = raw.lastIndexOf(0x0a);
  const indexBytes = raw.subarray(0, lastNewline + 1);
  const live = new Map<string, string>();
  for (const line of indexBytes.toString('utf8').split('\n')) {
    if (!line.trim()) continue;
    let record: IndexLine;
    try {
      record = JSON.parse(line) as IndexLine;
    } catch {
      continue;
    }
    if (record.op === 'put' && typeof record.file?.key === 'string' && isValidFileKey(record.file.key)) {
      live.set(record.file.key, typeof record.file.fileHash === 'string' ? record.file.fileHash : '');
    } else if (record.op === 'delete' && typeof record.key === 'string') {
      live.delete(record.key);
    }
  }
  return { indexBytes, files: [...live].map(([key, md5]) => ({ key, md5 })) };
}
