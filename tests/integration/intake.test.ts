import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startMailCatcher } from '@/lib/mail/catcher';
import type { World } from './support/lifecycle';

// env() reads SMTP_URL once: the catcher must listen and the variables be set before the app is loaded.
const catcher = await startMailCatcher({ smtpPort: 0, httpPort: 0 });
process.env.SMTP_URL = `smtp://127.0.0.1:${catcher.smtpPort}`;
process.env.MAIL_CATCHER_URL = `http://127.0.0.1:${catcher.httpPort}`;

const { and, asc, count, eq } = await import('drizzle-orm');
const { getDb } = await import('@/db/client');
const { auditEvent, custodyEvent, delivery, instrument, intakeResult, measurementSet, outgoingMail, reading, sample, supplierFarm } = await import('@/db/schema');
const { recordIntake, correctIntake } = await import('@/lib/dal/intake');
const { recordCalibrationCheck } = await import('@/lib/dal/instruments');
const { getDeliveryRecord } = await import('@/lib/dal/intake-record');
const { farmHistory, listFarms } = await import('@/lib/dal/intake-history');
const { findDelivery, listDeliveries, deliveryListQuerySchema } = await import('@/lib/dal/deliveries');
const { openDispute } = await import('@/lib/dal/open-dispute');
const { verifyAuditChain } = await import('@/lib/audit/verify');
const { resetMailTransport } = await import('@/lib/mail/transport');
const { formatDateTime } = await import('@/lib/format/dates');
const { eventually } = await import('./helpers');
const L = await import('./support/lifecycle');
const { HOUR, MINUTE } = L;

let world: World;
let farmOfSupplier: string;
let farmOfSupplier2: string;
let failingInstrumentId: string;

const passingReadings = ['-0.5121', '-0.5118', '-0.5124', '-0.5119', '-0.5122'];

/** An intake as the form sends it: typed text and local times as ISO strings. */
function intakeBody(overrides: Record<string, unknown> = {}) {
  const id = L.unique();
  const now = Date.now();
  return {
    farmId: farmOfSupplier,
    reference: `LW-INT-${id}`,
    collectedAt: new Date(now - 3 * HOUR).toISOString(),
    receivedAt: new Date(now - 1 * HOUR).toISOString(),
    volumeLitres: '9000',
    tanker: 'LV-T3',
    compartment: '2',
    receiptTemperature: '4.3',
    routineCode: '',
    retainedCode: '',
    sealNumber: `LVS-I${id}`,
    retainedLocation: 'Retained-sample refrigerator B',
    retainedTemperature: '3.9',
    instrumentId: world.plantInstrumentId,
    analystName: 'T. Fenwick',
    testedAt: new Date(now - 20 * MINUTE).toISOString(),
    sampleTemperature: '20.2',
    preparation: 'none',
    readings: [
      { value: '-0.5262', flag: 'none' },
      { value: '-0.5258', flag: 'none' },
    ],
    ...overrides,
  };
}

async function counts() {
  const db = getDb();
  const [[d], [s], [c], [m], [r], [i], [a], [o]] = await Promise.all([
    db.select({ n: count() }).from(delivery),
    db.select({ n: count() }).from(sample),
    db.select({ n: count() }).from(custodyEvent),
    db.select({ n: count() }).from(measurementSet),
    db.select({ n: count() }).from(reading),
    db.select({ n: count() }).from(intakeResult),
    db.select({ n: count() }).from(auditEvent),
    db.select({ n: count() }).from(outgoingMail),
  ]);
  return { deliveries: d.n, samples: s.n, custody: c.n, sets: m.n, readings: r.n, results: i.n, audit: a.n, mail: o.n, caught: catcher.messages.length };
}

function mailFor(reference: string) {
  return catcher.messages.filter((m) => m.subject.startsWith(`${reference}:`));
}

