import { createHash } from 'node:crypto';
import { addBusinessDays } from 'date-fns';
import type { CaseStatus, DisputeGround, AttachmentKind, custodyEvent, disputeCase, measurementSet, reading, note, attachment, calibrationCheck } from '@/db/schema';
import { calibrationCheck as checkCalibration, finalResult } from '@/lib/arbitration';
import type { AuditContext } from '@/lib/audit/record';
import type { AuditEventInput } from '@/lib/audit/events';
import type { Random } from '@/db/seed/random';
import type { SchemeRules } from '@/lib/rules/schema';
import { toTenthMilliC } from '@/lib/temperature';

const HOUR = 3_600_000;

/** A contestable intake result (deducted or rejected, with a sealed retained sample) that a case can rest on. */
export type Candidate = {
  resultId: string;
  deliveryId: string;
  reference: string;
  farmId: string;
  receivedAt: Date;
  supplierOrganisationId: string;
  collectedAt: Date;
  testedAt: Date;
  notifiedAt: Date | null;
  valueTenthMilliC: number;
  retainedSampleId: string;
  sealNumber: string | null;
};

export type Party = { userId: string; organisationId: string };
export type ScaleParties = {
  suppliers: Map<string, Party>;
  plant: Party;
  lab: Party & { instrumentId: string };
  arbiter: Party & { name: string };
  rulesVersionId: string;
  rules: SchemeRules;
};

export type PendingAudit = { context: AuditContext & { at: Date }; input: AuditEventInput };

export type CaseRows = {
  cases: (typeof disputeCase.$inferInsert)[];
  custody: (typeof custodyEvent.$inferInsert)[];
  checks: (typeof calibrationCheck.$inferInsert)[];
  sets: (typeof measurementSet.$inferInsert)[];
  readings: (typeof reading.$inferInsert)[];
  notes: (typeof note.$inferInsert)[];
  attachments: (typeof attachment.$inferInsert)[];
  audit: PendingAudit[];
  /** Cases to be decided once their records are in, through the product's own sealing path. */
  toDecide: { caseId: string; decidedAt: Date }[];
};

/** How the cases spread over the lifecycle: old ones are settled, the most recent are still moving. */
export const statusPlan: { status: CaseStatus; count: number }[] = [
  { status: 'decided', count: 2600 },
  { status: 'withdrawn', count: 500 },
  { status: 'review', count: 700 },
  { status: 'retest', count: 400 },
  { status: 'awaiting_sample', count: 400 },
  { status: 'open', count: 400 },
];

const stageOrder: CaseStatus[] = ['open', 'awaiting_sample', 'retest', 'review', 'decided'];
const reached = (status: CaseStatus, stage: CaseStatus) => status !== 'withdrawn' && stageOrder.indexOf(status) >= stageOrder.indexOf(stage);

const groundsChoices: DisputeGround[][] = [['instrument'], ['sampling'], ['natural_variation'], ['sample_handling'], ['other'], ['instrument', 'natural_variation'], ['sampling', 'sample_handling']];
const explanations = [
  'Our own bulk-tank check that morning read well below the limit; we ask that the retained sample be retested.',
  'The herd moved to new grazing this week and its freezing point always rises for a few days.',
  'The routine sample stood on the intake bench for a long time before it was tested.',
  'Heavy rain overnight; we suspect a faulty tank lid, not added water, and ask for the retest.',
  'The tanker was sampled before the agitator had run for the full two minutes.',
];
const remedies = ['Pay the load in full.', 'Cancel the deduction.', 'Reduce the deduction to the measured share.', 'Pay the load in full and refund the referee fee.'];
const noteTexts = [
  'The herd records for the last month are attached for the board.',
  'The instrument passed its morning check on the −0.512 °C standard.',
  'Compartment rinse log for that round is on file; nothing unusual recorded.',
  'We ask the board to weigh the weather that week: two days of heavy rain.',
  'Sample reception confirms the cool box logger stayed between 3 and 5 °C.',
  'Please note the collection was delayed by a road closure on the valley route.',
];
const withdrawReasons = ['Settled directly with the plant after a herd check.', 'Our own records show a tank lid fault; we accept the result.', 'Agreed with the plant to share the deduction.'];
const attachmentKinds: { kind: AttachmentKind; contentType: string; ext: string }[] = [
  { kind: 'lab_sheet', contentType: 'application/pdf', ext: 'pdf' },
  { kind: 'calibration_certificate', contentType: 'application/pdf', ext: 'pdf' },
  { kind: 'correspondence', contentType: 'application/pdf', ext: 'pdf' },
  { kind: 'other', contentType: 'text/csv', ext: 'csv' },
];

