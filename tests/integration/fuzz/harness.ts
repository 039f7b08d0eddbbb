import { expect } from 'vitest';
import fc from 'fast-check';
import { sql } from 'drizzle-orm';
import { getDb } from '@/db/client';

/** Fixed by default so a run can be repeated; FUZZ_SEED=<n> explores other inputs. */
export const fuzzSeed = Number(process.env.FUZZ_SEED ?? 20_261_202);
/** FUZZ_SCALE=0.2 for a quick local pass; the suite's own minimum (1,000 a target) needs 1. */
export const fuzzScale = Number(process.env.FUZZ_SCALE ?? 1);
export const MIN_CASES_PER_TARGET = 1_000;

export type Dimension = 'bodies' | 'queries' | 'headers' | 'fields' | 'files' | 'sessions' | 'values' | 'args';

/** Cases actually executed, per target and dimension: the summary test reads these, not the plan. */
export const executed = new Map<string, Partial<Record<Dimension, number>>>();

export function countCase(targetId: string, dimension: Dimension): void {
  const entry = executed.get(targetId) ?? {};
  entry[dimension] = (entry[dimension] ?? 0) + 1;
  executed.set(targetId, entry);
}

/** What the answers were, per target: shows that cases reach validation past the session check. */
export const outcomes = new Map<string, Map<string, number>>();

export function countOutcome(targetId: string, outcome: string): void {
  const entry = outcomes.get(targetId) ?? new Map<string, number>();
  entry.set(outcome, (entry.get(outcome) ?? 0) + 1);
  outcomes.set(targetId, entry);
}

export function totalFor(targetId: string): number {
  return Object.values(executed.get(targetId) ?? {}).reduce((a, b) => a + b, 0);
}

/** Runs one property with the suite's seed, and names the seed to repeat it with when it fails. */
export async function fuzz<T>(label: string, arbitrary: fc.Arbitrary<T>, numRuns: number, predicate: (value: T) => Promise<void>): Promise<void> {
  const runs = Math.max(1, Math.round(numRuns * fuzzScale));
  try {
    await fc.assert(fc.asyncProperty(arbitrary, predicate), { seed: fuzzSeed, numRuns: runs, maxSkipsPerRun: 1_000 });
  } catch (error) {
    const message = error instanceof Error ? error.message : String(error);
    throw new Error(`${label} failed with FUZZ_SEED=${fuzzSeed} (run again with that variable to repeat it).\n${message}`, { cause: error });
  }
}

function rowsOf<T>(result: unknown): T[] {
  return ('rows' in (result as object) ? (result as { rows: T[] }).rows : (result as T[])) ?? [];
}

export type DbSnapshot = Record<string, string>;

/**
 * Row count and a content hash of every table, so "nothing changed" covers tables nobody thought of.
 * `exclude` must say why in the caller: only tables that legitimately change on refused input.
 */
export async function snapshotDb(exclude: readonly string[] = []): Promise<DbSnapshot> {
  const db = getDb();
  const tables = rowsOf<{ name: string }>(
    await db.execute(sql`select table_name as name from information_schema.tables where table_schema = 'public' and table_type = 'BASE TABLE' order by 1`),
  ).map((t) => t.name);
  expect(tables.length).toBeGreaterThan(10);
  const snapshot: DbSnapshot = {};
  for (const name of tables) {
    if (exclude.includes(name)) continue;
    const [row] = rowsOf<{ n: number; h: string }>(
      await db.execute(sql.raw(`select count(*)::int as n, md5(coalesce(string_agg(t::text, '|' order by t::text), '')) as h from "${name.replaceAll('"', '""')}" t`)),
    );
    snapshot[name] = `${row.n} rows, ${row.h}`;
  }
  return snapshot;
}

/** Ids of real rows, by table, for path parameters and fields that name something that exists. */
export async function realIdsByTable(limitPerTable = 40): Promise<Record<string, string[]>> {
  const db = getDb();
  const tables = rowsOf<{ name: string }>(
    await db.execute(sql`select table_name as name from information_schema.columns where table_schema = 'public' and column_name = 'id' order by 1`),
  ).map((t) => t.name);
  const ids: Record<string, string[]> = {};
  for (const name of tables) {
    ids[name] = rowsOf<{ id: string }>(await db.execute(sql.raw(`select id::text as id from "${name}" order by 1 limit ${limitPerTable}`))).map((r) => r.id);
  }
  return ids;
}

/** True when any string in the value (or its keys) is one of the given ids. */
export function mentionsAny(value: unknown, ids: ReadonlySet<string>, depth = 0): boolean {
  if (depth > 20) return false;
  if (typeof value === 'string') return ids.has(value.trim().toLowerCase()) || ids.has(value);
  if (value instanceof Map) return [...value.entries()].some(([k, v]) => mentionsAny(k, ids, depth + 1) || mentionsAny(v, ids, depth + 1));
  if (value instanceof Set) return [...value].some((v) => mentionsAny(v, ids, depth + 1));
  if (Array.isArray(value)) return value.some((v) => mentionsAny(v, ids, depth + 1));
  if (value && typeof value === 'object') return Object.entries(value).some(([k, v]) => ids.has(k) || mentionsAny(v, ids, depth + 1));
  return false;
}

/** What lib/http/problem.ts makes: RFC 9457 with our type URIs, and a 4xx status. */
export async function expectClientProblem(response: Response, context: string): Promise<Record<string, unknown>> {
  const text = await response.text();
  const where = `${context} → ${response.status} ${text.slice(0, 300)}`;
  expect(response.status, where).toBeGreaterThanOrEqual(400);
  expect(response.status, where).toBeLessThan(500);
  expect(response.headers.get('content-type'), where).toMatch(/^application\/problem\+json/);
  const body = JSON.parse(text) as Record<string, unknown>;
  expect(body.type, where).toMatch(/^https:\/\/countersample\.test\/problems\/[a-z-]+$/);
  expect(typeof body.title === 'string' && body.title.length > 0, where).toBe(true);
  expect(body.status, where).toBe(response.status);
  expect(typeof body.detail === 'string' && body.detail.length > 0, where).toBe(true);
  return body;
}

/** console.error is where the wrappers report unexpected errors: any call during a case is a finding. */
export function watchConsoleErrors() {
  const seen: string[] = [];
  const original = console.error;
  console.error = (...args: unknown[]) => {
    seen.push(args.map((a) => (a instanceof Error ? `${a.name}: ${a.message}\n${a.stack}` : String(a))).join(' '));
  };
  return {
    take: () => seen.splice(0),
    restore: () => {
      console.error = original;
    },
  };
}

export function describeCounts(targetIds: readonly string[]): string {
  return targetIds
    .map((id) => {
      const counts = executed.get(id) ?? {};
      const parts = Object.entries(counts).map(([d, n]) => `${d} ${n}`).join(', ');
      const answers = [...(outcomes.get(id) ?? new Map<string, number>())].sort((a, b) => b[1] - a[1]).map(([o, n]) => `${o} ×${n}`).join(', ');
      return `${id}: ${totalFor(id)} (${parts}) answers: ${answers}`;
    })
    .join('\n');
}
