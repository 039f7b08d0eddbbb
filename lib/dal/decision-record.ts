import 'server-only';
import { eq, inArray, or } from 'drizzle-orm';
import type { DbOrTx } from '@/db/client';
import { pipelined } from '@/db/pipeline';
import {
  attachment,
  calibrationCheck,
  custodyEvent,
  decision,
  delivery,
  disputeCase,
  instrument,
  intakeResult,
  measurementSet,
  note,
  organisation,
  reading,
  sample,
  schemeRules,
  supplierFarm,
} from '@/db/schema';
import { noteBodySha256, sealedRecord, type CaseEvidence, type RecordDecision, type SealedRecord } from '@/lib/decision/record';

type DecisionRow = typeof decision.$inferSelect;

const iso = (value: Date) => value.toISOString();
const isoOrNull = (value: Date | null) => (value ? value.toISOString() : null);

/** JSON as the database gives it back: what is sealed must be what a later read will see. */
export function asStoredJson<T>(value: T): T {
  return JSON.parse(JSON.stringify(value)) as T;
}

/**
 * Reads, unscoped, everything of a case that its decision rests on. Callers have already decided the
 * actor may seal or verify it; nothing read here is returned to a browser as it is.
 */
export async function caseEvidence(db: DbOrTx, caseId: string): Promise<CaseEvidence> {
  const [row] = await db.select().from(disputeCase).where(eq(disputeCase.id, caseId));
  if (!row) throw new Error(`Case ${caseId} does not exist`);
  // Pipelined, not Promise.all: sealing reads this inside its transaction, where a PostgreSQL client takes one statement at a time.
  const [[rules], [load], [result]] = await pipelined([
    () => db.select().from(schemeRules).where(eq(schemeRules.id, row.rulesVersionId)),
    () =>
      db
        .select({ delivery, farm: { id: supplierFarm.id, name: supplierFarm.name, herdCode: supplierFarm.herdCode } })
        .from(delivery)
        .innerJoin(supplierFarm, eq(supplierFarm.id, delivery.farmId))
        .where(eq(delivery.id, row.deliveryId)),
    () => db.select().from(intakeResult).where(eq(intakeResult.id, row.intakeResultId)),
  ]);
  if (!rules || !load || !result) throw new Error(`Case ${row.number} is missing its rules, delivery or intake result`);

  const [sets, samples, files, notes] = await pipelined([
    () =>
      db
        .select({ set: measurementSet, instrument: { id: instrument.id, serialNumber: instrument.serialNumber, description: instrument.description } })
        .from(measurementSet)
        .innerJoin(instrument, eq(instrument.id, measurementSet.instrumentId))
        .where(or(eq(measurementSet.caseId, row.id), eq(measurementSet.id, result.measurementSetId))),
    () => db.select().from(sample).where(or(eq(sample.deliveryId, row.deliveryId), eq(sample.caseId, row.id))),
    () => db.select().from(attachment).where(eq(attachment.caseId, row.id)),
    () => db.select().from(note).where(eq(note.caseId, row.id)),
  ]);
  const setIds = sets.map((s) => s.set.id);
  const checkIds = sets.map((s) => s.set.calibrationCheckId).filter((id): id is string => id !== null);
  const sampleIds = samples.map((s) => s.id);
  const [readings, checks, custody] = await pipelined([
    () => (setIds.length ? db.select().from(reading).where(inArray(reading.measurementSetId, setIds)) : Promise.resolve([])),
    () => (checkIds.length ? db.select().from(calibrationCheck).where(inArray(calibrationCheck.id, checkIds)) : Promise.resolve([])),
    () => (sampleIds.length ? db.select().from(custodyEvent).where(inArray(custodyEvent.sampleId, sampleIds)) : Promise.resolve([])),
  ]);

  const organisationIds = new Set<string>([row.supplierOrganisationId, row.plantOrganisationId, row.boardOrganisationId]);
  if (row.labOrganisationId) organisationIds.add(row.labOrganisationId);
  for (const s of sets) organisationIds.add(s.set.organisationId);
  for (const c of custody) organisationIds.add(c.organisationId);
  for (const f of files) organisationIds.add(f.organisationId);
  for (const n of notes) organisationIds.add(n.organisationId);
  const organisations = await db.select({ id: organisation.id, name: organisation.name, kind: organisation.kind }).from(organisation).where(inArray(organisation.id, [...organisationIds]));

  return {
    case: {
      id: row.id,
      number: row.number,
      openedAt: iso(row.openedAt),
      openedBy: row.openedBy,
      grounds: [...row.grounds],
      explanation: row.explanation,
      remedy: row.remedy,
      supplierOrganisationId: row.supplierOrganisationId,
      plantOrganisationId: row.plantOrganisationId,
      labOrganisationId: row.labOrganisationId,
      boardOrganisationId: row.boardOrganisationId,
      rulesVersionId: row.rulesVersionId,
      retestSubmittedAt: isoOrNull(row.retestSubmittedAt),
    },
    organisations,
    rules: { id: rules.id, version: rules.version, effectiveFrom: iso(rules.effectiveFrom), rules: rules.rules },
    delivery: {
      id: load.delivery.id,
      reference: load.delivery.reference,
      farm: load.farm,
      collectedAt: iso(load.delivery.collectedAt),
      receivedAt: iso(load.delivery.receivedAt),
      volumeLitres: load.delivery.volumeLitres,
      tanker: load.delivery.tanker,
      compartment: load.delivery.compartment,
      receiptTempTenthMilliC: load.delivery.receiptTempTenthMilliC,
    },
    intakeResult: {
      id: result.id,
      measurementSetId: result.measurementSetId,
      rulesVersionId: result.rulesVersionId,
      verdict: result.verdict,
      valueTenthMilliC: result.valueTenthMilliC,
      limitTenthMilliC: result.limitTenthMilliC,
      decisionRule: result.decisionRule,
      addedWaterBasisPoints: result.addedWaterBasisPoints,
      amountMinor: result.amountMinor,
      currency: result.currency,
      decidedAt: iso(result.decidedAt),
      notifiedAt: isoOrNull(result.notifiedAt),
      supersedesId: result.supersedesId,
      correctionReason: result.correctionReason,
    },
    measurementSets: sets.map(({ set, instrument: device }) => {
      const check = checks.find((c) => c.id === set.calibrationCheckId);
      return {
        id: set.id,
        purpose: set.purpose,
        sampleId: set.sampleId,
        organisationId: set.organisationId,
        instrument: device,
        calibrationCheck: check
          ? {
              id: check.id,
              checkedAt: iso(check.checkedAt),
              analystName: check.analystName,
              nominalTenthMilliC: check.nominalTenthMilliC,
              readingsTenthMilliC: [...check.readingsTenthMilliC],
              toleranceTenthMilliC: check.toleranceTenthMilliC,
              required: check.required,
              within: check.within,
              pass: check.pass,
            }
          : null,
        analystName: set.analystName,
        testedAt: iso(set.testedAt),
        sampleTempTenthMilliC: set.sampleTempTenthMilliC,
        preparation: set.preparation,
        resultTenthMilliC: set.resultTenthMilliC,
        resultBasis: set.resultBasis,
        readingsUsed: set.readingsUsed,
        submittedAt: isoOrNull(set.submittedAt),
        readings: readings.filter((r) => r.measurementSetId === set.id).map((r) => ({ position: r.position, valueTenthMilliC: r.valueTenthMilliC, flag: r.flag })),
      };
    }),
    samples: samples.map((s) => ({
      id: s.id,
      code: s.code,
      kind: s.kind,
      caseId: s.caseId,
      sealNumber: s.sealNumber,
      preservative: s.preservative,
      storage: s.storage,
      sampledAt: iso(s.sampledAt),
      custody: custody
        .filter((c) => c.sampleId === s.id)
        .map((c) => ({
          id: c.id,
          kind: c.kind,
          at: iso(c.at),
          organisationId: c.organisationId,
          actorUserId: c.actorUserId,
          location: c.location,
          tempTenthMilliC: c.tempTenthMilliC,
          sealIntact: c.sealIntact,
          frozen: c.frozen,
          note: c.note,
        })),
    })),
    attachments: files.map((f) => ({
      id: f.id,
      kind: f.kind,
      fileName: f.fileName,
      contentType: f.contentType,
      sizeBytes: f.sizeBytes,
      sha256: f.sha256,
      uploadedBy: f.uploadedBy,
      organisationId: f.organisationId,
      createdAt: iso(f.createdAt),
      removedAt: isoOrNull(f.removedAt),
    })),
    notes: notes.map((n) => ({
      id: n.id,
      parentId: n.parentId,
      authorUserId: n.authorUserId,
      organisationId: n.organisationId,
      visibility: n.visibility,
      createdAt: iso(n.createdAt),
      editedAt: isoOrNull(n.editedAt),
      bodySha256: noteBodySha256(n.body),
    })),
  };
}

