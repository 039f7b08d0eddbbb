// The scale dataset for the benchmarks: the demo scenario over a full year, grown to 200 farms,
// about 73,000 deliveries, 5,000 cases over every status and about 60,000 chained audit events.
import fs from 'node:fs';
import path from 'node:path';
import { and, asc, desc, eq, ne, sql } from 'drizzle-orm';
import type { Db } from '@/db/client';
import {
  attachment,
  auditEvent,
  calibrationCheck,
  custodyEvent,
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
  user,
} from '@/db/schema';
import { seedDemo } from '@/db/seed/demo';
import { seedDeliveries, type DemoFarm } from '@/db/seed/demo-deliveries';
import { demoOrganisations, demoUsers } from '@/db/seed/demo-names';
import { createOrganisation, createUserWithPassword } from '@/db/seed/factories';
import { seededRandom } from '@/db/seed/random';
import { DEMO_REAUTHENTICATION } from '@/db/seed/demo-cases';
import { GENESIS_HASH } from '@/lib/audit/chain';
import { chainedRow } from '@/lib/audit/record';
import { decisionBasis, settlementOrRefusal } from '@/lib/dal/decision-draft';
import { insertSealedDecision } from '@/lib/dal/decision-seal';
import { bindingOutcomes, SIGNATURE_MEANING, type BindingOutcome } from '@/lib/decision/labels';
import { defaultSchemeRules } from '@/lib/rules/defaults';
import { buildCases, type Candidate, type Party, type PendingAudit } from './scale-cases';
import { scaleFarmName, scaleSupplierGroups, scaleSupplierUsers } from './scale-names';

export const SCALE_DAYS = 365;
export const SCALE_FARMS_PER_GROUP = 32;
export const SCALE_AUDIT_TARGET = 60_000;
const SCALE_ORIGIN = 'scale data';

export type ScaleManifest = {
  generatedAt: string;
  seconds: number;
  counts: Record<string, number>;
};

const log = (started: number, message: string) => console.log(`[scale data ${((Date.now() - started) / 1000).toFixed(1).padStart(6)} s] ${message}`);

async function insertChunked<T>(rows: T[], insert: (chunk: T[]) => Promise<unknown>, size = 400) {
  for (let i = 0; i < rows.length; i += size) await insert(rows.slice(i, i + size));
}

/** True when a complete scale dataset is already in this database (its closing audit event is written last). */
export async function hasScaleData(db: Db): Promise<boolean> {
  const [marker] = await db.select({ seq: auditEvent.seq }).from(auditEvent).where(and(eq(auditEvent.action, 'demo.seeded'), eq(auditEvent.origin, SCALE_ORIGIN))).limit(1);
  return marker !== undefined;
}

/** Appends events to the chain in time order, hashing each as `recordAudit` does, in bulk. */
async function appendAuditChain(db: Db, pending: PendingAudit[]): Promise<number> {
  const [last] = await db.select({ seq: auditEvent.seq, hash: auditEvent.hash }).from(auditEvent).orderBy(desc(auditEvent.seq)).limit(1);
  let prevHash = last?.hash ?? GENESIS_HASH;
  let seq = last?.seq ?? 0;
  pending.sort((a, b) => a.context.at.getTime() - b.context.at.getTime());
  const rows: (typeof auditEvent.$inferInsert)[] = pending.map(({ context, input }) => {
    const row = chainedRow(context, input, prevHash);
    prevHash = row.hash;
    seq += 1;
    return { ...row, seq };
  });
  await insertChunked(rows, (chunk) => db.insert(auditEvent).values(chunk), 1000);
  // The rows carry their own sequence numbers; the next live event must follow them.
  await db.execute(sql`select setval(pg_get_serial_sequence('audit_event', 'seq'), (select max(seq) from audit_event))`);
  return rows.length;
}

