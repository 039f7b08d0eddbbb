// The benchmark's look inside one database, run as its own process while no server has the
// embedded folder open (PGlite allows one process per folder). Prints one JSON line.
//   probe direct <query-string>   time the cases list's data-layer call directly, as the arbiter
//   probe explain <query-string>  EXPLAIN ANALYZE of the list's two statements
//   probe transitions             cases ready for dispatch and receipt, with their seal numbers
//   probe verify                  walk the audit chain
import { and, asc, eq, inArray } from 'drizzle-orm';

process.env.APP_ENV ??= 'demo';
const [mode, queryString = ''] = process.argv.slice(2);
// Never fall back to the default data folder: the probe is for the bench's own datasets.
if (!process.env.PGLITE_DIR && !process.env.DATABASE_URL) {
  console.error('probe: set PGLITE_DIR (or DATABASE_URL) to the database to look at.');
  process.exit(2);
}

const { closeDb, getDb } = await import('../db/client');
const { migrate } = await import('../db/migrate');
const schema = await import('../db/schema');
const { demoUsers } = await import('../db/seed/demo-names');
const { listCases } = await import('../lib/dal/cases');
const { caseListQuerySchema } = await import('../lib/dal/cases-query');
const { verifyAuditChain } = await import('../lib/audit/verify');
const { summarise } = await import('./measure');
type Actor = import('../lib/auth/actor').Actor;

async function actorOf(key: string): Promise<Actor> {
  const db = getDb();
  const email = demoUsers.find((u) => u.key === key)!.email;
  const [row] = await db
    .select({ user: schema.user, organisation: schema.organisation })
    .from(schema.user)
    .innerJoin(schema.organisation, eq(schema.organisation.id, schema.user.organisationId))
    .where(eq(schema.user.email, email));
  return { userId: row.user.id, sessionId: 'bench', name: row.user.name, email: row.user.email, role: row.user.role as Actor['role'], organisationId: row.organisation.id, organisationName: row.organisation.name, organisationKind: row.organisation.kind };
}

const listQuery = () => caseListQuerySchema.parse(Object.fromEntries(new URLSearchParams(queryString)));

async function direct() {
  const db = getDb();
  const actor = await actorOf('arbiter');
  const query = listQuery();
  const warmup = Number(process.env.PROBE_WARMUP ?? 20);
  const requests = Number(process.env.PROBE_REQUESTS ?? 200);
  for (let i = 0; i < warmup; i++) await listCases(db, actor, query);
  const samples: number[] = [];
  let items = 0;
  for (let i = 0; i < requests; i++) {
    const started = performance.now();
    const page = await listCases(db, actor, query);
    samples.push(performance.now() - started);
    items = page.items.length;
  }
  return { ...summarise(samples), items };
}

/** The two statements the list runs, with their plans; drizzle logs each statement as it runs. */
async function explain() {
  const actor = await actorOf('arbiter');
  const statements: { sql: string; params: unknown[] }[] = [];
  const { drizzle } = await import('drizzle-orm/pglite');
  const db = getDb();
  const client = (db as unknown as { $client: import('@electric-sql/pglite').PGlite }).$client;
  const logged = drizzle(client, { schema, logger: { logQuery: (query, params) => statements.push({ sql: query, params }) } });
  await listCases(logged as never, actor, listQuery());
  const plans: string[] = [];
  for (const s of statements) {
    const result = await client.query<{ 'QUERY PLAN': string }>(`explain (analyze, buffers) ${s.sql}`, s.params as never[]);
    plans.push(`${s.sql}\n${result.rows.map((r) => r['QUERY PLAN']).join('\n')}`);
  }
  return { plans };
}

async function transitionsReady() {
  const db = getDb();
  const rows = await db
    .select({ id: schema.disputeCase.id, status: schema.disputeCase.status, sealNumber: schema.sample.sealNumber })
    .from(schema.disputeCase)
    .innerJoin(schema.sample, and(eq(schema.sample.deliveryId, schema.disputeCase.deliveryId), eq(schema.sample.kind, 'retained')))
    .where(inArray(schema.disputeCase.status, ['open', 'awaiting_sample']))
    .orderBy(asc(schema.disputeCase.number));
  const [lab] = await db.select({ id: schema.organisation.id }).from(schema.organisation).where(eq(schema.organisation.kind, 'lab'));
  return { labOrganisationId: lab.id, cases: rows };
}

async function verify() {
  const started = performance.now();
  const verdict = await verifyAuditChain(getDb());
  return { ...verdict, seconds: (performance.now() - started) / 1000 };
}

try {
  await migrate();
  const modes: Record<string, () => Promise<unknown>> = { direct, explain, transitions: transitionsReady, verify };
  const run = modes[mode];
  if (!run) throw new Error(`probe: unknown mode ${mode}`);
  console.log(JSON.stringify(await run()));
} finally {
  await closeDb();
}
