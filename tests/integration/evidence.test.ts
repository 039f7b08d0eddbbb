import { createHash } from 'node:crypto';
import fs from 'node:fs';
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import os from 'node:os';
import path from 'node:path';
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';

// Upload evidence end to end through UploadThing's SDK: the file router served over HTTP as Next.js
// would serve it, the local upload service in this process, callbacks from the service to the route.
// env() reads the UPLOADTHING_* settings once, so the service runs and the variables are set before
// any app module is loaded.

const API_KEY = 'sk_test_evidence_integration_key';
const APP_ID = 'evidencetest';
const storageDir = fs.mkdtempSync(path.join(os.tmpdir(), 'countersample-evidence-'));
const { startUploadService } = await import('@/lib/upload-service/server');
const { uploadThingEnv } = await import('@/lib/upload-service/config');
let service = await startUploadService({ storageDir, apiKey: API_KEY, appId: APP_ID, callbackTimeoutMs: 20_000 });

type Handler = (request: Request) => Promise<Response>;
let routeHandler: Handler | null = null;
const appServer = http.createServer((req, res) => {
  void (async () => {
    const chunks: Buffer[] = [];
    for await (const chunk of req) chunks.push(chunk as Buffer);
    const headers = new Headers();
    for (const [name, value] of Object.entries(req.headers)) if (typeof value === 'string') headers.set(name, value);
    const request = new Request(`http://localhost:${(appServer.address() as AddressInfo).port}${req.url}`, {
      method: req.method,
      headers,
      body: req.method === 'GET' || req.method === 'HEAD' ? undefined : Buffer.concat(chunks),
    });
    const response = await routeHandler!(request);
    res.writeHead(response.status, Object.fromEntries(response.headers));
    res.end(Buffer.from(await response.arrayBuffer()));
  })().catch((error: Error) => {
    res.writeHead(500);
    res.end(error.message);
  });
});
await new Promise<void>((resolve) => appServer.listen(0, '127.0.0.1', resolve));
const appOrigin = `http://localhost:${(appServer.address() as AddressInfo).port}`;
Object.assign(process.env, uploadThingEnv({ origin: service.origin, apiKey: API_KEY, appId: APP_ID, callbackUrl: `${appOrigin}/api/uploadthing` }));

const { and, count, eq } = await import('drizzle-orm');
const { UTApi } = await import('uploadthing/server');
const { getDb } = await import('@/db/client');
const { attachment, auditEvent } = await import('@/db/schema');
const { GET: uploadRouteGet, POST: uploadRoutePost } = await import('@/app/api/uploadthing/route');
const { GET: downloadRoute } = await import('@/app/api/v1/cases/[caseId]/attachments/[attachmentId]/route');
const { GET: thumbnailRoute } = await import('@/app/api/v1/cases/[caseId]/attachments/[attachmentId]/thumbnail/route');
const { getCaseFile } = await import('@/lib/dal/case-file');
const { removeAttachment } = await import('@/lib/dal/attachments');
const { receiveUpload } = await import('@/lib/evidence/receive');
const { STORE_UNREACHABLE } = await import('@/lib/evidence/upload-errors');
const { uploadThingSdkConfig } = await import('@/lib/upload-service/settings');
const { verifyAuditChain } = await import('@/lib/audit/verify');
const { actorOf, allCases, callRoute, demoUser, expectProblem, seedDemoForTests, signIn } = await import('./helpers');
const { minimalPdf, sampleImage } = await import('../unit/evidence/samples');

routeHandler = (request) => (request.method === 'GET' ? uploadRouteGet(request) : uploadRoutePost(request));

type Key = 'plant' | 'lab' | 'supplier' | 'supplier2' | 'arbiter' | 'admin';
const cookies = {} as Record<Key, string>;
const cases = {} as Record<'review' | 'retest' | 'decided', { id: string; number: string }>;
let utapi: InstanceType<typeof UTApi>;

const sha256 = (bytes: Uint8Array) => createHash('sha256').update(bytes).digest('hex');

