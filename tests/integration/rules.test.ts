import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startMailCatcher } from '@/lib/mail/catcher';
import type { World } from './support/lifecycle';

// env() reads SMTP_URL once: the catcher must listen and the variables be set before the app is loaded.
const catcher = await startMailCatcher({ smtpPort: 0, httpPort: 0 });
process.env.SMTP_URL = `smtp://127.0.0.1:${catcher.smtpPort}`;
process.env.MAIL_CATCHER_URL = `http://127.0.0.1:${catcher.httpPort}`;

const { and, asc, count, eq } = await import('drizzle-orm');
const { getDb } = await import('@/db/client');
const { auditEvent, disputeCase, instrument, intakeResult, measurementSet, schemeRules, supplierFarm } = await import('@/db/schema');
const { listRulesVersions, publishRulesVersion, rulesInForce } = await import('@/lib/dal/rules');
const { recordIntake, correctIntake } = await import('@/lib/dal/intake');
const { recordCalibrationCheck } = await import('@/lib/dal/instruments');
const { getDeliveryRecord } = await import('@/lib/dal/intake-record');
const { findDelivery } = await import('@/lib/dal/deliveries');
const { defaultSchemeRules } = await import('@/lib/rules/defaults');
const { resetMailTransport } = await import('@/lib/mail/transport');
const { eventually } = await import('./helpers');
const L = await import('./support/lifecycle');
const { HOUR, MINUTE } = L;

let world: World;
let farmId: string;
let unfitInstrumentId: string;

function intakeBody(readings: string[], overrides: Record<string, unknown> = {}) {
  const id = L.unique();
  const now = Date.now();
  return {
    farmId,
    reference: `LW-RUL-${id}`,
    collectedAt: new Date(now - 3 * HOUR).toISOString(),
    receivedAt: new Date(now - 1 * HOUR).toISOString(),
    volumeLitres: '10000',
    tanker: 'LV-T1',
    compartment: '3',
    receiptTemperature: '4.0',
    sealNumber: `LVS-R${id}`,
    retainedLocation: 'Retained-sample refrigerator B',
    retainedTemperature: '4.1',
    instrumentId: world.plantInstrumentId,
    analystName: 'T. Fenwick',
    // Tested now, so the version in force when the test is recorded is the one that applies.
    testedAt: new Date(now).toISOString(),
    sampleTemperature: '19.8',
    preparation: 'none',
    readings: readings.map((value) => ({ value, flag: 'none' })),
    ...overrides,
  };
}

async function pastResults() {
  return getDb()
    .select({ id: intakeResult.id, rulesVersionId: intakeResult.rulesVersionId, verdict: intakeResult.verdict, value: intakeResult.valueTenthMilliC, amount: intakeResult.amountMinor, limit: intakeResult.limitTenthMilliC, decisionRule: intakeResult.decisionRule })
    .from(intakeResult)
    .orderBy(asc(intakeResult.id));
}

const stricter = { ...defaultSchemeRules, limits: { upper: -0.518, lower: -0.56 }, decisionRule: 'simple' as const };
// −0.5160 / −0.5162 °C: mean −0.5161 °C. Under version 1 (upper −0.515 °C, guarded rejection) it is
// within the limit; under the stricter version (upper −0.518 °C, simple acceptance) it is beyond it,
// with (0.520 − 0.5161)/0.520 = 0.75 % added water: a deduction (derived).
const borderline = ['-0.5160', '-0.5162'];

beforeAll(async () => {
  world = await L.setUpWorld();
  const db = getDb();
  [{ id: farmId }] = await db.select({ id: supplierFarm.id }).from(supplierFarm).where(eq(supplierFarm.organisationId, world.org.supplier)).limit(1);
  const checkedAt = new Date(Date.now() - 2 * HOUR).toISOString();
  await recordCalibrationCheck(db, world.actors.plant, { instrumentId: world.plantInstrumentId, analystName: 'T. Fenwick', checkedAt, nominal: '-0.512', readings: ['-0.5121', '-0.5118', '-0.5124', '-0.5119', '-0.5122'] });
  const [second] = await db.select({ id: instrument.id }).from(instrument).where(and(eq(instrument.organisationId, world.org.plant), eq(instrument.serialNumber, 'LW-CRY-02')));
  unfitInstrumentId = second.id;
  await recordCalibrationCheck(db, world.actors.plant, { instrumentId: unfitInstrumentId, analystName: 'T. Fenwick', checkedAt, nominal: '-0.512', readings: ['-0.5165', '-0.5071', '-0.5118', '-0.5163', '-0.5124'] });
});

