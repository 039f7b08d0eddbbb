import { spawn, type ChildProcess } from 'node:child_process';
import fs from 'node:fs';
import net from 'node:net';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { fixtures } from '../support/fixtures';

// Crash safety of the embedded database: a production server of its own, on a fresh demo folder,
// takes a burst of lifecycle transitions through the HTTP API and is killed with SIGKILL in the
// middle, twice, at different points. After each restart (which must take over the stale lock)
// every acknowledged transition must be there, no case may be half-transitioned, and the audit
// chain must hold. The mail relay is down throughout the burst, so every transition also shows
// that it commits while its mail is recorded as failed; the last start brings the relay back and
// the server's own retry job (15 s after start, one batch per run) must hand failed mail over again.

const root = process.cwd();
const nextBin = path.join(root, 'node_modules', 'next', 'dist', 'bin', 'next');
const tsxCli = path.join(root, 'node_modules', 'tsx', 'dist', 'cli.mjs');
const work = fs.mkdtempSync(path.join(os.tmpdir(), 'countersample-crash-'));
const dataDir = path.join(work, 'pglite');
const password = fixtures().password;

type Seeded = { cookies: Record<'plant' | 'lab' | 'supplier' | 'supplier2', string>; labId: string; cases: { id: string; number: string; seal: string; supplier: 'supplier' | 'supplier2' }[] };
type Op = { caseId: string; transition: 'dispatch' | 'receive' | 'withdraw'; outcome: 'acked' | 'refused' | 'lost'; status?: number };
type Checked = {
  cases: { id: string; status: string }[];
  events: { caseId: string; seq: number; action: string; from: string | null; to: string | null; transition: string | null }[];
  custody: { caseId: string; kind: string }[];
  mail: { id: string; caseId: string; template: string; status: string; claimed: boolean }[];
  chain: { ok: boolean; checked: number; brokenAt?: number; reason?: string };
};

function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const server = net.createServer();
    server.once('error', reject);
    server.listen(0, '127.0.0.1', () => {
      const { port } = server.address() as net.AddressInfo;
      server.close(() => resolve(port));
    });
  });
}

let appPort = 0;
let smtpPort = 0;
const baseEnv = (): NodeJS.ProcessEnv => ({
  ...process.env,
  APP_ENV: 'demo',
  NODE_ENV: 'production',
  NEXT_TELEMETRY_DISABLED: '1',
  PGLITE_DIR: dataDir,
  BETTER_AUTH_URL: `http://localhost:${appPort}`,
  SMTP_URL: `smtp://127.0.0.1:${smtpPort}`,
  DEMO_PASSWORD: password,
  PORT: String(appPort),
});

/** Runs app code in a child process (the folder's lock is its own), returning the JSON it prints last. */
async function runScript<T>(code: string): Promise<T> {
  const child = spawn(process.execPath, [tsxCli, '--import', './scripts/register-server-only.mjs', '-e', code], { cwd: root, env: baseEnv(), stdio: ['ignore', 'pipe', 'pipe'] });
  let out = '';
  let err = '';
  child.stdout.on('data', (d) => (out += d));
  child.stderr.on('data', (d) => (err += d));
  const code_ = await new Promise<number>((resolve) => child.once('exit', (c) => resolve(c ?? 1)));
  const line = out.split('\n').find((l) => l.startsWith('RESULT:'));
  if (code_ !== 0 || !line) throw new Error(`script failed (${code_}):\n${out.slice(-2000)}\n${err.slice(-3000)}`);
  return JSON.parse(line.slice('RESULT:'.length)) as T;
}

