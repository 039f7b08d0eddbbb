// The benchmark suite: `npm run bench` (flags: --quick for short runs while developing,
// --skip-build to reuse the last build in .next-bench, --only=reads or --only=writes for one half
// while working on it). Budgets are printed, never asserted in tests.
// Writes bench/results.json (not committed). See "Benchmarks" in DEVELOPERS.md.
import { spawn } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { demoUsers } from '@/db/seed/demo-names';
import { assessRate } from './assess-rate';
import { startMailSink, type MailSink } from './mail-sink';
import { measurePageLoad, type PageLoadFigures } from './browser';
import { runLoad, sampleRss, sequentialLatency, summarise, timedGet, type Latency, type LoadRequest, type LoadResult } from './measure';
import { BENCH_DIST_DIR, buildApp, hasBuild, signIn, startServer, type RunningServer } from './server';

const quick = process.argv.includes('--quick');
const skipBuild = process.argv.includes('--skip-build');
const only = process.argv.find((a) => a.startsWith('--only='))?.slice('--only='.length);
if (only !== undefined && only !== 'reads' && only !== 'writes') throw new Error(`--only takes reads or writes, not ${only}`);
const runs = (half: 'reads' | 'writes') => only === undefined || only === half;
const password = process.env.DEMO_PASSWORD || 'countersample-demo';
const scale = {
  listRequests: quick ? 60 : 200,
  pageRequests: quick ? 40 : 200,
  warmup: quick ? 10 : 20,
  loadSeconds: quick ? 8 : 30,
  assessSeconds: quick ? 1.5 : 5,
  pageLoads: quick ? 3 : 5,
  transitions: quick ? 200 : Number.POSITIVE_INFINITY,
};
const LIST_QUERY = 'pageSize=50&status=review,decided&q=howe&sort=deliveredAt&order=desc';

const root = process.cwd();
const scaleDir = path.join(root, 'data', 'scale', 'pglite');
const manifestFile = path.join(root, 'data', 'scale', 'manifest.json');
const logDir = fs.mkdtempSync(path.join(os.tmpdir(), 'countersample-bench-'));
const started = Date.now();
const log = (message: string) => console.log(`[bench ${((Date.now() - started) / 1000).toFixed(0).padStart(4)} s] ${message}`);
const email = (key: string) => demoUsers.find((u) => u.key === key)!.email;

/** Runs one of the bench's scripts in its own process (the embedded folder takes one process at a time). */
function runScript(script: string, args: string[], env: Record<string, string>, logName: string): Promise<string> {
  // An empty value means "unset" for the child: PGLITE_DIR or DATABASE_URL must not leak in.
  const childEnv: NodeJS.ProcessEnv = { ...process.env };
  for (const [key, value] of Object.entries(env)) {
    if (value === '') delete childEnv[key];
    else childEnv[key] = value;
  }
  return new Promise((resolve, reject) => {
    const logFile = path.join(logDir, logName);
    const child = spawn(path.join(root, 'node_modules', '.bin', 'tsx'), ['--import', './scripts/register-server-only.mjs', script, ...args], { env: childEnv, stdio: ['ignore', 'pipe', 'pipe'] });
    let stdout = '';
    child.stdout.on('data', (chunk: Buffer) => {
      stdout += chunk;
      fs.appendFileSync(logFile, chunk);
    });
    child.stderr.on('data', (chunk: Buffer) => fs.appendFileSync(logFile, chunk));
    child.once('exit', (code) => (code === 0 ? resolve(stdout) : reject(new Error(`${script} ${args.join(' ')} exited with ${code}; see ${logFile}`))));
  });
}

const probe = async <T>(dir: string, args: string[], env: Record<string, string> = {}): Promise<T> => {
  const out = await runScript('bench/probe.ts', args, { PGLITE_DIR: dir, DATABASE_URL: '', ...env }, `probe-${args[0]}.log`);
  return JSON.parse(out.trim().split('\n').at(-1)!) as T;
};

