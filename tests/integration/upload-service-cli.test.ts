// The upload service as `npm run uploads:service` runs it, and the settings that choose a service.
import { spawn } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { EnvError, LOCAL_UPLOAD_API_KEY, LOCAL_UPLOAD_APP_ID, parseEnv } from '@/lib/env';
import { decodeUploadThingToken, uploadThingEnv, uploadThingToken } from '@/lib/upload-service/config';
import { uploadThingSdkConfig, uploadThingSettings } from '@/lib/upload-service/settings';

const hostedToken = uploadThingToken({ apiKey: 'sk_live_hosted_example', appId: 'hostedexample', region: 'fra1' });
const folders: string[] = [];

afterAll(() => {
  for (const folder of folders) fs.rmSync(folder, { recursive: true, force: true });
});

describe('upload settings', () => {
  it('points a laptop at the local service with the development key', () => {
    const settings = uploadThingSettings(parseEnv({ BETTER_AUTH_URL: 'http://localhost:4100' }));
    expect(settings).toMatchObject({ local: true, servicePort: 3900, apiKey: LOCAL_UPLOAD_API_KEY, appId: LOCAL_UPLOAD_APP_ID });
    expect(settings.vars).toMatchObject({
      UPLOADTHING_INGEST_URL: 'http://localhost:3900',
      UPLOADTHING_API_URL: 'http://localhost:3900',
      UPLOADTHING_UFS_HOST: 'localhost:3900',
      UPLOADTHING_UFS_APP_ID_LOCATION: 'path',
      UPLOADTHING_CALLBACK_URL: 'http://localhost:4100/api/uploadthing',
    });
    expect(decodeUploadThingToken(settings.vars.UPLOADTHING_TOKEN)).toEqual({ apiKey: LOCAL_UPLOAD_API_KEY, appId: LOCAL_UPLOAD_APP_ID, regions: ['local'] });
    expect(uploadThingSdkConfig(parseEnv({ UPLOAD_SERVICE_PORT: '3911' }))).toMatchObject({ ingestUrl: 'http://localhost:3911', ufsHost: 'localhost:3911', ufsAppIdLocation: 'path', isDev: false });
  });

  it('passes a hosted token through untouched and adds no local addresses', () => {
    const settings = uploadThingSettings(parseEnv({ APP_ENV: 'production', BETTER_AUTH_SECRET: 'x'.repeat(48), UPLOADTHING_TOKEN: hostedToken }));
    expect(settings).toEqual({ local: false, servicePort: null, apiKey: 'sk_live_hosted_example', appId: 'hostedexample', vars: { UPLOADTHING_TOKEN: hostedToken } });
  });

  it('refuses production without a token of its own, and with the development key', () => {
    const production = { APP_ENV: 'production', BETTER_AUTH_SECRET: 'x'.repeat(48) };
    expect(() => uploadThingSettings(parseEnv(production))).toThrow(EnvError);
    expect(() => uploadThingSettings(parseEnv(production))).toThrow(/UPLOADTHING_TOKEN: must be set in production/);
    const localToken = uploadThingToken({ apiKey: LOCAL_UPLOAD_API_KEY, appId: LOCAL_UPLOAD_APP_ID });
    expect(() => parseEnv({ ...production, UPLOADTHING_TOKEN: localToken })).toThrow(/UPLOADTHING_TOKEN: must not carry the local development key/);
  });

  it('names a malformed token and a malformed port', () => {
    expect(() => parseEnv({ UPLOADTHING_TOKEN: Buffer.from('{"apiKey":"pk_x","appId":"a","regions":["r"]}').toString('base64') })).toThrow(/UPLOADTHING_TOKEN: .*apiKey/);
    expect(() => parseEnv({ UPLOAD_SERVICE_PORT: 'ninety' })).toThrow(/UPLOAD_SERVICE_PORT/);
  });

  it('will not address an http service by IP address, where the SDK would sign https file URLs', () => {
    expect(() => uploadThingEnv({ origin: 'http://127.0.0.1:3900', apiKey: 'sk_x', appId: 'a' })).toThrow(/localhost/);
  });
});

describe('npm run uploads:service', () => {
  it('starts from the settings, logs one line, serves, and exits cleanly on SIGTERM', async () => {
    const storage = fs.mkdtempSync(path.join(os.tmpdir(), 'upload-service-cli-'));
    folders.push(storage);
    const tsx = path.join(process.cwd(), 'node_modules', '.bin', 'tsx');
    const child = spawn(tsx, ['lib/upload-service/cli.ts'], {
      cwd: process.cwd(),
      env: { ...process.env, APP_ENV: 'development', UPLOAD_SERVICE_PORT: '0', UPLOAD_SERVICE_DIR: storage, UPLOADTHING_TOKEN: '' },
      stdio: ['ignore', 'pipe', 'pipe'],
    });
    let output = '';
    child.stdout.on('data', (chunk: Buffer) => (output += chunk.toString()));
    child.stderr.on('data', (chunk: Buffer) => (output += chunk.toString()));
    const exited = new Promise<number | null>((resolve) => child.once('exit', (code) => resolve(code)));

    const deadline = Date.now() + 30_000;
    while (!/Upload service on (http:\/\/localhost:\d+)/.test(output)) {
      if (Date.now() > deadline || child.exitCode !== null) throw new Error(`the service did not start:\n${output}`);
      await new Promise((resolve) => setTimeout(resolve, 50));
    }
    const origin = output.match(/Upload service on (http:\/\/localhost:\d+)/)![1];
    expect(output.trim().split('\n')).toHaveLength(1);
    expect(output).toContain(`for app ${LOCAL_UPLOAD_APP_ID}`);
    const health = await fetch(`${origin}/`);
    expect(health.status).toBe(200);
    expect(fs.existsSync(path.join(storage, 'files'))).toBe(true);

    child.kill('SIGTERM');
    expect(await exited).toBe(0);
    await expect(fetch(`${origin}/`)).rejects.toThrow();
  });
});