const seedCode = `
const { sql } = await import('drizzle-orm');
const { migrate } = await import('./db/migrate.ts');
const { getDb, closeDb } = await import('./db/client.ts');
const { seedDemo } = await import('./db/seed/demo.ts');
const { getAuth } = await import('./lib/auth/auth.ts');
const { actorFromHeaders } = await import('./lib/auth/session.ts');
const { openDispute } = await import('./lib/dal/open-dispute.ts');
const { demoUsers } = await import('./db/seed/demo-names.ts');
console.error = () => {};
await migrate();
const db = getDb();
await seedDemo(db, { password: process.env.DEMO_PASSWORD });
const cookies = {};
for (const key of ['plant', 'lab', 'supplier', 'supplier2']) {
  const u = demoUsers.find((d) => d.key === key);
  const r = await getAuth().api.signInEmail({ body: { email: u.email, password: process.env.DEMO_PASSWORD }, asResponse: true });
  cookies[key] = r.headers.getSetCookie().map((c) => c.split(';')[0]).join('; ');
}
const actors = { supplier: await actorFromHeaders(new Headers({ cookie: cookies.supplier })), supplier2: await actorFromHeaders(new Headers({ cookie: cookies.supplier2 })) };
// Every contestable result of the two suppliers with accounts becomes an open case, each opened
// within its own contest window (the demo spans weeks).
const results = (await db.execute(sql\`select ir.id, ir.notified_at, d.supplier_organisation_id as org from intake_result ir join delivery d on d.id = ir.delivery_id
  where ir.verdict in ('rejected', 'deducted') and ir.superseded_at is null and ir.notified_at is not null
  and not exists (select 1 from dispute_case c where c.intake_result_id = ir.id) order by ir.notified_at\`)).rows;
for (const r of results) {
  const key = Object.keys(actors).find((k) => actors[k].organisationId === r.org);
  if (!key) continue;
  await openDispute(db, actors[key], { intakeResultId: r.id, grounds: ['instrument'], explanation: 'Our own bulk-tank check read well below the limit; please retest the retained sample.', remedy: 'Pay the load in full.' }, { now: new Date(new Date(r.notified_at).getTime() + 30 * 60000) });
}
const cases = (await db.execute(sql\`select c.id, c.number, s.seal_number as seal, c.supplier_organisation_id as org from dispute_case c
  join sample s on s.delivery_id = c.delivery_id and s.kind = 'retained' where c.status = 'open' order by c.number\`)).rows
  .map((c) => ({ id: c.id, number: c.number, seal: c.seal, supplier: Object.keys(actors).find((k) => actors[k].organisationId === c.org) }))
  .filter((c) => c.supplier);
const [lab] = (await db.execute(sql\`select id from organisation where kind = 'lab' order by created_at limit 1\`)).rows;
await closeDb();
console.log('RESULT:' + JSON.stringify({ cookies, labId: lab.id, cases }));
`;

const checkCode = `
const { sql } = await import('drizzle-orm');
const { getDb, closeDb } = await import('./db/client.ts');
const { verifyAuditChain } = await import('./lib/audit/verify.ts');
const db = getDb();
const q = async (text) => (await db.execute(sql.raw(text))).rows;
const cases = await q("select id, status from dispute_case");
const events = await q("select case_id as \\"caseId\\", seq::int as seq, action, change->>'from' as \\"from\\", change->>'to' as \\"to\\", change->>'transition' as transition from audit_event where case_id is not null order by seq");
const custody = await q("select s.case_id as \\"caseId\\", e.kind from custody_event e join sample s on s.id = e.sample_id where s.case_id is not null union all select c.id, e.kind from custody_event e join sample s on s.id = e.sample_id join dispute_case c on c.delivery_id = s.delivery_id where s.case_id is null");
const mail = await q("select id, case_id as \\"caseId\\", template, status, claimed_at is not null as claimed from outgoing_mail where case_id is not null");
const chain = await verifyAuditChain(db);
await closeDb();
console.log('RESULT:' + JSON.stringify({ cases, events, custody, mail, chain }));
`;

let server: ChildProcess | null = null;
const serverLog = path.join(work, 'next-start.log');

