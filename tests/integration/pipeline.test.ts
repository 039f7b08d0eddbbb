import { beforeAll, describe, expect, it } from 'vitest';
import { eq, sql } from 'drizzle-orm';
import { integer, pgTable, text } from 'drizzle-orm/pg-core';
import { getDb } from '@/db/client';
import { pipelined } from '@/db/pipeline';

const probe = pgTable('pipeline_probe', { id: integer('id').primaryKey(), label: text('label').notNull() });

// The same answers on the embedded database, which takes the statements at once, and on a
// PostgreSQL server, which takes them one after the other.
describe('pipelined statements of one transaction', () => {
  beforeAll(async () => {
    await getDb().execute(sql`create table if not exists pipeline_probe (id integer primary key, label text not null)`);
  });

  it('gives each step its own answer, in order, and a step sees the writes of the steps before it', async () => {
    await getDb().delete(probe);
    const [inserted, updated, read] = await getDb().transaction((tx) =>
      pipelined([
        () => tx.insert(probe).values({ id: 1, label: 'sealed' }).returning(),
        () => tx.update(probe).set({ label: 'dispatched' }).where(eq(probe.id, 1)).returning({ label: probe.label }),
        () => tx.select().from(probe),
      ]),
    );
    expect(inserted).toEqual([{ id: 1, label: 'sealed' }]);
    expect(updated).toEqual([{ label: 'dispatched' }]);
    expect(read).toEqual([{ id: 1, label: 'dispatched' }]);
  });

  it('throws the first failure in order, not the abort that follows it, and the transaction leaves nothing behind', async () => {
    await getDb().delete(probe);
    await getDb().insert(probe).values({ id: 7, label: 'already there' });
    const failure = await getDb()
      .transaction((tx) =>
        pipelined([
          () => tx.insert(probe).values({ id: 8, label: 'new' }),
          () => tx.insert(probe).values({ id: 7, label: 'duplicate' }),
          () => tx.insert(probe).values({ id: 9, label: 'after the failure' }),
        ]),
      )
      .catch((error: unknown) => error);
    // 23505 is the duplicate key; 25P02 would be the aborted transaction refusing the third insert.
    expect(failure).toMatchObject({ cause: { code: '23505' } });
    expect(await getDb().select().from(probe).orderBy(probe.id)).toEqual([{ id: 7, label: 'already there' }]);
  });

  it('reports a step that throws before it sends anything as that step’s failure', async () => {
    const refused = await pipelined([
      () => getDb().select().from(probe),
      () => {
        throw new Error('The audit event is invalid.');
      },
    ]).catch((error: unknown) => error);
    expect(refused).toEqual(new Error('The audit event is invalid.'));
  });
});