type Row = { metric: string; value: string; target: string; pass: boolean | null };
const rows: Row[] = [];
const details: Record<string, unknown> = {};
const ms = (x: number) => `${x.toFixed(1)} ms`;
const row = (metric: string, value: string, target = '—', pass: boolean | null = null) => rows.push({ metric, value, target, pass });

async function signInAll(server: RunningServer, keys: string[]): Promise<Record<string, string>> {
  const cookies: Record<string, string> = {};
  for (const key of keys) cookies[key] = await signIn(server.baseUrl, email(key), password);
  return cookies;
}

async function caseIds(server: RunningServer, cookie: string, query: string): Promise<string[]> {
  const response = await fetch(`${server.baseUrl}/api/v1/cases?${query}`, { headers: { cookie } });
  if (response.status !== 200) throw new Error(`case list answered ${response.status}`);
  const page = (await response.json()) as { items: { id: string }[] };
  return page.items.map((i) => i.id);
}

function readMix(cookies: Record<string, string>, review: string[], decided: string[]): LoadRequest[] {
  const arbiter = { cookie: cookies.arbiter };
  const plant = { cookie: cookies.plant };
  const mix: LoadRequest[] = [];
  const lists = [LIST_QUERY, 'pageSize=50&status=open,awaiting_sample&sort=dueAt&order=asc', 'pageSize=25&q=CS-2026&sort=number', 'pageSize=50&status=retest,review&overdue=true', 'pageSize=50&page=3'];
  for (let i = 0; i < 10; i++) {
    const id = i % 2 ? review[i % review.length] : decided[i % decided.length];
    mix.push({ label: 'case list', path: `/api/v1/cases?${lists[i % lists.length]}`, headers: arbiter });
    mix.push({ label: 'case JSON', path: `/api/v1/cases/${id}`, headers: arbiter });
    mix.push({ label: 'case page', path: `/cases/${id}`, headers: arbiter });
    if (i % 2 === 0) mix.push({ label: 'deliveries page', path: i % 4 ? '/deliveries?verdict=rejected,deducted' : '/deliveries', headers: plant });
  }
  return mix;
}

/**
 * Every request of the mix answers 200 before the load; then each is timed three times more on one
 * connection, so the table says which kind of request the load's latency is made of.
 */
async function checkMix(server: RunningServer, mix: LoadRequest[]): Promise<Record<string, number>> {
  const byLabel = new Map<string, number[]>();
  for (const request of mix) {
    const { status } = await timedGet(`${server.baseUrl}${request.path}`, request.headers);
    if (status !== 200) throw new Error(`${request.label} ${request.path} answered ${status} before the load`);
  }
  for (let round = 0; round < 3; round++) {
    for (const request of mix) {
      const { ms } = await timedGet(`${server.baseUrl}${request.path}`, request.headers);
      byLabel.set(request.label, [...(byLabel.get(request.label) ?? []), ms]);
    }
  }
  return Object.fromEntries([...byLabel].map(([label, samples]) => [label, summarise(samples, 0).p50]));
}

async function loadWithMemory(server: RunningServer, mix: LoadRequest[]): Promise<LoadResult & { peakRssMb: number }> {
  const rss = sampleRss(server.pid);
  const result = await runLoad(server.baseUrl, mix, { connections: 20, seconds: scale.loadSeconds });
  return { ...result, peakRssMb: rss.stop() };
}

