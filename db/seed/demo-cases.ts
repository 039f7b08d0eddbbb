import { addBusinessDays } from 'date-fns';
import { eq } from 'drizzle-orm';
import type { Db } from '@/db/client';
import { calibrationCheck, custodyEvent, disputeCase, measurementSet, note, reading, type CaseStatus, type DisputeGround } from '@/db/schema';
import { calibrationCheck as checkCalibration, finalResult } from '@/lib/arbitration';
import { recordAudit } from '@/lib/audit/record';
import { decisionBasis, settlementOrRefusal } from '@/lib/dal/decision-draft';
import { insertSealedDecision } from '@/lib/dal/decision-seal';
import { SIGNATURE_MEANING } from '@/lib/decision/labels';
import type { SchemeRules } from '@/lib/rules/schema';
import { toTenthMilliC } from '@/lib/temperature';
import type { SeededDelivery } from './demo-deliveries';
import { validateNoteBody } from '@/lib/notes/validate';

const HOUR = 3_600_000;
// What a seeded decision records as its re-authentication: there was none.
export const DEMO_REAUTHENTICATION = 'none (demo seed)';

type Party = { userId: string; organisationId: string };
export type CaseParties = {
  supplierUsers: Record<string, Party>;
  plant: Party;
  lab: Party & { instrumentId: string };
  arbiter: Party & { name: string };
  rulesVersionId: string;
  rules: SchemeRules;
};

export type DemoCasePlan = {
  deliveryKey: string;
  sequence: number;
  status: CaseStatus;
  supplierKey: string;
  grounds: DisputeGround[];
  explanation: string;
  remedy: string;
  openedAfterNoticeHours: number;
  /** Pins the opening relative to now, for cases that should look fresh in the demo. */
  openedHoursAgo?: number;
  retestReadings?: number[];
  decision?: { outcome: 'uphold' | 'reverse' | 'adjust'; reasons: string };
  notes?: { author: 'supplier' | 'plant' | 'lab' | 'arbiter'; text: string; visibility: 'parties' | 'internal' }[];
};

/** A demo note as the editor would store it; checked by the same rules as a note posted in the app. */
function doc(text: string) {
  const checked = validateNoteBody({ type: 'doc', content: [{ type: 'paragraph', content: [{ type: 'text', text }] }] });
  if (!checked.ok) throw new Error(`A demo note breaks the notes' rules: ${checked.message}`);
  return checked.doc;
}

const stageOrder: CaseStatus[] = ['open', 'awaiting_sample', 'retest', 'review', 'decided'];
function reached(status: CaseStatus, stage: CaseStatus): boolean {
  if (status === 'withdrawn') return stage === 'open';
  return stageOrder.indexOf(status) >= stageOrder.indexOf(stage);
}

