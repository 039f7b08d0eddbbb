// Stored files: one file of bytes per key under `files/`, never overwritten, and an append-only
// JSONL index whose writes go through one queue, so parallel uploads cannot interleave or lose lines.
// One process per folder: opening tidies up after a crash, which would disturb a running owner.
import { randomUUID } from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';

export type Acl = 'public-read' | 'private';
export type ContentDisposition = 'inline' | 'attachment';

export type StoredFile = {
  id: string;
  key: string;
  name: string;
  size: number;
  type: string;
  customId: string | null;
  acl: Acl;
  contentDisposition: ContentDisposition;
  /** MD5 hex of the bytes, as the service reports `fileHash`. */
  fileHash: string;
  uploadedAtMs: number;
  slug: string | null;
};

type IndexRecord =
  | { op: 'put'; file: StoredFile }
  | { op: 'update'; key: string; name?: string; acl?: Acl }
  | { op: 'delete'; key: string };

/** Keys are what the SDK generates (sqids over an alphanumeric alphabet); nothing else may name a stored file. */
export const FILE_KEY_PATTERN = /^[A-Za-z0-9]{8,128}$/;

export function isValidFileKey(key: string): boolean {
  return FILE_KEY_PATTERN.test(key);
}

export class StoreConflict extends Error {}

export class FileStore {
  private readonly files = new Map<string, StoredFile>();
  /** Keys once used stay used: a replayed URL must not bring a deleted file back. */
  private readonly retired = new Set<string>();
  private readonly reserved = new Set<string>();
  private queue: Promise<void> = Promise.resolve();

  private constructor(
    private readonly filesDir: string,
    private readonly incomingDir: string,
    private readonly indexFile: string,
  ) {}

  static async open(storageDir: string): Promise<FileStore> {
    const store = new FileStore(path.join(storageDir, 'files'), path.join(storageDir, 'incoming'), path.join(storageDir, 'index.jsonl'));
    await fs.promises.mkdir(store.filesDir, { recursive: true });
    // Whatever is in `incoming/` belongs to an upload that never finished.
    await fs.promises.rm(store.incomingDir, { recursive: true, force: true });
    await fs.promises.mkdir(store.incomingDir, { recursive: true });
    await store.load();
    return store;
  }

  private async load(): Promise<void> {
    let text = '';
    try {
      text = await fs.promises.readFile(this.indexFile, 'utf8');
    } catch (error) {
      if ((error as NodeJS.ErrnoException).code !== 'ENOENT') throw error;
    }
    let records = 0;
    for (const line of text.split('\n')) {
      if (!line.trim()) continue;
      let record: IndexRecord;
      try {
        record = JSON.parse(line) as IndexRecord;
      } catch {
        // A line torn by a crash mid-append: the upload it belonged to never answered success.
        continue;
      }
      records += 1;
      this.apply(record);
    }
    // Bytes without an index line (a crash between the two) are not a stored file.
    for (const name of await fs.promises.readdir(this.filesDir)) {
      if (!this.files.has(name)) await fs.promises.rm(path.join(this.filesDir, name), { force: true });
    }
    for (const [key, file] of this.files) {
      if (!fs.existsSync(path.join(this.filesDir, key))) {
        this.files.delete(key);
        this.retired.add(file.key);
      }
    }
    if (records > this.files.size) await this.compact();
  }

  private apply(record: IndexRecord): void {
    if (record.op === 'put') {
      this.files.set(record.file.key, record.file);
      this.retired.add(record.file.key);
    } else if (record.op === 'update') {
      const file = this.files.get(record.key);
      if (file) this.files.set(record.key, { ...file, ...(record.name ? { name: record.name } : {}), ...(record.acl ? { acl: record.acl } : {}) });
    } else if (record.op === 'delete') {
      this.files.delete(record.key);
    }
  }

