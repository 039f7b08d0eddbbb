// The browser tests' runner: a production build, a throw-away embedded database with the demo
// scenario, the mail catcher, the local upload service and `next start` on free ports, then the specs under Vitest.
// Everything it starts is stopped at the end, whatever happened.
import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import fs from 'node:fs';
import net from 'node:net';
import os from 'node:os';
import path from 'node:path';
import { register } from 'node:module';
import { fileURLToPath, pathToFileURL } from 'node:url';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..', '..');
process.chdir(root);
// The seed runs the app's server modules in this process, outside Next.js, where 'server-only' throws.
register('./scripts/server-only-hooks.mjs', pathToFileURL(`${root}${path.sep}`));

const DEMO_PASSWORD = process.env.DEMO_PASSWORD || 'countersample-demo';
const distDir = process.env.NEXT_DIST_DIR || '.next';
const nextBin = path.join(root, 'node_modules', 'next', 'dist', 'bin', 'next');
const vitestBin = path.join(root, 'node_modules', 'vitest', 'vitest.mjs');
const started = Date.now();

const log = (message: string) => console.log(`[e2e ${((Date.now() - started) / 1000).toFixed(1).padStart(5)} s] ${message}`);

/** Newest modification time among the inputs of `next build`. */
function newestSourceTime(): number {
  const inputs = ['app', 'components', 'lib', 'db', 'public', 'proxy.ts', 'instrumentation.ts', 'next.config.ts', 'postcss.config.mjs', 'tsconfig.json', 'package.json', 'package-lock.json'];
  let newest = 0;
  const visit = (entry: string) => {
    if (!fs.existsSync(entry)) return;
    const stat = fs.statSync(entry);
    // A folder's own time counts too: deleting or renaming a file changes only that.
    newest = Math.max(newest, stat.mtimeMs);
    if (stat.isDirectory()) {
      for (const child of fs.readdirSync(entry)) if (child !== 'node_modules' && !child.startsWith('.')) visit(path.join(entry, child));
    }
  };
  inputs.forEach(visit);
  return newest;
}

function buildReason(): string | null {
  if (process.env.CI === 'true') return 'CI=true';
  const buildId = path.join(distDir, 'BUILD_ID');
  if (!fs.existsSync(buildId)) return `${buildId} is missing`;
  if (newestSourceTime() > fs.statSync(buildId).mtimeMs) return 'sources changed since the last build';
  return null;
}

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

async function waitForServer(url: string, server: ChildProcess, timeoutMs: number): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  while (Date.now() < deadline) {
    if (server.exitCode !== null) throw new Error(`next start exited with code ${server.exitCode} before it was ready`);
    try {
      const response = await fetch(url, { redirect: 'manual', signal: AbortSignal.timeout(5000) });
      if (response.status === 200) return;
    } catch {
      // Not listening yet.
    }
    await new Promise((resolve) => setTimeout(resolve, 250));
  }
  throw new Error(`${url} did not answer 200 within ${timeoutMs / 1000} s`);
}

function stopProcess(child: ChildProcess | null): Promise<void> {
  if (!child || child.exitCode !== null || child.signalCode !== null) return Promise.resolve();
  return new Promise((resolve) => {
    const force = setTimeout(() => child.kill('SIGKILL'), 5000);
    child.once('exit', () => {
      clearTimeout(force);
      resolve();
    });
    child.kill('SIGTERM');
  });
}

type Summary = { passed: number; failed: number; skipped: number; files: number };

function readSummary(file: string): Summary | null {
  try {
    const report = JSON.parse(fs.readFileSync(file, 'utf8')) as { numPassedTests: number; numFailedTests: number; numPendingTests: number; numTodoTests: number; testResults: unknown[] };
    return { passed: report.numPassedTests, failed: report.numFailedTests, skipped: report.numPendingTests + report.numTodoTests, files: report.testResults.length };
  } catch {
    return null;
  }
}

const workDir = fs.mkdtempSync(path.join(os.tmpdir(), 'countersample-e2e-'));
let server: ChildProcess | null = null;
let catcher: { close: () => Promise<void> } | null = null;
let uploadService: { close: () => Promise<void> } | null = null;
let specs: ChildProcess | null = null;
let cleanedUp = false;

