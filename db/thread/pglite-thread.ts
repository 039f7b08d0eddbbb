// The entry of the database thread: the embedded database lives here, so its WebAssembly and the
// decoding of its answers run on a core of their own while the request thread renders pages.
import { parentPort, workerData } from 'node:worker_threads';
import type { PGlite, Transaction } from '@electric-sql/pglite';
import { DrizzlePGlite } from '../drizzle-pglite';
import type { Reply, Request, ThreadError, ThreadInit } from './protocol';

const { dataDir, sharedBuffers } = workerData as ThreadInit;
const database = new DrizzlePGlite(dataDir, { sharedBuffers });
const opened = database.waitReady.then(() => database);

type OpenTransaction = { tx: Transaction; finish: (commit: boolean) => void; done: Promise<void> };
// By the request thread's number, from the moment it asked: a statement may arrive before the lock is taken.
const transactions = new Map<number, Promise<OpenTransaction>>();

function asThreadError(error: unknown): ThreadError {
  if (!(error instanceof Error)) return { name: 'Error', message: String(error), fields: {} };
  const fields: Record<string, unknown> = {};
  for (const [key, value] of Object.entries(error)) if (value === null || ['string', 'number', 'boolean'].includes(typeof value)) fields[key] = value;
  return { name: error.name, message: error.message, fields };
}

async function openTransaction(tx: number): Promise<OpenTransaction> {
  const open = await transactions.get(tx);
  if (!open) throw new Error(`Transaction ${tx} is not open on the database thread.`);
  return open;
}

async function target(db: PGlite, tx: number | null): Promise<PGlite | Transaction> {
  return tx === null ? db : (await openTransaction(tx)).tx;
}

/**
 * Opens a transaction that stays open across messages: PGlite runs the callback under its
 * transaction lock, and the callback waits until the request thread says commit or rollback. The
 * request thread numbers it and sends its first statement without waiting for the start, which
 * waits here instead.
 */
function begin(db: PGlite, id: number): Promise<void> {
  const started = new Promise<OpenTransaction>((resolve, failedToStart) => {
    const done: Promise<void> = db
      .transaction(async (tx) => {
        const decided = new Promise<boolean>((finish) => resolve({ tx, finish, done }));
        if (!(await decided)) await tx.rollback();
      })
      .finally(() => transactions.delete(id));
    done.catch(failedToStart);
  });
  transactions.set(id, started);
  return started.then(() => undefined);
}

async function finish(tx: number, commit: boolean): Promise<void> {
  const open = await openTransaction(tx);
  open.finish(commit);
  await open.done;
}

async function handle(request: Request): Promise<unknown> {
  const db = await opened;
  switch (request.op) {
    case 'query':
      return (await target(db, request.tx)).query(request.sql, request.params as unknown[], request.options);
    case 'exec':
      return (await target(db, request.tx)).exec(request.sql);
    case 'begin':
      return begin(db, request.tx);
    case 'commit':
    case 'rollback':
      return finish(request.tx, request.op === 'commit');
    case 'dump': {
      const blob = await db.dumpDataDir(request.compression);
      return new Uint8Array(await blob.arrayBuffer());
    }
    case 'close':
      await db.close();
      return null;
  }
}

parentPort!.on('message', (request: Request) => {
  handle(request).then(
    (value) => {
      const reply: Reply = { id: request.id, ok: true, value };
      parentPort!.postMessage(reply, value instanceof Uint8Array ? [value.buffer as ArrayBuffer] : []);
    },
    (error: unknown) => parentPort!.postMessage({ id: request.id, ok: false, error: asThreadError(error) } satisfies Reply),
  );
});
