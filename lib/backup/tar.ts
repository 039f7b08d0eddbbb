import type { Writable } from 'node:stream';

// A minimal ustar writer and streaming reader: regular files only, which is all a backup holds.
// No dependency, so the archive format stays ours to read in ten years.

const BLOCK = 512;
const zeroBlock = Buffer.alloc(BLOCK);

function octal(value: number, width: number): string {
  return value.toString(8).padStart(width - 1, '0') + '\0';
}

/** Splits a path into ustar's 155-byte prefix and 100-byte name, or refuses it. */
function splitName(entryName: string): { name: string; prefix: string } {
  if (Buffer.byteLength(entryName) <= 100) return { name: entryName, prefix: '' };
  for (let cut = entryName.indexOf('/'); cut > 0; cut = entryName.indexOf('/', cut + 1)) {
    const prefix = entryName.slice(0, cut);
    const name = entryName.slice(cut + 1);
    if (Buffer.byteLength(prefix) <= 155 && Buffer.byteLength(name) <= 100) return { name, prefix };
  }
  throw new Error(`The path ${entryName} is too long for the archive (at most 100 bytes after a folder of 155).`);
}

export function tarHeader(entryName: string, sizeBytes: number, mtime: Date): Buffer {
  const header = Buffer.alloc(BLOCK);
  const { name, prefix } = splitName(entryName);
  header.write(name, 0, 100, 'utf8');
  header.write(octal(0o644, 8), 100, 'ascii');
  header.write(octal(0, 8), 108, 'ascii');
  header.write(octal(0, 8), 116, 'ascii');
  header.write(octal(sizeBytes, 12), 124, 'ascii');
  header.write(octal(Math.floor(mtime.getTime() / 1000), 12), 136, 'ascii');
  header.write('        ', 148, 'ascii');
  header.write('0', 156, 'ascii');
  header.write('ustar\0', 257, 'ascii');
  header.write('00', 263, 'ascii');
  header.write(prefix, 345, 155, 'utf8');
  let sum = 0;
  for (const byte of header) sum += byte;
  header.write(octal(sum, 7) + ' ', 148, 'ascii');
  return header;
}

export function tarPadding(sizeBytes: number): Buffer {
  const rest = sizeBytes % BLOCK;
  return rest === 0 ? Buffer.alloc(0) : Buffer.alloc(BLOCK - rest);
}

export const tarEnd = Buffer.alloc(BLOCK * 2);

/** Writes to a stream and waits when it asks us to, so a large file never sits in memory. */
export function writeChunk(out: Writable, chunk: Buffer): Promise<void> {
  return new Promise((resolve, reject) => {
    const onError = (error: Error) => reject(error);
    out.once('error', onError);
    const flushed = out.write(chunk, (error) => {
      if (error) reject(error);
    });
    const done = () => {
      out.off('error', onError);
      resolve();
    };
    if (flushed) done();
    else out.once('drain', done);
  });
}

/** Reads exact byte counts from a stream of chunks. */
class ByteReader {
  private buffered: Buffer[] = [];
  private length = 0;
  private done = false;
  constructor(private readonly source: AsyncIterator<Buffer>) {}

  private async fill(n: number): Promise<void> {
    while (this.length < n && !this.done) {
      const next = await this.pull();
      if (next.done) this.done = true;
      else {
        const chunk = Buffer.isBuffer(next.value) ? next.value : Buffer.from(next.value);
        this.buffered.push(chunk);
        this.length += chunk.length;
      }
    }
  }

  private take(n: number): Buffer {
    const all = this.buffered.length === 1 ? this.buffered[0] : Buffer.concat(this.buffered);
    const out = all.subarray(0, n);
    const rest = all.subarray(n);
    this.buffered = rest.length ? [rest] : [];
    this.length = rest.length;
    return out;
  }

  /** Exactly n bytes, or null at a clean end; a short read is a truncated archive. */
  async exact(n: number): Promise<Buffer | null> {
    await this.fill(n);
    if (this.length === 0 && this.done) return null;
    if (this.length < n) throw new Error('The archive ends in the middle of an entry: it is truncated.');
    return this.take(n);
  }

  /** The source's next chunk; its failure (a bad gzip stream, a read error) names the archive. */
  private async pull(): Promise<IteratorResult<Buffer>> {
    try {
      return await this.source.next();
    } catch (error) {
      throw new Error(`The archive cannot be read: ${(error as Error).message}.`);
    }
  }

  /** Reads to the end, so a compressed source gets to check its trailer. */
  async drain(): Promise<void> {
    for (;;) {
      const next = await this.pull();
      if (next.done) break;
    }
    this.done = true;
    this.buffered = [];
    this.length = 0;
  }

  /** n bytes as a sequence of chunks, for entries too large to hold at once. */
  async *chunks(n: number): AsyncGenerator<Buffer> {
    let left = n;
    while (left > 0) {
      await this.fill(1);
      if (this.length === 0) throw new Error('The archive ends in the middle of an entry: it is truncated.');
      const piece = this.take(Math.min(left, this.length));
      left -= piece.length;
      yield piece;
    }
  }
}

function readOctal(field: Buffer): number {
  const text = field.toString('ascii').replace(/\0.*$/s, '').trim();
  if (!/^[0-7]+$/.test(text)) throw new Error('The archive has a damaged entry header.');
  return parseInt(text, 8);
}

function headerChecksumHolds(header: Buffer): boolean {
  const stored = readOctal(header.subarray(148, 156));
  let sum = 0;
  for (let i = 0; i < BLOCK; i++) sum += i >= 148 && i < 156 ? 0x20 : header[i];
  return sum === stored;
}

export type TarEntry = { name: string; sizeBytes: number; body: AsyncGenerator<Buffer> };

/**
 * The entries of a tar stream in order; read an entry's body before asking for the next (what is
 * left unread is skipped). Anything but a regular file is refused: a backup holds nothing else.
 */
export async function* readTar(source: AsyncIterable<Buffer>): AsyncGenerator<TarEntry> {
  const reader = new ByteReader(source[Symbol.asyncIterator]());
  for (;;) {
    const header = await reader.exact(BLOCK);
    if (!header) throw new Error('The archive ends without its end marker: it is truncated.');
    if (header.equals(zeroBlock)) {
      await reader.drain();
      return;
    }
    if (!headerChecksumHolds(header)) throw new Error('The archive has a damaged entry header.');
    const type = String.fromCharCode(header[156]);
    if (type !== '0' && type !== '\0') throw new Error('The archive holds something other than plain files.');
    const name = header.subarray(0, 100).toString('utf8').replace(/\0.*$/s, '');
    const prefix = header.subarray(345, 500).toString('utf8').replace(/\0.*$/s, '');
    const sizeBytes = readOctal(header.subarray(124, 136));
    const fullName = prefix ? `${prefix}/${name}` : name;
    let consumed = 0;
    const body = (async function* () {
      for await (const piece of reader.chunks(sizeBytes)) {
        consumed += piece.length;
        yield piece;
      }
    })();
    yield { name: fullName, sizeBytes, body };
    // Whatever the caller left unread is skipped, so the next header is found where it is.
    for await (const piece of reader.chunks(sizeBytes - consumed)) void piece;
    const padding = tarPadding(sizeBytes).length;
    if (padding && !(await reader.exact(padding))) throw new Error('The archive ends in the middle of an entry: it is truncated.');
  }
}