beforeAll(async () => {
  await seedDemoForTests();
  for (const key of ['plant', 'lab', 'supplier', 'supplier2', 'arbiter', 'admin'] as const) cookies[key] = await signIn(demoUser(key).email);
  const all = await allCases();
  const supplierOrg = (await actorOf(cookies.supplier)).organisationId;
  const supplier2Org = (await actorOf(cookies.supplier2)).organisationId;
  const pick = (status: string, org: string) => {
    const found = all.find((c) => c.status === status && c.supplierOrganisationId === org);
    if (!found) throw new Error(`No demo case in ${status}`);
    return { id: found.id, number: found.number };
  };
  // review: supplier@'s, retest submitted. retest: supplier2@'s, the laboratory still blind.
  cases.review = pick('review', supplierOrg);
  cases.retest = pick('retest', supplier2Org);
  cases.decided = pick('decided', supplierOrg);
  utapi = new UTApi(uploadThingSdkConfig());
});

afterAll(async () => {
  await new Promise<void>((resolve) => appServer.close(() => resolve()));
  await service.close();
  fs.rmSync(storageDir, { recursive: true, force: true });
});

type Outcome = { ok: true; attachmentId: string; fileName: string; sha256: string } | { ok: false; fileName: string; reason: string };
type Sent = { name: string; type: string; bytes: Uint8Array };

/** What the browser's uploader does: ask the route to presign, then HEAD and PUT each file to the service. */
async function upload(who: Key, slug: string, input: Record<string, unknown>, files: Sent[]) {
  const presign = await fetch(`${appOrigin}/api/uploadthing?actionType=upload&slug=${slug}`, {
    method: 'POST',
    headers: { cookie: cookies[who], 'content-type': 'application/json', 'x-uploadthing-package': '@uploadthing/react' },
    body: JSON.stringify({ input, files: files.map((f) => ({ name: f.name, size: f.bytes.byteLength, type: f.type, lastModified: Date.now() })) }),
  });
  if (!presign.ok) return { refused: { status: presign.status, message: ((await presign.json()) as { message: string }).message }, outcomes: [] as Outcome[], keys: [] as string[] };
  const presigned = (await presign.json()) as { url: string; key: string; name: string }[];
  const outcomes: Outcome[] = [];
  for (const [i, p] of presigned.entries()) {
    const head = await fetch(p.url, { method: 'HEAD' });
    expect(head.headers.get('x-ut-range-start')).toBe('0');
    const form = new FormData();
    form.append('file', new Blob([files[i].bytes as Uint8Array<ArrayBuffer>], { type: files[i].type }), p.name);
    const put = await fetch(p.url, { method: 'PUT', body: form, headers: { range: 'bytes=0-' } });
    expect(put.status, await put.clone().text()).toBe(200);
    outcomes.push(((await put.json()) as { serverData: Outcome }).serverData);
  }
  return { refused: null, outcomes, keys: presigned.map((p) => p.key) };
}

async function storedKeys(): Promise<string[]> {
  return (await utapi.listFiles({ limit: 5000 })).files.map((f) => f.key);
}

async function rowCounts() {
  const db = getDb();
  const [[files], [events]] = await Promise.all([db.select({ n: count() }).from(attachment), db.select({ n: count() }).from(auditEvent)]);
  return { files: files.n, events: events.n };
}

function download(who: Key, caseId: string, attachmentId: string, thumbnail = false) {
  const route = thumbnail ? thumbnailRoute : downloadRoute;
  const suffix = thumbnail ? '/thumbnail' : '';
  return callRoute(route, `/api/v1/cases/${caseId}/attachments/${attachmentId}${suffix}`, { cookie: cookies[who], params: { caseId, attachmentId } });
}

const ids: { labSheet?: string; photo?: string; plantOnRetest?: string; labOnRetest?: string } = {};
const pdf = minimalPdf();

