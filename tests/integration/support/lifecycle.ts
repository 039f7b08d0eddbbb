import { expect } from 'vitest';
import { asc, count, eq, gt, inArray, max, or } from 'drizzle-orm';
import { getDb } from '@/db/client';
import {
  auditEvent,
  calibrationCheck,
  custodyEvent,
  delivery,
  disputeCase,
  instrument,
  intakeResult,
  measurementSet,
  organisation,
  outgoingMail,
  reading,
  sample,
  schemeRules,
  supplierFarm,
  type CaseStatus,
} from '@/db/schema';
import { demoOrganisations } from '@/db/seed/demo-names';
import { createOrganisation, createUserWithPassword } from '@/db/seed/factories';
import { finalResult } from '@/lib/arbitration';
import type { Actor } from '@/lib/auth/actor';
import type { TransitionName } from '@/lib/cases/lifecycle';
import { runTransition } from '@/lib/dal/case-transition';
import { currentSample } from '@/lib/dal/case-samples';
import { openDispute } from '@/lib/dal/open-dispute';
import { AppError } from '@/lib/errors';
import { intakeVerdict } from '@/lib/intake/verdict';
import { defaultSchemeRules } from '@/lib/rules/defaults';
import { toTenthMilliC } from '@/lib/temperature';
import { POST as transitionRoute } from '@/app/api/v1/cases/[caseId]/transitions/[transition]/route';
import { actorOf, callRoute, demoUser, expectProblem, seedDemoForTests, signIn, TEST_PASSWORD, type DemoKey } from '../helpers';

/**
 * Shared set-up for the lifecycle tests: the demo scenario plus a second laboratory and a second
 * board (outsiders to every demo case), and fresh deliveries built to order, so each test can open
 * and move its own case without depending on what another test did to a shared one.
 */

export const HOUR = 3_600_000;
export const MINUTE = 60_000;

export type ActorKey = DemoKey | 'otherLab' | 'otherArbiter';
export type CaseRow = typeof disputeCase.$inferSelect;

export type World = {
  actors: Record<ActorKey, Actor>;
  cookies: Record<ActorKey, string>;
  org: { plant: string; lab: string; board: string; supplier: string; supplier2: string; otherLab: string; otherBoard: string };
  labInstrumentId: string;
  otherLabInstrumentId: string;
  plantInstrumentId: string;
};

const outsiders = {
  otherLab: { email: 'analyst@second-lab.countersample.test', name: 'Petra Lindqvist', role: 'lab' as const, org: 'Fernhollow Referee Laboratory (test)', kind: 'lab' as const },
  otherArbiter: { email: 'arbiter@second-board.countersample.test', name: 'Hamish Curwen', role: 'arbiter' as const, org: 'Brackwater Milk Quality Board (test)', kind: 'board' as const },
};

async function orgIdByName(name: string): Promise<string> {
  const [row] = await getDb().select({ id: organisation.id }).from(organisation).where(eq(organisation.name, name));
  if (!row) throw new Error(`No organisation ${name}`);
  return row.id;
}

