import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { generateKeyPairSync } from 'node:crypto';
import { afterAll, describe, expect, it } from 'vitest';
import { canonicalJson, sha256Hex } from '@/lib/canonical-json';
import { noteBodySha256, recordSha256, sealedRecord, type CaseEvidence, type RecordDecision } from '@/lib/decision/record';
import { keyIdOf, parsePrivateKey, publicKeyOf, signRecordHash, signedMessage, SigningKeyError, verifyRecordSignature } from '@/lib/decision/signature';
import { loadSigningKey, readOrCreateKeyFile, verificationKey } from '@/lib/decision/signing-key';
import { embeddedRecordHash } from '@/lib/decision/letter/marker';
import { recordHashSchema, signDecisionSchema } from '@/lib/decision/schemas';

const at = (hour: number) => new Date(Date.UTC(2026, 4, 12, hour)).toISOString();

const evidence: CaseEvidence = {
  case: {
    id: 'c1', number: 'CS-2026-0099', openedAt: at(9), openedBy: 'u-supplier', grounds: ['instrument'], explanation: 'Our tank read −0.521 °C.', remedy: 'Pay in full.',
    supplierOrganisationId: 'o-supplier', plantOrganisationId: 'o-plant', labOrganisationId: 'o-lab', boardOrganisationId: 'o-board', rulesVersionId: 'r1', retestSubmittedAt: at(15),
  },
  organisations: [
    { id: 'o-plant', name: 'Plant', kind: 'plant' },
    { id: 'o-board', name: 'Board', kind: 'board' },
  ],
  rules: { id: 'r1', version: 1, effectiveFrom: at(0), rules: { limits: { upper: -0.515 } } },
  delivery: { id: 'd1', reference: 'LW-1', farm: { id: 'f1', name: 'Farm', herdCode: 'UL-1' }, collectedAt: at(5), receivedAt: at(6), volumeLitres: 9000, tanker: 'T', compartment: '1', receiptTempTenthMilliC: 41_000 },
  intakeResult: { id: 'i1', measurementSetId: 'm1', rulesVersionId: 'r1', verdict: 'rejected', valueTenthMilliC: -5036, limitTenthMilliC: -5150, decisionRule: 'guarded_rejection', addedWaterBasisPoints: 316, amountMinor: 414_000, currency: 'EUR', decidedAt: at(7), notifiedAt: at(7), supersedesId: null, correctionReason: null },
  measurementSets: [
    { id: 'm2', purpose: 'retest', sampleId: 's1', organisationId: 'o-lab', instrument: { id: 'x2', serialNumber: 'ESK-7', description: 'bench' }, calibrationCheck: null, analystName: 'A', testedAt: at(15), sampleTempTenthMilliC: null, preparation: 'none', resultTenthMilliC: -5040, resultBasis: 'mean_of_2', readingsUsed: 2, submittedAt: at(15), readings: [{ position: 2, valueTenthMilliC: -5042, flag: 'none' }, { position: 1, valueTenthMilliC: -5038, flag: 'none' }] },
    { id: 'm1', purpose: 'intake', sampleId: 's0', organisationId: 'o-plant', instrument: { id: 'x1', serialNumber: 'LW-1', description: 'bay' }, calibrationCheck: null, analystName: 'B', testedAt: at(7), sampleTempTenthMilliC: 200_000, preparation: 'none', resultTenthMilliC: -5036, resultBasis: 'mean_of_2', readingsUsed: 2, submittedAt: at(7), readings: [{ position: 1, valueTenthMilliC: -5040, flag: 'none' }, { position: 2, valueTenthMilliC: -5031, flag: 'none' }] },
  ],
  samples: [{ id: 's1', code: 'K-1', kind: 'retained', caseId: null, sealNumber: 'LVS-1', preservative: null, storage: null, sampledAt: at(5), custody: [{ id: 'e2', kind: 'received', at: at(12), organisationId: 'o-lab', actorUserId: null, location: null, tempTenthMilliC: 46_000, sealIntact: true, frozen: false, note: null }, { id: 'e1', kind: 'sealed', at: at(5), organisationId: 'o-plant', actorUserId: null, location: null, tempTenthMilliC: null, sealIntact: true, frozen: null, note: null }] }],
  attachments: [],
  notes: [{ id: 'n1', parentId: null, authorUserId: 'u-plant', organisationId: 'o-plant', visibility: 'parties', createdAt: at(10), editedAt: null, bodySha256: noteBodySha256({ type: 'doc', content: [] }) }],
};

