import { PGlite, types, type QueryOptions, type Transaction } from '@electric-sql/pglite';

const keepText = (value: string) => value;

// The types drizzle parses itself (dates, times, intervals and these arrays), as its PGlite driver
// lists them.
const TEXT_KEPT_TYPES = [types.TIMESTAMP, types.TIMESTAMPTZ, types.INTERVAL, types.DATE, 1231, 1115, 1185, 1187, 1182];
const textKept = Object.fromEntries(TEXT_KEPT_TYPES.map((oid) => [oid, keepText]));

function withoutParsers(options?: QueryOptions): QueryOptions | undefined {
  if (!options?.parsers) return options;
  const { parsers: _kept, ...rest } = options;
  return rest;
}

/**
 * PGlite as drizzle uses it, minus a cost. Drizzle hands PGlite, with every query, parsers that keep
 * the text of the types it parses itself, and PGlite then copies its table of several hundred
 * parsers for that one query: most of the time it spends on a small answer. This database keeps
 * those types' text by its own table, set once, and drops the parsers a query brings.
 */
export class DrizzlePGlite extends PGlite {
  /** `sharedBuffers` sizes PostgreSQL's page cache ("24MB"); PGlite's default, 128MB, is most of a server's memory. */
  constructor(dataDir?: string, options: { sharedBuffers?: string } = {}) {
    const startParams = options.sharedBuffers ? [...PGlite.defaultStartParams, '-c', `shared_buffers=${options.sharedBuffers}`] : undefined;
    // One options object: PGlite reads a second argument only after a data folder.
    super({ dataDir, parsers: textKept, startParams });
  }

  // On start, and whenever asked to look again, PGlite writes a parser for every array type over the
  // ones it was given.
  override async _initArrayTypes(options?: { force?: boolean }): Promise<void> {
    await super._initArrayTypes(options);
    Object.assign(this.parsers, textKept);
  }

  override query<T>(sql: string, params?: unknown[], options?: QueryOptions) {
    return super.query<T>(sql, params, withoutParsers(options));
  }

  override transaction<T>(callback: (tx: Transaction) => Promise<T>): Promise<T> {
    return super.transaction((tx) =>
      callback({
        query: (sql, params, options) => tx.query(sql, params, withoutParsers(options)),
        sql: (...args) => tx.sql(...args),
        exec: (sql, options) => tx.exec(sql, options),
        rollback: () => tx.rollback(),
        listen: (channel, callback) => tx.listen(channel, callback),
        get closed() {
          return tx.closed;
        },
      }),
    );
  }
}