export async function setUpWorld(): Promise<World> {
  await seedDemoForTests();
  const db = getDb();
  const otherLab = await createOrganisation(db, { name: outsiders.otherLab.org, kind: outsiders.otherLab.kind });
  const otherBoard = await createOrganisation(db, { name: outsiders.otherArbiter.org, kind: outsiders.otherArbiter.kind });
  for (const [key, o] of Object.entries(outsiders)) {
    await createUserWithPassword(db, { email: o.email, name: o.name, role: o.role, organisationId: key === 'otherLab' ? otherLab.id : otherBoard.id, password: TEST_PASSWORD });
  }
  const [otherInstrument] = await db.insert(instrument).values({ organisationId: otherLab.id, serialNumber: 'FH-CRY-03', description: 'Reference cryoscope, room 4' }).returning();

  const cookies = {} as Record<ActorKey, string>;
  const actors = {} as Record<ActorKey, Actor>;
  const demoKeys: DemoKey[] = ['admin', 'plant', 'lab', 'arbiter', 'arbiter2', 'supplier', 'supplier2'];
  for (const key of demoKeys) cookies[key] = await signIn(demoUser(key).email);
  cookies.otherLab = await signIn(outsiders.otherLab.email);
  cookies.otherArbiter = await signIn(outsiders.otherArbiter.email);
  for (const key of Object.keys(cookies) as ActorKey[]) actors[key] = await actorOf(cookies[key]);

  const org = {
    plant: await orgIdByName(demoOrganisations.plant.name),
    lab: await orgIdByName(demoOrganisations.lab.name),
    board: await orgIdByName(demoOrganisations.board.name),
    supplier: await orgIdByName(demoOrganisations.suppliers[0].name),
    supplier2: await orgIdByName(demoOrganisations.suppliers[1].name),
    otherLab: otherLab.id,
    otherBoard: otherBoard.id,
  };
  const [labInstrument] = await db.select({ id: instrument.id }).from(instrument).where(eq(instrument.organisationId, org.lab));
  const [plantInstrument] = await db.select({ id: instrument.id }).from(instrument).where(eq(instrument.organisationId, org.plant)).orderBy(asc(instrument.serialNumber));
  return { actors, cookies, org, labInstrumentId: labInstrument.id, otherLabInstrumentId: otherInstrument.id, plantInstrumentId: plantInstrument.id };
}

let serial = 0;
/** A short suffix unique within the file, for references, codes and seal numbers. */
export function unique(): string {
  serial += 1;
  return `${String(Date.now()).slice(-6)}${String(serial).padStart(3, '0')}`;
}

export type FreshResult = {
  intakeResultId: string;
  deliveryId: string;
  retainedSampleId: string;
  retainedCode: string;
  sealNumber: string;
  collectedAt: Date;
  notifiedAt: Date | null;
  verdict: 'accepted' | 'deducted' | 'rejected';
  valueTenthMilliC: number;
};

/**
 * One delivery of a supplier with its intake set, verdict and sealed retained sample, as the plant
 * records them. Times are relative to `at` (the real clock unless given), so the contest window is open.
 */