describe('an upload through the SDK', () => {
  it('the route tells the browser each kind’s accepted types and limits', async () => {
    const response = await fetch(`${appOrigin}/api/uploadthing`);
    const routes = (await response.json()) as { slug: string; config: Record<string, { maxFileSize: string; maxFileCount: number; acl?: string; contentDisposition?: string }> }[];
    expect(routes.map((r) => r.slug).sort()).toEqual(['calibration_certificate', 'correspondence', 'lab_sheet', 'other', 'photo']);
    const photo = routes.find((r) => r.slug === 'photo')!.config;
    expect(Object.keys(photo).sort()).toEqual(['image/jpeg', 'image/png', 'image/webp']);
    expect(photo['image/jpeg']).toMatchObject({ maxFileSize: '8MB', maxFileCount: 10, acl: 'private', contentDisposition: 'attachment' });
  });

  it('the laboratory uploads a PDF lab sheet: one row with the hash of the bytes, one audit event, the file private', async () => {
    const before = await rowCounts();
    const { refused, outcomes, keys } = await upload('lab', 'lab_sheet', { caseId: cases.review.id, kind: 'lab_sheet', caption: 'Retest sheet, bench 2' }, [{ name: 'retest sheet.pdf', type: 'application/pdf', bytes: pdf }]);
    expect(refused).toBeNull();
    expect(outcomes).toEqual([{ ok: true, attachmentId: expect.any(String), fileName: 'retest sheet.pdf', sha256: sha256(pdf) }]);
    const ok = outcomes[0] as Extract<Outcome, { ok: true }>;
    ids.labSheet = ok.attachmentId;

    const [row] = await getDb().select().from(attachment).where(eq(attachment.id, ok.attachmentId));
    expect(row).toMatchObject({ caseId: cases.review.id, kind: 'lab_sheet', caption: 'Retest sheet, bench 2', fileName: 'retest sheet.pdf', contentType: 'application/pdf', sizeBytes: pdf.length, sha256: sha256(pdf), storageKey: keys[0], thumbnailKey: null, removedAt: null });
    expect(row.organisationId).toBe((await actorOf(cookies.lab)).organisationId);
    expect(await rowCounts()).toEqual({ files: before.files + 1, events: before.events + 1 });
    const [event] = await getDb().select().from(auditEvent).where(and(eq(auditEvent.action, 'evidence.uploaded'), eq(auditEvent.objectId, ok.attachmentId)));
    expect(event.change).toMatchObject({ kind: 'lab_sheet', detail: { sha256: sha256(pdf), storageKey: keys[0] } });
    expect((await verifyAuditChain(getDb())).ok).toBe(true);

    // Private: the file's plain address answers 403 without a signature.
    const unsigned = await fetch(`${service.origin}/a/${APP_ID}/${keys[0]}`);
    expect(unsigned.status).toBe(403);
  });

  it('the supplier downloads it: 303 to a short-lived signed link, served as an attachment with nosniff, same bytes', async () => {
    const response = await download('supplier', cases.review.id, ids.labSheet!);
    expect(response.status).toBe(303);
    expect(response.headers.get('cache-control')).toContain('no-store');
    const location = new URL(response.headers.get('location')!);
    const expiresInMs = Number(location.searchParams.get('expires')) - Date.now();
    expect(expiresInMs).toBeGreaterThan(60_000);
    expect(expiresInMs).toBeLessThanOrEqual(120_000);
    const file = await fetch(location);
    expect(file.status).toBe(200);
    expect(file.headers.get('content-disposition')).toMatch(/^attachment; filename="retest sheet\.pdf"/);
    expect(file.headers.get('x-content-type-options')).toBe('nosniff');
    expect(sha256(new Uint8Array(await file.arrayBuffer()))).toBe(sha256(pdf));
  });

  it('a photo gets a WebP preview, stored privately too and served through its own route', async () => {
    const photo = await sampleImage('jpeg', 1200, 900);
    const { outcomes } = await upload('lab', 'photo', { caseId: cases.review.id, kind: 'photo' }, [{ name: 'seal 4471.jpg', type: 'image/jpeg', bytes: photo }]);
    expect(outcomes[0]).toMatchObject({ ok: true, sha256: sha256(photo) });
    ids.photo = (outcomes[0] as Extract<Outcome, { ok: true }>).attachmentId;
    const [row] = await getDb().select().from(attachment).where(eq(attachment.id, ids.photo));
    expect(row.thumbnailKey).toMatch(/^[A-Za-z0-9]+$/);
    expect(row.caption).toBeNull();

    const response = await download('plant', cases.review.id, ids.photo, true);
    expect(response.status).toBe(303);
    const preview = await fetch(response.headers.get('location')!);
    expect(preview.headers.get('content-type')).toBe('image/webp');
    const meta = await sharp(new Uint8Array(await preview.arrayBuffer())).metadata();
    expect([meta.format, meta.width, meta.height]).toEqual(['webp', 320, 240]);
    // A PDF has no preview.
    await expectProblem(await download('plant', cases.review.id, ids.labSheet!, true), 404);
  });

  it('a file whose content is not what its name says leaves nothing stored and no row, and says why', async () => {
    const png = await sampleImage('png', 64, 64);
    const before = { ...(await rowCounts()), keys: await storedKeys() };
    const { outcomes, keys } = await upload('plant', 'lab_sheet', { caseId: cases.review.id, kind: 'lab_sheet' }, [{ name: 'intake sheet.pdf', type: 'application/pdf', bytes: png }]);
    expect(outcomes).toEqual([{ ok: false, fileName: 'intake sheet.pdf', reason: expect.stringMatching(/named \.pdf but its content is PNG.*Nothing was saved/) }]);
    expect(await rowCounts()).toEqual({ files: before.files, events: before.events });
    const after = await storedKeys();
    expect(after).not.toContain(keys[0]);
    expect(after.sort()).toEqual(before.keys.sort());
    expect(await getDb().select().from(attachment).where(eq(attachment.storageKey, keys[0]))).toEqual([]);
  });

  it('a case decided between the presign and the completion takes nothing: the completion checks again and deletes the file', async () => {
    const plant = await actorOf(cookies.plant);
    const stored = await utapi.uploadFiles(new File([new Uint8Array(pdf)], 'late sheet.pdf', { type: 'application/pdf' }), { acl: 'private', contentDisposition: 'attachment' });
    const key = stored.data!.key;
    expect(await storedKeys()).toContain(key);
    const before = await rowCounts();
    const outcome = await receiveUpload(getDb(), {
      file: { key, name: 'late sheet.pdf', ufsUrl: stored.data!.ufsUrl },
      metadata: { caseId: cases.decided.id, kind: 'lab_sheet', caption: null, userId: plant.userId, sessionId: plant.sessionId, organisationId: plant.organisationId, origin: 'test' },
    });
    expect(outcome).toEqual({ ok: false, fileName: 'late sheet.pdf', reason: expect.stringMatching(/decided and its record is sealed.*Nothing was saved/) });
    expect(await rowCounts()).toEqual(before);
    expect(await storedKeys()).not.toContain(key);
  });

  it('a repeated completion call for a recorded file changes nothing and deletes nothing', async () => {
    const [row] = await getDb().select().from(attachment).where(eq(attachment.id, ids.labSheet!));
    const before = { ...(await rowCounts()), keys: await storedKeys() };
    const outcome = await receiveUpload(getDb(), { file: { key: row.storageKey, name: row.fileName, ufsUrl: row.url }, metadata: {} });
    expect(outcome).toEqual({ ok: true, attachmentId: row.id, fileName: row.fileName, sha256: row.sha256 });
    expect({ ...(await rowCounts()), keys: await storedKeys() }).toEqual(before);
  });
});