afterAll(async () => {
  resetMailTransport();
  await catcher.close();
});

describe('publishing a rules version', () => {
  it('keeps every past result and case on its version, while new results use the new one', async () => {
    const before = await recordIntake(getDb(), world.actors.plant, intakeBody(borderline));
    expect(before.intakeResult.verdict).toBe('accepted');
    expect(before.rulesVersion).toBe(1);
    const [v1] = await getDb().select().from(schemeRules).where(eq(schemeRules.version, 1));
    const results = await pastResults();
    const cases = await getDb().select({ id: disputeCase.id, rulesVersionId: disputeCase.rulesVersionId }).from(disputeCase).orderBy(asc(disputeCase.id));
    expect(cases.length).toBeGreaterThan(0);

    const published = await publishRulesVersion(
      getDb(),
      world.actors.admin,
      { effectiveFrom: new Date(Date.now() - MINUTE).toISOString(), note: 'Upper limit −0.518 °C and simple acceptance, as the board agreed.', rules: stricter },
      { origin: 'web 198.51.100.40' },
    );
    expect(published).toMatchObject({ version: 2, createdBy: world.actors.admin.userId, rules: stricter });
    expect((await rulesInForce(getDb()))?.id).toBe(published.id);
    const [event] = await getDb().select().from(auditEvent).where(eq(auditEvent.objectId, published.id));
    expect(event).toMatchObject({ action: 'rules.version_created', origin: 'web 198.51.100.40', change: { version: 2 } });

    // Nothing made before is touched: same rows, same version, same verdict and money.
    expect(await pastResults()).toEqual(results);
    expect(await getDb().select({ id: disputeCase.id, rulesVersionId: disputeCase.rulesVersionId }).from(disputeCase).orderBy(asc(disputeCase.id))).toEqual(cases);
    expect(results.every((r) => r.rulesVersionId === v1.id)).toBe(true);
    expect(await findDelivery(getDb(), world.actors.supplier, before.deliveryId)).toMatchObject({ verdict: 'accepted', rulesVersion: 1 });

    const after = await recordIntake(getDb(), world.actors.plant, intakeBody(borderline));
    expect(after.rulesVersion).toBe(2);
    expect(after.intakeResult).toMatchObject({ verdict: 'deducted', rulesVersionId: published.id, limitTenthMilliC: -5180, decisionRule: 'simple', addedWaterBasisPoints: 75 });
    const record = await getDeliveryRecord(getDb(), world.actors.supplier, after.deliveryId);
    expect(record.current).toMatchObject({ rulesVersion: 2, acceptanceLimit: -0.518 });

    // A correction of the earlier result is judged under the earlier result's version, not the new one.
    const corrected = await correctIntake(getDb(), world.actors.plant, { intakeResultId: before.intakeResult.id, reason: 'The test portion temperature was entered as 19.8 instead of 20.3.', sampleTemperature: '20.3', preparation: 'none', readings: borderline.map((value) => ({ value, flag: 'none' })) });
    expect(corrected.intakeResult).toMatchObject({ verdict: 'accepted', rulesVersionId: v1.id });
  });

  it('schedules a version for later without changing what is in force now', async () => {
    const current = await rulesInForce(getDb());
    const tomorrow = new Date(Date.now() + 26 * HOUR);
    const scheduled = await publishRulesVersion(getDb(), world.actors.admin, { effectiveFrom: tomorrow.toISOString(), note: 'Contest window of 48 h from next season.', rules: { ...stricter, deadlines: { ...stricter.deadlines, contestHours: 48 } } });
    expect(scheduled.version).toBe(3);
    expect((await rulesInForce(getDb()))?.id).toBe(current?.id);
    expect((await rulesInForce(getDb(), new Date(tomorrow.getTime() + MINUTE)))?.id).toBe(scheduled.id);
    expect((await listRulesVersions(getDb())).map((v) => v.version)).toEqual([3, 2, 1]);
  });

  it('answers bad rules with field errors and publishes nothing', async () => {
    const [{ n: versions }] = await getDb().select({ n: count() }).from(schemeRules);
    const [{ n: audit }] = await getDb().select({ n: count() }).from(auditEvent);
    const error = await L.expectAppError(
      publishRulesVersion(getDb(), world.actors.admin, {
        effectiveFrom: new Date(Date.now() - 3 * HOUR).toISOString(),
        note: '',
        rules: { ...stricter, currency: 'euro', limits: { upper: 0.2 }, calibration: { ...stricter.calibration, readings: 'five' }, money: { ...stricter.money, milkPricePerLitre: -1 } },
      }),
      'invalid',
    );
    expect(error.fieldErrors).toMatchObject({
      effectiveFrom: ['A new version takes effect now or later, never in the past.'],
      note: ['Say what changes and why (at least 5 characters).'],
      'rules.currency': ['a three-letter currency code such as EUR'],
      'rules.limits.upper': ['must be at most 0.000 °C'],
      'rules.calibration.readings': ['Enter a number.'],
      'rules.money.milkPricePerLitre': ['Must be more than 0.'],
    });
    for (const key of ['plant', 'supplier', 'lab', 'arbiter'] as const) {
      await L.expectAppError(publishRulesVersion(getDb(), world.actors[key], { effectiveFrom: new Date().toISOString(), note: 'Not theirs to publish.', rules: stricter }), 'forbidden');
    }
    expect((await getDb().select({ n: count() }).from(schemeRules))[0].n).toBe(versions);
    expect((await getDb().select({ n: count() }).from(auditEvent))[0].n).toBe(audit);
  });
});