async function readPhase(mail: { smtpPort: number; httpPort: number }): Promise<{ load: LoadResult & { peakRssMb: number }; list: Latency }> {
  log('read phase: next start on the embedded scale dataset');
  const server = await startServer({ database: { pgliteDir: scaleDir }, mail, logFile: path.join(logDir, 'server-pglite.log') });
  try {
    const cookies = await signInAll(server, ['arbiter', 'plant']);
    const review = await caseIds(server, cookies.arbiter, 'status=review&pageSize=20');
    const decided = await caseIds(server, cookies.arbiter, 'status=decided&pageSize=20');
    const arbiter = { cookie: cookies.arbiter };

    const list = await sequentialLatency(() => `${server.baseUrl}/api/v1/cases?${LIST_QUERY}`, arbiter, { warmup: scale.warmup, requests: scale.listRequests });
    log(`case list API: p50 ${ms(list.p50)}, p95 ${ms(list.p95)} over ${list.n}`);
    let n = 0;
    const page = await sequentialLatency(() => `${server.baseUrl}/cases/${review[n++ % review.length]}`, arbiter, { warmup: scale.warmup, requests: scale.pageRequests });
    log(`case page: p50 ${ms(page.p50)}, p95 ${ms(page.p95)} over ${page.n}`);
    details.caseList = list;
    details.casePage = page;
    row('GET /api/v1/cases p50 (1 connection)', ms(list.p50));
    row('GET /api/v1/cases p95 (1 connection)', ms(list.p95), '≤ 50 ms', list.p95 <= 50 && list.errors === 0);
    row('case page HTML p95, arbiter (1 connection)', ms(page.p95), '≤ 150 ms', page.p95 <= 150 && page.errors === 0);

    let browser: PageLoadFigures | null = null;
    try {
      browser = await measurePageLoad(`${server.baseUrl}/cases/${review[0]}`, cookies.arbiter, scale.pageLoads);
      details.browser = browser;
      log(`case page in Chromium: LCP median ${ms(browser.lcpMs)} of ${browser.lcpSamplesMs.map((x) => x.toFixed(0)).join(', ')}; ${browser.jsFiles} scripts, ${(browser.jsGzipBytes / 1024).toFixed(1)} kB gzip`);
      row('case page LCP, headless Chromium (median, cold cache)', ms(browser.lcpMs), '≤ 1000 ms', browser.lcpMs <= 1000);
      row('case page client JS (gzip -9 of scripts loaded)', `${(browser.jsGzipBytes / 1024).toFixed(1)} kB`, '≤ 250 kB', browser.jsGzipBytes <= 250 * 1024);
    } catch (error) {
      row('case page LCP, headless Chromium', `failed: ${(error as Error).message.slice(0, 80)}`, '≤ 1000 ms', false);
    }

    const mix = readMix(cookies, review, decided);
    const alone = await checkMix(server, mix);
    details.mixAlone = alone;
    log(`each kind alone, p50 on one connection: ${Object.entries(alone).map(([label, p50]) => `${label} ${ms(p50)}`).join(', ')}`);
    log(`mixed read load: 20 clients for ${scale.loadSeconds} s over ${mix.length} requests (${[...new Set(mix.map((m) => m.label))].join(', ')})`);
    const load = await loadWithMemory(server, mix);
    details.loadPglite = load;
    log(`PGlite load: ${load.requests} requests, ${load.rps.toFixed(0)} req/s, p99 ${ms(load.p99)}, errors ${load.errors}, peak RSS ${load.peakRssMb.toFixed(0)} MB`);
    row('mixed load, PGlite: requests/s', load.rps.toFixed(0));
    row('mixed load, PGlite: errors (incl. non-2xx)', String(load.errors), '0', load.errors === 0);
    row('mixed load, PGlite: p99', ms(load.p99), '≤ 500 ms', load.p99 <= 500);
    row('server RSS peak under load, PGlite', `${load.peakRssMb.toFixed(0)} MB`, '≤ 700 MB', load.peakRssMb <= 700);
    return { load, list };
  } finally {
    await server.stop();
  }
}

async function directPhase(list: Latency): Promise<void> {
  log('direct query: the list call through drizzle on the same folder, server stopped');
  const direct = await probe<Latency & { items: number }>(scaleDir, ['direct', LIST_QUERY], { PROBE_WARMUP: String(scale.warmup), PROBE_REQUESTS: String(scale.listRequests) });
  details.directList = direct;
  const ratio = list.p95 / direct.p95;
  log(`direct list: p50 ${ms(direct.p50)}, p95 ${ms(direct.p95)} (${direct.items} items); API/direct p95 ${ratio.toFixed(2)}×`);
  row('same list query direct (drizzle, in-process) p95', ms(direct.p95));
  row('list API p95 ÷ direct p95', `${ratio.toFixed(2)}×`, '≤ 3×', ratio <= 3);
}

