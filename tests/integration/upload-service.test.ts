// The local upload service driven by the real UploadThing SDK: UTApi for server-side uploads and the
// file API, and a small route handler (createRouteHandler) on its own port for the browser's flow.
import { createHash } from 'node:crypto';
import fs from 'node:fs';
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { createRouteHandler, createUploadthing, UTApi, UTFile, type FileRouter } from 'uploadthing/server';
import { uploadThingEnv } from '@/lib/upload-service/config';
import { startUploadService, type RunningUploadService } from '@/lib/upload-service/server';

const apiKey = 'sk_test_upload_service_integration';
const appId = 'uploadservicetest';

let storageDir: string;
let service: RunningUploadService;
let utapi: UTApi;

type Completion = { metadata: unknown; file: { key: string; name: string; size: number; ufsUrl: string; fileHash: string } };
const completions: Completion[] = [];
const uploadErrors: { fileKey: string; message: string }[] = [];

/** The SDK's options, taken from the variables an app process would get. */
function sdkOptions(vars: Record<string, string>) {
  return {
    token: vars.UPLOADTHING_TOKEN,
    ingestUrl: vars.UPLOADTHING_INGEST_URL,
    apiUrl: vars.UPLOADTHING_API_URL,
    ufsHost: vars.UPLOADTHING_UFS_HOST,
    ufsAppIdLocation: vars.UPLOADTHING_UFS_APP_ID_LOCATION as 'path',
    logLevel: 'Error' as const,
  };
}

const f = createUploadthing();
const router = {
  evidence: f({ blob: { maxFileSize: '1MB', maxFileCount: 5, acl: 'private' } })
    .middleware(() => ({ caseNumber: 'CS-2026-0007', uploadedBy: 'lab-analyst' }))
    .onUploadError(({ error, fileKey }) => {
      uploadErrors.push({ fileKey, message: error.message });
    })
    .onUploadComplete(({ metadata, file }) => {
      completions.push({ metadata, file: { key: file.key, name: file.name, size: file.size, ufsUrl: file.ufsUrl, fileHash: file.fileHash } });
      return { recordedAs: `attachment-of-${metadata.caseNumber}`, key: file.key };
    }),
  shortLived: f({ blob: { maxFileSize: '1MB' } }, { presignedURLTTL: 1 }).onUploadComplete(() => ({ ok: true })),
} satisfies FileRouter;

type RunningApp = { url: string; close: () => Promise<void> };

/** Serves the route handler the way Next.js would, on a free port. */
async function startApp(isDev: boolean): Promise<RunningApp> {
  let handler: (request: Request) => Promise<Response> = async () => new Response('starting', { status: 503 });
  const server = http.createServer((req, res) => {
    const chunks: Buffer[] = [];
    req.on('data', (c: Buffer) => chunks.push(c));
    req.on('end', async () => {
      const body = chunks.length ? Buffer.concat(chunks) : undefined;
      const headers = new Headers();
      for (const [name, value] of Object.entries(req.headers)) if (typeof value === 'string') headers.set(name, value);
      const response = await handler(new Request(`http://localhost:${(server.address() as AddressInfo).port}${req.url}`, { method: req.method, headers, body }));
      res.writeHead(response.status, Object.fromEntries(response.headers));
      res.end(Buffer.from(await response.arrayBuffer()));
    });
  });
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  const url = `http://localhost:${(server.address() as AddressInfo).port}`;
  const vars = uploadThingEnv({ origin: service.origin, apiKey, appId, callbackUrl: `${url}/api/uploadthing`, isDev });
  handler = createRouteHandler({ router, config: { ...sdkOptions(vars), callbackUrl: vars.UPLOADTHING_CALLBACK_URL, isDev } });
  return {
    url,
    close: () =>
      new Promise((resolve) => {
        server.close(() => resolve());
        server.closeAllConnections();
      }),
  };
}

type Presigned = { url: string; key: string; name: string; customId: string | null };

