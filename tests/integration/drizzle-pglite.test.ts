import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { drizzle } from 'drizzle-orm/pglite';
import { date, integer, pgTable, timestamp } from 'drizzle-orm/pg-core';
import { DrizzlePGlite } from '@/db/drizzle-pglite';

const stamp = pgTable('stamp', {
  id: integer('id').primaryKey(),
  at: timestamp('at', { withTimezone: true }).notNull(),
  day: date('day').notNull(),
  plain: timestamp('plain').notNull(),
});

// The embedded database drops the parsers drizzle passes per query and keeps their effect itself.
describe.skipIf(Boolean(process.env.DATABASE_URL))('PGlite as drizzle uses it', () => {
  const client = new DrizzlePGlite();
  const db = drizzle({ client });

  beforeAll(async () => {
    await client.exec('create table stamp (id integer primary key, at timestamptz not null, day date not null, plain timestamp not null)');
  });
  afterAll(() => client.close());

  it('starts PostgreSQL with the page cache it is given, and PGlite’s own without one', async () => {
    const sized = new DrizzlePGlite(undefined, { sharedBuffers: '16MB' });
    try {
      expect((await sized.query<{ shared_buffers: string }>('show shared_buffers')).rows[0].shared_buffers).toBe('16MB');
    } finally {
      await sized.close();
    }
    expect((await client.query<{ shared_buffers: string }>('show shared_buffers')).rows[0].shared_buffers).toBe('128MB');
  });

  it('hands over the text of dates and times, as drizzle’s own parsers would', async () => {
    const { rows } = await client.query<Record<string, unknown>>(
      `select timestamptz '2026-03-01 10:00:00.5+00' as tz, timestamp '2026-03-01 10:00' as ts, date '2026-03-01' as d, interval '90 minutes' as i, array[timestamp '2026-03-01 10:00'] as ts_list, array[1.5::numeric] as n_list, 3::int as n, '{"a":1}'::jsonb as j`,
    );
    expect(rows[0]).toEqual({ tz: '2026-03-01 10:00:00.5+00', ts: '2026-03-01 10:00:00', d: '2026-03-01', i: '01:30:00', ts_list: '{"2026-03-01 10:00:00"}', n_list: '{1.5}', n: 3, j: { a: 1 } });
  });

  it('gives drizzle its dates back as the values it stored, in and out of a transaction', async () => {
    const at = new Date('2026-03-01T10:00:00.250Z');
    await db.insert(stamp).values({ id: 1, at, day: '2026-03-01', plain: new Date('2026-03-01T08:30:00Z') });
    const [outside] = await db.select().from(stamp);
    expect(outside.at.toISOString()).toBe(at.toISOString());
    expect(outside.day).toBe('2026-03-01');
    expect(outside.plain.toISOString()).toBe('2026-03-01T08:30:00.000Z');
    const inside = await db.transaction(async (tx) => (await tx.select().from(stamp))[0]);
    expect(inside).toEqual(outside);
  });
});