async function writePhase(mail: MailSink): Promise<void> {
  const copy = path.join(root, 'data', 'scale', 'pglite-writes');
  fs.rmSync(copy, { recursive: true, force: true });
  fs.rmSync(`${copy}.lock`, { force: true });
  fs.cpSync(scaleDir, copy, { recursive: true });
  try {
    const ready = await probe<{ labOrganisationId: string; cases: { id: string; status: string; sealNumber: string | null }[] }>(copy, ['transitions']);
    const open = ready.cases.filter((c) => c.status === 'open').slice(0, scale.transitions / 2);
    const awaiting = ready.cases.filter((c) => c.status === 'awaiting_sample').slice(0, scale.transitions / 2);
    log(`write phase: ${open.length} dispatches and ${open.length ? awaiting.length : 0} receipts over HTTP on a copy of the dataset`);
    const server = await startServer({ database: { pgliteDir: copy }, mail, logFile: path.join(logDir, 'server-writes.log') });
    let figures: { done: number; errors: number; seconds: number; latency: Latency; firstErrors: string[] };
    let drain: { messages: number; seconds: number };
    try {
      const cookies = await signInAll(server, ['plant', 'lab']);
      const jobs = [
        ...open.map((c) => ({ id: c.id, transition: 'dispatch', cookie: cookies.plant, body: { labOrganisationId: ready.labOrganisationId, sealNumber: c.sealNumber, courier: 'Cool box 14 with data logger, by courier', temperature: 4.2, sealIntact: true } })),
        ...awaiting.map((c) => ({ id: c.id, transition: 'receive', cookie: cookies.lab, body: { sealNumber: c.sealNumber, sealIntact: true, frozen: false, temperature: 4.6, condition: 'Cool box intact, logger within range.' } })),
      ];
      // Interleaved, so both kinds of write contend at once as they would in a working day.
      jobs.sort((a, b) => a.id.localeCompare(b.id));
      const caughtBefore = await mail.received();
      const samples: number[] = [];
      const firstErrors: string[] = [];
      let next = 0;
      let errors = 0;
      const began = performance.now();
      const worker = async () => {
        while (next < jobs.length) {
          const job = jobs[next++];
          const t0 = performance.now();
          const response = await fetch(`${server.baseUrl}/api/v1/cases/${job.id}/transitions/${job.transition}`, {
            method: 'POST',
            headers: { cookie: job.cookie, 'content-type': 'application/json', origin: server.baseUrl },
            body: JSON.stringify(job.body),
          });
          const text = await response.text();
          samples.push(performance.now() - t0);
          if (response.status < 200 || response.status > 299) {
            errors++;
            if (firstErrors.length < 3) firstErrors.push(`${job.transition} ${response.status}: ${text.slice(0, 200)}`);
          }
        }
      };
      await Promise.all(Array.from({ length: 10 }, worker));
      const ended = performance.now();
      const seconds = (ended - began) / 1000;
      figures = { done: jobs.length, errors, seconds, latency: summarise(samples, errors), firstErrors };
      // The notices go out after the answers, from the server's delivery worker: wait until the
      // sink has had nothing new for three seconds, and say how long delivery ran past the burst.
      let count = -1;
      let lastChange = performance.now();
      while (performance.now() - lastChange < 3000 && performance.now() - ended < 180_000) {
        await new Promise((r) => setTimeout(r, 250));
        const received = await mail.received();
        if (received !== count) {
          count = received;
          lastChange = performance.now();
        }
      }
      drain = { messages: count - caughtBefore, seconds: Math.max(0, (lastChange - ended) / 1000) };
    } finally {
      await server.stop();
    }
    const chain = await probe<{ ok: boolean; checked: number; brokenAt?: number; reason?: string; seconds: number }>(copy, ['verify']);
    const rate = figures.done / figures.seconds;
    details.transitions = { ...figures, perSecond: rate, chain, mailDrain: drain };
    log(`notices of the burst: ${drain.messages} handed to SMTP, the last ${drain.seconds.toFixed(1)} s after the last answer`);
    log(`transitions: ${figures.done} in ${figures.seconds.toFixed(1)} s = ${rate.toFixed(0)}/s, p50 ${ms(figures.latency.p50)}, errors ${figures.errors}${figures.firstErrors.length ? ` (${figures.firstErrors.join(' | ')})` : ''}; chain ${chain.ok ? 'intact' : `BROKEN at ${chain.brokenAt}`} (${chain.checked} events, ${chain.seconds.toFixed(1)} s)`);
    row('transitions/s over HTTP, PGlite, 10 at once', rate.toFixed(0), '≥ 100/s', rate >= 100 && figures.errors === 0);
    row('transition errors', String(figures.errors), '0', figures.errors === 0);
    row('their notices delivered after the burst (background worker)', `${drain.messages} in +${drain.seconds.toFixed(1)} s`);
    row('audit chain after the writes', chain.ok ? `intact (${chain.checked} events)` : `broken at #${chain.brokenAt}`, 'intact', chain.ok);
  } finally {
    fs.rmSync(copy, { recursive: true, force: true });
    fs.rmSync(`${copy}.lock`, { force: true });
  }
}