const decision: RecordDecision = {
  id: 'dec1', caseId: 'c1', outcome: 'uphold', reasons: 'Both agree.', followedProposal: true, departureReason: null, settlement: { lines: ['x'] },
  signer: { userId: 'u-arbiter', name: 'R. Oakenshaw' }, signedAt: at(18), signatureMeaning: 'binding decision', reauthenticatedAt: at(18), reauthenticationMethod: 'password', supersedes: null,
};

describe('the sealed record', () => {
  it('is put in one canonical order, whatever order its parts came in', () => {
    const record = sealedRecord(evidence, { outcome: 'uphold' }, decision);
    expect(record.measurementSets.map((s) => s.id)).toEqual(['m1', 'm2']);
    expect(record.measurementSets[1].readings.map((r) => r.position)).toEqual([1, 2]);
    expect(record.samples[0].custody.map((c) => c.id)).toEqual(['e1', 'e2']);
    expect(record.organisations.map((o) => o.id)).toEqual(['o-board', 'o-plant']);
    const shuffled: CaseEvidence = { ...evidence, measurementSets: [...evidence.measurementSets].reverse(), organisations: [...evidence.organisations].reverse() };
    expect(recordSha256(sealedRecord(shuffled, { outcome: 'uphold' }, decision))).toBe(recordSha256(record));
  });

  it('is hashed as SHA-256 of its RFC 8785 canonical JSON', () => {
    const record = sealedRecord(evidence, { outcome: 'uphold' }, decision);
    expect(recordSha256(record)).toBe(sha256Hex(canonicalJson(record)));
    expect(recordSha256(record)).toMatch(/^[0-9a-f]{64}$/);
    expect(record).toMatchObject({ format: 'countersample.sealed-case-record', version: 1 });
  });

  it('changes its hash when any sealed field changes', () => {
    const hash = recordSha256(sealedRecord(evidence, { outcome: 'uphold' }, decision));
    const variants: CaseEvidence[] = [
      { ...evidence, delivery: { ...evidence.delivery, volumeLitres: 9001 } },
      { ...evidence, intakeResult: { ...evidence.intakeResult, amountMinor: 413_999 } },
      { ...evidence, notes: [{ ...evidence.notes[0], bodySha256: noteBodySha256({ type: 'doc', content: [{ type: 'paragraph' }] }) }] },
      { ...evidence, samples: [{ ...evidence.samples[0], custody: [{ ...evidence.samples[0].custody[0], sealIntact: false }, evidence.samples[0].custody[1]] }] },
    ];
    for (const variant of variants) expect(recordSha256(sealedRecord(variant, { outcome: 'uphold' }, decision))).not.toBe(hash);
    expect(recordSha256(sealedRecord(evidence, { outcome: 'reverse' }, decision))).not.toBe(hash);
    expect(recordSha256(sealedRecord(evidence, { outcome: 'uphold' }, { ...decision, reasons: 'Both agree!' }))).not.toBe(hash);
    expect(recordSha256(sealedRecord(evidence, { outcome: 'uphold' }, { ...decision, supersedes: { id: 'dec0', recordSha256: hash } }))).not.toBe(hash);
  });

  it('hashes a note body by its content, not by the order of its keys', () => {
    expect(noteBodySha256({ type: 'doc', content: [] })).toBe(noteBodySha256({ content: [], type: 'doc' }));
    expect(noteBodySha256({ type: 'doc', content: [] })).not.toBe(noteBodySha256({ type: 'doc', content: [{ type: 'text', text: 'x' }] }));
  });
});