/** The decision part of the record, from its stored row and the row it supersedes. */
export function recordDecisionOf(row: DecisionRow, superseded: { id: string; recordSha256: string | null } | null): RecordDecision {
  if (row.supersedesId && (!superseded || superseded.id !== row.supersedesId || !superseded.recordSha256)) {
    throw new Error(`Decision ${row.id} supersedes ${row.supersedesId}, which has no sealed hash`);
  }
  return {
    id: row.id,
    caseId: row.caseId,
    outcome: row.outcome,
    reasons: row.reasons,
    followedProposal: row.followedProposal,
    departureReason: row.departureReason,
    settlement: row.settlement,
    signer: { userId: row.signerUserId, name: row.signerName },
    signedAt: iso(row.signedAt),
    signatureMeaning: row.signatureMeaning,
    reauthenticatedAt: iso(row.reauthenticatedAt),
    reauthenticationMethod: row.reauthenticationMethod,
    supersedes: row.supersedesId && superseded?.recordSha256 ? { id: superseded.id, recordSha256: superseded.recordSha256 } : null,
  };
}

/** The sealed record of a stored decision, rebuilt from the database as it is now. */
export async function rebuildSealedRecord(db: DbOrTx, row: DecisionRow): Promise<SealedRecord> {
  const superseded = row.supersedesId
    ? ((await db.select({ id: decision.id, recordSha256: decision.recordSha256 }).from(decision).where(eq(decision.id, row.supersedesId)))[0] ?? null)
    : null;
  return sealedRecord(await caseEvidence(db, row.caseId), row.proposal, recordDecisionOf(row, superseded));
}

/** The decision of a case that no other supersedes. */
export async function currentDecisionOf(db: DbOrTx, caseId: string) {
  const rows = await db.select().from(decision).where(eq(decision.caseId, caseId));
  const superseded = new Set(rows.map((r) => r.supersedesId).filter((id): id is string => id !== null));
  const current = rows.filter((r) => !superseded.has(r.id));
  if (current.length > 1) throw new Error(`Case ${caseId} has ${current.length} current decisions`);
  return current[0] ?? null;
}

