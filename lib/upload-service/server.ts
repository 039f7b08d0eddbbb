// A local stand-in for the UploadThing service, speaking its wire protocol as uploadthing 7.7 uses it:
// presigned ingest (HEAD + multipart PUT), route registration and completion callbacks in production
// and dev mode, the `/v6/*` file API of UTApi, and file serving at the UFS URL shapes.
import { createHash, timingSafeEqual } from 'node:crypto';
import fs from 'node:fs';
import http, { type IncomingMessage, type ServerResponse } from 'node:http';
import type { AddressInfo } from 'node:net';
import { z } from 'zod';
import { AppError } from '../errors';
import { fileUrls, isFileApiEndpoint, runFileApi, type FileApiContext } from './file-api';
import { ClientAborted, readBody, readJson, sendJson, sendProblem } from './http';
import { CallbackTimeout, UploadRegistry, type HookLine, type Registration } from './registry';
import { signPayload, verifySignedUrl } from './signature';
import { FILE_KEY_PATTERN, FileStore, StoreConflict, isValidFileKey, type Acl, type ContentDisposition, type StoredFile } from './store';

export type UploadServiceOptions = {
  /** 0 picks a free port. */
  port?: number;
  /** Default 127.0.0.1. */
  host?: string;
  storageDir: string;
  apiKey: string;
  appId: string;
  log?: (line: string) => void;
  /** Largest file accepted, whatever a presigned URL says. Default 64 MiB. */
  maxFileBytes?: number;
  /** How long an upload waits for the app's `callback-result`. Default 30 s. */
  callbackTimeoutMs?: number;
  /** How long a finished upload waits for its registration (dev mode registers late). Default 10 s. */
  registrationWaitMs?: number;
};

export type RunningUploadService = {
  /** `http://localhost:<port>`: the SDK signs http file URLs only for hosts containing "local". */
  origin: string;
  port: number;
  close(): Promise<void>;
};

/** Room for the multipart framing around the file's bytes (boundaries, part headers, long file names). */
const MULTIPART_OVERHEAD_BYTES = 64 * 1024;
const REGISTRATION_TTL_MS = 60 * 60 * 1000;
const DRAIN_GRACE_MS = 5000;

const routeMetadataSchema = z.object({
  fileKeys: z.array(z.string().regex(FILE_KEY_PATTERN, 'is not a file key')).min(1).max(500),
  metadata: z.unknown(),
  isDev: z.boolean().default(false),
  callbackUrl: z.url({ protocol: /^https?$/ }),
  callbackSlug: z.string().min(1).max(200),
  awaitServerData: z.boolean().default(true),
});

const callbackResultSchema = z.union([
  z.object({ fileKey: z.string().regex(FILE_KEY_PATTERN), error: z.string() }),
  z.object({ fileKey: z.string().regex(FILE_KEY_PATTERN), callbackData: z.unknown() }),
]);

const CORS_HEADERS = {
  'access-control-allow-origin': '*',
  'access-control-allow-methods': 'GET, HEAD, PUT, POST, OPTIONS',
  'access-control-expose-headers': 'x-ut-range-start, content-length, content-type, content-disposition',
  'access-control-max-age': '600',
};

/** What a verified presigned ingest URL says about the upload. */
type IngestTicket = {
  key: string;
  name: string;
  size: number;
  type: string;
  customId: string | null;
  acl: Acl;
  contentDisposition: ContentDisposition;
  slug: string | null;
};

