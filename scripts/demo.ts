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
const { startMailCatcher } = await import('../lib/mail/catcher');
const { startUploadService } = await import('../lib/upload-service/server');
const { uploadThingSettings } = await import('../lib/upload-service/settings');

const settings = env();
console.log(`Database: ${settings.DATABASE_URL ? 'PostgreSQL server' : `embedded, in ${settings.PGLITE_DIR}`}`);
await migrate();
const seed = await seedDemo(getDb(), { password: settings.DEMO_PASSWORD });
console.log(seed.seeded ? 'Demo scenario seeded.' : 'Demo scenario already present.');
// The server process opens the embedded database next; this one must let go of it first.
await closeDb();

const smtp = new URL(settings.SMTP_URL);
const catcherHttp = new URL(settings.MAIL_CATCHER_URL);
const storeFile = path.join(process.cwd(), 'data', 'caught-mail.jsonl');
fs.mkdirSync(path.dirname(storeFile), { recursive: true });
const catcher = await startMailCatcher({ smtpPort: Number(smtp.port || 1025), httpPort: Number(catcherHttp.port || 1080), storeFile });
console.log(`Mail catcher: SMTP 127.0.0.1:${catcher.smtpPort}; caught mail on the Outbox page.`);

// The app reads the UPLOADTHING_* settings; without a hosted token they name the local service.
const uploads = uploadThingSettings(settings);
Object.assign(process.env, uploads.vars);
const uploadService = uploads.local
  ? await startUploadService({
      port: uploads.servicePort ?? settings.UPLOAD_SERVICE_PORT,
      storageDir: path.resolve(settings.UPLOAD_SERVICE_DIR),
      apiKey: uploads.apiKey,
      appId: uploads.appId,
      log: (line) => console.log(`[uploads] ${line}`),
    })
  : null;
console.log(uploadService ? `Upload service: ${uploadService.origin}, files in ${settings.UPLOAD_SERVICE_DIR}/` : 'Uploads: the hosted service named by UPLOADTHING_TOKEN');
let closing: Promise<void> | undefined;
const closeServices = () => (closing ??= Promise.all([catcher.close(), uploadService?.close()]).then(() => undefined));

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
