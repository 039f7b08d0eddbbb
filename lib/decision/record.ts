import { canonicalJson, sha256Hex } from '@/lib/canonical-json';

/**
 * The sealed case record: everything a binding decision rests on, as plain JSON. Its SHA-256 over
 * the RFC 8785 canonical form is what the server signs and the letter prints. Only what cannot
 * change after sealing belongs here (no status, no "updated at"), so the hash can be recomputed from
 * the database at any later time and must come out the same. Lists are sorted here, never left to
 * the order a query happened to return.
 */
export const RECORD_FORMAT = 'countersample.sealed-case-record';
export const RECORD_VERSION = 1;

type Iso = string;

export type RecordOrganisation = { id: string; name: string; kind: string };

export type RecordCase = {
  id: string;
  number: string;
  openedAt: Iso;
  openedBy: string;
  grounds: string[];
  explanation: string;
  remedy: string;
  supplierOrganisationId: string;
  plantOrganisationId: string;
  labOrganisationId: string | null;
  boardOrganisationId: string;
  rulesVersionId: string;
  retestSubmittedAt: Iso | null;
};

export type RecordRules = { id: string; version: number; effectiveFrom: Iso; rules: unknown };

export type RecordDelivery = {
  id: string;
  reference: string;
  farm: { id: string; name: string; herdCode: string };
  collectedAt: Iso;
  receivedAt: Iso;
  volumeLitres: number;
  tanker: string;
  compartment: string;
  receiptTempTenthMilliC: number;
};

export type RecordIntakeResult = {
  id: string;
  measurementSetId: string;
  rulesVersionId: string;
  verdict: 'accepted' | 'deducted' | 'rejected';
  valueTenthMilliC: number;
  limitTenthMilliC: number;
  decisionRule: string;
  addedWaterBasisPoints: number;
  amountMinor: number;
  currency: string;
  decidedAt: Iso;
  notifiedAt: Iso | null;
  supersedesId: string | null;
  correctionReason: string | null;
};

export type RecordCalibrationCheck = {
  id: string;
  checkedAt: Iso;
  analystName: string;
  nominalTenthMilliC: number;
  readingsTenthMilliC: number[];
  toleranceTenthMilliC: number;
  required: number;
  within: number;
  pass: boolean;
};

export type RecordMeasurementSet = {
  id: string;
  purpose: string;
  sampleId: string;
  organisationId: string;
  instrument: { id: string; serialNumber: string; description: string };
  calibrationCheck: RecordCalibrationCheck | null;
  analystName: string;
  testedAt: Iso;
  sampleTempTenthMilliC: number | null;
  preparation: string;
  resultTenthMilliC: number | null;
  resultBasis: string | null;
  readingsUsed: number | null;
  submittedAt: Iso | null;
  readings: { position: number; valueTenthMilliC: number; flag: string }[];
};

export type RecordCustodyEvent = {
  id: string;
  kind: string;
  at: Iso;
  organisationId: string;
  actorUserId: string | null;
  location: string | null;
  tempTenthMilliC: number | null;
  sealIntact: boolean | null;
  frozen: boolean | null;
  note: string | null;
};

export type RecordSample = {
  id: string;
  code: string;
  kind: string;
  caseId: string | null;
  sealNumber: string | null;
  preservative: string | null;
  storage: string | null;
  sampledAt: Iso;
  custody: RecordCustodyEvent[];
};

export type RecordAttachment = {
  id: string;
  kind: string;
  fileName: string;
  contentType: string;
  sizeBytes: number;
  sha256: string;
  uploadedBy: string;
  organisationId: string;
  createdAt: Iso;
  removedAt: Iso | null;
};

/** A note is sealed by the hash of its body: the record proves it unchanged without repeating it. */
export type RecordNote = {
  id: string;
  parentId: string | null;
  authorUserId: string;
  organisationId: string;
  visibility: string;
  createdAt: Iso;
  editedAt: Iso | null;
  bodySha256: string;
};

export type RecordDecision = {
  id: string;
  caseId: string;
  outcome: string;
  reasons: string;
  followedProposal: boolean;
  departureReason: string | null;
  settlement: unknown;
  signer: { userId: string; name: string };
  signedAt: Iso;
  signatureMeaning: string;
  reauthenticatedAt: Iso;
  reauthenticationMethod: string;
  /** A correction names the decision it replaces and that decision's sealed hash. */
  supersedes: { id: string; recordSha256: string } | null;
};

/** Everything of the case that the decision rests on; the same for every decision of the case. */
export type CaseEvidence = {
  case: RecordCase;
  organisations: RecordOrganisation[];
  rules: RecordRules;
  delivery: RecordDelivery;
  intakeResult: RecordIntakeResult;
  measurementSets: RecordMeasurementSet[];
  samples: RecordSample[];
  attachments: RecordAttachment[];
  notes: RecordNote[];
};

export type SealedRecord = CaseEvidence & {
  format: typeof RECORD_FORMAT;
  version: typeof RECORD_VERSION;
  proposal: unknown;
  decision: RecordDecision;
};

const byKeys =
  <T>(...keys: ((item: T) => string | number)[]) =>
  (a: T, b: T): number => {
    for (const key of keys) {
      const x = key(a);
      const y = key(b);
      if (x < y) return -1;
      if (x > y) return 1;
    }
    return 0;
  };

/** The note body's own hash, over its canonical JSON. */
export function noteBodySha256(body: unknown): string {
  return sha256Hex(canonicalJson(body ?? null));
}

/** Puts the parts in their one canonical order and adds the proposal and the decision. */
export function sealedRecord(evidence: CaseEvidence, proposal: unknown, decision: RecordDecision): SealedRecord {
  return {
    format: RECORD_FORMAT,
    version: RECORD_VERSION,
    case: evidence.case,
    organisations: [...evidence.organisations].sort(byKeys((o) => o.id)),
    rules: evidence.rules,
    delivery: evidence.delivery,
    intakeResult: evidence.intakeResult,
    measurementSets: [...evidence.measurementSets]
      .sort(byKeys((s) => s.testedAt, (s) => s.id))
      .map((s) => ({ ...s, readings: [...s.readings].sort(byKeys((r) => r.position)) })),
    samples: [...evidence.samples]
      .sort(byKeys((s) => s.sampledAt, (s) => s.code, (s) => s.id))
      .map((s) => ({ ...s, custody: [...s.custody].sort(byKeys((c) => c.at, (c) => c.id)) })),
    attachments: [...evidence.attachments].sort(byKeys((a) => a.createdAt, (a) => a.id)),
    notes: [...evidence.notes].sort(byKeys((n) => n.createdAt, (n) => n.id)),
    proposal,
    decision,
  };
}

/** The SHA-256 (lowercase hex) of the record's canonical JSON. */
export function recordSha256(record: SealedRecord): string {
  return sha256Hex(canonicalJson(record));
}

export function isSha256Hex(value: string): boolean {
  return /^[0-9a-f]{64}$/.test(value);
}