describe('the Ed25519 signature', () => {
  const { privateKey } = generateKeyPairSync('ed25519');
  const publicKey = publicKeyOf(privateKey);
  const hash = 'ab'.repeat(32);

  it('signs the prefixed hash and verifies only with the right key and hash', () => {
    const signature = signRecordHash(privateKey, hash);
    expect(Buffer.from(signature, 'base64')).toHaveLength(64);
    expect(signedMessage(hash).toString()).toBe(`countersample-sealed-record:v1:${hash}`);
    expect(verifyRecordSignature(publicKey, hash, signature)).toBe(true);
    expect(verifyRecordSignature(publicKey, 'cd'.repeat(32), signature)).toBe(false);
    expect(verifyRecordSignature(publicOf(), hash, signature)).toBe(false);
    expect(verifyRecordSignature(publicKey, hash, 'not a signature')).toBe(false);
  });

  it('names a key by the first 16 hex digits of its SPKI hash', () => {
    expect(keyIdOf(publicKey)).toBe(sha256Hex(publicKey.export({ type: 'spki', format: 'der' })).slice(0, 16));
  });

  function publicOf() {
    return generateKeyPairSync('ed25519').publicKey;
  }
});

describe('the signing key setting', () => {
  const { privateKey } = generateKeyPairSync('ed25519');
  const pem = privateKey.export({ type: 'pkcs8', format: 'pem' }).toString();
  const der = privateKey.export({ type: 'pkcs8', format: 'der' }).toString('base64');
  const folder = fs.mkdtempSync(path.join(os.tmpdir(), 'countersample-key-'));
  afterAll(() => fs.rmSync(folder, { recursive: true, force: true }));

  it('takes PKCS#8 PEM, PEM with written-out line breaks, and base64 DER, all as the same key', () => {
    const id = keyIdOf(publicKeyOf(privateKey));
    for (const text of [pem, pem.replaceAll('\n', '\\n'), der]) expect(keyIdOf(publicKeyOf(parsePrivateKey(text)))).toBe(id);
    expect(loadSigningKey({ APP_ENV: 'production', DECISION_SIGNING_KEY: pem }, path.join(folder, 'unused.pem'))).toMatchObject({ keyId: id, source: 'setting' });
  });

  it('refuses a key that is not Ed25519, or no key at all, naming the setting', () => {
    const rsa = generateKeyPairSync('rsa', { modulusLength: 2048 }).privateKey.export({ type: 'pkcs8', format: 'pem' }).toString();
    expect(() => parsePrivateKey(rsa)).toThrow(/rsa key; the decision seal needs an Ed25519 key/);
    expect(() => loadSigningKey({ APP_ENV: 'development', DECISION_SIGNING_KEY: 'bm90IGEga2V5' })).toThrow(/^DECISION_SIGNING_KEY is not a private key/);
    expect(() => loadSigningKey({ APP_ENV: 'production', DECISION_SIGNING_KEY: undefined })).toThrow(SigningKeyError);
    expect(() => loadSigningKey({ APP_ENV: 'production', DECISION_SIGNING_KEY: undefined })).toThrow(/must be set in production/);
  });

  it('takes retired public keys as PEM blocks or base64 DER, drops the current key and repeats, and refuses anything else', () => {
    const older = generateKeyPairSync('ed25519').publicKey;
    const oldest = generateKeyPairSync('ed25519').publicKey;
    const olderPem = older.export({ type: 'spki', format: 'pem' }).toString();
    const oldestDer = oldest.export({ type: 'spki', format: 'der' }).toString('base64');
    const currentPem = publicKeyOf(privateKey).export({ type: 'spki', format: 'pem' }).toString();
    const key = loadSigningKey({ APP_ENV: 'production', DECISION_SIGNING_KEY: pem, DECISION_RETIRED_PUBLIC_KEYS: `${olderPem},${oldestDer}, ${olderPem}${currentPem}` });
    expect(key.retired.map((k) => k.keyId)).toEqual([keyIdOf(older), keyIdOf(oldest)]);
    expect(verificationKey(key, keyIdOf(oldest))?.keyId).toBe(keyIdOf(oldest));
    expect(verificationKey(key, key.keyId)?.keyId).toBe(key.keyId);
    expect(verificationKey(key, '0000000000000000')).toBeNull();
    const rsa = generateKeyPairSync('rsa', { modulusLength: 2048 }).publicKey.export({ type: 'spki', format: 'pem' }).toString();
    expect(() => loadSigningKey({ APP_ENV: 'production', DECISION_SIGNING_KEY: pem, DECISION_RETIRED_PUBLIC_KEYS: rsa })).toThrow(/^DECISION_RETIRED_PUBLIC_KEYS holds a rsa key/);
    expect(() => loadSigningKey({ APP_ENV: 'production', DECISION_SIGNING_KEY: pem, DECISION_RETIRED_PUBLIC_KEYS: 'bm90IGEga2V5' })).toThrow(/^DECISION_RETIRED_PUBLIC_KEYS holds something that is not a public key/);
  });

  it('makes a development key on first start, keeps it private, and gives the same key on every later start', () => {
    const file = path.join(folder, 'nested', 'decision-signing-key.pem');
    const first = loadSigningKey({ APP_ENV: 'development', DECISION_SIGNING_KEY: undefined }, file);
    expect(first.source).toBe('development key file');
    expect(fs.statSync(file).mode & 0o777).toBe(0o600);
    const again = loadSigningKey({ APP_ENV: 'demo', DECISION_SIGNING_KEY: undefined }, file);
    expect(again.keyId).toBe(first.keyId);
    expect(fs.readdirSync(path.dirname(file))).toEqual(['decision-signing-key.pem']);
    expect(keyIdOf(publicKeyOf(readOrCreateKeyFile(file)))).toBe(first.keyId);
  });

  it('says which file holds a broken development key', () => {
    const file = path.join(folder, 'broken.pem');
    fs.writeFileSync(file, 'garbage');
    expect(() => readOrCreateKeyFile(file)).toThrow(/broken\.pem .*delete it/);
  });

  it('gives tests a key of their own, never touching a file', () => {
    const file = path.join(folder, 'never.pem');
    expect(loadSigningKey({ APP_ENV: 'test', DECISION_SIGNING_KEY: undefined }, file).source).toBe('ephemeral test key');
    expect(fs.existsSync(file)).toBe(false);
  });
});