/** Builds one case to the stage its plan names, with custody, the retest and the audit trail that stage implies. */
export async function seedCase(db: Db, plan: DemoCasePlan, load: SeededDelivery, parties: CaseParties, now: Date): Promise<string> {
  const supplier = parties.supplierUsers[plan.supplierKey];
  const noticeAt = load.notifiedAt ?? load.testedAt;
  const openedAt = plan.openedHoursAgo === undefined ? new Date(noticeAt.getTime() + plan.openedAfterNoticeHours * HOUR) : new Date(now.getTime() - plan.openedHoursAgo * HOUR);
  const dispatchedAt = new Date(openedAt.getTime() + 1.5 * HOUR);
  const receivedAt = new Date(dispatchedAt.getTime() + 3 * HOUR);
  const retestAt = new Date(receivedAt.getTime() + 5 * HOUR);
  const decidedAt = addBusinessDays(retestAt, 3);
  const clamp = (d: Date) => (d.getTime() > now.getTime() - 10 * 60_000 ? new Date(now.getTime() - 10 * 60_000) : d);
  const caseId = crypto.randomUUID();
  const number = `CS-${openedAt.getUTCFullYear()}-${String(plan.sequence).padStart(4, '0')}`;
  const rules = parties.rules;
  const audit = (actor: Party, at: Date) => ({ actorUserId: actor.userId, actorOrganisationId: actor.organisationId, origin: 'demo seed', at });

  await db.insert(disputeCase).values({
    id: caseId,
    number,
    year: openedAt.getUTCFullYear(),
    sequence: plan.sequence,
    deliveryId: load.deliveryId,
    deliveryReference: load.reference,
    farmId: load.farm.id,
    deliveredAt: load.receivedAt,
    intakeResultId: load.intakeResultId,
    supplierOrganisationId: load.farm.organisationId,
    plantOrganisationId: parties.plant.organisationId,
    labOrganisationId: parties.lab.organisationId,
    boardOrganisationId: parties.arbiter.organisationId,
    rulesVersionId: parties.rulesVersionId,
    status: plan.status,
    grounds: plan.grounds,
    explanation: plan.explanation,
    remedy: plan.remedy,
    openedBy: supplier.userId,
    openedAt,
    dispatchDueAt: new Date(openedAt.getTime() + rules.deadlines.dispatchHours * HOUR),
    sampleValidUntil: new Date(load.collectedAt.getTime() + rules.sample.validHours * HOUR),
    retestSubmittedAt: reached(plan.status, 'review') ? retestAt : null,
    decisionDueAt: reached(plan.status, 'review') ? addBusinessDays(retestAt, rules.deadlines.decisionWorkingDays) : null,
    decidedAt: plan.status === 'decided' ? decidedAt : null,
    withdrawnAt: plan.status === 'withdrawn' ? clamp(new Date(openedAt.getTime() + 3 * HOUR)) : null,
    updatedAt: now,
  });
  await recordAudit(db, audit(supplier, openedAt), {
    action: 'case.opened',
    objectType: 'case',
    objectId: caseId,
    caseId,
    change: { number, status: 'open' },
  });

  const retained = load.retainedSampleId!;
  // Sealing and cold storage are recorded with the delivery; the case adds what happened after.
  const custody: (typeof custodyEvent.$inferInsert)[] = [];

  if (plan.status === 'withdrawn') {
    if (custody.length) await db.insert(custodyEvent).values(custody);
    const withdrawnAt = clamp(new Date(openedAt.getTime() + 3 * HOUR));
    await recordAudit(db, audit(supplier, withdrawnAt), {
      action: 'case.transitioned',
      objectType: 'case',
      objectId: caseId,
      caseId,
      change: { from: 'open', to: 'withdrawn', transition: 'withdraw', detail: { reason: 'Settled directly with the plant after a herd check.' } },
    });
    return caseId;
  }

  if (reached(plan.status, 'awaiting_sample')) {
    custody.push({ sampleId: retained, kind: 'dispatched', at: clamp(dispatchedAt), organisationId: parties.plant.organisationId, actorUserId: parties.plant.userId, location: 'Cool box 14 with data logger, by courier', tempTenthMilliC: toTenthMilliC(4.1), sealIntact: true, frozen: false });
    await recordAudit(db, audit(parties.plant, clamp(dispatchedAt)), {
      action: 'case.transitioned',
      objectType: 'case',
      objectId: caseId,
      caseId,
      change: { from: 'open', to: 'awaiting_sample', transition: 'dispatch', detail: { sealNumber: load.sealNumber } },
    });
  }
  if (reached(plan.status, 'retest')) {
    custody.push({ sampleId: retained, kind: 'received', at: clamp(receivedAt), organisationId: parties.lab.organisationId, actorUserId: parties.lab.userId, location: 'Sample reception, Eskmere', tempTenthMilliC: toTenthMilliC(4.6), sealIntact: true, frozen: false, note: 'Seal number matches the dispatch note; container undamaged.' });
    await recordAudit(db, audit(parties.lab, clamp(receivedAt)), {
      action: 'case.transitioned',
      objectType: 'case',
      objectId: caseId,
      caseId,
      change: { from: 'awaiting_sample', to: 'retest', transition: 'receive', detail: { sealIntact: true } },
    });
  }

  let labCheck: { id: string; readings: number[] } | null = null;
  if (reached(plan.status, 'review') && plan.retestReadings) {
    const labCheckReadings = [-0.5121, -0.5118, -0.5124, -0.5119, -0.5122];
    const verdict = checkCalibration({ nominal: rules.calibration.nominal, readings: labCheckReadings, tolerance: rules.calibration.tolerance, required: rules.calibration.required });
    const checkedAt = new Date(retestAt.getTime() - 40 * 60_000);
    const [check] = await db
      .insert(calibrationCheck)
      .values({
        instrumentId: parties.lab.instrumentId,
        checkedAt,
        checkedBy: parties.lab.userId,
        analystName: 'I. Halloran',
        nominalTenthMilliC: toTenthMilliC(rules.calibration.nominal),
        readingsTenthMilliC: labCheckReadings.map(toTenthMilliC),
        toleranceTenthMilliC: toTenthMilliC(rules.calibration.tolerance),
        required: rules.calibration.required,
        within: verdict.within,
        pass: verdict.pass,
        validUntil: new Date(checkedAt.getTime() + rules.calibration.validHours * HOUR),
        rulesVersionId: parties.rulesVersionId,
      })
      .returning({ id: calibrationCheck.id });
    labCheck = { id: check.id, readings: labCheckReadings };
    const outcome = finalResult(plan.retestReadings, rules.precision);
    if (outcome.status !== 'accepted') throw new Error(`Demo retest readings of ${number} are not conclusive`);
    const [set] = await db
      .insert(measurementSet)
      .values({
        sampleId: retained,
        caseId,
        organisationId: parties.lab.organisationId,
        instrumentId: parties.lab.instrumentId,
        calibrationCheckId: check.id,
        purpose: 'retest',
        analystName: 'I. Halloran',
        testedAt: retestAt,
        sampleTempTenthMilliC: toTenthMilliC(20.1),
        preparation: 'none',
        resultTenthMilliC: toTenthMilliC(outcome.value),
        resultBasis: outcome.basis,
        readingsUsed: outcome.used,
        createdBy: parties.lab.userId,
        submittedAt: retestAt,
      })
      .returning({ id: measurementSet.id });
    await db.insert(reading).values(plan.retestReadings.map((value, i) => ({ measurementSetId: set.id, position: i + 1, valueTenthMilliC: toTenthMilliC(value) })));
    custody.push({ sampleId: retained, kind: 'opened', at: new Date(retestAt.getTime() - 20 * 60_000), organisationId: parties.lab.organisationId, actorUserId: parties.lab.userId, location: 'Cryoscopy bench 2', tempTenthMilliC: toTenthMilliC(4.4), sealIntact: true, frozen: false });
    await recordAudit(db, audit(parties.lab, retestAt), {
      action: 'case.transitioned',
      objectType: 'case',
      objectId: caseId,
      caseId,
      change: { from: 'retest', to: 'review', transition: 'submit_retest', detail: { readings: plan.retestReadings.length, result: outcome.value } },
    });
  }
  if (custody.length) await db.insert(custodyEvent).values(custody);

  if (plan.notes?.length) {
    const authorOf = { supplier, plant: parties.plant, lab: parties.lab, arbiter: parties.arbiter };
    await db.insert(note).values(
      plan.notes.map((n, i) => ({
        caseId,
        authorUserId: authorOf[n.author].userId,
        organisationId: authorOf[n.author].organisationId,
        visibility: n.visibility,
        body: doc(n.text),
        createdAt: clamp(new Date(openedAt.getTime() + (i + 1) * 2 * HOUR)),
      })),
    );
  }
  // Sealed last, through the product's own path, so the record it hashes holds everything above.
  if (plan.status === 'decided' && plan.decision && plan.retestReadings && labCheck) {
    await sealDemoDecision(db, caseId, plan.decision, parties.arbiter, decidedAt);
  }
  return caseId;
}