export async function createIntakeResult(
  world: World,
  options: { supplier?: 'supplier' | 'supplier2'; readings?: number[]; at?: Date; notified?: boolean; superseded?: boolean } = {},
): Promise<FreshResult> {
  const db = getDb();
  const supplierOrg = world.org[options.supplier ?? 'supplier'];
  const at = options.at ?? new Date();
  const readings = options.readings ?? [-0.504, -0.5031];
  const outcome = finalResult(readings, defaultSchemeRules.precision);
  if (outcome.status !== 'accepted') throw new Error('Test intake readings must be conclusive');

  const [farm] = await db.select({ id: supplierFarm.id }).from(supplierFarm).where(eq(supplierFarm.organisationId, supplierOrg)).limit(1);
  const [rules] = await db.select({ id: schemeRules.id }).from(schemeRules).orderBy(asc(schemeRules.version)).limit(1);
  const [check] = await db.select({ id: calibrationCheck.id }).from(calibrationCheck).where(eq(calibrationCheck.instrumentId, world.plantInstrumentId)).limit(1);
  const plantUser = { id: world.actors.plant.userId };

  const id = unique();
  const reference = `LW-TEST-${id}`;
  const collectedAt = new Date(at.getTime() - 6 * HOUR);
  const receivedAt = new Date(at.getTime() - 5 * HOUR);
  const testedAt = new Date(at.getTime() - 4.5 * HOUR);
  const notifiedAt = options.notified === false ? null : new Date(at.getTime() - 4 * HOUR);
  const volumeLitres = 9_000;
  const verdict = intakeVerdict({ value: outcome.value, readingsUsed: outcome.used, volumeLitres, rules: defaultSchemeRules });

  const [load] = await db
    .insert(delivery)
    .values({ reference, plantOrganisationId: world.org.plant, supplierOrganisationId: supplierOrg, farmId: farm.id, collectedAt, receivedAt, volumeLitres, tanker: 'LV-T2', compartment: '1', receiptTempTenthMilliC: toTenthMilliC(4.1) })
    .returning({ id: delivery.id });
  const [routine] = await db.insert(sample).values({ deliveryId: load.id, code: `R-${reference}`, kind: 'routine', sampledAt: collectedAt, storage: 'Intake rack, 4 °C' }).returning({ id: sample.id });
  const sealNumber = `LVS-T${id}`;
  const [retained] = await db
    .insert(sample)
    .values({ deliveryId: load.id, code: `K-${reference}`, kind: 'retained', sealNumber, preservative: 'None', storage: 'Retained-sample refrigerator B, 0–6 °C', sampledAt: collectedAt })
    .returning({ id: sample.id });
  await db.insert(custodyEvent).values([
    { sampleId: retained.id, kind: 'sealed', at: collectedAt, organisationId: world.org.plant, actorUserId: plantUser.id, location: 'Farm tank, by the tanker driver', sealIntact: true },
    { sampleId: retained.id, kind: 'stored', at: receivedAt, organisationId: world.org.plant, actorUserId: plantUser.id, location: 'Retained-sample refrigerator B', tempTenthMilliC: toTenthMilliC(4.0), sealIntact: true, frozen: false },
  ]);
  const [set] = await db
    .insert(measurementSet)
    .values({
      sampleId: routine.id,
      organisationId: world.org.plant,
      instrumentId: world.plantInstrumentId,
      calibrationCheckId: check?.id,
      purpose: 'intake',
      analystName: 'T. Fenwick',
      testedAt,
      sampleTempTenthMilliC: toTenthMilliC(20),
      preparation: 'none',
      resultTenthMilliC: toTenthMilliC(outcome.value),
      resultBasis: outcome.basis,
      readingsUsed: outcome.used,
      createdBy: plantUser.id,
      submittedAt: testedAt,
    })
    .returning({ id: measurementSet.id });
  await db.insert(reading).values(readings.map((value, i) => ({ measurementSetId: set.id, position: i + 1, valueTenthMilliC: toTenthMilliC(value) })));
  const [result] = await db
    .insert(intakeResult)
    .values({
      deliveryId: load.id,
      measurementSetId: set.id,
      rulesVersionId: rules.id,
      valueTenthMilliC: toTenthMilliC(outcome.value),
      limitTenthMilliC: toTenthMilliC(verdict.limit),
      decisionRule: defaultSchemeRules.decisionRule,
      verdict: verdict.verdict,
      addedWaterBasisPoints: Math.round(verdict.addedWaterPercent * 100),
      amountMinor: verdict.amountMinor,
      currency: defaultSchemeRules.currency,
      decidedBy: plantUser.id,
      decidedAt: testedAt,
      notifiedAt,
      supersededAt: options.superseded ? new Date(at.getTime() - 3 * HOUR) : null,
    })
    .returning({ id: intakeResult.id });
  return {
    intakeResultId: result.id,
    deliveryId: load.id,
    retainedSampleId: retained.id,
    retainedCode: `K-${reference}`,
    sealNumber,
    collectedAt,
    notifiedAt,
    verdict: verdict.verdict,
    valueTenthMilliC: toTenthMilliC(outcome.value),
  };
}

export const disputeBody = (intakeResultId: string) => ({
  intakeResultId,
  grounds: ['instrument'],
  explanation: 'Our own bulk-tank check that morning read well below the limit; we ask for the retained sample to be retested.',
  remedy: 'Pay the load in full.',
});