async function cleanUp(): Promise<void> {
  if (cleanedUp) return;
  cleanedUp = true;
  await stopProcess(specs);
  await stopProcess(server);
  await catcher?.close().catch(() => undefined);
  await uploadService?.close().catch(() => undefined);
  if (process.env.E2E_KEEP_DATA !== '1') fs.rmSync(workDir, { recursive: true, force: true });
}

for (const signal of ['SIGINT', 'SIGTERM'] as const) {
  process.on(signal, () => {
    log(`${signal}: stopping the server and the mail catcher`);
    void cleanUp().then(() => process.exit(130));
  });
}

async function main(): Promise<number> {
  const reason = buildReason();
  if (reason) {
    log(`building the app (${reason})`);
    const build = spawnSync(process.execPath, [nextBin, 'build'], { stdio: 'inherit', env: { ...process.env, NEXT_TELEMETRY_DISABLED: '1' } });
    if (build.status !== 0) {
      console.error('e2e: next build failed');
      return 1;
    }
  } else log(`reusing the build in ${distDir}`);

  const port = await freePort();
  const baseUrl = `http://localhost:${port}`;
  const dataDir = path.join(workDir, 'pglite');

  // Seed in this process, with the same settings the server will read, then let go of the folder.
  delete process.env.DATABASE_URL;
  Object.assign(process.env, { APP_ENV: 'demo', PGLITE_DIR: dataDir, BETTER_AUTH_URL: baseUrl, DEMO_PASSWORD });
  const { startMailCatcher } = await import('../../lib/mail/catcher');
  const mail = await startMailCatcher({ smtpPort: 0, httpPort: 0 });
  catcher = mail;
  process.env.SMTP_URL = `smtp://127.0.0.1:${mail.smtpPort}`;
  process.env.MAIL_CATCHER_URL = `http://127.0.0.1:${mail.httpPort}`;
  log(`mail catcher on SMTP ${mail.smtpPort}, HTTP ${mail.httpPort}`);

  // Uploads go to a local upload service with its own throw-away storage, whatever the shell has set.
  const { startUploadService } = await import('../../lib/upload-service/server');
  const { uploadThingEnv } = await import('../../lib/upload-service/config');
  const { LOCAL_UPLOAD_API_KEY, LOCAL_UPLOAD_APP_ID } = await import('../../lib/env');
  const uploads = await startUploadService({ port: 0, storageDir: path.join(workDir, 'uploads'), apiKey: LOCAL_UPLOAD_API_KEY, appId: LOCAL_UPLOAD_APP_ID });
  uploadService = uploads;
  Object.assign(process.env, uploadThingEnv({ origin: uploads.origin, apiKey: LOCAL_UPLOAD_API_KEY, appId: LOCAL_UPLOAD_APP_ID, callbackUrl: `${baseUrl}/api/uploadthing` }));
  log(`upload service on ${uploads.origin}`);

  const fixtures = await seed(baseUrl);
  log(`demo scenario seeded in a temporary embedded database`);

  const serverLog = path.join(workDir, 'next-start.log');
  const serverOut = fs.openSync(serverLog, 'a');
  server = spawn(process.execPath, [nextBin, 'start', '-p', String(port)], {
    stdio: ['ignore', serverOut, serverOut],
    env: { ...process.env, NODE_ENV: 'production', NEXT_TELEMETRY_DISABLED: '1', PORT: String(port) },
  });
  try {
    await waitForServer(`${baseUrl}/sign-in`, server, 90_000);
  } catch (error) {
    console.error(`e2e: ${(error as Error).message}\n--- server log ---\n${fs.readFileSync(serverLog, 'utf8').slice(-4000)}`);
    return 1;
  }
  log(`next start ready on ${baseUrl}`);

  const artifactsDir = path.join(root, 'tests', 'e2e', 'artifacts');
  fs.mkdirSync(artifactsDir, { recursive: true });
  const reportFile = path.join(workDir, 'results.json');
  specs = spawn(
    process.execPath,
    [vitestBin, 'run', '--config', 'tests/e2e/vitest.e2e.config.ts', '--reporter=default', '--reporter=json', `--outputFile.json=${reportFile}`, ...process.argv.slice(2)],
    {
      stdio: 'inherit',
      env: {
        ...process.env,
        E2E_FIXTURES: JSON.stringify({ ...fixtures, baseUrl, mailUrl: process.env.MAIL_CATCHER_URL, artifactsDir, password: DEMO_PASSWORD }),
      },
    },
  );
  const code = await new Promise<number>((resolve) => specs!.once('exit', (exitCode) => resolve(exitCode ?? 1)));
  specs = null;

  const summary = readSummary(reportFile);
  const seconds = ((Date.now() - started) / 1000).toFixed(1);
  if (!summary) {
    console.log(`\nE2E: no results (the spec runner exited with code ${code}) in ${seconds} s`);
    return code || 1;
  }
  if (code !== 0 || summary.failed > 0) {
    console.log(`--- last lines of the server log ---\n${fs.readFileSync(serverLog, 'utf8').slice(-3000)}`);
  }
  console.log(`\nE2E: ${summary.passed} passed, ${summary.failed} failed${summary.skipped ? `, ${summary.skipped} skipped` : ''} in ${summary.files} files, ${seconds} s — ${code === 0 && summary.failed === 0 ? 'PASSED' : 'FAILED'}`);
  return code === 0 && summary.failed === 0 ? 0 : 1;
}