beforeAll(async () => {
  world = await L.setUpWorld();
  const db = getDb();
  [{ id: farmOfSupplier }] = await db.select({ id: supplierFarm.id }).from(supplierFarm).where(eq(supplierFarm.organisationId, world.org.supplier)).orderBy(asc(supplierFarm.herdCode)).limit(1);
  [{ id: farmOfSupplier2 }] = await db.select({ id: supplierFarm.id }).from(supplierFarm).where(eq(supplierFarm.organisationId, world.org.supplier2)).limit(1);
  // A fresh passing check on the first intake cryoscope, and a failed one on the second, an hour ago.
  const checkedAt = new Date(Date.now() - HOUR).toISOString();
  await recordCalibrationCheck(db, world.actors.plant, { instrumentId: world.plantInstrumentId, analystName: 'T. Fenwick', checkedAt, nominal: '-0.512', readings: passingReadings });
  const [second] = await db.select({ id: instrument.id }).from(instrument).where(and(eq(instrument.organisationId, world.org.plant), eq(instrument.serialNumber, 'LW-CRY-02')));
  failingInstrumentId = second.id;
  const failed = await recordCalibrationCheck(db, world.actors.plant, { instrumentId: failingInstrumentId, analystName: 'T. Fenwick', checkedAt, nominal: '-0.512', readings: ['-0.5165', '-0.5071', '-0.5118', '-0.5163', '-0.5124'] });
  expect(failed.pass).toBe(false);
});

afterAll(async () => {
  resetMailTransport();
  await catcher.close();
});