/** Opens a fresh case on a fresh delivery, as the supplier would. */
export async function openFreshCase(world: World, options: { supplier?: 'supplier' | 'supplier2'; now?: Date } = {}): Promise<CaseRow & { fresh: FreshResult }> {
  const key = options.supplier ?? 'supplier';
  const fresh = await createIntakeResult(world, { supplier: key, at: options.now });
  const row = await openDispute(getDb(), world.actors[key], disputeBody(fresh.intakeResultId), { now: options.now });
  return { ...row, fresh };
}

export async function caseRow(caseId: string): Promise<CaseRow> {
  const [row] = await getDb().select().from(disputeCase).where(eq(disputeCase.id, caseId));
  return row;
}

export async function caseByNumber(number: string): Promise<CaseRow> {
  const [row] = await getDb().select().from(disputeCase).where(eq(disputeCase.number, number));
  if (!row) throw new Error(`No case ${number}`);
  return row;
}

async function currentSealOf(caseId: string): Promise<string> {
  const current = await currentSample(getDb(), await caseRow(caseId));
  if (!current?.sealNumber) throw new Error('The case has no sealed sample');
  return current.sealNumber;
}

/** Valid bodies for each transition, as JSON would carry them (dates as ISO text). */
export const inputs = {
  async dispatch(world: World, caseId: string, overrides: Record<string, unknown> = {}) {
    return { labOrganisationId: world.org.lab, sealNumber: await currentSealOf(caseId), courier: 'Cool box 7 with data logger, by courier', temperature: 4.2, sealIntact: true, ...overrides };
  },
  async receive(_world: World, caseId: string, overrides: Record<string, unknown> = {}) {
    return { sealNumber: await currentSealOf(caseId), sealIntact: true, frozen: false, temperature: 4.6, condition: 'Container undamaged; data logger within range.', ...overrides };
  },
  submit_retest(world: World, overrides: Record<string, unknown> = {}) {
    return {
      instrumentId: world.labInstrumentId,
      analystName: 'I. Halloran',
      testedAt: new Date().toISOString(),
      sampleTemperature: 20.1,
      preparation: 'none',
      calibrationReadings: [-0.5121, -0.5118, -0.5124, -0.5119, -0.5122],
      readings: [{ value: -0.519 }, { value: -0.5196 }],
      ...overrides,
    };
  },
  order_further_test(world: World, overrides: Record<string, unknown> = {}) {
    const id = unique();
    return {
      kind: 'third_laboratory',
      labOrganisationId: world.org.otherLab,
      sampleCode: `F-TEST-${id}`,
      sealNumber: `LVS-F${id}`,
      sampledAt: new Date(Date.now() - 30 * MINUTE).toISOString(),
      reasons: 'The retest and the intake result differ by more than the critical difference.',
      ...overrides,
    };
  },
  withdraw(_world: World, overrides: Record<string, unknown> = {}) {
    return { reason: 'Settled directly with the plant after a herd check.', ...overrides };
  },
};

/** A valid body for any transition on a case. */
export async function validInput(world: World, name: TransitionName, caseId: string): Promise<Record<string, unknown>> {
  switch (name) {
    case 'dispatch':
      return inputs.dispatch(world, caseId);
    case 'receive':
      return inputs.receive(world, caseId);
    case 'submit_retest':
      return inputs.submit_retest(world);
    case 'order_further_test':
      return inputs.order_further_test(world);
    case 'withdraw':
      return inputs.withdraw(world);
  }
}

const path: Record<Exclude<CaseStatus, 'decided' | 'withdrawn'>, { name: TransitionName; by: ActorKey } | null> = {
  open: null,
  awaiting_sample: { name: 'dispatch', by: 'plant' },
  retest: { name: 'receive', by: 'lab' },
  review: { name: 'submit_retest', by: 'lab' },
};
const order = ['open', 'awaiting_sample', 'retest', 'review'] as const;

