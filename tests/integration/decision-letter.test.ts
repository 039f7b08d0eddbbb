import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { createPublicKey, verify } from 'node:crypto';
import path from 'node:path';
import { startMailCatcher } from '@/lib/mail/catcher';
import type { ActorKey, World } from './support/lifecycle';

// The letter check reads the caller's address for its throttle, as a server action does in a request.
vi.mock('next/headers', () => ({ headers: async () => new Headers({ 'x-forwarded-for': '192.0.2.10' }) }));

// env() reads SMTP_URL once: the catcher must listen and the variables be set before the app is loaded.
const catcher = await startMailCatcher({ smtpPort: 0, httpPort: 0 });
process.env.SMTP_URL = `smtp://127.0.0.1:${catcher.smtpPort}`;
process.env.MAIL_CATCHER_URL = `http://127.0.0.1:${catcher.httpPort}`;

const { and, count, eq, sql } = await import('drizzle-orm');
const { getDb } = await import('@/db/client');
const { auditEvent, custodyEvent, decision, disputeCase, measurementSet, note, reading } = await import('@/db/schema');
const { signDecision, correctDecision } = await import('@/lib/dal/decision-sign');
const { verifySealedDecision, publicVerification } = await import('@/lib/dal/decision-verify');
const { runTransition } = await import('@/lib/dal/case-transition');
const { resetMailTransport } = await import('@/lib/mail/transport');
const { sha256Hex } = await import('@/lib/canonical-json');
const { signedMessage } = await import('@/lib/decision/signature');
const { GET: letterRoute } = await import('@/app/api/v1/cases/[caseId]/letter/route');
const { GET: keyRoute } = await import('@/app/.well-known/countersample-signing-key/route');
const { checkLetter } = await import('@/app/verify/actions');
const { callRoute, TEST_PASSWORD } = await import('./helpers');
const L = await import('./support/lifecycle');

let world: World;

const AGREEING_RETEST = [{ value: -0.5038 }, { value: -0.5042 }];
const REASONS = 'Both laboratories agree within the critical difference; the accepted value lies beyond the upper limit.';

async function sealedCase(by: 'arbiter' | 'arbiter2' = 'arbiter') {
  const c = await L.freshCaseIn(world, 'retest');
  await runTransition(getDb(), world.actors.lab, c.id, 'submit_retest', L.inputs.submit_retest(world, { readings: AGREEING_RETEST }));
  const signed = await signDecision(getDb(), world.actors[by], c.id, { outcome: 'uphold', reasons: REASONS, confirm: true, password: TEST_PASSWORD });
  const [row] = await getDb().select().from(decision).where(eq(decision.id, signed.decisionId));
  return { c, signed, row };
}

function getLetter(key: ActorKey | 'anonymous', caseId: string, query = '') {
  return callRoute(letterRoute, `/api/v1/cases/${caseId}/letter${query}`, { cookie: key === 'anonymous' ? undefined : world.cookies[key], params: { caseId } });
}

/** The text of every page, as a PDF reader extracts it. */
async function pdfText(bytes: Buffer): Promise<string> {
  const pdfjs = await import('pdfjs-dist/legacy/build/pdf.mjs');
  // The letter's hashes are set in Courier, one of the standard fonts the library ships as data files.
  const standardFontDataUrl = `${path.join(process.cwd(), 'node_modules', 'pdfjs-dist', 'standard_fonts')}${path.sep}`;
  const doc = await pdfjs.getDocument({ data: new Uint8Array(bytes), isEvalSupported: false, useSystemFonts: false, standardFontDataUrl }).promise;
  const pages: string[] = [];
  for (let n = 1; n <= doc.numPages; n++) {
    const content = await (await doc.getPage(n)).getTextContent();
    pages.push(content.items.map((item) => ('str' in item ? item.str : '')).join(' '));
  }
  await doc.destroy();
  return pages.join('\n').replace(/\s+/g, ' ');
}

beforeAll(async () => {
  world = await L.setUpWorld();
});

afterAll(async () => {
  resetMailTransport();
  await catcher.close();
});

