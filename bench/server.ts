import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import fs from 'node:fs';
import net from 'node:net';
import path from 'node:path';

/** The benchmark's own build folder, so it never clobbers a developer's or the browser tests' build. */
export const BENCH_DIST_DIR = '.next-bench';
const nextBin = () => path.join(process.cwd(), 'node_modules', 'next', 'dist', 'bin', 'next');

export function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const server = net.createServer();
    server.once('error', reject);
    server.listen(0, '127.0.0.1', () => {
      const { port } = server.address() as net.AddressInfo;
      server.close(() => resolve(port));
    });
  });
}

export function hasBuild(): boolean {
  return fs.existsSync(path.join(BENCH_DIST_DIR, 'BUILD_ID'));
}

/**
 * `next build` into the bench folder. The build adds its folder's type globs to tsconfig.json's
 * "include"; they are taken out again so the shared file stays as it was.
 */
export function buildApp(logFile: string): number {
  const started = Date.now();
  const out = fs.openSync(logFile, 'a');
  const result = spawnSync(process.execPath, [nextBin(), 'build'], {
    stdio: ['ignore', out, out],
    // Types are the business of `npm run typecheck`; work in progress elsewhere must not stop a measurement.
    env: { ...process.env, NEXT_DIST_DIR: BENCH_DIST_DIR, NEXT_TELEMETRY_DISABLED: '1', NEXT_BUILD_SKIP_TYPECHECK: '1' },
  });
  fs.closeSync(out);
  removeBuildIncludes();
  if (result.status !== 0) throw new Error(`next build failed (exit ${result.status}); see ${logFile}`);
  return (Date.now() - started) / 1000;
}

function removeBuildIncludes(): void {
  const file = path.join(process.cwd(), 'tsconfig.json');
  const config = JSON.parse(fs.readFileSync(file, 'utf8')) as { include?: string[] };
  const kept = (config.include ?? []).filter((entry) => !entry.startsWith(`${BENCH_DIST_DIR}/`));
  if (kept.length === (config.include ?? []).length) return;
  config.include = kept;
  fs.writeFileSync(file, `${JSON.stringify(config, null, 2)}\n`);
}

export type RunningServer = { baseUrl: string; pid: number; child: ChildProcess; stop: () => Promise<void> };

/** `next start` on a free port against one database; the scheduler is off so no reminder mail skews the figures. */
export async function startServer(options: { database: { pgliteDir: string } | { url: string }; mail: { smtpPort: number; httpPort: number }; logFile: string }): Promise<RunningServer> {
  const port = await freePort();
  const baseUrl = `http://localhost:${port}`;
  const env: NodeJS.ProcessEnv = {
    ...process.env,
    NODE_ENV: 'production',
    NEXT_TELEMETRY_DISABLED: '1',
    NEXT_DIST_DIR: BENCH_DIST_DIR,
    APP_ENV: 'demo',
    PORT: String(port),
    BETTER_AUTH_URL: baseUrl,
    SMTP_URL: `smtp://127.0.0.1:${options.mail.smtpPort}`,
    MAIL_CATCHER_URL: `http://127.0.0.1:${options.mail.httpPort}`,
    COUNTERSAMPLE_SCHEDULER: 'off',
  };
  if ('url' in options.database) {
    env.DATABASE_URL = options.database.url;
    delete env.PGLITE_DIR;
  } else {
    delete env.DATABASE_URL;
    env.PGLITE_DIR = options.database.pgliteDir;
  }
  const out = fs.openSync(options.logFile, 'a');
  // BENCH_SERVER_NODE_ARGS passes flags Node refuses in NODE_OPTIONS, such as --cpu-prof, to the server alone.
  const nodeArgs = (process.env.BENCH_SERVER_NODE_ARGS ?? '').split(' ').filter(Boolean);
  const child = spawn(process.execPath, [...nodeArgs, nextBin(), 'start', '-p', String(port)], { stdio: ['ignore', out, out], env });
  fs.closeSync(out);
  const stop = () =>
    new Promise<void>((resolve) => {
      if (child.exitCode !== null || child.signalCode !== null) return resolve();
      const force = setTimeout(() => child.kill('SIGKILL'), 8000);
      child.once('exit', () => {
        clearTimeout(force);
        resolve();
      });
      child.kill('SIGTERM');
    });
  const deadline = Date.now() + 90_000;
  for (;;) {
    if (child.exitCode !== null) throw new Error(`next start exited with code ${child.exitCode}; see ${options.logFile}`);
    try {
      const response = await fetch(`${baseUrl}/sign-in`, { redirect: 'manual', signal: AbortSignal.timeout(10_000) });
      if (response.status === 200) break;
    } catch {
      // Not listening yet.
    }
    if (Date.now() > deadline) {
      await stop();
      throw new Error(`${baseUrl} did not answer within 90 s; see ${options.logFile}`);
    }
    await new Promise((resolve) => setTimeout(resolve, 250));
  }
  return { baseUrl, pid: child.pid!, child, stop };
}

/** Signs in through better-auth's HTTP API, as a browser would, and returns the session cookie header. */
export async function signIn(baseUrl: string, email: string, password: string): Promise<string> {
  const response = await fetch(`${baseUrl}/api/auth/sign-in/email`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', origin: baseUrl },
    body: JSON.stringify({ email, password }),
  });
  if (response.status !== 200) throw new Error(`sign-in of ${email} answered ${response.status}: ${(await response.text()).slice(0, 300)}`);
  const cookie = response.headers.getSetCookie().map((c) => c.split(';')[0]).join('; ');
  if (!cookie) throw new Error(`sign-in of ${email} set no cookie`);
  return cookie;
}
