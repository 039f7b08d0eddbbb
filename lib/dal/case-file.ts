import 'server-only';
import { and, asc, desc, eq, inArray, or } from 'drizzle-orm';
import type { DbOrTx } from '@/db/client';
import {
  auditEvent,
  custodyEvent,
  decision,
  delivery,
  instrument,
  intakeResult,
  measurementSet,
  organisation,
  reading,
  sample,
  schemeRules,
  supplierFarm,
  user,
} from '@/db/schema';
import type { Actor } from '@/lib/auth/actor';
import { findVisibleCase } from './cases';
import { isBlindFor } from './case-scope';
import { notesOfCase } from './notes';
import { attachmentsOfCase } from './attachments';

function redactedChange(change: unknown): unknown {
  if (!change || typeof change !== 'object') return change;
  const { detail: _withheld, ...rest } = change as Record<string, unknown>;
  return rest;
}

function isOthersInternalNoteEvent(e: { action: string; change: unknown; actorOrganisationId: string | null }, actor: Actor): boolean {
  if (!e.action.startsWith('note.') || e.actorOrganisationId === actor.organisationId) return false;
  return (e.change as { visibility?: unknown } | null)?.visibility !== 'parties';
}

/** Everything one actor may see of one case, as plain data for the Case file page and the API. */
export async function getCaseFile(db: DbOrTx, actor: Actor, caseId: string) {
  const found = await findVisibleCase(db, actor, caseId);
  const blind = isBlindFor(actor, found.retestSubmittedAt);

  const orgIds = [found.supplierOrganisationId, found.plantOrganisationId, found.boardOrganisationId, found.labOrganisationId].filter(
    (id): id is string => id !== null,
  );
  const [result] = await db.select().from(intakeResult).where(eq(intakeResult.id, found.intakeResultId));
  // Blind: the laboratory's view holds only the sets of this case, never the intake set.
  // Blind, a laboratory sees only its own sets: not the intake set, nor an earlier referee's retest.
  const setScope = blind
    ? and(eq(measurementSet.caseId, found.id), eq(measurementSet.organisationId, actor.organisationId))
    : result
      ? or(eq(measurementSet.caseId, found.id), eq(measurementSet.id, result.measurementSetId))
      : eq(measurementSet.caseId, found.id);
  const [orgs, [load], [rules], samples, sets, notes, decisions, ledger, files] = await Promise.all([
    db.select({ id: organisation.id, name: organisation.name, kind: organisation.kind }).from(organisation).where(inArray(organisation.id, orgIds)),
    db
      .select({
        id: delivery.id,
        reference: delivery.reference,
        farmName: supplierFarm.name,
        herdCode: supplierFarm.herdCode,
        collectedAt: delivery.collectedAt,
        receivedAt: delivery.receivedAt,
        volumeLitres: delivery.volumeLitres,
        tanker: delivery.tanker,
        compartment: delivery.compartment,
        receiptTempTenthMilliC: delivery.receiptTempTenthMilliC,
      })
      .from(delivery)
      .innerJoin(supplierFarm, eq(supplierFarm.id, delivery.farmId))
      .where(eq(delivery.id, found.deliveryId)),
    db.select({ id: schemeRules.id, version: schemeRules.version, rules: schemeRules.rules, effectiveFrom: schemeRules.effectiveFrom }).from(schemeRules).where(eq(schemeRules.id, found.rulesVersionId)),
    db
      .select()
      .from(sample)
      .where(and(or(eq(sample.deliveryId, found.deliveryId), eq(sample.caseId, found.id)), inArray(sample.kind, ['retained', 'counter', 'referee', 'authentic'])))
      .orderBy(asc(sample.createdAt)),
    db
      .select({
        id: measurementSet.id,
        purpose: measurementSet.purpose,
        organisationId: measurementSet.organisationId,
        analystName: measurementSet.analystName,
        testedAt: measurementSet.testedAt,
        sampleTempTenthMilliC: measurementSet.sampleTempTenthMilliC,
        preparation: measurementSet.preparation,
        resultTenthMilliC: measurementSet.resultTenthMilliC,
        resultBasis: measurementSet.resultBasis,
        readingsUsed: measurementSet.readingsUsed,
        submittedAt: measurementSet.submittedAt,
        instrumentSerial: instrument.serialNumber,
        calibrationCheckId: measurementSet.calibrationCheckId,
        calibrationWarning: measurementSet.calibrationWarning,
      })
      .from(measurementSet)
      .innerJoin(instrument, eq(instrument.id, measurementSet.instrumentId))
      .where(setScope)
      .orderBy(asc(measurementSet.testedAt)),
    // One rule for every reader of notes (lib/dal/notes.ts): shared ones and the own organisation's; blind, only the own.
    notesOfCase(db, actor, found),
    db.select().from(decision).where(eq(decision.caseId, found.id)).orderBy(desc(decision.signedAt)),
    db
      .select({ seq: auditEvent.seq, at: auditEvent.at, action: auditEvent.action, change: auditEvent.change, actorName: user.name, actorOrganisationId: auditEvent.actorOrganisationId })
      .from(auditEvent)
      .leftJoin(user, eq(user.id, auditEvent.actorUserId))
      .where(eq(auditEvent.caseId, found.id))
      .orderBy(asc(auditEvent.seq)),
    // One rule for the page, the API and the download route (lib/dal/attachments.ts); blind, only the own organisation's.
    attachmentsOfCase(db, actor, found),
  ]);

  const sampleIds = samples.map((s) => s.id);
  const setIds = sets.map((s) => s.id);
  const [custody, readings] = await Promise.all([
    sampleIds.length ? db.select().from(custodyEvent).where(inArray(custodyEvent.sampleId, sampleIds)).orderBy(asc(custodyEvent.at)) : [],
    setIds.length ? db.select().from(reading).where(inArray(reading.measurementSetId, setIds)).orderBy(asc(reading.position)) : [],
  ]);
  const orgName = (id: string | null) => orgs.find((o) => o.id === id)?.name ?? null;

  return {
    id: found.id,
    number: found.number,
    status: found.status,
    blind,
    openedAt: found.openedAt,
    grounds: found.grounds,
    // The supplier's own account may quote values; the blind laboratory does not read it.
    explanation: blind ? null : found.explanation,
    remedy: blind ? null : found.remedy,
    deadlines: {
      dispatchDueAt: found.dispatchDueAt,
      sampleValidUntil: found.sampleValidUntil,
      decisionDueAt: found.decisionDueAt,
    },
    retestSubmittedAt: found.retestSubmittedAt,
    decidedAt: found.decidedAt,
    withdrawnAt: found.withdrawnAt,
    parties: {
      supplier: orgName(found.supplierOrganisationId),
      plant: orgName(found.plantOrganisationId),
      lab: orgName(found.labOrganisationId),
      board: orgName(found.boardOrganisationId),
    },
    delivery: load,
    intake: blind || !result
      ? null
      : {
          verdict: result.verdict,
          valueTenthMilliC: result.valueTenthMilliC,
          limitTenthMilliC: result.limitTenthMilliC,
          decisionRule: result.decisionRule,
          addedWaterBasisPoints: result.addedWaterBasisPoints,
          amountMinor: result.amountMinor,
          currency: result.currency,
          decidedAt: result.decidedAt,
          notifiedAt: result.notifiedAt,
        },
    rules: rules ? { version: rules.version, name: rules.rules.name, effectiveFrom: rules.effectiveFrom } : null,
    samples: samples.map((s) => ({
      id: s.id,
      code: s.code,
      kind: s.kind,
      sealNumber: s.sealNumber,
      preservative: s.preservative,
      storage: s.storage,
      sampledAt: s.sampledAt,
      custody: custody
        .filter((c) => c.sampleId === s.id)
        .map((c) => ({
          id: c.id,
          kind: c.kind,
          at: c.at,
          organisation: orgName(c.organisationId),
          location: c.location,
          tempTenthMilliC: c.tempTenthMilliC,
          sealIntact: c.sealIntact,
          frozen: c.frozen,
          // A note on another party's custody step may carry its argument; withheld while blind.
          note: blind && c.organisationId !== actor.organisationId ? null : c.note,
        })),
    })),
    measurementSets: sets.map((set) => ({
      ...set,
      laboratory: orgName(set.organisationId),
      readings: readings.filter((r) => r.measurementSetId === set.id).map((r) => ({ position: r.position, valueTenthMilliC: r.valueTenthMilliC, flag: r.flag })),
    })),
    notes,
    decisions: decisions.map((d) => ({
      id: d.id,
      outcome: d.outcome,
      reasons: d.reasons,
      followedProposal: d.followedProposal,
      departureReason: d.departureReason,
      signerName: d.signerName,
      signedAt: d.signedAt,
      signatureMeaning: d.signatureMeaning,
      recordSha256: d.recordSha256,
      supersedesId: d.supersedesId,
    })),
    attachments: files,
    // Blind, the ledger shows who did what and when, not the details other parties recorded.
    // Another organisation's internal note is not there for this reader, so neither is its trace.
    ledger: ledger.filter((e) => !isOthersInternalNoteEvent(e, actor)).map((e) => ({
      ...e,
      change: blind && e.actorOrganisationId !== actor.organisationId ? redactedChange(e.change) : e.change,
      actorOrganisation: orgName(e.actorOrganisationId),
    })),
  };
}

export type CaseFile = Awaited<ReturnType<typeof getCaseFile>>;