describe('GET /api/v1/cases/{id}/letter', () => {
  it('gives the parties of the case the PDF, and everyone else 404 as for a missing case', async () => {
    const { c } = await sealedCase();
    for (const key of ['supplier', 'plant', 'lab', 'arbiter', 'arbiter2'] as const) {
      const response = await getLetter(key, c.id);
      expect(response.status, key).toBe(200);
      expect(response.headers.get('content-type')).toBe('application/pdf');
      expect(response.headers.get('content-disposition')).toMatch(new RegExp(`^attachment; filename="${c.number}-decision-[0-9a-f]{8}\\.pdf"$`));
      expect(response.headers.get('cache-control')).toBe('private, no-store');
      expect(Buffer.from(await response.arrayBuffer()).subarray(0, 5).toString()).toBe('%PDF-');
    }
    const missing = await L.expectProblem(await getLetter('supplier', crypto.randomUUID()), 404);
    for (const key of ['supplier2', 'admin', 'otherArbiter', 'otherLab'] as const) {
      const problem = await L.expectProblem(await getLetter(key, c.id), 404);
      expect(problem.detail).toBe(missing.detail);
    }
    await L.expectProblem(await getLetter('anonymous', c.id), 401);
    await L.expectProblem(await getLetter('supplier', 'not-a-uuid'), 404);
    await L.expectProblem(await getLetter('supplier', c.id, '?decision=nonsense'), 400);
  });

  it('answers 404 for a case with no decision yet, and for a decision of another case', async () => {
    const open = await L.freshCaseIn(world, 'review');
    const problem = await L.expectProblem(await getLetter('supplier', open.id), 404);
    expect(problem.detail).toMatch(/no signed decision/);
    const { row } = await sealedCase();
    await L.expectProblem(await getLetter('supplier', open.id, `?decision=${row.id}`), 404);
  });

  it('issues the same bytes every time, recorded once in the audit chain as the letter that was mailed', async () => {
    const { c, row } = await sealedCase();
    const first = Buffer.from(await (await getLetter('supplier', c.id)).arrayBuffer());
    const second = Buffer.from(await (await getLetter('plant', c.id)).arrayBuffer());
    expect(sha256Hex(second)).toBe(sha256Hex(first));
    const issued = await getDb().select().from(auditEvent).where(and(eq(auditEvent.action, 'decision.letter_issued'), eq(auditEvent.objectId, row.id)));
    expect(issued).toHaveLength(1);
    expect(issued[0].change).toEqual({ letterSha256: sha256Hex(first), bytes: first.length, recordSha256: row.recordSha256 });
    const mailed = catcher.messages.find((m) => m.subject.startsWith(`${c.number}:`) && m.template === 'case-decided')!;
    expect(sha256Hex(Buffer.from(mailed.attachments[0].contentBase64, 'base64'))).toBe(sha256Hex(first));
  });

  it('holds the parties, both laboratories’ results, the checks, the outcome, the settlement, the signer, the hash and the signature in its text', async () => {
    const { c, row } = await sealedCase();
    const text = await pdfText(Buffer.from(await (await getLetter('supplier', c.id)).arrayBuffer()));
    const expected = [
      `Binding decision · ${c.number}`,
      'Upper Larch Producers’ Group',
      'Larchwater Valley Dairy Cooperative',
      'Eskmere Regional Dairy Laboratory',
      'Larch Valley Milk Quality Board',
      // The intake: readings −0.5040 and −0.5031 °C, mean −0.50355 stored as −0.5036 °C, against −0.515 °C.
      '−0.5040, −0.5031 °C',
      '−0.5036 °C against the limit −0.5150 °C',
      'rejected (not paid)',
      // The retest: −0.5038 and −0.5042 °C, mean −0.5040 °C.
      '−0.5038, −0.5042 °C',
      '−0.5040 °C (mean of 2 readings)',
      '5 of 5 within ±4.0 m°C of −0.512 °C (3 needed): pass',
      'Accepted value −0.5038 °C (mean of both laboratories)',
      'The laboratories differ by 0.45 m°C against a critical difference of 5.292 m°C: they agree.',
      'Intake result upheld',
      'The decision module proposed uphold; the board followed the proposal.',
      REASONS,
      'Withheld at intake: 9,000 l × 0.46 EUR/l = €4,140.00.',
      'The intake result stands: the €4,140.00 withheld at intake stays withheld.',
      "Referee laboratory's fee: €180.00, borne by the supplier",
      world.actors.arbiter.name,
      'Arbiter, Larch Valley Milk Quality Board',
      'binding decision',
      'password,',
      row.recordSha256!,
      row.recordSignature!,
      row.signingKeyId!,
      `http://localhost:3000/verify?hash=${row.recordSha256}`,
      'Local regulations and the supply contract prevail.',
      // Every page says which it is, and of how many: a letter with a page missing shows it.
      'page 1 of',
    ];
    // A reader splits runs of glyphs at its own whim ("°" and "C" may come apart): compare without white space.
    const squashed = text.replace(/\s+/g, '');
    for (const phrase of expected) expect(squashed, phrase).toContain(phrase.replace(/\s+/g, ''));
    expect(squashed).toContain('PassThefirsttworetestreadings');
    expect(squashed).toContain('FailTheacceptedvalue−0.5038°Cagainsttheupperlimit');
  });
});

