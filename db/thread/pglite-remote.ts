import { Worker } from 'node:worker_threads';
import type { Results } from '@electric-sql/pglite';
import type { QueryOptions, Reply, Request, ThreadError, ThreadInit } from './protocol';

type Pending = { resolve: (value: unknown) => void; reject: (error: Error) => void };
type DistributiveOmit<T, K extends PropertyKey> = T extends unknown ? Omit<T, K> : never;
type Call = DistributiveOmit<Request, 'id'>;
type DrizzleQueryOptions = { rowMode?: 'array' | 'object'; parsers?: Record<number, unknown> };

/** The database thread's error as this thread's: same message, PostgreSQL's fields on it. */
function rebuilt(error: ThreadError): Error {
  const copy = new Error(error.message);
  Object.assign(copy, error.fields);
  copy.name = error.name;
  return copy;
}

/** Starts the thread from the bundled entry; tests pass a factory that runs the TypeScript source. */
export type SpawnThread = (init: ThreadInit) => Worker;

export const spawnBundledThread: SpawnThread = (init) =>
  // Written out in full here: the bundler finds the thread's entry by this very expression.
  new Worker(new URL('./pglite-thread.ts', import.meta.url), { workerData: init });

/**
 * The embedded database on its own thread, with the part of PGlite's client that drizzle and the
 * backup use: query, exec, transaction and dumpDataDir. PGlite's locks still order the work, so a
 * query from another request waits for an open transaction exactly as it would in this thread.
 */
export class RemotePGlite {
  readonly #worker: Worker;
  readonly #pending = new Map<number, Pending>();
  #nextId = 1;
  #nextTransaction = 1;
  #failure: Error | null = null;

  constructor(init: ThreadInit, spawn: SpawnThread = spawnBundledThread) {
    this.#worker = spawn(init);
    this.#worker.on('message', (reply: Reply) => {
      const pending = this.#pending.get(reply.id);
      if (!pending) return;
      this.#pending.delete(reply.id);
      if (this.#pending.size === 0) this.#worker.unref();
      if (reply.ok) pending.resolve(reply.value);
      else pending.reject(rebuilt(reply.error));
    });
    const fail = (error: Error) => {
      this.#failure ??= error;
      for (const { reject } of this.#pending.values()) reject(this.#failure);
      this.#pending.clear();
    };
    this.#worker.on('error', (error) => {
      console.error('The database thread failed; every later query will be refused:', error);
      fail(error);
    });
    this.#worker.on('exit', (code) => fail(new Error(`The database thread stopped (exit code ${code}).`)));
    // The thread keeps the process alive only while an answer is awaited, as a socket would.
    this.#worker.unref();
  }

  #call<T>(call: Call): Promise<T> {
    if (this.#failure) return Promise.reject(this.#failure);
    const id = this.#nextId++;
    return new Promise<T>((resolve, reject) => {
      if (this.#pending.size === 0) this.#worker.ref();
      this.#pending.set(id, { resolve: resolve as (value: unknown) => void, reject });
      this.#worker.postMessage({ ...call, id });
    });
  }

  query<T>(sql: string, params: unknown[] = [], options: DrizzleQueryOptions = {}, tx: number | null = null): Promise<Results<T>> {
    // The parsers drizzle passes stay here: the thread's database applies the same ones by itself.
    const sent: QueryOptions = { rowMode: options.rowMode };
    const call: Call = { op: 'query', tx, sql, params, options: sent };
    return this.#call(call);
  }

  exec(sql: string, tx: number | null = null): Promise<Results[]> {
    return this.#call({ op: 'exec', tx, sql });
  }

  /** Runs `callback` in one transaction: committed when it resolves, rolled back when it throws. */
  async transaction<T>(callback: (tx: RemoteTransaction) => Promise<T>): Promise<T> {
    // The first statement goes out with the start rather than after its answer: one wait fewer
    // while the lock is held. A start that fails fails that statement, and so the callback.
    const id = this.#nextTransaction++;
    const begun = this.#call<void>({ op: 'begin', tx: id });
    begun.catch(() => undefined);
    let result: T;
    try {
      result = await callback(new RemoteTransaction(this, id));
    } catch (error) {
      await this.#call({ op: 'rollback', tx: id }).catch(() => undefined);
      throw error;
    }
    await begun;
    await this.#call({ op: 'commit', tx: id });
    return result;
  }

  async dumpDataDir(compression: 'none' | 'gzip' | 'auto' = 'auto'): Promise<Blob> {
    const bytes = await this.#call<Uint8Array<ArrayBuffer>>({ op: 'dump', compression });
    return new Blob([bytes]);
  }

  async close(): Promise<void> {
    if (!this.#failure) await this.#call({ op: 'close' });
    await this.#worker.terminate();
  }
}

/** One open transaction, as drizzle's PGlite session expects of the client it is handed. */
export class RemoteTransaction {
  constructor(
    private readonly db: RemotePGlite,
    private readonly id: number,
  ) {}

  query<T>(sql: string, params?: unknown[], options?: DrizzleQueryOptions): Promise<Results<T>> {
    return this.db.query<T>(sql, params, options, this.id);
  }

  exec(sql: string): Promise<Results[]> {
    return this.db.exec(sql, this.id);
  }
}