/** What the browser client does first: ask the app's route for presigned URLs. */
async function requestUpload(app: RunningApp, slug: keyof typeof router, files: { name: string; size: number; type: string }[]): Promise<Presigned[]> {
  const response = await fetch(`${app.url}/api/uploadthing?actionType=upload&slug=${slug}`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', 'x-uploadthing-package': '@uploadthing/react' },
    body: JSON.stringify({ files: files.map((file) => ({ ...file, lastModified: Date.now() })), input: null }),
  });
  expect(response.status).toBe(200);
  return (await response.json()) as Presigned[];
}

/** Then, per file: HEAD for the resume offset, and a multipart PUT with the field `file`. */
async function sendFile(url: string, bytes: Uint8Array, name: string, type: string): Promise<Response> {
  const head = await fetch(url, { method: 'HEAD' });
  if (head.status !== 200) return head;
  const start = Number(head.headers.get('x-ut-range-start') ?? '0');
  const form = new FormData();
  form.append('file', new File([bytes.slice(start) as Uint8Array<ArrayBuffer>], name, { type }));
  return fetch(url, { method: 'PUT', body: form, headers: { range: `bytes=${start}-` } });
}

function storedBytesPath(key: string): string {
  return path.join(storageDir, 'files', key);
}

async function listedKeys(): Promise<string[]> {
  return (await utapi.listFiles({ limit: 5000 })).files.map((file) => file.key);
}

async function eventually<T>(read: () => T | undefined, timeoutMs = 5000): Promise<T> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const value = read();
    if (value !== undefined) return value;
    if (Date.now() > deadline) throw new Error('timed out waiting');
    await new Promise((resolve) => setTimeout(resolve, 25));
  }
}

const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));
const md5 = (bytes: Uint8Array) => createHash('md5').update(bytes).digest('hex');
const csv = (rows: number) => new TextEncoder().encode(['sample,freezing_point_mC', ...Array.from({ length: rows }, (_, i) => `S-${i},-${512 + (i % 9)}`)].join('\n'));

beforeAll(async () => {
  // The SDK warns about its own deprecated getters whenever it logs a result; that is not ours to fix.
  const warn = console.warn.bind(console);
  vi.spyOn(console, 'warn').mockImplementation((...args: unknown[]) => {
    if (!String(args[0]).includes('[uploadthing][deprecated]')) warn(...args);
  });
  storageDir = fs.mkdtempSync(path.join(os.tmpdir(), 'upload-service-'));
  service = await startUploadService({ storageDir, apiKey, appId, callbackTimeoutMs: 10_000 });
  utapi = new UTApi(sdkOptions(uploadThingEnv({ origin: service.origin, apiKey, appId })));
});

afterAll(async () => {
  await service?.close();
  fs.rmSync(storageDir, { recursive: true, force: true });
});

