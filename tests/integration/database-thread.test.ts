import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { Worker } from 'node:worker_threads';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { PGlite } from '@electric-sql/pglite';
import { drizzle } from 'drizzle-orm/pglite';
import { integer, pgTable, text } from 'drizzle-orm/pg-core';
import { eq } from 'drizzle-orm';
import { RemotePGlite, type SpawnThread } from '@/db/thread/pglite-remote';

const spawnFromSource: SpawnThread = (init) => new Worker(new URL('../support/pglite-thread-bootstrap.mjs', import.meta.url), { workerData: init });

const item = pgTable('item', { id: integer('id').primaryKey(), label: text('label').notNull() });

// The server's path to the embedded database; against a PostgreSQL server there is no thread.
describe.skipIf(Boolean(process.env.DATABASE_URL))('the embedded database on its own thread', () => {
  let dir: string;
  let remote: RemotePGlite;

  beforeEach(async () => {
    dir = fs.mkdtempSync(path.join(os.tmpdir(), 'countersample-thread-'));
    remote = new RemotePGlite({ dataDir: path.join(dir, 'db'), sharedBuffers: '16MB' }, spawnFromSource);
    await remote.exec('create table item (id integer primary key, label text not null)');
  });

  afterEach(async () => {
    await remote.close();
    fs.rmSync(dir, { recursive: true, force: true });
  });

  it('answers queries with parameters, in either row mode, with dates as text for drizzle to parse', async () => {
    await remote.query('insert into item (id, label) values ($1, $2), ($3, $4)', [1, 'first', 2, 'second']);
    const objects = await remote.query<{ id: number; label: string }>('select id, label from item order by id', [], { rowMode: 'object' });
    expect(objects.rows).toEqual([
      { id: 1, label: 'first' },
      { id: 2, label: 'second' },
    ]);
    const arrays = await remote.query('select id, label from item where id = $1', [2], { rowMode: 'array' });
    expect(arrays.rows).toEqual([[2, 'second']]);
    const dated = await remote.query<{ at: unknown; day: unknown; n: unknown }>(`select timestamptz '2026-03-01 10:00:00+00' as at, date '2026-03-01' as day, 7::int as n`);
    expect(dated.rows[0]).toEqual({ at: '2026-03-01 10:00:00+00', day: '2026-03-01', n: 7 });
  });

  it('starts PostgreSQL with the page cache it was given', async () => {
    const { rows } = await remote.query<{ shared_buffers: string }>('show shared_buffers');
    expect(rows[0].shared_buffers).toBe('16MB');
  });

  it('passes on PostgreSQL’s error fields, and the thread keeps serving after an error', async () => {
    await remote.query('insert into item (id, label) values (1, $1)', ['first']);
    const refused = await remote.query('insert into item (id, label) values (1, $1)', ['again']).catch((error: unknown) => error);
    expect(refused).toBeInstanceOf(Error);
    expect(refused).toMatchObject({ code: '23505', constraint: 'item_pkey' });
    expect((refused as Error).message).toMatch(/duplicate key/);
    const { rows } = await remote.query<{ n: number }>('select count(*)::int as n from item');
    expect(rows[0].n).toBe(1);
  });

  it('commits a transaction that resolves and rolls back one that throws', async () => {
    await remote.transaction(async (tx) => {
      await tx.query('insert into item (id, label) values (1, $1)', ['kept']);
    });
    const failure = new Error('changed my mind');
    await expect(
      remote.transaction(async (tx) => {
        await tx.query('insert into item (id, label) values (2, $1)', ['dropped']);
        throw failure;
      }),
    ).rejects.toBe(failure);
    const { rows } = await remote.query<{ label: string }>('select label from item order by id');
    expect(rows.map((r) => r.label)).toEqual(['kept']);
  });

  it('holds a query from outside until the open transaction has committed', async () => {
    const events: string[] = [];
    let outside: Promise<number> | null = null;
    await remote.transaction(async (tx) => {
      await tx.query('insert into item (id, label) values (1, $1)', ['in the transaction']);
      outside = remote.query<{ n: number }>('select count(*)::int as n from item').then((r) => {
        events.push('outside answered');
        return r.rows[0].n;
      });
      // Time for the outside query to overtake, were the lock not held across messages.
      await new Promise((resolve) => setTimeout(resolve, 100));
      events.push('committing');
    });
    expect(await outside).toBe(1);
    expect(events).toEqual(['committing', 'outside answered']);
  });

  it('serves drizzle, savepoints included', async () => {
    const db = drizzle({ client: remote as unknown as PGlite });
    await db.insert(item).values({ id: 1, label: 'outer' });
    await db.transaction(async (tx) => {
      await tx.update(item).set({ label: 'outer, edited' }).where(eq(item.id, 1));
      await tx
        .transaction(async (inner) => {
          await inner.insert(item).values({ id: 2, label: 'inner' });
          inner.rollback();
        })
        .catch(() => undefined);
    });
    expect(await db.select().from(item).orderBy(item.id)).toEqual([{ id: 1, label: 'outer, edited' }]);
  });

  it('runs statements sent at once in a transaction in the order they were sent, the first going out with the start', async () => {
    const db = drizzle({ client: remote as unknown as PGlite });
    const answers = await db.transaction((tx) =>
      Promise.all([
        tx.insert(item).values({ id: 1, label: 'sent first' }).returning(),
        tx.update(item).set({ label: 'then edited' }).where(eq(item.id, 1)).returning(),
        tx.select().from(item),
      ]),
    );
    expect(answers).toEqual([[{ id: 1, label: 'sent first' }], [{ id: 1, label: 'then edited' }], [{ id: 1, label: 'then edited' }]]);
  });

  it('dumps a snapshot that opens as a database with the committed rows', async () => {
    await remote.query('insert into item (id, label) values (1, $1)', ['in the snapshot']);
    const tar = await remote.dumpDataDir('none');
    expect(tar.size).toBeGreaterThan(1_000_000);
    const copy = await PGlite.create({ loadDataDir: tar });
    try {
      const { rows } = await copy.query<{ label: string }>('select label from item');
      expect(rows).toEqual([{ label: 'in the snapshot' }]);
    } finally {
      await copy.close();
    }
  });

  it('refuses work once the thread has stopped, with a message that says so', async () => {
    await remote.close();
    await expect(remote.query('select 1')).rejects.toThrow(/database thread stopped/);
    // afterEach closes again: closing a stopped thread is harmless.
  });
});