describe('recording an intake', () => {
  it('records an accepted load with its samples, custody, readings and the check it rests on, and tells nobody', async () => {
    const before = await counts();
    const body = intakeBody();
    const recorded = await recordIntake(getDb(), world.actors.plant, body, { origin: 'web 198.51.100.20' });

    expect(recorded.intakeResult).toMatchObject({ verdict: 'accepted', valueTenthMilliC: -5260, amountMinor: 0, notifiedAt: null, currency: 'EUR', decisionRule: 'guarded_rejection' });
    expect(recorded.mail).toBeNull();
    expect(recorded.calibrationWarning).toBeNull();
    const after = await counts();
    expect(after).toMatchObject({ deliveries: before.deliveries + 1, samples: before.samples + 2, custody: before.custody + 2, sets: before.sets + 1, readings: before.readings + 2, results: before.results + 1, audit: before.audit + 1, mail: before.mail });

    const record = await getDeliveryRecord(getDb(), world.actors.plant, recorded.deliveryId);
    expect(record.samples.map((s) => [s.kind, s.code]).sort()).toEqual([
      ['retained', `K-${body.reference}`],
      ['routine', `R-${body.reference}`],
    ]);
    const retained = record.samples.find((s) => s.kind === 'retained')!;
    expect(retained.sealNumber).toBe(body.sealNumber);
    expect(retained.custody.map((c) => c.kind)).toEqual(['sealed', 'stored']);
    expect(retained.custody[1]).toMatchObject({ tempTenthMilliC: 39_000, sealIntact: true, frozen: false, location: 'Retained-sample refrigerator B' });
    expect(record.current).toMatchObject({ instrumentSerial: 'LW-CRY-01', checkPass: true, checkWithin: 5, rulesVersion: 1, resultBasis: 'mean_of_2', sampleTempTenthMilliC: 202_000 });
    expect(record.current!.readings.map((r) => r.valueTenthMilliC)).toEqual([-5262, -5258]);

    const [event] = await getDb().select().from(auditEvent).where(eq(auditEvent.objectId, recorded.intakeResult.id));
    expect(event).toMatchObject({ action: 'intake.recorded', actorUserId: world.actors.plant.userId, origin: 'web 198.51.100.20' });
    expect(event.change).toMatchObject({ verdict: 'accepted', rulesVersion: 1, calibrationWarning: null, notifiedAt: null });
    expect(await verifyAuditChain(getDb())).toMatchObject({ ok: true });
  });

  it('takes two more readings when the first two disagree, rejects the load, and e-mails the supplier with the values, rule and deadline', async () => {
    const now = new Date();
    const body = intakeBody({
      readings: [
        { value: '-0.5032', flag: 'none' },
        { value: '-0.5079', flag: 'early_crystallisation' },
        { value: '-0.5021', flag: 'none' },
        { value: '-0.5048', flag: 'none' },
      ],
      preparation: 'prewarmed',
    });
    const recorded = await recordIntake(getDb(), world.actors.plant, body, { now });

    // ISO 5725-6:1994, 5.2.2: |−0.5032 − (−0.5079)| = 4.7 m°C > r, so four readings; their range 5.8 m°C
    // exceeds CR0.95(4) = 3.6·σr = 5.14 m°C, so the median −0.5040 °C is the result (derived).
    expect(recorded.intakeResult).toMatchObject({ verdict: 'rejected', valueTenthMilliC: -5040, amountMinor: 414_000 });
    // Added water (0.520 − 0.504)/0.520 = 3.08 % ≥ the scheme's 3 % (derived): the whole load, 9 000 l × 0.46 EUR/l.
    expect(recorded.intakeResult.addedWaterBasisPoints).toBe(308);
    expect(recorded.intakeResult.notifiedAt?.getTime()).toBe(now.getTime());
    expect(recorded.mail?.status).toBe('sent');

    const [message] = await eventually(() => (mailFor(body.reference).length ? mailFor(body.reference) : undefined), 'the intake notice');
    expect(message.to).toEqual([world.actors.supplier.email]);
    expect(message.template).toBe('intake-notice');
    expect(message.subject).toBe(`${body.reference}: rejected`);
    const deadline = new Date(now.getTime() + 24 * HOUR);
    expect(message.text).toContain('Freezing point −0.5040 °C (median of 4 readings; readings −0.5032, −0.5079, −0.5021, −0.5048 °C) on instrument LW-CRY-01.');
    expect(message.text).toContain('upper limit (added water suspected above it) −0.515 °C under guarded rejection');
    expect(message.text).toContain('rules version 1');
    expect(message.text).toContain('Withheld: €4,140.00 (9000 l × 0.46 EUR/l).');
    expect(message.text).toContain(`You may contest this result until ${formatDateTime(deadline)}`);
    expect(message.text).toContain(`/deliveries/${recorded.deliveryId}`);

    const row = await findDelivery(getDb(), world.actors.supplier, recorded.deliveryId);
    expect(row).toMatchObject({ verdict: 'rejected', contestable: true, rulesVersion: 1 });
    expect(row!.contestDeadline?.getTime()).toBe(deadline.getTime());
    const desk = await listDeliveries(getDb(), world.actors.supplier, deliveryListQuerySchema.parse({ verdict: 'rejected,deducted', sinceDays: 14, pageSize: 100 }));
    expect(desk.items.map((i) => i.id)).toContain(recorded.deliveryId);

    const record = await getDeliveryRecord(getDb(), world.actors.supplier, recorded.deliveryId);
    expect(record.current).toMatchObject({ resultBasis: 'median_of_4', readingsUsed: 4, preparation: 'prewarmed', contestOpen: true });
    expect(record.current!.readings.map((r) => r.flag)).toEqual(['none', 'early_crystallisation', 'none', 'none']);
  });

  it('deducts a load just beyond the limit by the added-water share', async () => {
    const body = intakeBody({ readings: [{ value: '-0.5110', flag: 'none' }, { value: '-0.5112', flag: 'none' }] });
    const recorded = await recordIntake(getDb(), world.actors.plant, body);
    // Mean −0.5111 °C beyond the guarded-rejection acceptance limit −0.51189 °C (n = 2); added water
    // (0.520 − 0.5111)/0.520 = 1.7115 %; 9 000 l × 1.7115 % × 0.46 EUR/l = 70.86 EUR (derived).
    expect(recorded.intakeResult).toMatchObject({ verdict: 'deducted', valueTenthMilliC: -5111, addedWaterBasisPoints: 171, amountMinor: 7086 });
    const [message] = await eventually(() => (mailFor(body.reference).length ? mailFor(body.reference) : undefined), 'the deduction notice');
    expect(message.subject).toBe(`${body.reference}: paid with a deduction`);
    expect(message.text).toContain('Withheld: €70.86');
  });

  it('refuses a test on an instrument whose last check failed, with the reason, and writes nothing', async () => {
    const before = await counts();
    const error = await L.expectAppError(recordIntake(getDb(), world.actors.plant, intakeBody({ instrumentId: failingInstrumentId })), 'conflict');
    expect(error.message).toContain('Refused: instrument LW-CRY-02 had no passing calibration check in force');
    expect(error.fieldErrors?.instrumentId?.[0]).toMatch(/^Unfit: the check of .* failed \(2 of 5 within tolerance\); recalibrate and check again\. The scheme does not allow/);
    expect(await counts()).toEqual(before);
  });

  it('refuses a test on an instrument never checked, and on one of another organisation', async () => {
    const [fresh] = await getDb().insert(instrument).values({ organisationId: world.org.plant, serialNumber: `LW-CRY-N${L.unique()}`, description: 'Spare cryoscope, store room' }).returning();
    const before = await counts();
    const unchecked = await L.expectAppError(recordIntake(getDb(), world.actors.plant, intakeBody({ instrumentId: fresh.id })), 'conflict');
    expect(unchecked.fieldErrors?.instrumentId?.[0]).toContain('Unfit: no calibration check recorded');
    const foreign = await L.expectAppError(recordIntake(getDb(), world.actors.plant, intakeBody({ instrumentId: world.labInstrumentId })), 'invalid');
    expect(foreign.fieldErrors).toEqual({ instrumentId: ['Choose one of your laboratory’s instruments.'] });
    expect(await counts()).toEqual(before);
  });

  it('answers bad input with field errors and writes nothing', async () => {
    const before = await counts();
    const bad = await L.expectAppError(
      recordIntake(getDb(), world.actors.plant, intakeBody({ farmId: 'not-a-farm', volumeLitres: '-5', sealNumber: '', readings: [{ value: '-0.5262', flag: 'none' }, { value: '', flag: 'none' }], testedAt: new Date(Date.now() + 3 * HOUR).toISOString() })),
      'invalid',
    );
    expect(bad.fieldErrors).toMatchObject({
      farmId: ['Choose the farm the load came from.'],
      volumeLitres: ['Enter a volume from 1 to 60 000 litres.'],
      sealNumber: ['Enter the seal number.'],
      'readings.1.value': ['Enter the reading in °C, such as −0.5120.'],
      testedAt: ['This cannot be in the future.'],
    });
    const inconclusive = await L.expectAppError(recordIntake(getDb(), world.actors.plant, intakeBody({ readings: [{ value: '-0.5032', flag: 'none' }, { value: '-0.5079', flag: 'none' }] })), 'invalid');
    expect(inconclusive.fieldErrors?.readings?.[0]).toBe('2 more readings needed: the first two differ by more than the repeatability limit r = 4.0 m°C.');
    const first = intakeBody();
    await recordIntake(getDb(), world.actors.plant, first);
    const afterFirst = await counts();
    const duplicate = await L.expectAppError(recordIntake(getDb(), world.actors.plant, intakeBody({ reference: first.reference })), 'invalid');
    expect(duplicate.fieldErrors).toEqual({ reference: ['A delivery with this reference is already recorded.'] });
    expect(await counts()).toEqual(afterFirst);
    expect(afterFirst.deliveries).toBe(before.deliveries + 1);
  });

  it('lets only the plant record an intake', async () => {
    for (const key of ['supplier', 'lab', 'arbiter', 'admin'] as const) {
      await L.expectAppError(recordIntake(getDb(), world.actors[key], intakeBody()), 'forbidden');
    }
  });
});