describe('browser uploads through the app route (production callback mode)', () => {
  let app: RunningApp;
  beforeAll(async () => {
    app = await startApp(false);
  });
  afterAll(() => app.close());

  it('stores the file, runs onUploadComplete with the route metadata and returns its serverData to the PUT', async () => {
    const bytes = csv(40);
    const [presigned] = await requestUpload(app, 'evidence', [{ name: 'retest readings.csv', size: bytes.length, type: 'text/csv' }]);
    expect(presigned.url.startsWith(`${service.origin}/${presigned.key}?`)).toBe(true);

    const response = await sendFile(presigned.url, bytes, 'retest readings.csv', 'text/csv');
    expect(response.status).toBe(200);
    expect(response.headers.get('access-control-allow-origin')).toBe('*');
    const body = (await response.json()) as Record<string, unknown>;
    expect(body).toEqual({
      url: `${service.origin}/f/${presigned.key}`,
      appUrl: `${service.origin}/a/${appId}/${presigned.key}`,
      ufsUrl: `${service.origin}/a/${appId}/${presigned.key}`,
      fileHash: md5(bytes),
      serverData: { recordedAs: 'attachment-of-CS-2026-0007', key: presigned.key },
    });

    const completion = completions.find((c) => c.file.key === presigned.key);
    expect(completion?.metadata).toEqual({ caseNumber: 'CS-2026-0007', uploadedBy: 'lab-analyst' });
    expect(completion?.file).toMatchObject({ name: 'retest readings.csv', size: bytes.length, ufsUrl: body.ufsUrl, fileHash: md5(bytes) });
    expect(fs.readFileSync(storedBytesPath(presigned.key))).toEqual(Buffer.from(bytes));
    // The route asks for private files: no signature, no bytes.
    expect((await fetch(String(body.ufsUrl))).status).toBe(403);
  });

  it('answers the CORS preflight the browser sends before HEAD and PUT', async () => {
    const response = await fetch(`${service.origin}/anykey0123456789`, {
      method: 'OPTIONS',
      headers: { origin: 'http://localhost:3000', 'access-control-request-method': 'PUT', 'access-control-request-headers': 'range,x-uploadthing-version,b3,traceparent' },
    });
    expect(response.status).toBe(204);
    expect(response.headers.get('access-control-allow-methods')).toContain('PUT');
    expect(response.headers.get('access-control-allow-headers')).toBe('range,x-uploadthing-version,b3,traceparent');
    expect(response.headers.get('access-control-expose-headers')).toContain('x-ut-range-start');
  });

  it('refuses a tampered upload URL with 403 and stores nothing', async () => {
    const bytes = csv(5);
    const [presigned] = await requestUpload(app, 'evidence', [{ name: 'notes.csv', size: bytes.length, type: 'text/csv' }]);
    const bigger = presigned.url.replace(/x-ut-file-size=\d+/, 'x-ut-file-size=900000');
    const renamed = presigned.url.replace('x-ut-file-name=notes.csv', 'x-ut-file-name=other.csv');
    const unsigned = presigned.url.slice(0, presigned.url.indexOf('&signature='));
    for (const url of [bigger, renamed, unsigned]) {
      expect(url).not.toBe(presigned.url);
      const response = await sendFile(url, bytes, 'notes.csv', 'text/csv');
      expect(response.status).toBe(403);
      const put = await fetch(url, { method: 'PUT', body: new FormData() });
      expect(put.status).toBe(403);
      expect(put.headers.get('content-type')).toContain('application/problem+json');
      expect(((await put.json()) as { detail: string }).detail).toMatch(/not signed|signature/);
    }
    expect(fs.existsSync(storedBytesPath(presigned.key))).toBe(false);
    expect(await listedKeys()).not.toContain(presigned.key);
  });

  it('refuses an expired upload URL with 403 and stores nothing', async () => {
    const bytes = csv(3);
    const [presigned] = await requestUpload(app, 'shortLived', [{ name: 'late.csv', size: bytes.length, type: 'text/csv' }]);
    await sleep(1200);
    const response = await sendFile(presigned.url, bytes, 'late.csv', 'text/csv');
    expect(response.status).toBe(403);
    const form = new FormData();
    form.append('file', new File([bytes], 'late.csv', { type: 'text/csv' }));
    const put = await fetch(presigned.url, { method: 'PUT', body: form });
    expect(put.status).toBe(403);
    expect(((await put.json()) as { detail: string }).detail).toMatch(/expired/);
    expect(fs.existsSync(storedBytesPath(presigned.key))).toBe(false);
  });

  it('refuses a PUT larger than the size the app signed, stores nothing and reports the failure to the route', async () => {
    const declared = csv(2);
    const [presigned] = await requestUpload(app, 'evidence', [{ name: 'small.csv', size: declared.length, type: 'text/csv' }]);
    const response = await sendFile(presigned.url, csv(400), 'small.csv', 'text/csv');
    expect(response.status).toBe(413);
    expect(fs.existsSync(storedBytesPath(presigned.key))).toBe(false);
    expect(await listedKeys()).not.toContain(presigned.key);
    const reported = await eventually(() => uploadErrors.find((e) => e.fileKey === presigned.key));
    expect(reported.message).toMatch(/more than/);
    expect(completions.some((c) => c.file.key === presigned.key)).toBe(false);
  });

  it('keeps nothing of an upload cut off halfway, and the URL still works afterwards', async () => {
    const bytes = csv(2000);
    const [presigned] = await requestUpload(app, 'evidence', [{ name: 'cut.csv', size: bytes.length, type: 'text/csv' }]);
    const boundary = 'cut-off-boundary';
    const head = Buffer.from(`--${boundary}\r\ncontent-disposition: form-data; name="file"; filename="cut.csv"\r\ncontent-type: text/csv\r\n\r\n`);
    const tail = Buffer.from(`\r\n--${boundary}--\r\n`);
    const target = new URL(presigned.url);
    await new Promise<void>((resolve) => {
      const req = http.request({
        host: '127.0.0.1',
        port: target.port,
        method: 'PUT',
        path: `${target.pathname}${target.search}`,
        headers: { host: target.host, 'content-type': `multipart/form-data; boundary=${boundary}`, 'content-length': head.length + bytes.length + tail.length },
      });
      req.on('error', () => resolve());
      req.write(Buffer.concat([head, Buffer.from(bytes.slice(0, bytes.length / 2))]), () => setTimeout(() => {
        req.destroy();
        resolve();
      }, 100));
    });
    await sleep(100);
    expect(fs.existsSync(storedBytesPath(presigned.key))).toBe(false);
    expect(fs.readdirSync(path.join(storageDir, 'incoming'))).toEqual([]);
    expect(await listedKeys()).not.toContain(presigned.key);

    const retry = await sendFile(presigned.url, bytes, 'cut.csv', 'text/csv');
    expect(retry.status).toBe(200);
    expect(((await retry.json()) as { serverData: unknown }).serverData).toEqual({ recordedAs: 'attachment-of-CS-2026-0007', key: presigned.key });
    expect(fs.readFileSync(storedBytesPath(presigned.key))).toEqual(Buffer.from(bytes));
  });

  it('never lets a path name anything but a stored key', async () => {
    const indexFile = path.join(storageDir, 'index.jsonl');
    for (const pathname of ['/f/..%2Findex.jsonl', '/f/..%2F..%2Fetc%2Fpasswd', `/a/${appId}/..%2Findex.jsonl`, '/a/otherapp/anything00000', '/..%2Findex.jsonl']) {
      const response = await fetch(`${service.origin}${pathname}`);
      expect(response.status).toBe(404);
      expect(await response.text()).not.toContain('"op"');
    }
    expect(fs.existsSync(indexFile)).toBe(true);
  });

  it('uses a presigned URL once', async () => {
    const bytes = csv(4);
    const [presigned] = await requestUpload(app, 'evidence', [{ name: 'once.csv', size: bytes.length, type: 'text/csv' }]);
    expect((await sendFile(presigned.url, bytes, 'once.csv', 'text/csv')).status).toBe(200);
    expect((await sendFile(presigned.url, csv(4), 'once.csv', 'text/csv')).status).toBe(409);
    expect(fs.readFileSync(storedBytesPath(presigned.key))).toEqual(Buffer.from(bytes));
  });
});

