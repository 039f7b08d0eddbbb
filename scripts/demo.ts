import { spawn, spawnSync } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';

// The demo runs the production build against the embedded database, the local mail catcher and the local upload service.
process.env.APP_ENV ??= 'demo';
const port = process.env.PORT ?? '3000';
process.env.BETTER_AUTH_URL ??= `http://localhost:${port}`;

const { migrate } = await import('../db/migrate');
const { closeDb, getDb } = await import('../db/client');
const { seedDemo } = await import('../db/seed/demo');
const { env } = await import('../lib/env');
const { startLocalServices } = await import('./local-services');

const settings = env();
console.log(`Database: ${settings.DATABASE_URL ? 'PostgreSQL server' : `embedded, in ${settings.PGLITE_DIR}`}`);
await migrate();
const seed = await seedDemo(getDb(), { password: settings.DEMO_PASSWORD });
console.log(seed.seeded ? 'Demo scenario seeded.' : 'Demo scenario already present.');
// The server process opens the embedded database next; this one must let go of it first.
await closeDb();

const services = await startLocalServices(settings);
const closeServices = services.close;

const nextBin = path.join(process.cwd(), 'node_modules', 'next', 'dist', 'bin', 'next');
if (process.env.DEMO_SKIP_BUILD !== '1' || !fs.existsSync(path.join(process.env.NEXT_DIST_DIR || '.next', 'BUILD_ID'))) {
  console.log('Building the production app…');
  const build = spawnSync(process.execPath, [nextBin, 'build'], { stdio: 'inherit', env: process.env });
  if (build.status !== 0) {
    await closeServices();
    process.exit(build.status ?? 1);
  }
}

const server = spawn(process.execPath, [nextBin, 'start', '-p', port], { stdio: ['ignore', 'inherit', 'inherit'], env: process.env });
const stop = async () => {
  server.kill('SIGTERM');
  await closeServices();
};
process.on('SIGINT', () => void stop().then(() => process.exit(0)));
process.on('SIGTERM', () => void stop().then(() => process.exit(0)));
server.on('exit', (code) => void closeServices().then(() => process.exit(code ?? 0)));

console.log(`\nCountersample demo on http://localhost:${port}\nAccounts (password: ${process.env.DEMO_PASSWORD ? 'as set in DEMO_PASSWORD' : settings.DEMO_PASSWORD}):`);
for (const account of seed.accounts) console.log(`  ${account.email.padEnd(38)} ${account.role.padEnd(9)} ${account.organisation}`);
