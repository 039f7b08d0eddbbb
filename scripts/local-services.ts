// The services a local app talks to, for `npm run demo` and `npm run dev`: the mail catcher on the
// SMTP_URL port, and the local upload service unless a hosted UPLOADTHING_TOKEN is set. The
// UPLOADTHING_* settings that point the app at the service go into this process's environment,
// which the Next.js server inherits.
import fs from 'node:fs';
import path from 'node:path';
import type { Env } from '../lib/env';

export async function startLocalServices(settings: Env): Promise<{ close: () => Promise<void> }> {
  const { startMailCatcher } = await import('../lib/mail/catcher');
  const { startUploadService } = await import('../lib/upload-service/server');
  const { uploadThingSettings } = await import('../lib/upload-service/settings');

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
  return { close: () => (closing ??= Promise.all([catcher.close(), uploadService?.close()]).then(() => undefined)) };
}