async function postgresPhase(mail: { smtpPort: number; httpPort: number }, pglite: LoadResult): Promise<void> {
  const url = process.env.BENCH_DATABASE_URL;
  if (!url) {
    const message = 'skipped: no PostgreSQL server (set BENCH_DATABASE_URL)';
    log(`PostgreSQL: ${message}`);
    row('mixed load, PostgreSQL', message);
    return;
  }
  log('PostgreSQL: making sure the same dataset is there (migrate, then generate if missing)');
  const generation = Date.now();
  await runScript('bench/scale-data.ts', [], { DATABASE_URL: url, PGLITE_DIR: '' }, 'scale-data-postgres.log');
  log(`PostgreSQL dataset ready in ${((Date.now() - generation) / 1000).toFixed(0)} s`);
  const server = await startServer({ database: { url }, mail, logFile: path.join(logDir, 'server-postgres.log') });
  try {
    const cookies = await signInAll(server, ['arbiter', 'plant']);
    const review = await caseIds(server, cookies.arbiter, 'status=review&pageSize=20');
    const decided = await caseIds(server, cookies.arbiter, 'status=decided&pageSize=20');
    const list = await sequentialLatency(() => `${server.baseUrl}/api/v1/cases?${LIST_QUERY}`, { cookie: cookies.arbiter }, { warmup: scale.warmup, requests: scale.listRequests });
    const mix = readMix(cookies, review, decided);
    const alone = await checkMix(server, mix);
    details.mixAlonePostgres = alone;
    log(`each kind alone, p50 on one connection: ${Object.entries(alone).map(([label, p50]) => `${label} ${ms(p50)}`).join(', ')}`);
    const load = await loadWithMemory(server, mix);
    details.listPostgres = list;
    details.loadPostgres = load;
    log(`PostgreSQL load: ${load.requests} requests, ${load.rps.toFixed(0)} req/s, p99 ${ms(load.p99)}, errors ${load.errors}, peak RSS ${load.peakRssMb.toFixed(0)} MB; list p95 ${ms(list.p95)}`);
    row('GET /api/v1/cases p95, PostgreSQL (1 connection)', ms(list.p95), '≤ 50 ms', list.p95 <= 50);
    row('mixed load, PostgreSQL: requests/s', `${load.rps.toFixed(0)} (${(load.rps / pglite.rps).toFixed(2)}× PGlite)`);
    row('mixed load, PostgreSQL: errors (incl. non-2xx)', String(load.errors), '0', load.errors === 0);
    row('mixed load, PostgreSQL: p99', `${ms(load.p99)} (${(load.p99 / pglite.p99).toFixed(2)}× PGlite)`, '≤ 500 ms', load.p99 <= 500);
    row('server RSS peak under load, PostgreSQL', `${load.peakRssMb.toFixed(0)} MB`, '≤ 700 MB', load.peakRssMb <= 700);
  } finally {
    await server.stop();
  }
}

