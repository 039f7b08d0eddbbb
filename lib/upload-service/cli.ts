// `npm run uploads:service`: the local upload service on UPLOAD_SERVICE_PORT, storing under UPLOAD_SERVICE_DIR.
import path from 'node:path';
import { env } from '../env';
import { startUploadService } from './server';
import { uploadThingSettings } from './settings';

const settings = env();
const upload = uploadThingSettings(settings);
if (!upload.local) console.warn('UPLOADTHING_TOKEN names a hosted service; this local one answers only apps configured with UPLOADTHING_INGEST_URL pointing here.');
const storageDir = path.resolve(settings.UPLOAD_SERVICE_DIR);
const service = await startUploadService({
  port: upload.servicePort ?? settings.UPLOAD_SERVICE_PORT,
  storageDir,
  apiKey: upload.apiKey,
  appId: upload.appId,
  log: (line) => console.log(`[uploads] ${line}`),
});
console.log(`Upload service on ${service.origin} for app ${upload.appId}, files in ${storageDir}`);

let stopping = false;
const stop = () => {
  if (stopping) return;
  stopping = true;
  void service.close().then(
    () => process.exit(0),
    (error: Error) => {
      console.error(`Upload service did not close cleanly: ${error.message}`);
      process.exit(1);
    },
  );
};
process.on('SIGINT', stop);
process.on('SIGTERM', stop);