async function startServer(): Promise<ChildProcess> {
  const out = fs.openSync(serverLog, 'a');
  const child = spawn(process.execPath, [nextBin, 'start', '-p', String(appPort)], { cwd: root, env: baseEnv(), stdio: ['ignore', out, out] });
  const deadline = Date.now() + 90_000;
  while (Date.now() < deadline) {
    if (child.exitCode !== null) throw new Error(`next start exited with ${child.exitCode}:\n${fs.readFileSync(serverLog, 'utf8').slice(-3000)}`);
    try {
      const response = await fetch(`http://127.0.0.1:${appPort}/sign-in`, { signal: AbortSignal.timeout(5000) });
      if (response.status === 200) return child;
    } catch {
      // not listening yet
    }
    await new Promise((r) => setTimeout(r, 250));
  }
  child.kill('SIGKILL');
  throw new Error('next start did not become ready in 90 s');
}

function killHard(child: ChildProcess): Promise<void> {
  return new Promise((resolve) => {
    if (child.exitCode !== null || child.signalCode !== null) return resolve();
    child.once('exit', () => resolve());
    child.kill('SIGKILL');
  });
}

function stopGently(child: ChildProcess): Promise<void> {
  return new Promise((resolve) => {
    if (child.exitCode !== null || child.signalCode !== null) return resolve();
    const force = setTimeout(() => child.kill('SIGKILL'), 10_000);
    child.once('exit', () => {
      clearTimeout(force);
      resolve();
    });
    child.kill('SIGTERM');
  });
}

let seeded: Seeded;

function bodyFor(transition: Op['transition'], c: Seeded['cases'][number]) {
  if (transition === 'dispatch') return { labOrganisationId: seeded.labId, sealNumber: c.seal, courier: 'Cool box 7 with data logger, by courier', temperature: 4.2, sealIntact: true };
  if (transition === 'receive') return { sealNumber: c.seal, sealIntact: true, frozen: false, temperature: 4.6, condition: 'Container undamaged; data logger within range.' };
  return { reason: 'Settled directly with the plant after a herd check.' };
}

/**
 * Walks each case through dispatch → receive → withdraw, several cases at once, and kills the
 * server with SIGKILL as soon as `killAfterAcks` transitions have been acknowledged, while others
 * are still in flight. Returns what every request got back.
 */
// Queued notices go out once the commits pause (lib/mail/delivery-timing.ts); a lull this long lets
// the background delivery try the relay that is down before the burst goes on.
const LULL_MS = 1500;

async function burst(child: ChildProcess, cases: Seeded['cases'], killAfterAcks: number, concurrency: number, lullAfterAcks?: number): Promise<Op[]> {
  const ops: Op[] = [];
  let acked = 0;
  let killed: Promise<void> | null = null;
  let lull: Promise<void> | null = null;
  const queue = [...cases];
  const worker = async () => {
    for (let c = queue.shift(); c && !killed; c = queue.shift()) {
      for (const [transition, by] of [['dispatch', 'plant'], ['receive', 'lab'], ['withdraw', c.supplier]] as const) {
        if (lull) await lull;
        if (killed) return;
        try {
          const response = await fetch(`http://127.0.0.1:${appPort}/api/v1/cases/${c.id}/transitions/${transition}`, {
            method: 'POST',
            headers: { cookie: seeded.cookies[by], 'content-type': 'application/json' },
            body: JSON.stringify(bodyFor(transition, c)),
            signal: AbortSignal.timeout(30_000),
          });
          await response.arrayBuffer();
          if (response.ok) {
            ops.push({ caseId: c.id, transition, outcome: 'acked', status: response.status });
            acked += 1;
            if (lullAfterAcks !== undefined && acked === lullAfterAcks) lull = new Promise((resolve) => setTimeout(resolve, LULL_MS));
            if (acked >= killAfterAcks) killed ??= killHard(child);
          } else {
            ops.push({ caseId: c.id, transition, outcome: 'refused', status: response.status });
            break;
          }
        } catch {
          ops.push({ caseId: c.id, transition, outcome: 'lost' });
          return;
        }
      }
    }
  };
  await Promise.all(Array.from({ length: concurrency }, worker));
  await (killed ?? killHard(child));
  return ops;
}

const allOps: Op[] = [];
const rounds: { acked: number; lost: number; refused: number; lockHolderDead: boolean }[] = [];
let checked: Checked;
let afterCrashes: Checked;
let mailCaught = 0;