describe('a scheme that allows results on an unfit instrument', () => {
  it('refuses until the warning is confirmed, then records it with the result, the mail and the record', async () => {
    await publishRulesVersion(getDb(), world.actors.admin, {
      effectiveFrom: new Date(Date.now() - MINUTE).toISOString(),
      note: 'Results on an unfit instrument are recorded with a warning during the instrument replacement.',
      rules: { ...stricter, calibration: { ...stricter.calibration, allowUnfitWithWarning: true } },
    });
    const unconfirmed = await L.expectAppError(recordIntake(getDb(), world.actors.plant, intakeBody(['-0.5100', '-0.5104'], { instrumentId: unfitInstrumentId })), 'invalid');
    expect(unconfirmed.fieldErrors?.acknowledgeUnfit?.[0]).toMatch(/^Unfit: the check of .* failed .* confirm it\.$/);

    const body = intakeBody(['-0.5100', '-0.5104'], { instrumentId: unfitInstrumentId, acknowledgeUnfit: true });
    const recorded = await recordIntake(getDb(), world.actors.plant, body);
    expect(recorded.calibrationWarning).toMatch(/^Tested on LW-CRY-02 without a passing calibration check in force \(the check of .* failed \(2 of 5 within tolerance\); recalibrate and check again\)\.$/);
    expect(recorded.rulesVersion).toBe(4);
    const [set] = await getDb().select().from(measurementSet).where(eq(measurementSet.id, recorded.intakeResult.measurementSetId));
    expect(set.calibrationWarning).toBe(recorded.calibrationWarning);
    const record = await getDeliveryRecord(getDb(), world.actors.supplier, recorded.deliveryId);
    expect(record.current).toMatchObject({ calibrationWarning: recorded.calibrationWarning, checkPass: false });
    const mail = await eventually(() => catcher.messages.find((m) => m.subject.startsWith(`${body.reference}:`)), 'the notice with the warning');
    expect(mail.text).toContain(`Note: ${recorded.calibrationWarning}`);
  });
});