describe('browser uploads in dev mode (NDJSON registration stream)', () => {
  let app: RunningApp;
  beforeAll(async () => {
    app = await startApp(true);
  });
  afterAll(() => app.close());

  it('forwards the signed callback through the stream and still returns serverData', async () => {
    const bytes = csv(12);
    const files = [
      { name: 'first.csv', size: bytes.length, type: 'text/csv' },
      { name: 'second.csv', size: bytes.length, type: 'text/csv' },
    ];
    const presigneds = await requestUpload(app, 'evidence', files);
    const responses = await Promise.all(presigneds.map((p, i) => sendFile(p.url, bytes, files[i].name, 'text/csv')));
    for (const [i, response] of responses.entries()) {
      expect(response.status).toBe(200);
      expect(((await response.json()) as { serverData: unknown }).serverData).toEqual({ recordedAs: 'attachment-of-CS-2026-0007', key: presigneds[i].key });
      expect(completions.find((c) => c.file.key === presigneds[i].key)?.metadata).toEqual({ caseNumber: 'CS-2026-0007', uploadedBy: 'lab-analyst' });
    }
  });
});

describe('server-side uploads and the file API (UTApi)', () => {
  it('lands 20 parallel uploads with the right bytes and one index entry each', async () => {
    const files = Array.from({ length: 20 }, (_, i) => new UTFile([csv(10 + i)], `thumb-${i}.csv`, { type: 'text/csv' }));
    const results = await utapi.uploadFiles(files, { concurrency: 20 });
    expect(results.map((r) => r.error)).toEqual(Array(20).fill(null));
    const keys = results.map((r) => r.data!.key);
    expect(new Set(keys).size).toBe(20);

    for (const [i, result] of results.entries()) {
      const expected = csv(10 + i);
      expect(result.data!.fileHash).toBe(md5(expected));
      const served = await fetch(result.data!.ufsUrl);
      expect(served.status).toBe(200);
      expect(Buffer.from(await served.arrayBuffer())).toEqual(Buffer.from(expected));
    }
    const listed = (await utapi.listFiles({ limit: 5000 })).files;
    for (const [i, key] of keys.entries()) {
      expect(listed.filter((f) => f.key === key)).toEqual([expect.objectContaining({ name: `thumb-${i}.csv`, size: csv(10 + i).length, status: 'Uploaded' })]);
    }
    const indexLines = fs.readFileSync(path.join(storageDir, 'index.jsonl'), 'utf8').trim().split('\n').map((line) => JSON.parse(line) as { op: string; file?: { key: string } });
    for (const key of keys) expect(indexLines.filter((r) => r.op === 'put' && r.file?.key === key)).toHaveLength(1);
  });

  it('serves a private file only through a valid, unexpired signed URL, always as an attachment', async () => {
    const bytes = new TextEncoder().encode('<html><script>alert(1)</script></html>');
    const { data, error } = await utapi.uploadFiles(new UTFile([bytes], 'Prüfbericht März.html', { type: 'text/html' }), { acl: 'private' });
    expect(error).toBeNull();
    const key = data!.key;
    expect((await fetch(data!.ufsUrl)).status).toBe(403);
    expect((await fetch(`${service.origin}/f/${key}`)).status).toBe(403);

    const { ufsUrl: signed } = await utapi.generateSignedURL(key, { expiresIn: 60 });
    expect(signed.startsWith(`${service.origin}/a/${appId}/${key}?expires=`)).toBe(true);
    const response = await fetch(signed);
    expect(response.status).toBe(200);
    expect(response.headers.get('content-disposition')).toBe(`attachment; filename="Pr_fbericht M_rz.html"; filename*=UTF-8''${encodeURIComponent('Prüfbericht März.html')}`);
    expect(response.headers.get('x-content-type-options')).toBe('nosniff');
    expect(response.headers.get('content-type')).toBe('text/html');
    expect(response.headers.get('content-length')).toBe(String(bytes.length));
    expect(response.headers.get('cache-control')).toBe('private, no-store');
    expect(Buffer.from(await response.arrayBuffer())).toEqual(Buffer.from(bytes));

    // A signature is bound to its file.
    const other = await utapi.uploadFiles(new UTFile(['other'], 'other.txt'), { acl: 'private' });
    expect((await fetch(signed.replace(key, other.data!.key))).status).toBe(403);

    // The API's own signed URL works as well.
    const access = await utapi.getSignedURL(key, { expiresIn: 60 });
    expect((await fetch(access.ufsUrl)).status).toBe(200);
  });

  it('refuses an expired signed file URL', async () => {
    const { data } = await utapi.uploadFiles(new UTFile(['sealed'], 'sealed.txt'), { acl: 'private' });
    const { ufsUrl } = await utapi.generateSignedURL(data!.key, { expiresIn: 1 });
    await sleep(1200);
    const response = await fetch(ufsUrl);
    expect(response.status).toBe(403);
    expect(((await response.json()) as { detail: string }).detail).toMatch(/expired/);
  });

  it('renames, changes the ACL and resolves URLs', async () => {
    const { data } = await utapi.uploadFiles(new UTFile(['a,b\n1,2'], 'draft.csv'), { acl: 'private' });
    const key = data!.key;
    await expect(utapi.renameFiles({ fileKey: key, newName: 'final.csv' })).resolves.toEqual({ success: true });
    await expect(utapi.updateACL(key, 'public-read')).resolves.toEqual({ success: true });
    const served = await fetch(data!.ufsUrl);
    expect(served.status).toBe(200);
    expect(served.headers.get('content-disposition')).toContain("filename*=UTF-8''final.csv");
    expect((await utapi.getFileUrls(key)).data).toEqual([{ key, url: data!.ufsUrl }]);
    // An unknown key changes nothing and fails.
    await expect(utapi.renameFiles([{ fileKey: key, newName: 'again.csv' }, { fileKey: 'unknownkey00000000', newName: 'x.csv' }])).rejects.toThrow();
    expect((await utapi.listFiles({ limit: 5000 })).files.find((f) => f.key === key)?.name).toBe('final.csv');
  });

  it('deletes files: gone from the index, the disk and the file URL', async () => {
    const { data } = await utapi.uploadFiles(new UTFile(['to be removed'], 'rejected.bin'));
    const key = data!.key;
    expect(fs.existsSync(storedBytesPath(key))).toBe(true);
    await expect(utapi.deleteFiles(key)).resolves.toEqual({ success: true, deletedCount: 1 });
    expect(fs.existsSync(storedBytesPath(key))).toBe(false);
    expect(await listedKeys()).not.toContain(key);
    expect((await fetch(data!.ufsUrl)).status).toBe(404);
    await expect(utapi.deleteFiles(key)).resolves.toEqual({ success: true, deletedCount: 0 });
  });

  it('checks the api key on the file API and on registrations', async () => {
    for (const pathname of ['/v6/listFiles', '/v6/deleteFiles', '/route-metadata', '/callback-result']) {
      const response = await fetch(`${service.origin}${pathname}`, { method: 'POST', headers: { 'content-type': 'application/json', 'x-uploadthing-api-key': 'sk_wrong' }, body: '{}' });
      expect(response.status).toBe(401);
    }
    const wrongKey = new UTApi({ ...sdkOptions(uploadThingEnv({ origin: service.origin, apiKey: 'sk_not_the_key', appId })) });
    await expect(wrongKey.listFiles()).rejects.toThrow();
    const upload = await wrongKey.uploadFiles(new UTFile(['x'], 'x.txt'));
    expect(upload.error).not.toBeNull();
  });

  it('works from the UPLOADTHING_* variables alone', async () => {
    for (const [name, value] of Object.entries(uploadThingEnv({ origin: service.origin, apiKey, appId }))) vi.stubEnv(name, value);
    vi.stubEnv('UPLOADTHING_LOG_LEVEL', 'Error');
    try {
      const fromEnv = new UTApi();
      const { data, error } = await fromEnv.uploadFiles(new UTFile(['configured by env'], 'env.txt'));
      expect(error).toBeNull();
      expect(data!.ufsUrl).toBe(`${service.origin}/a/${appId}/${data!.key}`);
      expect(await (await fetch(data!.ufsUrl)).text()).toBe('configured by env');
    } finally {
      vi.unstubAllEnvs();
    }
  });

  it('keeps its index and files across a restart', async () => {
    const before = (await utapi.listFiles({ limit: 5000 })).files;
    expect(before.length).toBeGreaterThan(20);
    const sample = before[0];
    const sampleBytes = fs.readFileSync(storedBytesPath(sample.key));
    // A second service on the same port stops there, before it touches the folder.
    const indexBefore = fs.readFileSync(path.join(storageDir, 'index.jsonl'), 'utf8');
    await expect(startUploadService({ port: service.port, storageDir, apiKey, appId })).rejects.toThrow(/EADDRINUSE/);
    expect(fs.readFileSync(path.join(storageDir, 'index.jsonl'), 'utf8')).toBe(indexBefore);
    const port = service.port;
    await service.close();
    // What a crash can leave: bytes without their index line, and a torn last line.
    fs.writeFileSync(storedBytesPath('orphanedbytes000000'), 'no index line');
    fs.appendFileSync(path.join(storageDir, 'index.jsonl'), '{"op":"put","file":{"key":"torn');
    service = await startUploadService({ port, storageDir, apiKey, appId });
    expect(fs.existsSync(storedBytesPath('orphanedbytes000000'))).toBe(false);

    expect((await utapi.listFiles({ limit: 5000 })).files).toEqual(before);
    const { ufsUrl } = await utapi.generateSignedURL(sample.key);
    const served = await fetch(ufsUrl);
    expect(served.status).toBe(200);
    expect(Buffer.from(await served.arrayBuffer())).toEqual(sampleBytes);
  });
});