/** Opens a fresh case and walks it forward through the ordinary path to `status`. */
export async function freshCaseIn(world: World, status: (typeof order)[number] | 'withdrawn', options: { supplier?: 'supplier' | 'supplier2' } = {}): Promise<CaseRow & { fresh: FreshResult }> {
  const opened = await openFreshCase(world, options);
  if (status === 'withdrawn') {
    await runTransition(getDb(), world.actors[options.supplier ?? 'supplier'], opened.id, 'withdraw', inputs.withdraw(world));
  } else {
    for (const step of order.slice(1, order.indexOf(status) + 1)) {
      const move = path[step]!;
      await runTransition(getDb(), world.actors[move.by], opened.id, move.name, await validInput(world, move.name, opened.id));
    }
  }
  return { ...(await caseRow(opened.id)), fresh: opened.fresh };
}

/** Everything a refused transition must leave as it was. */
export async function snapshot(caseId: string) {
  const db = getDb();
  const row = await caseRow(caseId);
  const samples = await db.select({ id: sample.id }).from(sample).where(or(eq(sample.deliveryId, row.deliveryId), eq(sample.caseId, caseId)));
  const sampleIds = samples.map((s) => s.id);
  const [[custody], [audit], [sets], [mail], [checks]] = await Promise.all([
    db.select({ n: count() }).from(custodyEvent).where(inArray(custodyEvent.sampleId, sampleIds)),
    db.select({ n: count() }).from(auditEvent),
    db.select({ n: count() }).from(measurementSet).where(eq(measurementSet.caseId, caseId)),
    db.select({ n: count() }).from(outgoingMail).where(eq(outgoingMail.caseId, caseId)),
    db.select({ n: count() }).from(calibrationCheck),
  ]);
  return { row, samples: sampleIds.length, custody: custody.n, audit: audit.n, measurementSets: sets.n, mail: mail.n, calibrationChecks: checks.n };
}

export async function lastAuditSeq(): Promise<number> {
  const [row] = await getDb().select({ seq: max(auditEvent.seq) }).from(auditEvent);
  return Number(row.seq ?? 0);
}

export async function auditSince(seq: number) {
  return getDb().select().from(auditEvent).where(gt(auditEvent.seq, seq)).orderBy(asc(auditEvent.seq));
}

export async function custodyOfCase(caseId: string) {
  const db = getDb();
  const row = await caseRow(caseId);
  const samples = await db.select({ id: sample.id }).from(sample).where(or(eq(sample.deliveryId, row.deliveryId), eq(sample.caseId, caseId)));
  return db.select().from(custodyEvent).where(inArray(custodyEvent.sampleId, samples.map((s) => s.id))).orderBy(asc(custodyEvent.at), asc(custodyEvent.createdAt));
}

export async function mailOfCase(caseId: string) {
  return getDb().select().from(outgoingMail).where(eq(outgoingMail.caseId, caseId)).orderBy(asc(outgoingMail.createdAt));
}

/** Awaits a promise that must reject with an AppError of `code`, and returns the error. */
export async function expectAppError(promise: Promise<unknown>, code: AppError['code']): Promise<AppError> {
  const outcome = await promise.then(
    (value) => ({ resolved: value }),
    (error: unknown) => ({ error }),
  );
  if ('resolved' in outcome) throw new Error(`Expected an AppError ${code}, but the call succeeded`);
  expect(outcome.error).toBeInstanceOf(AppError);
  expect((outcome.error as AppError).code).toBe(code);
  return outcome.error as AppError;
}

/** Calls the transition route as `key` would, and returns the raw response. */
export function postTransition(world: World, key: ActorKey, caseId: string, name: string, body: unknown): Promise<Response> {
  return callRoute(transitionRoute, `/api/v1/cases/${caseId}/transitions/${name}`, { cookie: world.cookies[key], params: { caseId, transition: name }, method: 'POST', body });
}

export { expectProblem };