/**
 * Signs a demo decision as the product does, minus the password: the seed has none to ask for, and
 * the record says so rather than claiming a re-authentication that did not happen.
 */
async function sealDemoDecision(db: Db, caseId: string, planned: NonNullable<DemoCasePlan['decision']>, arbiter: Party & { name: string }, decidedAt: Date): Promise<void> {
  const audit = { actorUserId: arbiter.userId, actorOrganisationId: arbiter.organisationId, origin: 'demo seed', at: decidedAt };
  await db.transaction(async (tx) => {
    const [row] = await tx.select().from(disputeCase).where(eq(disputeCase.id, caseId));
    const basis = await decisionBasis(tx, row);
    const followedProposal = basis.proposal.assessment.outcome === planned.outcome;
    const sealed = await insertSealedDecision(tx, {
      caseId,
      outcome: planned.outcome,
      reasons: planned.reasons,
      followedProposal,
      departureReason: followedProposal ? null : 'The board weighed the herd history supplied by the supplier.',
      proposal: basis.proposal,
      settlement: settlementOrRefusal(basis, planned.outcome),
      signer: { userId: arbiter.userId, name: arbiter.name },
      signedAt: decidedAt,
      signatureMeaning: SIGNATURE_MEANING,
      reauthenticatedAt: decidedAt,
      reauthenticationMethod: DEMO_REAUTHENTICATION,
      supersedes: null,
    });
    await recordAudit(tx, audit, {
      action: 'case.transitioned',
      objectType: 'case',
      objectId: caseId,
      caseId,
      change: { from: 'review', to: 'decided', transition: 'decide', detail: { decisionId: sealed.id, outcome: planned.outcome, followedProposal } },
    });
    await recordAudit(tx, audit, {
      action: 'decision.sealed',
      objectType: 'decision',
      objectId: sealed.id,
      caseId,
      change: { outcome: planned.outcome, followedProposal, recordSha256: sealed.recordSha256, signingKeyId: sealed.signingKeyId, signatureMeaning: SIGNATURE_MEANING, reauthenticationMethod: DEMO_REAUTHENTICATION, supersedesId: null, correctionReason: null },
    });
  });
}