function doc(text: string) {
  return { type: 'doc', content: [{ type: 'paragraph', content: [{ type: 'text', text }] }] };
}

const round4 = (x: number) => Math.round(x * 10_000) / 10_000;

/** Retest readings near the intake value: mostly the same result, sometimes a lower one, as labs differ. */
function retestReadings(intakeValue: number, random: Random, rules: SchemeRules): number[] {
  const truth = intakeValue + random.normal(-0.0015, 0.0025);
  for (let attempt = 0; attempt < 5; attempt++) {
    const two = [round4(random.normal(truth, 0.0008)), round4(random.normal(truth, 0.0008))];
    if (finalResult(two, rules.precision).status === 'accepted') return two;
  }
  return [round4(truth), round4(truth)];
}

/**
 * Builds the rows of the scale dataset's cases in memory, stage by stage as the demo seed does for
 * its seven, with the audit events each stage records. Nothing is written here.
 */
export function buildCases(candidates: Candidate[], parties: ScaleParties, random: Random, now: Date, firstSequence: Map<number, number>): CaseRows {
  const rows: CaseRows = { cases: [], custody: [], checks: [], sets: [], readings: [], notes: [], attachments: [], audit: [], toDecide: [] };
  const total = statusPlan.reduce((sum, s) => sum + s.count, 0);
  if (candidates.length < total) throw new Error(`Only ${candidates.length} contestable results for ${total} cases; generate more deliveries.`);
  // Oldest results get the settled states, the latest the live ones.
  const chosen = candidates.slice(-total);
  const statuses = statusPlan.flatMap((s) => Array.from({ length: s.count }, () => s.status));
  const rules = parties.rules;
  const nextSequence = new Map(firstSequence);
  const latest = new Date(now.getTime() - 10 * 60_000);
  const clamp = (d: Date) => (d.getTime() > latest.getTime() ? latest : d);

  chosen.forEach((load, index) => {
    const status = statuses[index];
    const supplier = parties.suppliers.get(load.supplierOrganisationId);
    if (!supplier) throw new Error(`No supplier account for organisation ${load.supplierOrganisationId}`);
    const noticeAt = load.notifiedAt ?? load.testedAt;
    const openedAt = clamp(new Date(noticeAt.getTime() + random.between(0.5, 20) * HOUR));
    const dispatchedAt = clamp(new Date(openedAt.getTime() + random.between(1, 3.5) * HOUR));
    const receivedAt = clamp(new Date(dispatchedAt.getTime() + random.between(2, 6) * HOUR));
    const retestAt = clamp(new Date(receivedAt.getTime() + random.between(2, 8) * HOUR));
    const decidedAt = clamp(addBusinessDays(retestAt, random.int(1, 4)));
    const withdrawnAt = clamp(new Date(openedAt.getTime() + random.between(1, 30) * HOUR));
    const year = openedAt.getUTCFullYear();
    const sequence = nextSequence.get(year) ?? 1;
    nextSequence.set(year, sequence + 1);
    const caseId = crypto.randomUUID();
    const number = `CS-${year}-${String(sequence).padStart(4, '0')}`;
    const audit = (actor: Party, at: Date, input: AuditEventInput) =>
      rows.audit.push({ context: { actorUserId: actor.userId, actorOrganisationId: actor.organisationId, origin: 'scale data', at }, input });
    const transitioned = (actor: Party, at: Date, from: CaseStatus, to: CaseStatus, transition: string, detail: Record<string, unknown>) =>
      audit(actor, at, { action: 'case.transitioned', objectType: 'case', objectId: caseId, caseId, change: { from, to, transition, detail } });

    const inReview = reached(status, 'review');
    rows.cases.push({
      id: caseId,
      number,
      year,
      sequence,
      deliveryId: load.deliveryId,
      deliveryReference: load.reference,
      farmId: load.farmId,
      deliveredAt: load.receivedAt,
      intakeResultId: load.resultId,
      supplierOrganisationId: load.supplierOrganisationId,
      plantOrganisationId: parties.plant.organisationId,
      labOrganisationId: reached(status, 'awaiting_sample') ? parties.lab.organisationId : null,
      boardOrganisationId: parties.arbiter.organisationId,
      rulesVersionId: parties.rulesVersionId,
      // Decided cases are inserted in review and sealed afterwards, as the product would.
      status: status === 'decided' ? 'review' : status,
      grounds: random.pick(groundsChoices),
      explanation: random.pick(explanations),
      remedy: random.pick(remedies),
      openedBy: supplier.userId,
      openedAt,
      dispatchDueAt: new Date(openedAt.getTime() + rules.deadlines.dispatchHours * HOUR),
      sampleValidUntil: new Date(load.collectedAt.getTime() + rules.sample.validHours * HOUR),
      retestSubmittedAt: inReview ? retestAt : null,
      decisionDueAt: inReview ? addBusinessDays(retestAt, rules.deadlines.decisionWorkingDays) : null,
      withdrawnAt: status === 'withdrawn' ? withdrawnAt : null,
      updatedAt: now,
    });
    audit(supplier, openedAt, { action: 'case.opened', objectType: 'case', objectId: caseId, caseId, change: { number, status: 'open' } });

    if (status === 'withdrawn') {
      transitioned(supplier, withdrawnAt, 'open', 'withdrawn', 'withdraw', { reason: random.pick(withdrawReasons) });
    }
    if (reached(status, 'awaiting_sample')) {
      rows.custody.push({ sampleId: load.retainedSampleId, kind: 'dispatched', at: dispatchedAt, organisationId: parties.plant.organisationId, actorUserId: parties.plant.userId, location: 'Cool box with data logger, by courier', tempTenthMilliC: toTenthMilliC(round4(random.between(3.5, 4.8))), sealIntact: true, frozen: false });
      transitioned(parties.plant, dispatchedAt, 'open', 'awaiting_sample', 'dispatch', { sealNumber: load.sealNumber });
    }
    if (reached(status, 'retest')) {
      rows.custody.push({ sampleId: load.retainedSampleId, kind: 'received', at: receivedAt, organisationId: parties.lab.organisationId, actorUserId: parties.lab.userId, location: 'Sample reception, Eskmere', tempTenthMilliC: toTenthMilliC(round4(random.between(3.8, 5.2))), sealIntact: true, frozen: false, note: 'Seal number matches the dispatch note; container undamaged.' });
      transitioned(parties.lab, receivedAt, 'awaiting_sample', 'retest', 'receive', { sealIntact: true });
    }
    if (inReview) {
      const checkReadings = Array.from({ length: rules.calibration.readings }, () => round4(random.normal(rules.calibration.nominal, 0.0008)));
      const verdict = checkCalibration({ nominal: rules.calibration.nominal, readings: checkReadings, tolerance: rules.calibration.tolerance, required: rules.calibration.required });
      const checkedAt = new Date(retestAt.getTime() - 40 * 60_000);
      const checkId = crypto.randomUUID();
      rows.checks.push({
        id: checkId,
        instrumentId: parties.lab.instrumentId,
        checkedAt,
        checkedBy: parties.lab.userId,
        analystName: 'I. Halloran',
        nominalTenthMilliC: toTenthMilliC(rules.calibration.nominal),
        readingsTenthMilliC: checkReadings.map(toTenthMilliC),
        toleranceTenthMilliC: toTenthMilliC(rules.calibration.tolerance),
        required: rules.calibration.required,
        within: verdict.within,
        pass: verdict.pass,
        validUntil: new Date(checkedAt.getTime() + rules.calibration.validHours * HOUR),
        rulesVersionId: parties.rulesVersionId,
      });
      const values = retestReadings(load.valueTenthMilliC / 10_000, random, rules);
      const outcome = finalResult(values, rules.precision);
      const setId = crypto.randomUUID();
      rows.sets.push({
        id: setId,
        sampleId: load.retainedSampleId,
        caseId,
        organisationId: parties.lab.organisationId,
        instrumentId: parties.lab.instrumentId,
        calibrationCheckId: checkId,
        purpose: 'retest',
        analystName: 'I. Halloran',
        testedAt: retestAt,
        sampleTempTenthMilliC: toTenthMilliC(round4(random.between(19.5, 20.5))),
        preparation: 'none',
        resultTenthMilliC: outcome.status === 'accepted' ? toTenthMilliC(outcome.value) : null,
        resultBasis: outcome.status === 'accepted' ? outcome.basis : null,
        readingsUsed: outcome.status === 'accepted' ? outcome.used : null,
        createdBy: parties.lab.userId,
        submittedAt: retestAt,
      });
      values.forEach((value, i) => rows.readings.push({ measurementSetId: setId, position: i + 1, valueTenthMilliC: toTenthMilliC(value) }));
      rows.custody.push({ sampleId: load.retainedSampleId, kind: 'opened', at: new Date(retestAt.getTime() - 20 * 60_000), organisationId: parties.lab.organisationId, actorUserId: parties.lab.userId, location: 'Cryoscopy bench 2', tempTenthMilliC: toTenthMilliC(round4(random.between(4, 5))), sealIntact: true, frozen: false });
      transitioned(parties.lab, retestAt, 'retest', 'review', 'submit_retest', { readings: values.length, result: outcome.status === 'accepted' ? outcome.value : null });
    }
    if (status === 'decided') rows.toDecide.push({ caseId, decidedAt });

    // Notes and evidence: a few per case, from the parties, some threaded, some internal.
    const authors: Party[] = [supplier, parties.plant, parties.arbiter, ...(inReview ? [parties.lab] : [])];
    let firstNoteId: string | null = null;
    for (let i = 0, n = random.int(0, 4); i < n; i++) {
      const author = random.pick(authors);
      const id = crypto.randomUUID();
      rows.notes.push({
        id,
        caseId,
        parentId: firstNoteId && random.next() < 0.4 ? firstNoteId : null,
        authorUserId: author.userId,
        organisationId: author.organisationId,
        visibility: random.next() < 0.2 ? 'internal' : 'parties',
        body: doc(random.pick(noteTexts)),
        createdAt: clamp(new Date(openedAt.getTime() + (i + 1) * random.between(0.5, 3) * HOUR)),
      });
      firstNoteId ??= id;
    }
    for (let i = 0, n = random.int(0, 3); i < n; i++) {
      const uploader = random.pick([supplier, parties.plant]);
      const kind = random.pick(attachmentKinds);
      const storageKey = `scale-${caseId}-${i + 1}`;
      rows.attachments.push({
        caseId,
        uploadedBy: uploader.userId,
        organisationId: uploader.organisationId,
        kind: kind.kind,
        caption: kind.kind === 'lab_sheet' ? 'Intake bench sheet' : null,
        fileName: `${load.reference.toLowerCase()}-${kind.kind.replace('_', '-')}-${i + 1}.${kind.ext}`,
        contentType: kind.contentType,
        sizeBytes: random.int(18_000, 2_400_000),
        // Metadata only: the hash is well-formed, of the key, since no file is stored.
        sha256: createHash('sha256').update(storageKey).digest('hex'),
        storageKey,
        url: `https://files.countersample.test/f/${storageKey}`,
        createdAt: clamp(new Date(openedAt.getTime() + random.between(0.2, 6) * HOUR)),
      });
    }
  });
  return rows;
}