beforeAll(async () => {
  appPort = await freePort();
  smtpPort = await freePort(); // closed: the relay is down until the last start
  seeded = await runScript<Seeded>(seedCode);
  expect(seeded.cases.length).toBeGreaterThanOrEqual(12);

  const half = Math.ceil(seeded.cases.length / 2);
  const plan = [
    { cases: seeded.cases.slice(0, half), killAfterAcks: Math.ceil(half * 1.5), concurrency: 4, lullAfterAcks: 6 },
    { cases: seeded.cases.slice(half), killAfterAcks: 4, concurrency: 8 },
  ];
  for (const round of plan) {
    server = await startServer();
    const pid = server.pid!;
    const ops = await burst(server, round.cases, round.killAfterAcks, round.concurrency, round.lullAfterAcks);
    allOps.push(...ops);
    // The killed server could not remove its lock: the next start must take the stale one over.
    const lock = fs.readFileSync(`${dataDir}.lock`, 'utf8');
    rounds.push({ acked: ops.filter((o) => o.outcome === 'acked').length, lost: ops.filter((o) => o.outcome === 'lost').length, refused: ops.filter((o) => o.outcome === 'refused').length, lockHolderDead: lock === String(pid) });
  }

  // Between the crashes and the last start: what the burst left, mail included.
  afterCrashes = await runScript<Checked>(checkCode);

  // Last start, with the relay back on the port it was expected on: the retry job runs 15 s after start.
  const { startMailCatcher } = await import('../../../lib/mail/catcher');
  const catcher = await startMailCatcher({ smtpPort, httpPort: 0 });
  try {
    server = await startServer();
    const deadline = Date.now() + 60_000;
    let last = -1;
    let stableSince = Date.now();
    while (Date.now() < deadline) {
      await new Promise((r) => setTimeout(r, 1000));
      if (catcher.messages.length !== last) {
        last = catcher.messages.length;
        stableSince = Date.now();
      } else if (last > 0 && Date.now() - stableSince > 4000) break;
    }
    mailCaught = catcher.messages.length;
    await stopGently(server);
    server = null;
  } finally {
    await catcher.close();
  }
  checked = await runScript<Checked>(checkCode);
  const count = (c: Checked, status: string) => c.mail.filter((m) => m.status === status).length;
  console.log(
    `crash safety: ${seeded.cases.length} cases; rounds ${JSON.stringify(rounds)}; mail after the crashes: ${count(afterCrashes, 'failed')} failed, ${count(afterCrashes, 'queued')} queued; ` +
      `after the last start: ${count(checked, 'sent')} sent, ${count(checked, 'failed')} failed, ${count(checked, 'queued')} queued; ${mailCaught} messages caught`,
  );
}, 420_000);

afterAll(async () => {
  if (server) await killHard(server);
  if (process.env.E2E_KEEP_DATA !== '1') fs.rmSync(work, { recursive: true, force: true });
});