describe('the public key', () => {
  it('is published at the well-known address and verifies the letters’ signatures', async () => {
    const { row } = await sealedCase();
    const response = keyRoute();
    expect(response.status).toBe(200);
    const published = (await response.json()) as { algorithm: string; keyId: string; publicKeyPem: string; publicKeySpkiBase64: string };
    expect(published.algorithm).toBe('Ed25519');
    expect(published.keyId).toBe(row.signingKeyId);
    expect(JSON.stringify(published)).not.toMatch(/PRIVATE/);
    const key = createPublicKey(published.publicKeyPem);
    expect(verify(null, signedMessage(row.recordSha256!), key, Buffer.from(row.recordSignature!, 'base64'))).toBe(true);
    // The signature covers this hash and no other.
    expect(verify(null, signedMessage('0'.repeat(64)), key, Buffer.from(row.recordSignature!, 'base64'))).toBe(false);
  });
});

describe('verification', () => {
  it('recognises the record hash and the letter file as issued, and says nothing of the record', async () => {
    const { c, row } = await sealedCase();
    const letter = Buffer.from(await (await getLetter('supplier', c.id)).arrayBuffer());
    const byRecord = await publicVerification(getDb(), { recordSha256: row.recordSha256! });
    expect(byRecord).toEqual({ found: true, matchedBy: 'record', caseNumber: c.number, signedAt: row.signedAt.toISOString(), recordSha256: row.recordSha256, intact: true, signatureValid: true, superseded: null });
    expect(await publicVerification(getDb(), { letterSha256: sha256Hex(letter) })).toMatchObject({ found: true, matchedBy: 'letter', caseNumber: c.number, intact: true, signatureValid: true });
    expect(await publicVerification(getDb(), { recordSha256: sha256Hex('not a record') })).toEqual({ found: false });
    expect(await publicVerification(getDb(), { letterSha256: row.recordSha256! })).toEqual({ found: false });
    const answer = JSON.stringify(byRecord);
    for (const secret of [REASONS, 'Upper Larch', '4,140', world.actors.arbiter.name]) expect(answer).not.toContain(secret);
  });

  it('checks an uploaded letter on the server, and names a changed copy as changed with the record it claims', async () => {
    const { c, row } = await sealedCase();
    const letter = Buffer.from(await (await getLetter('supplier', c.id)).arrayBuffer());
    const asIssued = new FormData();
    asIssued.set('file', new File([new Uint8Array(letter)], 'letter.pdf', { type: 'application/pdf' }));
    expect(await checkLetter(asIssued)).toMatchObject({ ok: true, check: { fileSha256: sha256Hex(letter), byFile: { found: true, caseNumber: c.number, intact: true }, byEmbeddedHash: null } });

    const changed = Buffer.concat([letter, Buffer.from('\n% saved again by a viewer\n')]);
    const resaved = new FormData();
    resaved.set('file', new File([new Uint8Array(changed)], 'letter.pdf', { type: 'application/pdf' }));
    expect(await checkLetter(resaved)).toMatchObject({ ok: true, check: { byFile: { found: false }, embeddedRecordSha256: row.recordSha256, byEmbeddedHash: { found: true, caseNumber: c.number } } });

    // The browser path: only the hashes travel.
    const hashesOnly = new FormData();
    hashesOnly.set('fileSha256', sha256Hex(letter));
    expect(await checkLetter(hashesOnly)).toMatchObject({ ok: true, check: { byFile: { found: true } } });
    expect(await checkLetter(new FormData())).toEqual({ ok: false, message: 'Choose the letter’s PDF file.' });
  });

  it('verifies every seeded demo decision from the database', async () => {
    const rows = await getDb().select({ id: decision.id }).from(decision).where(eq(decision.reauthenticationMethod, 'none (demo seed)'));
    expect(rows.length).toBe(2);
    for (const r of rows) expect(await verifySealedDecision(getDb(), r.id)).toMatchObject({ ok: true, hashMatches: true, signatureValid: true });
  });
});