  /** Rewrites the index as one `put` per live file; the rename makes it all-or-nothing. */
  private async compact(): Promise<void> {
    const temp = `${this.indexFile}.${randomUUID()}.tmp`;
    const lines = [...this.files.values()].map((file) => JSON.stringify({ op: 'put', file } satisfies IndexRecord));
    await fs.promises.writeFile(temp, lines.length ? `${lines.join('\n')}\n` : '');
    await fs.promises.rename(temp, this.indexFile);
  }

  private append(record: IndexRecord): Promise<void> {
    const write = this.queue.then(() => fs.promises.appendFile(this.indexFile, `${JSON.stringify(record)}\n`));
    // The queue continues after a failed write; the caller still sees the failure.
    this.queue = write.catch(() => undefined);
    return write.then(() => this.apply(record));
  }

  get(key: string): StoredFile | undefined {
    return this.files.get(key);
  }

  byCustomId(customId: string): StoredFile | undefined {
    for (const file of this.files.values()) if (file.customId === customId) return file;
    return undefined;
  }

  list(): StoredFile[] {
    return [...this.files.values()].sort((a, b) => a.uploadedAtMs - b.uploadedAtMs || a.key.localeCompare(b.key));
  }

  bytesPath(key: string): string {
    if (!isValidFileKey(key)) throw new Error(`Invalid file key ${JSON.stringify(key)}`);
    return path.join(this.filesDir, key);
  }

  /** Claims a key for one upload at a time; false when it is stored, retired or being uploaded. */
  reserve(key: string, customId: string | null): boolean {
    if (!isValidFileKey(key) || this.retired.has(key) || this.reserved.has(key)) return false;
    if (customId !== null && this.byCustomId(customId)) return false;
    this.reserved.add(key);
    return true;
  }

  release(key: string): void {
    this.reserved.delete(key);
  }

  /** Stores the bytes of a reserved key, then its index line; on any failure nothing is left behind. */
  async commit(entry: Omit<StoredFile, 'id' | 'uploadedAtMs'>, bytes: Uint8Array): Promise<StoredFile> {
    if (!this.reserved.has(entry.key)) throw new Error(`Key ${entry.key} was not reserved`);
    const file: StoredFile = { ...entry, id: randomUUID(), uploadedAtMs: Date.now() };
    const temp = path.join(this.incomingDir, `${entry.key}.${randomUUID()}`);
    const final = this.bytesPath(entry.key);
    let linked = false;
    try {
      const handle = await fs.promises.open(temp, 'wx');
      try {
        await handle.writeFile(bytes);
        await handle.sync();
      } finally {
        await handle.close();
      }
      try {
        // link() refuses an existing name, so a stored file is never replaced.
        await fs.promises.link(temp, final);
      } catch (error) {
        if ((error as NodeJS.ErrnoException).code === 'EEXIST') throw new StoreConflict(`A file with key ${entry.key} is already stored`);
        throw error;
      }
      linked = true;
      await this.append({ op: 'put', file });
      return file;
    } catch (error) {
      if (linked) await fs.promises.rm(final, { force: true });
      throw error;
    } finally {
      await fs.promises.rm(temp, { force: true });
    }
  }

  async update(key: string, changes: { name?: string; acl?: Acl }): Promise<void> {
    if (!this.files.has(key)) throw new Error(`No stored file ${key}`);
    await this.append({ op: 'update', key, ...changes });
  }

  /** Removes the files and returns how many there were. */
  async delete(keys: string[]): Promise<number> {
    let deleted = 0;
    for (const key of new Set(keys)) {
      if (!this.files.has(key)) continue;
      // Gone at once, so a second delete running alongside does not count it again.
      this.files.delete(key);
      await this.append({ op: 'delete', key });
      await fs.promises.rm(this.bytesPath(key), { force: true });
      deleted += 1;
    }
    return deleted;
  }

  /** Waits for queued index writes. */
  async flush(): Promise<void> {
    await this.queue;
  }
}