describe('crash safety of the embedded database', () => {
  it('was killed in the middle of a burst, twice, with transitions in flight, and restarted over the stale lock', () => {
    expect(rounds).toHaveLength(2);
    for (const round of rounds) {
      expect(round.acked).toBeGreaterThan(0);
      expect(round.lost).toBeGreaterThan(0);
      expect(round.lockHolderDead).toBe(true);
    }
    expect(allOps.filter((o) => o.outcome === 'refused')).toEqual([]);
  });

  it('keeps every acknowledged transition, exactly once', () => {
    const acked = allOps.filter((o) => o.outcome === 'acked');
    for (const op of acked) {
      const recorded = checked.events.filter((e) => e.caseId === op.caseId && e.action === 'case.transitioned' && e.transition === op.transition);
      expect(recorded, `${op.transition} of ${op.caseId}`).toHaveLength(1);
    }
  });

  it('leaves no case half-transitioned: status, audit trail and custody agree', () => {
    const ours = new Set(seeded.cases.map((c) => c.id));
    const order = { dispatch: 'awaiting_sample', receive: 'retest', withdraw: 'withdrawn' } as const;
    for (const row of checked.cases.filter((c) => ours.has(c.id))) {
      const moves = checked.events.filter((e) => e.caseId === row.id && e.action === 'case.transitioned');
      // Each move starts where the one before it ended, and the last one is where the case is.
      let at = 'open';
      for (const move of moves) {
        expect(move.from, `case ${row.id}`).toBe(at);
        expect(move.to).toBe(order[move.transition as keyof typeof order]);
        at = move.to!;
      }
      expect(row.status, `case ${row.id}`).toBe(at);
      const kinds = checked.custody.filter((c) => c.caseId === row.id).map((c) => c.kind);
      expect(kinds.filter((k) => k === 'dispatched')).toHaveLength(moves.filter((m) => m.transition === 'dispatch').length);
      expect(kinds.filter((k) => k === 'received')).toHaveLength(moves.filter((m) => m.transition === 'receive').length);
    }
  });

  it('keeps the audit chain intact', () => {
    expect(checked.chain).toEqual({ ok: true, checked: expect.any(Number) });
    expect(checked.chain.checked).toBeGreaterThan(allOps.filter((o) => o.outcome === 'acked').length);
  });

  it('queued the notices of every committed transition with it, and nothing for a transition that did not commit', () => {
    const template = { dispatch: 'case-dispatched', receive: 'case-received', withdraw: 'case-withdrawn' } as const;
    const ours = new Set(seeded.cases.map((c) => c.id));
    const committed = afterCrashes.events.filter((e) => ours.has(e.caseId) && e.action === 'case.transitioned');
    expect(committed.length).toBeGreaterThanOrEqual(allOps.filter((o) => o.outcome === 'acked').length);
    for (const move of committed) {
      const rows = afterCrashes.mail.filter((m) => m.caseId === move.caseId && m.template === template[move.transition as keyof typeof template]);
      expect(rows.length, `${move.transition} of ${move.caseId}`).toBeGreaterThan(0);
    }
    const kinds = new Set(Object.values(template) as string[]);
    for (const row of afterCrashes.mail.filter((m) => ours.has(m.caseId) && kinds.has(m.template))) {
      const transition = Object.entries(template).find(([, t]) => t === row.template)![0];
      expect(committed.some((e) => e.caseId === row.caseId && e.transition === transition), `${row.template} of ${row.caseId}`).toBe(true);
    }
  });

  it('tried the relay in the background while it was down, and recorded the refusals as failed', () => {
    const statuses = afterCrashes.mail.map((m) => m.status);
    expect(statuses.filter((s) => s === 'failed').length).toBeGreaterThan(0);
    expect(statuses.filter((s) => s !== 'failed' && s !== 'queued')).toEqual([]);
  });

  it('leaves queued after the last start only messages a killed worker had claimed, until the claim is stale', () => {
    const claimedBefore = new Map(afterCrashes.mail.map((m) => [m.id, m.claimed]));
    for (const row of checked.mail.filter((m) => m.status === 'queued')) expect(claimedBefore.get(row.id), `${row.template} of ${row.caseId}`).toBe(true);
    const unclaimed = afterCrashes.mail.filter((m) => m.status === 'queued' && !m.claimed);
    for (const row of unclaimed) expect(checked.mail.find((m) => m.id === row.id)?.status, `${row.template} of ${row.caseId}`).toBe('sent');
  });

  it('hands failed mail over again from the server’s own retry job once the relay is back', () => {
    const before = new Map(afterCrashes.mail.map((m) => [m.id, m.status]));
    expect([...before.values()]).not.toContain('sent');
    const retried = checked.mail.filter((m) => before.get(m.id) === 'failed' && m.status === 'sent');
    expect(retried.length).toBeGreaterThan(0);
    // No row was lost on the way; the only new ones are the reminders the same job sends.
    for (const id of before.keys()) expect(checked.mail.some((m) => m.id === id)).toBe(true);
    for (const row of checked.mail.filter((m) => !before.has(m.id))) expect(row.template).toMatch(/^reminder-/);
    expect(mailCaught).toBe(checked.mail.filter((m) => m.status === 'sent').length);
  });
});
