import type { TableStats } from './manifest';

/** The one query method the backup needs; PGlite and node-postgres clients both have it. */
export type Queryable = { query: <T>(sql: string, params?: unknown[]) => Promise<{ rows: T[] }> };

const quoteIdent = (name: string) => `"${name.replace(/"/g, '""')}"`;

/**
 * Row count and a content hash of every table of the app's schemas. The hash is over each row's
 * text form, sorted bytewise, with the time zone and date style fixed, so the same data gives the
 * same hash whichever session computes it: a snapshot and its restore can be compared table by table.
 */
export async function tableStats(db: Queryable): Promise<TableStats[]> {
  await db.query(`set time zone 'UTC'`);
  await db.query(`set datestyle = 'ISO, YMD'`);
  await db.query(`set extra_float_digits = 3`);
  const { rows: tables } = await db.query<{ schema: string; name: string }>(
    `select table_schema as schema, table_name as name from information_schema.tables
     where table_type = 'BASE TABLE' and table_schema in ('public', 'drizzle')
     order by table_schema, table_name`,
  );
  const stats: TableStats[] = [];
  for (const table of tables) {
    const qualified = `${quoteIdent(table.schema)}.${quoteIdent(table.name)}`;
    const { rows } = await db.query<{ n: number; h: string }>(
      `select count(*)::int as n,
              encode(sha256(convert_to(coalesce(string_agg(t::text, E'\\n' order by t::text collate "C"), ''), 'UTF8')), 'hex') as h
       from ${qualified} t`,
    );
    stats.push({ name: `${table.schema}.${table.name}`, rows: rows[0].n, sha256: rows[0].h });
  }
  return stats;
}

export type MigrationState = { tag: string | null; appliedCount: number; createdAtMs: number | null };

/** The newest applied migration, named by the tag the migrations journal gives its timestamp. */
export async function migrationState(db: Queryable, journal: { entries: { tag: string; when: number }[] }): Promise<MigrationState> {
  const { rows: present } = await db.query<{ n: number }>(
    `select count(*)::int as n from information_schema.tables where table_schema = 'drizzle' and table_name = '__drizzle_migrations'`,
  );
  if (present[0].n === 0) return { tag: null, appliedCount: 0, createdAtMs: null };
  const { rows } = await db.query<{ n: number; newest: string | null }>(`select count(*)::int as n, max(created_at)::text as newest from drizzle.__drizzle_migrations`);
  const newest = rows[0].newest === null ? null : Number(rows[0].newest);
  const tag = newest === null ? null : (journal.entries.find((e) => e.when === newest)?.tag ?? null);
  return { tag, appliedCount: rows[0].n, createdAtMs: newest };
}

export function compareTableStats(expected: TableStats[], actual: TableStats[]): string[] {
  const problems: string[] = [];
  const byName = new Map(actual.map((t) => [t.name, t]));
  for (const want of expected) {
    const got = byName.get(want.name);
    if (!got) problems.push(`table ${want.name} is missing`);
    else if (got.rows !== want.rows) problems.push(`table ${want.name} has ${got.rows} rows, the snapshot had ${want.rows}`);
    else if (got.sha256 !== want.sha256) problems.push(`table ${want.name} has the same row count but different content`);
    byName.delete(want.name);
  }
  for (const extra of byName.keys()) problems.push(`table ${extra} was not in the snapshot`);
  return problems;
}