export async function generateScaleData(db: Db, options: { password: string; now?: Date }): Promise<ScaleManifest> {
  const started = Date.now();
  const now = options.now ?? new Date();
  const random = seededRandom(20261202);

  await seedDemo(db, { password: options.password, now, days: SCALE_DAYS });
  log(started, 'demo scenario over a year seeded');

  const [rules] = await db.select().from(schemeRules).orderBy(asc(schemeRules.version)).limit(1);
  const [plantOrg] = await db.select().from(organisation).where(eq(organisation.name, demoOrganisations.plant.name));
  const [labOrg] = await db.select().from(organisation).where(eq(organisation.name, demoOrganisations.lab.name));
  const [boardOrg] = await db.select().from(organisation).where(eq(organisation.name, demoOrganisations.board.name));
  const userOf = async (email: string) => (await db.select({ id: user.id, organisationId: user.organisationId, name: user.name }).from(user).where(eq(user.email, email)))[0];
  const account = (key: string) => demoUsers.find((u) => u.key === key)!.email;
  const plantUser = await userOf(account('plant'));
  const labUser = await userOf(account('lab'));
  const arbiterUser = await userOf(account('arbiter'));
  const [labInstrument] = await db.select().from(instrument).where(eq(instrument.organisationId, labOrg.id));

  // More producer groups and farms, two more intake cryoscopes for the larger intake.
  const supplierOrgs = await Promise.all(demoOrganisations.suppliers.map(async (s) => (await db.select().from(organisation).where(eq(organisation.name, s.name)))[0]));
  const farms: DemoFarm[] = [];
  let farmNumber = 0;
  for (const group of scaleSupplierGroups) {
    const org = await createOrganisation(db, { name: group.name, kind: 'supplier', contactEmail: group.contactEmail });
    supplierOrgs.push(org);
    const farmRows: (typeof supplierFarm.$inferInsert)[] = [];
    for (let i = 0; i < SCALE_FARMS_PER_GROUP; i++) {
      farmRows.push({ organisationId: org.id, name: scaleFarmName(farmNumber++), herdCode: `${group.prefix}-${String(101 + i)}` });
    }
    const inserted = await db.insert(supplierFarm).values(farmRows).returning();
    // These herds run closer to the limit than the demo's, so a year brings thousands of contested loads.
    for (const row of inserted) farms.push({ id: row.id, organisationId: row.organisationId, herdCode: row.herdCode, baseline: random.normal(-0.518, 0.004) });
  }
  for (const u of scaleSupplierUsers) {
    await createUserWithPassword(db, { email: u.email, name: u.name, role: 'supplier', organisationId: supplierOrgs[u.group].id, password: options.password });
  }
  const extraInstruments = await db
    .insert(instrument)
    .values([
      { organisationId: plantOrg.id, serialNumber: 'LW-CRY-03', description: 'Intake cryoscope, bay 3' },
      { organisationId: plantOrg.id, serialNumber: 'LW-CRY-04', description: 'Intake cryoscope, bay 4' },
    ])
    .returning();
  log(started, `${scaleSupplierGroups.length} producer groups with ${farms.length} farms added`);

  const { total } = await seedDeliveries(db, {
    now,
    days: SCALE_DAYS,
    farms,
    plantOrganisationId: plantOrg.id,
    instrumentIds: extraInstruments.map((i) => i.id),
    rules: defaultSchemeRules,
    rulesVersionId: rules.id,
    plantUserId: plantUser.id,
    random,
    incidents: [],
  });
  log(started, `${total} more deliveries with samples, readings and results`);

  const candidates: Candidate[] = (
    await db
      .select({
        resultId: intakeResult.id,
        deliveryId: delivery.id,
        reference: delivery.reference,
        farmId: delivery.farmId,
        receivedAt: delivery.receivedAt,
        supplierOrganisationId: delivery.supplierOrganisationId,
        collectedAt: delivery.collectedAt,
        testedAt: intakeResult.decidedAt,
        notifiedAt: intakeResult.notifiedAt,
        valueTenthMilliC: intakeResult.valueTenthMilliC,
        retainedSampleId: sample.id,
        sealNumber: sample.sealNumber,
        disputed: sql<string | null>`(select ${disputeCase.id} from ${disputeCase} where ${disputeCase.intakeResultId} = ${intakeResult.id} limit 1)`,
      })
      .from(intakeResult)
      .innerJoin(delivery, eq(delivery.id, intakeResult.deliveryId))
      .innerJoin(sample, and(eq(sample.deliveryId, delivery.id), eq(sample.kind, 'retained')))
      .where(ne(intakeResult.verdict, 'accepted'))
      .orderBy(asc(intakeResult.decidedAt))
  ).filter((c) => c.disputed === null);

  const suppliers = new Map<string, Party>();
  for (const u of [...demoUsers.filter((d) => d.role === 'supplier').map((d) => d.email), ...scaleSupplierUsers.map((s) => s.email)]) {
    const row = await userOf(u);
    suppliers.set(row.organisationId, { userId: row.id, organisationId: row.organisationId });
  }
  const sequences = await db.select({ year: disputeCase.year, max: sql<number>`max(${disputeCase.sequence})` }).from(disputeCase).groupBy(disputeCase.year);
  const firstSequence = new Map(sequences.map((s) => [s.year, Number(s.max) + 1]));
  const parties = {
    suppliers,
    plant: { userId: plantUser.id, organisationId: plantOrg.id },
    lab: { userId: labUser.id, organisationId: labOrg.id, instrumentId: labInstrument.id },
    arbiter: { userId: arbiterUser.id, organisationId: boardOrg.id, name: arbiterUser.name },
    rulesVersionId: rules.id,
    rules: defaultSchemeRules,
  };
  const built = buildCases(candidates, parties, random, now, firstSequence);
  await insertChunked(built.cases, (chunk) => db.insert(disputeCase).values(chunk), 300);
  await insertChunked(built.custody, (chunk) => db.insert(custodyEvent).values(chunk));
  await insertChunked(built.checks, (chunk) => db.insert(calibrationCheck).values(chunk));
  await insertChunked(built.sets, (chunk) => db.insert(measurementSet).values(chunk));
  await insertChunked(built.readings, (chunk) => db.insert(reading).values(chunk), 1000);
  await insertChunked(built.notes, (chunk) => db.insert(note).values(chunk));
  await insertChunked(built.attachments, (chunk) => db.insert(attachment).values(chunk));
  log(started, `${built.cases.length} cases from ${candidates.length} contestable results, with custody, retests, ${built.notes.length} notes and ${built.attachments.length} attachments`);

  // Decisions through the product's own sealing path, so each record hashes what is really there.
  const arbiterAudit = (at: Date) => ({ actorUserId: parties.arbiter.userId, actorOrganisationId: parties.arbiter.organisationId, origin: SCALE_ORIGIN, at });
  for (const { caseId, decidedAt } of built.toDecide) {
    await db.transaction(async (tx) => {
      const [row] = await tx.select().from(disputeCase).where(eq(disputeCase.id, caseId));
      const basis = await decisionBasis(tx, row);
      const proposed = basis.proposal.assessment.outcome;
      const available = bindingOutcomes.filter((o) => 'settlement' in basis.settlements[o]);
      const outcome: BindingOutcome = (bindingOutcomes as readonly string[]).includes(proposed) && available.includes(proposed as BindingOutcome) ? (proposed as BindingOutcome) : available[0];
      const followedProposal = outcome === proposed;
      const sealed = await insertSealedDecision(tx, {
        caseId,
        outcome,
        reasons: followedProposal ? 'The board follows the proposal: the laboratories’ results and the sample’s record support it.' : 'The proposal could not settle the case on the record; the board decides on the evidence before it.',
        followedProposal,
        departureReason: followedProposal ? null : 'The proposal asked for more than the record could give; the board weighed the retest and custody.',
        proposal: basis.proposal,
        settlement: settlementOrRefusal(basis, outcome),
        signer: { userId: parties.arbiter.userId, name: parties.arbiter.name },
        signedAt: decidedAt,
        signatureMeaning: SIGNATURE_MEANING,
        reauthenticatedAt: decidedAt,
        reauthenticationMethod: DEMO_REAUTHENTICATION,
        supersedes: null,
      });
      await tx.update(disputeCase).set({ status: 'decided', decidedAt, updatedAt: decidedAt }).where(eq(disputeCase.id, caseId));
      built.audit.push(
        { context: arbiterAudit(decidedAt), input: { action: 'case.transitioned', objectType: 'case', objectId: caseId, caseId, change: { from: 'review', to: 'decided', transition: 'decide', detail: { decisionId: sealed.id, outcome, followedProposal } } } },
        { context: arbiterAudit(decidedAt), input: { action: 'decision.sealed', objectType: 'decision', objectId: sealed.id, caseId, change: { outcome, followedProposal, recordSha256: sealed.recordSha256, signingKeyId: sealed.signingKeyId, signatureMeaning: SIGNATURE_MEANING, reauthenticationMethod: DEMO_REAUTHENTICATION, supersedesId: null, correctionReason: null } } },
      );
    });
  }
  log(started, `${built.toDecide.length} decisions sealed and signed`);

  // The plant's own trail: every instrument check, and the intake results of the latest deliveries
  // (as many as bring the trail to about the target size).
  const pending = built.audit;
  const checks = await db.select().from(calibrationCheck).innerJoin(instrument, eq(instrument.id, calibrationCheck.instrumentId));
  for (const { calibration_check: c, instrument: i } of checks) {
    const actor = i.organisationId === labOrg.id ? parties.lab : parties.plant;
    pending.push({
      context: { actorUserId: actor.userId, actorOrganisationId: actor.organisationId, origin: SCALE_ORIGIN, at: c.checkedAt },
      input: { action: 'calibration.checked', objectType: 'calibration_check', objectId: c.id, change: { instrumentId: c.instrumentId, nominalTenthMilliC: c.nominalTenthMilliC, within: c.within, total: c.readingsTenthMilliC.length, pass: c.pass, rulesVersion: rules.version } },
    });
  }
  const [{ existing }] = await db.select({ existing: sql<number>`count(*)::int` }).from(auditEvent);
  const intakeEvents = Math.max(0, SCALE_AUDIT_TARGET - existing - pending.length - 1);
  const latestResults = await db
    .select({ id: intakeResult.id, deliveryId: delivery.id, reference: delivery.reference, verdict: intakeResult.verdict, value: intakeResult.valueTenthMilliC, amountMinor: intakeResult.amountMinor, decidedAt: intakeResult.decidedAt, notifiedAt: intakeResult.notifiedAt, checkId: measurementSet.calibrationCheckId })
    .from(intakeResult)
    .innerJoin(delivery, eq(delivery.id, intakeResult.deliveryId))
    .innerJoin(measurementSet, eq(measurementSet.id, intakeResult.measurementSetId))
    .orderBy(desc(intakeResult.decidedAt))
    .limit(intakeEvents);
  for (const r of latestResults) {
    pending.push({
      context: { actorUserId: parties.plant.userId, actorOrganisationId: parties.plant.organisationId, origin: SCALE_ORIGIN, at: r.decidedAt },
      input: { action: 'intake.recorded', objectType: 'intake_result', objectId: r.id, change: { deliveryId: r.deliveryId, reference: r.reference, verdict: r.verdict, valueTenthMilliC: r.value, amountMinor: r.amountMinor, rulesVersion: rules.version, calibrationCheckId: r.checkId, calibrationWarning: null, notifiedAt: r.notifiedAt ? r.notifiedAt.toISOString() : null } },
    });
  }
  const appended = await appendAuditChain(db, pending);
  log(started, `${appended} audit events chained`);

  const count = async (table: string) => Number(((await db.execute(sql.raw(`select count(*)::int as n from ${table}`))).rows[0] as { n: number }).n);
  const counts: Record<string, number> = {
    farms: await count('supplier_farm'),
    deliveries: await count('delivery'),
    cases: await count('dispute_case'),
    samples: await count('sample'),
    custodyEvents: await count('custody_event'),
    measurementSets: await count('measurement_set'),
    readings: await count('reading'),
    notes: await count('note'),
    attachments: await count('attachment'),
    decisions: await count('decision'),
  };
  const byStatus = await db.select({ status: disputeCase.status, n: sql<number>`count(*)::int` }).from(disputeCase).groupBy(disputeCase.status);
  for (const s of byStatus) counts[`cases.${s.status}`] = s.n;
  // Written last: its presence says the dataset is complete.
  const [{ events }] = await db.select({ events: sql<number>`count(*)::int` }).from(auditEvent);
  await appendAuditChain(db, [
    { context: { actorUserId: null, actorOrganisationId: null, origin: SCALE_ORIGIN, at: new Date(Math.max(now.getTime(), Date.now())) }, input: { action: 'demo.seeded', objectType: 'system', objectId: 'scale', change: { organisations: supplierOrgs.length + 3, deliveries: counts.deliveries, cases: counts.cases } } },
  ]);
  // Planner statistics, as routine maintenance keeps them: PGlite runs no autovacuum of its own, so a
  // bulk-loaded folder would otherwise be planned as if every table were empty.
  await db.execute(sql`analyze`);
  log(started, 'statistics gathered (analyze)');
  const manifest: ScaleManifest = { generatedAt: new Date().toISOString(), seconds: (Date.now() - started) / 1000, counts: { ...counts, auditEvents: events + 1 } };
  log(started, `done: ${JSON.stringify(manifest.counts)}`);
  return manifest;
}

/** Where the embedded scale dataset lives, and its manifest beside it. */
export const scaleDataDir = () => path.join(process.cwd(), 'data', 'scale', 'pglite');
export const scaleManifestFile = () => path.join(process.cwd(), 'data', 'scale', 'manifest.json');

export function readScaleManifest(): ScaleManifest | null {
  try {
    return JSON.parse(fs.readFileSync(scaleManifestFile(), 'utf8')) as ScaleManifest;
  } catch {
    return null;
  }
}