describe('the upload route refuses before anything is stored', () => {
  async function refusal(who: Key, slug: string, input: Record<string, unknown>, file: Sent) {
    const keysBefore = await storedKeys();
    const { refused } = await upload(who, slug, input, [file]);
    expect(await storedKeys()).toEqual(keysBefore);
    return refused;
  }
  const sheet = { name: 'sheet.pdf', type: 'application/pdf', bytes: pdf };

  it('an outsider’s case answers as a missing one', async () => {
    expect(await refusal('supplier2', 'lab_sheet', { caseId: cases.review.id, kind: 'lab_sheet' }, sheet)).toEqual({ status: 404, message: 'That case was not found.' });
    expect(await refusal('admin', 'lab_sheet', { caseId: cases.review.id, kind: 'lab_sheet' }, sheet)).toEqual({ status: 404, message: 'That case was not found.' });
  });

  it('the arbiter reads evidence but does not add to it', async () => {
    expect(await refusal('arbiter', 'lab_sheet', { caseId: cases.review.id, kind: 'lab_sheet' }, sheet)).toEqual({ status: 403, message: expect.stringMatching(/does not add to it/) });
  });

  it('a decided case takes no more evidence', async () => {
    expect(await refusal('supplier', 'lab_sheet', { caseId: cases.decided.id, kind: 'lab_sheet' }, sheet)).toEqual({ status: 400, message: expect.stringMatching(/decided and its record is sealed/) });
  });

  it('a file type the kind does not take, an empty file, a path in the name, a bad caption, a kind that is not the route’s', async () => {
    const input = { caseId: cases.review.id, kind: 'photo' };
    expect(await refusal('plant', 'photo', input, sheet)).toEqual({ status: 400, message: 'sheet.pdf: a photo must be JPEG, PNG or WebP.' });
    expect(await refusal('plant', 'lab_sheet', { ...input, kind: 'lab_sheet' }, { ...sheet, bytes: new Uint8Array(0) })).toEqual({ status: 400, message: 'sheet.pdf is empty.' });
    expect((await refusal('plant', 'lab_sheet', { ...input, kind: 'lab_sheet' }, { ...sheet, name: '../../sheet.pdf' }))?.message).toMatch(/folder path/);
    expect(await refusal('plant', 'lab_sheet', { ...input, kind: 'lab_sheet', caption: 'x'.repeat(301) }, sheet)).toEqual({ status: 400, message: 'Keep the caption to 300 characters.' });
    expect((await refusal('plant', 'lab_sheet', input, sheet))?.message).toMatch(/does not match the upload/);
  });

  it('a visitor without a session', async () => {
    const response = await fetch(`${appOrigin}/api/uploadthing?actionType=upload&slug=lab_sheet`, {
      method: 'POST',
      headers: { 'content-type': 'application/json' },
      body: JSON.stringify({ input: { caseId: cases.review.id, kind: 'lab_sheet' }, files: [{ name: 'a.pdf', size: 10, type: 'application/pdf', lastModified: 0 }] }),
    });
    expect(response.status).toBe(403);
    expect(((await response.json()) as { message: string }).message).toMatch(/session has ended/);
  });
});