describe('the letter’s record marker', () => {
  it('finds the record hash a PDF names in its metadata, and nothing in a file without one', () => {
    const hash = 'f0'.repeat(32);
    const pdf = new TextEncoder().encode(`%PDF-1.3\n20 0 obj\n(countersample-record-sha256:${hash})\nendobj\n`);
    expect(embeddedRecordHash(pdf)).toBe(hash);
    expect(embeddedRecordHash(new TextEncoder().encode('%PDF-1.3 nothing here'))).toBeNull();
    expect(embeddedRecordHash(new TextEncoder().encode('countersample-record-sha256:XYZ'))).toBeNull();
  });
});

describe('the decision form’s schema', () => {
  const valid = { outcome: 'uphold', reasons: 'Both laboratories agree within the critical difference.', departureReason: '', confirm: 'on', password: 'x' };

  it('accepts the proposal’s outcome without a departure reason, and coerces the checkbox', () => {
    expect(signDecisionSchema('uphold').parse(valid)).toMatchObject({ outcome: 'uphold', confirm: true, departureReason: '' });
  });

  it('asks for a departure reason when the outcome is not the proposal’s, alongside the other problems', () => {
    const result = signDecisionSchema('uphold').safeParse({ ...valid, outcome: 'reverse', reasons: 'too short' });
    expect(result.success).toBe(false);
    expect(result.error!.issues.map((i) => i.path.join('.')).sort()).toEqual(['departureReason', 'reasons']);
  });

  it('sends a further test to its own transition', () => {
    const result = signDecisionSchema('further_test').safeParse({ ...valid, outcome: 'further_test' });
    expect(result.error!.issues.map((i) => [i.path.join('.'), i.message.includes('Order a further test')])).toEqual([['outcome', true]]);
  });

  it('reads a typed record hash leniently and refuses anything that is not one', () => {
    expect(recordHashSchema.parse(`  ${'AB'.repeat(16)} ${'cd'.repeat(16)} `)).toBe('ab'.repeat(16) + 'cd'.repeat(16));
    expect(recordHashSchema.safeParse('abc').success).toBe(false);
    expect(recordHashSchema.safeParse('g'.repeat(64)).success).toBe(false);
  });
});