describe('correcting an intake result', () => {
  it('keeps the original and its readings, adds the corrected result with who, when and why, and tells the supplier', async () => {
    const body = intakeBody({ readings: [{ value: '-0.5110', flag: 'none' }, { value: '-0.5112', flag: 'none' }] });
    const original = await recordIntake(getDb(), world.actors.plant, body);
    const [originalRow] = await getDb().select().from(intakeResult).where(eq(intakeResult.id, original.intakeResult.id));
    const originalReadings = await getDb().select().from(reading).where(eq(reading.measurementSetId, originalRow.measurementSetId)).orderBy(asc(reading.position));
    const later = new Date(Date.now() + MINUTE);

    const corrected = await correctIntake(
      getDb(),
      world.actors.plant,
      { intakeResultId: original.intakeResult.id, reason: 'Reading 1 was typed from the wrong line of the print-out; the print-out shows −0.5180.', sampleTemperature: '20.2', preparation: 'none', readings: [{ value: '-0.5180', flag: 'none' }, { value: '-0.5184', flag: 'none' }] },
      { now: later, origin: 'web 198.51.100.21' },
    );

    expect(corrected.intakeResult).toMatchObject({ verdict: 'accepted', valueTenthMilliC: -5182, supersedesId: originalRow.id, decidedBy: world.actors.plant.userId, rulesVersionId: originalRow.rulesVersionId });
    expect(corrected.intakeResult.correctionReason).toContain('wrong line of the print-out');
    // The original row is as it was, except that it now says when it was superseded.
    const [after] = await getDb().select().from(intakeResult).where(eq(intakeResult.id, originalRow.id));
    expect(after).toEqual({ ...originalRow, supersededAt: later });
    expect(await getDb().select().from(reading).where(eq(reading.measurementSetId, originalRow.measurementSetId)).orderBy(asc(reading.position))).toEqual(originalReadings);
    expect(corrected.intakeResult.measurementSetId).not.toBe(originalRow.measurementSetId);

    const record = await getDeliveryRecord(getDb(), world.actors.supplier, original.deliveryId);
    expect(record.results.map((r) => [r.verdict, r.valueTenthMilliC, r.supersededAt !== null])).toEqual([
      ['deducted', -5111, true],
      ['accepted', -5182, false],
    ]);
    expect(record.current).toMatchObject({ id: corrected.intakeResult.id, decidedByName: world.actors.plant.name });
    const listed = await findDelivery(getDb(), world.actors.supplier, original.deliveryId);
    expect(listed).toMatchObject({ intakeResultId: corrected.intakeResult.id, verdict: 'accepted' });

    const events = await getDb().select().from(auditEvent).where(eq(auditEvent.objectId, corrected.intakeResult.id));
    expect(events).toHaveLength(1);
    expect(events[0]).toMatchObject({ action: 'intake.corrected', actorUserId: world.actors.plant.userId, origin: 'web 198.51.100.21' });
    expect(events[0].change).toMatchObject({ supersedes: originalRow.id, from: { verdict: 'deducted', valueTenthMilliC: -5111, amountMinor: 7086 }, to: { verdict: 'accepted', valueTenthMilliC: -5182, amountMinor: 0 } });
    const mail = await eventually(() => catcher.messages.find((m) => m.subject === `${body.reference}: corrected result, accepted`), 'the correction notice');
    expect(mail.template).toBe('intake-corrected');
    expect(mail.text).toContain('This corrects the earlier result (deducted, −0.511 °C). Reason given: Reading 1 was typed');

    await L.expectAppError(correctIntake(getDb(), world.actors.plant, { intakeResultId: originalRow.id, reason: 'A second try at the superseded row.', sampleTemperature: '20', preparation: 'none', readings: [{ value: '-0.52', flag: 'none' }, { value: '-0.52', flag: 'none' }] }), 'conflict');
    expect(await verifyAuditChain(getDb())).toMatchObject({ ok: true });
  });

  it('refuses a correction once the supplier has disputed the result, and anyone but the plant', async () => {
    const recorded = await recordIntake(getDb(), world.actors.plant, intakeBody({ readings: [{ value: '-0.5110', flag: 'none' }, { value: '-0.5112', flag: 'none' }] }));
    const input = { intakeResultId: recorded.intakeResult.id, reason: 'Checking whether a correction is refused.', sampleTemperature: '20', preparation: 'none', readings: [{ value: '-0.5200', flag: 'none' }, { value: '-0.5202', flag: 'none' }] };
    await L.expectAppError(correctIntake(getDb(), world.actors.supplier, input), 'forbidden');
    const opened = await openDispute(getDb(), world.actors.supplier, L.disputeBody(recorded.intakeResult.id));
    const before = await counts();
    const error = await L.expectAppError(correctIntake(getDb(), world.actors.plant, input), 'conflict');
    expect(error.message).toContain(opened.number);
    expect(await counts()).toEqual(before);
    const record = await getDeliveryRecord(getDb(), world.actors.plant, recorded.deliveryId);
    expect(record).toMatchObject({ mayCorrect: false, correctionBlockedBy: opened.number });
  });

  it('answers a bad correction with field errors and writes nothing', async () => {
    const recorded = await recordIntake(getDb(), world.actors.plant, intakeBody());
    const before = await counts();
    const error = await L.expectAppError(correctIntake(getDb(), world.actors.plant, { intakeResultId: recorded.intakeResult.id, reason: 'short', sampleTemperature: 'warm', preparation: 'boiled', readings: [] }), 'invalid');
    expect(Object.keys(error.fieldErrors ?? {}).sort()).toEqual(['preparation', 'readings', 'reason', 'sampleTemperature']);
    expect(await counts()).toEqual(before);
  });
});