describe('who may open which file', () => {
  it('an outsider gets 404 for a file of a case that is not theirs, as for a file that does not exist', async () => {
    const outsider = await expectProblem(await download('supplier2', cases.review.id, ids.labSheet!), 404);
    const missing = await expectProblem(await download('supplier', cases.review.id, '00000000-0000-4000-8000-000000000000'), 404);
    expect(outsider.detail).toBe('That case was not found.');
    expect(missing.detail).toBe('That file was not found.');
    await expectProblem(await download('admin', cases.review.id, ids.labSheet!), 404);
    // The file's id under another case the caller can see is no way round it either.
    await expectProblem(await download('supplier', cases.decided.id, ids.labSheet!), 404);
  });

  it('the blind laboratory sees and opens only its own files until it submits its retest', async () => {
    const plantUp = await upload('plant', 'lab_sheet', { caseId: cases.retest.id, kind: 'lab_sheet', caption: 'Intake printout' }, [{ name: 'intake printout.pdf', type: 'application/pdf', bytes: minimalPdf('% intake\n') }]);
    const labUp = await upload('lab', 'lab_sheet', { caseId: cases.retest.id, kind: 'lab_sheet' }, [{ name: 'receipt check.pdf', type: 'application/pdf', bytes: minimalPdf('% receipt\n') }]);
    ids.plantOnRetest = (plantUp.outcomes[0] as Extract<Outcome, { ok: true }>).attachmentId;
    ids.labOnRetest = (labUp.outcomes[0] as Extract<Outcome, { ok: true }>).attachmentId;

    const db = getDb();
    const asLab = await getCaseFile(db, await actorOf(cookies.lab), cases.retest.id);
    expect(asLab.blind).toBe(true);
    expect(asLab.attachments.map((a) => a.id)).toEqual([ids.labOnRetest]);
    const asSupplier = await getCaseFile(db, await actorOf(cookies.supplier2), cases.retest.id);
    expect(asSupplier.attachments.map((a) => a.id).sort()).toEqual([ids.plantOnRetest, ids.labOnRetest].sort());
    // The ledger does not give the name away either.
    const plantEvent = asLab.ledger.find((e) => e.action === 'evidence.uploaded' && e.actorOrganisationId !== asLab.attachments[0].organisationId);
    expect(plantEvent).toBeDefined();
    expect(JSON.stringify(plantEvent!.change)).not.toContain('intake printout');

    await expectProblem(await download('lab', cases.retest.id, ids.plantOnRetest), 404);
    await expectProblem(await download('lab', cases.retest.id, ids.plantOnRetest, true), 404);
    expect((await download('lab', cases.retest.id, ids.labOnRetest)).status).toBe(303);
    expect((await download('supplier2', cases.retest.id, ids.plantOnRetest)).status).toBe(303);
    // Past its retest (the review case) the laboratory sees everyone's files.
    expect((await download('lab', cases.review.id, ids.labSheet!)).status).toBe(303);
  });
});

