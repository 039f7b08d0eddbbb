// The messages between the request thread and the database thread, all structured-cloneable.
// Value parsers, being functions, cannot cross: the thread's database keeps the text of the types
// drizzle parses itself (DrizzlePGlite), which is all the parsers drizzle ever asks for.

export type QueryOptions = { rowMode?: 'array' | 'object' };

export type Request =
  | { id: number; op: 'query'; tx: number | null; sql: string; params: unknown[]; options: QueryOptions }
  | { id: number; op: 'exec'; tx: number | null; sql: string }
  | { id: number; op: 'begin'; tx: number }
  | { id: number; op: 'commit' | 'rollback'; tx: number }
  | { id: number; op: 'dump'; compression: 'none' | 'gzip' | 'auto' }
  | { id: number; op: 'close' };

/** An error as the thread saw it: its message plus PostgreSQL's fields (code, detail, constraint…). */
export type ThreadError = { name: string; message: string; fields: Record<string, unknown> };

export type Reply = { id: number; ok: true; value: unknown } | { id: number; ok: false; error: ThreadError };

export type ThreadInit = { dataDir: string; sharedBuffers: string };