describe('what a supplier sees', () => {
  it('sees only its own farms, their history and their deliveries', async () => {
    const own = await listFarms(getDb(), world.actors.supplier);
    expect(own.length).toBeGreaterThan(0);
    const [ownOrgFarms] = await getDb().select({ n: count() }).from(supplierFarm).where(eq(supplierFarm.organisationId, world.org.supplier));
    expect(own).toHaveLength(ownOrgFarms.n);
    expect(own.map((f) => f.id)).not.toContain(farmOfSupplier2);

    const history = await farmHistory(getDb(), world.actors.supplier, farmOfSupplier);
    expect(history.farm.id).toBe(farmOfSupplier);
    expect(history.points.length).toBeGreaterThan(0);
    expect(history.limits).toMatchObject({ upper: -0.515, version: 1 });
    // The herd's intake results from this file are among its points, each at most once (corrections do not double them).
    const ids = history.points.map((p) => p.deliveryId);
    expect(new Set(ids).size).toBe(ids.length);

    await L.expectAppError(farmHistory(getDb(), world.actors.supplier, farmOfSupplier2), 'not_found');
    const theirs = await recordIntake(getDb(), world.actors.plant, intakeBody({ farmId: farmOfSupplier2 }));
    await L.expectAppError(getDeliveryRecord(getDb(), world.actors.supplier, theirs.deliveryId), 'not_found');
    expect(await findDelivery(getDb(), world.actors.supplier, theirs.deliveryId)).toBeNull();
    expect((await getDeliveryRecord(getDb(), world.actors.supplier2, theirs.deliveryId)).id).toBe(theirs.deliveryId);
    for (const key of ['lab', 'arbiter'] as const) await L.expectAppError(getDeliveryRecord(getDb(), world.actors[key], theirs.deliveryId), 'forbidden');
  });
});