describe('a field changed after sealing', () => {
  type Tamper = { title: string; change: (caseId: string, decisionId: string) => Promise<unknown> };
  const tampers: Tamper[] = [
    {
      title: 'a reading of the referee laboratory',
      change: async (caseId) => {
        const [set] = await getDb().select({ id: measurementSet.id }).from(measurementSet).where(eq(measurementSet.caseId, caseId));
        return getDb().update(reading).set({ valueTenthMilliC: -5150 }).where(and(eq(reading.measurementSetId, set.id), eq(reading.position, 1)));
      },
    },
    {
      title: 'the temperature of a custody step',
      change: async (caseId) => {
        const custody = await L.custodyOfCase(caseId);
        return getDb().update(custodyEvent).set({ tempTenthMilliC: 59_000 }).where(eq(custodyEvent.id, custody.find((e) => e.kind === 'dispatched')!.id));
      },
    },
    {
      title: 'the body of a note added behind the seal',
      change: async (caseId) =>
        getDb().insert(note).values({ caseId, authorUserId: world.actors.plant.userId, organisationId: world.org.plant, visibility: 'parties', body: { type: 'doc', content: [] } }),
    },
    { title: 'the reasons of the decision', change: async (_caseId, decisionId) => getDb().update(decision).set({ reasons: `${REASONS} (edited)` }).where(eq(decision.id, decisionId)) },
    { title: 'the case’s grounds', change: async (caseId) => getDb().update(disputeCase).set({ explanation: 'A different account of the dispute.' }).where(eq(disputeCase.id, caseId)) },
  ];

  it.each(tampers)('$title: verify:decision fails, the verification page says the record no longer matches, and no letter is issued', async ({ change }) => {
    const { c, row } = await sealedCase();
    expect(await verifySealedDecision(getDb(), row.id)).toMatchObject({ ok: true });
    await change(c.id, row.id);

    const check = await verifySealedDecision(getDb(), row.id);
    expect(check).toMatchObject({ ok: false, hashMatches: false, storedSha256: row.recordSha256, signatureValid: true });
    expect(check!.recomputedSha256).not.toBe(row.recordSha256);
    expect(check!.problems.join(' ')).toMatch(/changed after sealing/);
    expect(await publicVerification(getDb(), { recordSha256: row.recordSha256! })).toMatchObject({ found: true, intact: false });
    const problem = await L.expectProblem(await getLetter('supplier', c.id), 409);
    expect(problem.detail).toMatch(/no longer matches its seal/);
  });

  it('after a key rotation, a decision sealed under the old key verifies while that key is listed as retired, and fails once it is not', async () => {
    const { row } = await sealedCase();
    const { generateKeyPairSync } = await import('node:crypto');
    const { loadSigningKey, signingKey } = await import('@/lib/decision/signing-key');
    const { publicSigningKey } = await import('@/lib/decision/public-key');
    const old = signingKey();
    const nextPem = generateKeyPairSync('ed25519').privateKey.export({ type: 'pkcs8', format: 'pem' }).toString();
    // What a restart with the new settings does: the process loads its key once.
    const restartWith = (retired?: string) => {
      (globalThis as { __countersampleSigningKey?: unknown }).__countersampleSigningKey = loadSigningKey({ APP_ENV: 'production', DECISION_SIGNING_KEY: nextPem, DECISION_RETIRED_PUBLIC_KEYS: retired });
    };
    try {
      restartWith(old.publicKeyPem);
      expect(signingKey().keyId).not.toBe(old.keyId);
      expect(await verifySealedDecision(getDb(), row.id)).toMatchObject({ ok: true, signatureValid: true, keyIsCurrent: false, signingKeyId: old.keyId });
      expect(publicSigningKey().retiredKeys.map((k) => k.keyId)).toEqual([old.keyId]);

      restartWith(undefined);
      const check = await verifySealedDecision(getDb(), row.id);
      expect(check).toMatchObject({ ok: false, hashMatches: true, signatureValid: false });
      expect(check!.problems.join(' ')).toMatch(/neither the server's current key .* nor one of its retired keys/);
    } finally {
      (globalThis as { __countersampleSigningKey?: unknown }).__countersampleSigningKey = old;
    }
  });

  it('a forged signature fails even when the record is unchanged', async () => {
    const { row } = await sealedCase();
    const other = await sealedCase();
    await getDb().update(decision).set({ recordSignature: other.row.recordSignature }).where(eq(decision.id, row.id));
    expect(await verifySealedDecision(getDb(), row.id)).toMatchObject({ ok: false, hashMatches: true, signatureValid: false });
    expect(await publicVerification(getDb(), { recordSha256: row.recordSha256! })).toMatchObject({ found: true, intact: true, signatureValid: false });
  });
});

describe('a correction', () => {
  function correction(supersedesId: string, overrides: Record<string, unknown> = {}) {
    return {
      supersedesId,
      outcome: 'reverse',
      reasons: 'The retained sample’s seal record was found to belong to another load; the intake result cannot stand.',
      departureReason: 'The seal mix-up is outside what the decision module sees.',
      correctionReason: 'A custody record of another load was read as this one’s when the first decision was made.',
      confirm: true,
      password: TEST_PASSWORD,
      ...overrides,
    };
  }

  it('is a new sealed decision that supersedes the old one; both are kept and both verify', async () => {
    const { c, row: first } = await sealedCase();
    const seq = await L.lastAuditSeq();
    const corrected = await correctDecision(getDb(), world.actors.arbiter2, c.id, correction(first.id));
    expect(corrected).toMatchObject({ caseId: c.id, outcome: 'reverse', supersedesId: first.id });

    const rows = await getDb().select().from(decision).where(eq(decision.caseId, c.id));
    expect(rows).toHaveLength(2);
    const second = rows.find((r) => r.id === corrected.decisionId)!;
    expect(second).toMatchObject({ supersedesId: first.id, outcome: 'reverse', followedProposal: false, signerName: world.actors.arbiter2.name });
    expect(rows.find((r) => r.id === first.id)).toEqual(first);
    expect((await L.caseRow(c.id)).status).toBe('decided');

    expect(await verifySealedDecision(getDb(), first.id)).toMatchObject({ ok: true, supersededBy: { id: second.id } });
    expect(await verifySealedDecision(getDb(), second.id)).toMatchObject({ ok: true, supersededBy: null });
    expect(await publicVerification(getDb(), { recordSha256: first.recordSha256! })).toMatchObject({ found: true, intact: true, superseded: { signedAt: second.signedAt.toISOString() } });

    const events = await L.auditSince(seq);
    expect(events.find((e) => e.action === 'decision.sealed')).toMatchObject({ objectId: second.id, change: { supersedesId: first.id, correctionReason: correction(first.id).correctionReason } });
    // The current letter is the correction's, and it says what it corrects; the old one stays available.
    const text = await pdfText(Buffer.from(await (await getLetter('supplier', c.id)).arrayBuffer()));
    expect(text).toContain('Intake result reversed');
    expect(text).toContain(`supersedes the earlier decision ${first.id}`);
    expect((await getLetter('supplier', c.id, `?decision=${first.id}`)).status).toBe(200);
    expect(catcher.messages.some((m) => m.subject === `${c.number}: the board has corrected its decision (intake result reversed)`)).toBe(true);
  });

  it('accepts only the current decision, from an arbiter of the board with the right password', async () => {
    const { c, row: first } = await sealedCase();
    const before = await getDb().select({ n: count() }).from(decision).where(eq(decision.caseId, c.id));
    await L.expectAppError(correctDecision(getDb(), world.actors.admin, c.id, correction(first.id)), 'not_found');
    await L.expectAppError(correctDecision(getDb(), world.actors.otherArbiter, c.id, correction(first.id)), 'not_found');
    await L.expectAppError(correctDecision(getDb(), world.actors.supplier, c.id, correction(first.id)), 'forbidden');
    await L.expectAppError(correctDecision(getDb(), world.actors.arbiter, c.id, correction(first.id, { password: 'wrong-password-here' })), 'invalid');
    await L.expectAppError(correctDecision(getDb(), world.actors.arbiter, c.id, correction(first.id, { correctionReason: 'typo' })), 'invalid');
    expect(await getDb().select({ n: count() }).from(decision).where(eq(decision.caseId, c.id))).toEqual(before);

    await correctDecision(getDb(), world.actors.arbiter, c.id, correction(first.id));
    // The first decision is no longer current: correcting it again is a conflict.
    await L.expectAppError(correctDecision(getDb(), world.actors.arbiter2, c.id, correction(first.id)), 'conflict');
    const open = await L.freshCaseIn(world, 'review');
    await L.expectAppError(correctDecision(getDb(), world.actors.arbiter, open.id, correction(first.id)), 'conflict');
  });

  it('lets one of two simultaneous corrections of the same decision win', async () => {
    const { c, row: first } = await sealedCase();
    const results = await Promise.allSettled([
      correctDecision(getDb(), world.actors.arbiter, c.id, correction(first.id)),
      correctDecision(getDb(), world.actors.arbiter2, c.id, correction(first.id, { outcome: 'uphold', departureReason: '' })),
    ]);
    expect(results.map((r) => r.status).sort()).toEqual(['fulfilled', 'rejected']);
    expect((results.find((r) => r.status === 'rejected') as PromiseRejectedResult).reason).toMatchObject({ code: 'conflict' });
    const [{ n }] = await getDb().select({ n: count() }).from(decision).where(and(eq(decision.caseId, c.id), sql`${decision.supersedesId} is not null`));
    expect(n).toBe(1);
  });
});