describe('withdrawing a file', () => {
  it('only the organisation that added it may, with a reason; the row stays, the board still opens it, others see it struck through', async () => {
    const db = getDb();
    const reason = 'Uploaded to the wrong case by mistake.';
    await expect(removeAttachment(db, await actorOf(cookies.supplier), { caseId: cases.review.id, attachmentId: ids.photo!, reason })).rejects.toMatchObject({ code: 'forbidden' });
    await expect(removeAttachment(db, await actorOf(cookies.lab), { caseId: cases.review.id, attachmentId: ids.photo!, reason: '' })).rejects.toMatchObject({ code: 'invalid' });

    const before = await rowCounts();
    await removeAttachment(db, await actorOf(cookies.lab), { caseId: cases.review.id, attachmentId: ids.photo!, reason });
    expect(await rowCounts()).toEqual({ files: before.files, events: before.events + 1 });
    const [row] = await db.select().from(attachment).where(eq(attachment.id, ids.photo!));
    expect(row.removedAt).toBeInstanceOf(Date);
    expect(row.removalReason).toBe(reason);
    expect(await storedKeys()).toContain(row.storageKey);

    await expect(removeAttachment(db, await actorOf(cookies.lab), { caseId: cases.review.id, attachmentId: ids.photo!, reason })).rejects.toMatchObject({ code: 'conflict' });
    expect((await download('arbiter', cases.review.id, ids.photo!)).status).toBe(303);
    expect((await download('arbiter', cases.review.id, ids.photo!, true)).status).toBe(303);
    const gone = await expectProblem(await download('supplier', cases.review.id, ids.photo!), 410);
    expect(gone.detail).toMatch(/withdrawn from the case by Ines Halloran/);

    const asSupplier = await getCaseFile(db, await actorOf(cookies.supplier), cases.review.id);
    const listed = asSupplier.attachments.find((a) => a.id === ids.photo);
    expect(listed).toMatchObject({ removalReason: reason, removedByName: 'Ines Halloran', downloadable: false, hasThumbnail: false, removable: false });
    const asBoard = await getCaseFile(db, await actorOf(cookies.arbiter), cases.review.id);
    expect(asBoard.attachments.find((a) => a.id === ids.photo)).toMatchObject({ downloadable: true, hasThumbnail: true, removable: false });
  });
});

describe('when the upload service is down', () => {
  it('the upload fails with nothing half-written, and a completion that cannot read the file back records nothing', async () => {
    const db = getDb();
    const before = await rowCounts();
    // One file stored and recorded while the service runs, then the service stops.
    const { keys } = await upload('plant', 'lab_sheet', { caseId: cases.review.id, kind: 'lab_sheet' }, [{ name: 'kept.pdf', type: 'application/pdf', bytes: minimalPdf('% kept\n') }]);
    const afterUpload = await rowCounts();
    expect(afterUpload.files).toBe(before.files + 1);
    const plant = await actorOf(cookies.plant);
    await service.close();

    const presign = await fetch(`${appOrigin}/api/uploadthing?actionType=upload&slug=lab_sheet`, {
      method: 'POST',
      headers: { cookie: cookies.plant, 'content-type': 'application/json' },
      body: JSON.stringify({ input: { caseId: cases.review.id, kind: 'lab_sheet' }, files: [{ name: 'late.pdf', size: pdf.length, type: 'application/pdf', lastModified: 0 }] }),
    });
    // Asked before any file leaves the browser: the store does not answer, so nothing is presigned.
    expect(presign.status).toBe(500);
    expect(((await presign.json()) as { message: string }).message).toBe(STORE_UNREACHABLE);
    expect(await rowCounts()).toEqual(afterUpload);

    const outcome = await receiveUpload(db, {
      file: { key: 'NotStoredAnywhere0001', name: 'late.pdf', ufsUrl: `${service.origin}/a/${APP_ID}/NotStoredAnywhere0001` },
      metadata: { caseId: cases.review.id, kind: 'lab_sheet', caption: null, userId: plant.userId, sessionId: plant.sessionId, organisationId: plant.organisationId, origin: 'test' },
    });
    expect(outcome).toEqual({ ok: false, fileName: 'late.pdf', reason: expect.stringMatching(/file store could not be reached.*Nothing was saved/) });
    expect(await rowCounts()).toEqual(afterUpload);
    expect(keys).toHaveLength(1);

    // Back up on the same port, the stored files are all still there.
    const port = Number(new URL(service.origin).port);
    service = await startUploadService({ storageDir, apiKey: API_KEY, appId: APP_ID, port });
    expect(await storedKeys()).toContain(keys[0]);
  });
});
