import { sql, type SQL, type SQLWrapper } from 'drizzle-orm';

/**
 * Several writes of one transaction as one statement: each becomes a data-modifying WITH query, and
 * the statement answers how many rows the first one returned (so it should end in `returning`).
 * PostgreSQL runs each exactly once, all of them or none. One statement is one parse, one plan and
 * one answer: on the embedded database that fixed cost outweighs small inserts, and on a server it
 * is one round trip instead of one per write. The writes see the same snapshot, so none may need
 * another's rows, and no two may change the same row.
 */
export function writesAsOne(counted: SQLWrapper, others: readonly SQLWrapper[]): SQL {
  const parts = [counted, ...others].map((write, i) => sql`${sql.raw(`w${i}`)} as (${write.getSQL()})`);
  return sql`with ${sql.join(parts, sql`, `)} select count(*)::int as counted from w0`;
}

/** The count a `writesAsOne` statement answered, from either driver's result. */
export function countedOf(result: { rows: unknown[] }): number {
  const [row] = result.rows as { counted: number | string }[];
  return Number(row?.counted ?? 0);
}