const MIME_PATTERN = /^[a-z0-9][a-z0-9!#$&^_.+-]*\/[a-z0-9][a-z0-9!#$&^_.+-]*$/i;

export async function startUploadService(options: UploadServiceOptions): Promise<RunningUploadService> {
  const log = options.log ?? (() => undefined);
  const maxFileBytes = options.maxFileBytes ?? 64 * 1024 * 1024;
  const callbackTimeoutMs = options.callbackTimeoutMs ?? 30_000;
  const registrationWaitMs = options.registrationWaitMs ?? 10_000;
  // Opened once the port is ours: a second service started on the same settings stops at the
  // port, before it can tidy up (and so disturb) the folder of the one already running.
  let store!: FileStore;
  const registry = new UploadRegistry();
  let origin = '';
  const api = (): FileApiContext => ({ store, origin, appId: options.appId, apiKey: options.apiKey });

  function requestUrl(req: IncomingMessage): string {
    const host = req.headers.host;
    if (!host) throw new AppError('invalid', 'The request has no Host header.');
    return `http://${host}${req.url ?? '/'}`;
  }

  function requireApiKey(req: IncomingMessage): void {
    const given = Buffer.from(String(req.headers['x-uploadthing-api-key'] ?? ''));
    const expected = Buffer.from(options.apiKey);
    if (given.length !== expected.length || !timingSafeEqual(given, expected)) {
      throw new AppError('unauthenticated', 'Missing or wrong x-uploadthing-api-key.');
    }
  }

  function checkIngestUrl(req: IncomingMessage, key: string): IngestTicket {
    const check = verifySignedUrl(requestUrl(req), options.apiKey);
    if (!check.ok) {
      const why = check.reason === 'expired' ? 'The upload URL has expired.' : check.reason === 'unsigned' ? 'The upload URL is not signed.' : 'The upload URL signature is not valid.';
      throw new AppError('forbidden', why);
    }
    const p = check.params;
    if (p.get('x-ut-identifier') !== options.appId) throw new AppError('forbidden', 'The upload URL is for another app.');
    const size = Number(p.get('x-ut-file-size'));
    if (!Number.isSafeInteger(size) || size < 0) throw new AppError('invalid', 'The upload URL has no valid x-ut-file-size.');
    if (size > maxFileBytes) throw new AppError('payload_too_large', `Files up to ${maxFileBytes} bytes are accepted here.`);
    const name = p.get('x-ut-file-name');
    if (!name) throw new AppError('invalid', 'The upload URL has no x-ut-file-name.');
    const acl = p.get('x-ut-acl') ?? 'public-read';
    if (acl !== 'public-read' && acl !== 'private') throw new AppError('invalid', `Unknown x-ut-acl ${acl}.`);
    const disposition = p.get('x-ut-content-disposition') ?? 'inline';
    if (disposition !== 'inline' && disposition !== 'attachment') throw new AppError('invalid', `Unknown x-ut-content-disposition ${disposition}.`);
    const declaredType = p.get('x-ut-file-type') ?? '';
    return {
      key,
      name,
      size,
      type: MIME_PATTERN.test(declaredType) ? declaredType.toLowerCase() : 'application/octet-stream',
      customId: p.get('x-ut-custom-id') || null,
      acl,
      contentDisposition: disposition,
      slug: p.get('x-ut-slug') || null,
    };
  }

  async function fileBytes(req: IncomingMessage, ticket: IngestTicket): Promise<Uint8Array> {
    const range = req.headers.range;
    if (range && !/^bytes=0-\d*$/.test(range)) throw new AppError('invalid', 'Resuming an upload is not supported here; upload the whole file (Range: bytes=0-).');
    const contentType = String(req.headers['content-type'] ?? '');
    if (!contentType.toLowerCase().startsWith('multipart/form-data')) throw new AppError('unsupported_media_type', 'Upload the file as multipart/form-data with the field "file".');
    const body = await readBody(req, ticket.size + MULTIPART_OVERHEAD_BYTES);
    let part: FormDataEntryValue | null;
    try {
      part = (await new Response(body as Uint8Array<ArrayBuffer>, { headers: { 'content-type': contentType } }).formData()).get('file');
    } catch {
      throw new AppError('invalid', 'The multipart body could not be read.');
    }
    if (!part || typeof part === 'string') throw new AppError('invalid', 'The multipart body has no file in the field "file".');
    const bytes = new Uint8Array(await part.arrayBuffer());
    if (bytes.length > ticket.size) throw new AppError('payload_too_large', `The file has ${bytes.length} bytes, more than the ${ticket.size} its upload URL allows.`);
    if (bytes.length < ticket.size) throw new AppError('invalid', `The file has ${bytes.length} bytes, fewer than the ${ticket.size} its upload URL announced.`);
    return bytes;
  }

  async function deliverHook(registration: Registration, line: HookLine): Promise<void> {
    if (registration.isDev) {
      if (!registration.devStream || !registry.sendDevHook(registration, line)) throw new Error('the dev-mode registration stream is closed');
      return;
    }
    const target = new URL(registration.callbackUrl);
    target.searchParams.set('slug', registration.callbackSlug);
    const response = await fetch(target, {
      method: 'POST',
      headers: { 'content-type': 'application/json', 'uploadthing-hook': line.hook, 'x-uploadthing-signature': line.signature },
      body: line.payload,
      signal: AbortSignal.timeout(callbackTimeoutMs),
    });
    await response.arrayBuffer().catch(() => undefined);
    if (!response.ok) throw new Error(`the app's callback answered ${response.status}`);
  }

  /**
   * Tells the app that a registered upload failed (its onUploadError), without holding up the answer.
   * The registration stays: the browser may send the file again with the same URL.
   */
  function reportFailure(ticket: IngestTicket, message: string): void {
    if (!ticket.slug) return;
    void registry.registrationFor(ticket.key, 0).then(async (registration) => {
      if (!registration) return;
      const payload = JSON.stringify({ fileKey: ticket.key, error: message });
      await deliverHook(registration, { payload, signature: signPayload(payload, options.apiKey), hook: 'error' });
    }).catch((error: Error) => log(`error hook for ${ticket.key} not delivered: ${error.message}`));
  }

  /** Runs the app's completion callback and returns its `serverData`. */
  async function complete(file: StoredFile): Promise<unknown> {
    if (!file.slug) return null;
    const registration = await registry.registrationFor(file.key, registrationWaitMs);
    if (!registration) {
      log(`upload ${file.key} of route ${file.slug} finished without a registration; no callback sent`);
      return null;
    }
    try {
      const payload = JSON.stringify({
        status: 'uploaded',
        file: { key: file.key, name: file.name, size: file.size, type: file.type, customId: file.customId, lastModified: file.uploadedAtMs, fileHash: file.fileHash, ...fileUrls({ origin, appId: options.appId }, file.key) },
        origin,
        metadata: registration.metadata ?? {},
      });
      const result = registry.expectResult(file.key, callbackTimeoutMs);
      result.catch(() => undefined);
      await deliverHook(registration, { payload, signature: signPayload(payload, options.apiKey), hook: 'callback' });
      if (!registration.awaitServerData) {
        result.catch((error: Error) => log(`callback of ${file.key}: ${error.message}`));
        return null;
      }
      return await result;
    } catch (error) {
      const reason = error instanceof CallbackTimeout ? 'the app did not report a result in time' : (error as Error).message;
      log(`callback of ${file.key} failed: ${reason}`);
      throw new AppError('unavailable', `The file is stored, but the app's upload callback failed: ${reason}.`);
    } finally {
      registry.finish(file.key);
    }
  }

  async function ingest(req: IncomingMessage, res: ServerResponse, key: string): Promise<void> {
    const ticket = checkIngestUrl(req, key);
    if (req.method === 'HEAD') {
      // Nothing half-uploaded is ever kept, so every upload starts at byte 0.
      res.writeHead(200, { ...CORS_HEADERS, 'x-ut-range-start': '0', 'cache-control': 'no-store' });
      return void res.end();
    }
    if (!store.reserve(key, ticket.customId)) {
      throw new AppError('conflict', store.get(key) ? 'This file has already been uploaded.' : 'This upload URL has been used already, or its custom id is taken.');
    }
    let stored: StoredFile;
    try {
      const bytes = await fileBytes(req, ticket);
      stored = await store.commit(
        { key, name: ticket.name, size: ticket.size, type: ticket.type, customId: ticket.customId, acl: ticket.acl, contentDisposition: ticket.contentDisposition, slug: ticket.slug, fileHash: createHash('md5').update(bytes).digest('hex') },
        bytes,
      );
    } catch (error) {
      if (!(error instanceof ClientAborted)) reportFailure(ticket, error instanceof AppError || error instanceof StoreConflict ? error.message : 'The file could not be stored.');
      if (error instanceof StoreConflict) throw new AppError('conflict', error.message);
      throw error;
    } finally {
      store.release(key);
    }
    log(`stored ${key} (${stored.size} bytes, ${stored.acl}${stored.slug ? `, route ${stored.slug}` : ''})`);
    const serverData = await complete(stored);
    sendJson(res, 200, { ...fileUrls({ origin, appId: options.appId }, key), fileHash: stored.fileHash, serverData: serverData ?? null }, CORS_HEADERS);
  }

  async function routeMetadata(req: IncomingMessage, res: ServerResponse): Promise<void> {
    requireApiKey(req);
    const body = await readJson(req, routeMetadataSchema);
    const registration: Registration = {
      fileKeys: body.fileKeys,
      metadata: body.metadata,
      isDev: body.isDev,
      callbackUrl: body.callbackUrl,
      callbackSlug: body.callbackSlug,
      awaitServerData: body.awaitServerData,
      expiresAtMs: Date.now() + REGISTRATION_TTL_MS,
      devStream: null,
      pending: new Set(body.fileKeys),
    };
    if (body.isDev) {
      // Dev mode: the answer stays open and carries one signed hook line per finished upload.
      res.writeHead(200, { 'content-type': 'application/x-ndjson', 'cache-control': 'no-store' });
      res.flushHeaders();
      registration.devStream = res;
      res.once('close', () => {
        registration.devStream = null;
      });
      registry.register(registration);
    } else {
      registry.register(registration);
      sendJson(res, 200, { ok: true });
    }
    log(`registered ${body.fileKeys.length} upload(s) for route ${body.callbackSlug}${body.isDev ? ' (dev stream)' : ''}`);
  }

  async function callbackResult(req: IncomingMessage, res: ServerResponse): Promise<void> {
    requireApiKey(req);
    const body = await readJson(req, callbackResultSchema);
    registry.settleResult(body.fileKey, 'error' in body ? { error: body.error } : { callbackData: body.callbackData ?? null });
    sendJson(res, 200, { ok: true });
  }

  function serveFile(req: IncomingMessage, res: ServerResponse, key: string): void {
    const file = isValidFileKey(key) ? store.get(key) : undefined;
    if (!file) throw new AppError('not_found', 'No such file.');
    if (file.acl === 'private') {
      const check = verifySignedUrl(requestUrl(req), options.apiKey);
      if (!check.ok) throw new AppError('forbidden', check.reason === 'expired' ? 'The signed URL has expired.' : 'This file is private: it is served only through a valid signed URL.');
    }
    res.writeHead(200, {
      ...CORS_HEADERS,
      'content-type': file.type,
      'content-length': String(file.size),
      'content-disposition': attachment(file.name),
      'x-content-type-options': 'nosniff',
      'content-security-policy': "default-src 'none'; sandbox",
      'cache-control': 'private, no-store',
    });
    if (req.method === 'HEAD') return void res.end();
    fs.createReadStream(store.bytesPath(key))
      .on('error', (error) => {
        log(`reading ${key} failed: ${error.message}`);
        res.destroy(error);
      })
      .pipe(res);
  }

  async function route(req: IncomingMessage, res: ServerResponse): Promise<void> {
    const { pathname } = new URL(req.url ?? '/', 'http://localhost');
    const method = req.method ?? 'GET';
    if (method === 'OPTIONS') {
      const asked = req.headers['access-control-request-headers'];
      res.writeHead(204, { ...CORS_HEADERS, 'access-control-allow-headers': typeof asked === 'string' ? asked : 'content-type, range, x-uploadthing-version, b3, traceparent' });
      return void res.end();
    }
    if (pathname === '/' && (method === 'GET' || method === 'HEAD')) return sendJson(res, 200, { service: 'local upload service', appId: options.appId });
    if (pathname === '/route-metadata' && method === 'POST') return routeMetadata(req, res);
    if (pathname === '/callback-result' && method === 'POST') return callbackResult(req, res);
    const v6 = pathname.match(/^\/v6\/([A-Za-z]+)$/);
    if (v6 && method === 'POST') {
      requireApiKey(req);
      if (!isFileApiEndpoint(v6[1])) throw new AppError('not_found', `Unknown file API endpoint ${v6[1]}.`);
      return sendJson(res, 200, await runFileApi(api(), v6[1], await readJson(req, z.unknown())));
    }
    const byAppPath = pathname.match(/^\/a\/([^/]+)\/([^/]+)$/);
    const byFilePath = pathname.match(/^\/f\/([^/]+)$/);
    if ((byAppPath || byFilePath) && (method === 'GET' || method === 'HEAD')) {
      if (byAppPath && decodeURIComponent(byAppPath[1]) !== options.appId) throw new AppError('not_found', 'No such file.');
      return serveFile(req, res, decodeURIComponent((byAppPath?.[2] ?? byFilePath?.[1])!));
    }
    const ingestKey = pathname.match(/^\/([^/]+)$/);
    if (ingestKey && (method === 'PUT' || method === 'HEAD')) {
      if (!isValidFileKey(ingestKey[1])) throw new AppError('not_found', 'No such upload.');
      return ingest(req, res, ingestKey[1]);
    }
    throw new AppError('not_found', `No ${method} ${pathname} here.`);
  }

  const server = http.createServer((req, res) => {
    storeOpened.then(() => route(req, res)).catch((error: unknown) => {
      // Whatever the client is still sending is read and dropped, so it gets to see the answer;
      // a client that keeps sending after that loses the connection.
      if (!req.complete) {
        req.resume();
        res.once('finish', () => {
          if (!req.complete) setTimeout(() => req.destroy(), DRAIN_GRACE_MS).unref();
        });
      }
      if (error instanceof AppError) {
        if (error.status >= 500) log(`${req.method} ${req.url?.split('?')[0]}: ${error.message}`);
        return sendProblem(res, error, req.url?.split('?')[0], CORS_HEADERS);
      }
      log(`${req.method} ${req.url?.split('?')[0]} failed: ${(error as Error).stack ?? String(error)}`);
      sendProblem(res, new AppError('unavailable', 'The upload service failed on this request.'), undefined, CORS_HEADERS);
    });
  });

  let storeOpened: Promise<void> = new Promise(() => undefined);
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(options.port ?? 0, options.host ?? '127.0.0.1', () => {
      server.off('error', reject);
      resolve();
    });
  });
  storeOpened = FileStore.open(options.storageDir).then((opened) => {
    store = opened;
  });
  try {
    await storeOpened;
  } catch (error) {
    server.close();
    throw error;
  }
  const port = (server.address() as AddressInfo).port;
  origin = `http://localhost:${port}`;

  return {
    origin,
    port,
    async close() {
      registry.close();
      await new Promise<void>((resolve) => {
        server.close(() => resolve());
        server.closeAllConnections();
      });
      await store.flush();
    },
  };
}

/** Always a download: a stored file never renders in the service's origin. */
function attachment(name: string): string {
  const fallback = name.replace(/[^\x20-\x7e]|["\\%;]/g, '_');
  const encoded = encodeURIComponent(name).replace(/['()*]/g, (c) => `%${c.charCodeAt(0).toString(16).toUpperCase()}`);
  return `attachment; filename="${fallback}"; filename*=UTF-8''${encoded}`;
}