/** Migrates and seeds the demo, and prepares what the specs need to know about it. */
async function seed(baseUrl: string) {
  const { migrate } = await import('../../db/migrate');
  const { closeDb, getDb } = await import('../../db/client');
  const { seedDemo } = await import('../../db/seed/demo');
  const { getAuth } = await import('../../lib/auth/auth');
  const { demoUsers, demoOrganisations } = await import('../../db/seed/demo-names');
  const schema = await import('../../db/schema');
  const { eq } = await import('drizzle-orm');
  try {
    await migrate();
    const db = getDb();
    await seedDemo(db, { password: DEMO_PASSWORD });

    // Sessions for the HTTP walk, opened here through the API: the browser specs are the only ones
    // that sign in through the form, and the server's sign-in rate limit applies to the form alone.
    const cookies: Record<string, string> = {};
    for (const u of demoUsers) {
      const response = await getAuth().api.signInEmail({ body: { email: u.email, password: DEMO_PASSWORD }, asResponse: true });
      if (response.status !== 200) throw new Error(`seeding: sign-in of ${u.email} answered ${response.status}`);
      cookies[u.key] = response.headers.getSetCookie().map((c) => c.split(';')[0]).join('; ');
    }

    const cases = await db
      .select({ id: schema.disputeCase.id, number: schema.disputeCase.number, status: schema.disputeCase.status, deliveryId: schema.disputeCase.deliveryId, supplier: schema.organisation.name })
      .from(schema.disputeCase)
      .innerJoin(schema.organisation, eq(schema.organisation.id, schema.disputeCase.supplierOrganisationId));
    const firstSupplier = demoOrganisations.suppliers[0].name;
    const ofFirstSupplier = cases.filter((c) => c.supplier === firstSupplier);
    const caseOfSupplier = ofFirstSupplier.find((c) => c.status === 'review') ?? ofFirstSupplier[0];
    if (!caseOfSupplier) throw new Error(`seeding: no case of ${firstSupplier}`);
    return {
      baseUrlAtSeed: baseUrl,
      accounts: demoUsers.map((u) => ({ key: u.key, email: u.email, name: u.name, role: u.role })),
      cookies,
      caseOfSupplier: { id: caseOfSupplier.id, number: caseOfSupplier.number },
      deliveryOfSupplier: { id: caseOfSupplier.deliveryId },
    };
  } finally {
    await closeDb();
  }
}

let exitCode = 1;
try {
  exitCode = await main();
} catch (error) {
  console.error('e2e: the runner failed:', error);
  exitCode = 1;
} finally {
  await cleanUp();
}
process.exit(exitCode);
