// `npm run dev`: `next dev` beside the local mail catcher and the local upload service, with the
// UPLOADTHING_* settings that point the app at it (unless a hosted UPLOADTHING_TOKEN is set).
import { spawn } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';

process.env.APP_ENV ??= 'development';
const port = process.env.PORT ?? '3000';
process.env.BETTER_AUTH_URL ??= `http://localhost:${port}`;

const { env } = await import('../lib/env');
const { startMailCatcher } = await import('../lib/mail/catcher');
const { startUploadService } = await import('../lib/upload-service/server');
const { uploadThingSettings } = await import('../lib/upload-service/settings');

const settings = env();
const smtp = new URL(settings.SMTP_URL);
const catcherHttp = new URL(settings.MAIL_CATCHER_URL);
const storeFile = path.join(process.cwd(), 'data', 'caught-mail.jsonl');
fs.mkdirSync(path.dirname(storeFile), { recursive: true });
const catcher = await startMailCatcher({ smtpPort: Number(smtp.port || 1025), httpPort: Number(catcherHttp.port || 1080), storeFile });
console.log(`Mail catcher: SMTP 127.0.0.1:${catcher.smtpPort}; caught mail on the Outbox page.`);

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
const server = spawn(process.execPath, [nextBin, 'dev', '-p', port], { stdio: ['ignore', 'inherit', 'inherit'], env: process.env });
const stop = () => {
  server.kill('SIGTERM');
  void closeServices().then(() => process.exit(0));
};
process.on('SIGINT', stop);
process.on('SIGTERM', stop);
server.on('exit', (code) => void closeServices().then(() => process.exit(code ?? 0)));