function printTable(): void {
  const width = [Math.max(...rows.map((r) => r.metric.length)), Math.max(...rows.map((r) => r.value.length)), Math.max(...rows.map((r) => r.target.length))];
  const line = (a: string, b: string, c: string, d: string) => `${a.padEnd(width[0])}  ${b.padStart(width[1])}  ${c.padEnd(width[2])}  ${d}`;
  console.log(`\n${line('metric', 'value', 'target', 'result')}`);
  console.log('-'.repeat(width[0] + width[1] + width[2] + 14));
  for (const r of rows) console.log(line(r.metric, r.value, r.target, r.pass === null ? '' : r.pass ? 'pass' : 'MISS'));
}

async function main(): Promise<number> {
  const machine = { cores: os.cpus().length, node: process.version, loadAverage: os.loadavg().map((x) => Number(x.toFixed(2))), quick, only: only ?? 'all' };
  log(`machine: ${machine.cores} cores, Node ${machine.node}, load average ${machine.loadAverage.join(' ')}${quick ? ' (--quick)' : ''}; logs in ${logDir}`);

  if (!fs.existsSync(manifestFile) || !fs.existsSync(scaleDir)) {
    log('generating the scale dataset (npm run bench:data)…');
    await runScript('bench/scale-data.ts', [], { PGLITE_DIR: '', DATABASE_URL: '' }, 'scale-data.log');
  }
  const manifest = JSON.parse(fs.readFileSync(manifestFile, 'utf8')) as { seconds: number; counts: Record<string, number> };
  details.dataset = manifest;
  log(`dataset: ${manifest.counts.farms} farms, ${manifest.counts.deliveries} deliveries, ${manifest.counts.cases} cases, ${manifest.counts.auditEvents} audit events (generated in ${manifest.seconds.toFixed(0)} s)`);

  if (skipBuild && hasBuild()) log(`reusing the build in ${BENCH_DIST_DIR}`);
  else {
    log(`building into ${BENCH_DIST_DIR}…`);
    log(`built in ${buildApp(path.join(logDir, 'build.log')).toFixed(0)} s`);
  }

  if (runs('reads')) {
    log(`assess: ${scale.assessSeconds} s loop on one thread`);
    const assessFigures = assessRate({ seconds: scale.assessSeconds });
    details.assess = assessFigures;
    row('assess proposals/s, one core', assessFigures.perSecond.toFixed(0), '≥ 50000/s', assessFigures.perSecond >= 50_000);
  }

  const sink = await startMailSink();
  try {
    if (runs('reads')) {
      const { load, list } = await readPhase(sink);
      await directPhase(list);
      if (runs('writes')) await writePhase(sink);
      await postgresPhase(sink, load);
    } else await writePhase(sink);
  } finally {
    await sink.close();
  }

  printTable();
  console.log(`\n${machine.cores} cores, Node ${machine.node}, load average at start ${machine.loadAverage.join(' ')}${quick ? '; --quick run' : ''}${only ? `; --only=${only}` : ''}.`);
  const results = { at: new Date().toISOString(), machine, rows, details };
  fs.writeFileSync(path.join(root, 'bench', 'results.json'), `${JSON.stringify(results, null, 2)}\n`);
  log('wrote bench/results.json');
  return rows.every((r) => r.pass !== false) ? 0 : 1;
}

let code = 1;
try {
  code = await main();
} catch (error) {
  console.error('bench failed:', error);
} finally {
  if (process.env.BENCH_KEEP_LOGS !== '1' && code === 0) fs.rmSync(logDir, { recursive: true, force: true });
}
process.exit(code);
