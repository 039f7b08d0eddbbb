import { beforeAll, describe, expect, it } from 'vitest';
import { and, count, eq } from 'drizzle-orm';
import { getDb } from '@/db/client';
import { auditEvent, calibrationCheck, instrument, organisation } from '@/db/schema';
import { addInstrument, getInstrument, listInstruments, recordCalibrationCheck } from '@/lib/dal/instruments';
import { verifyAuditChain } from '@/lib/audit/verify';
import * as L from './support/lifecycle';

const { HOUR, MINUTE } = L;
let world: L.World;

// A −0.512 °C standard (ISO 5764, Table 1: 8.697 g NaCl per kg of water) checked with five readings;
// fit for work when at least 3 of 5 lie within ±0.004 °C (common practice, no published source).
const fiveWithin = ['-0.5121', '-0.5117', '-0.5124', '-0.5119', '-0.5126'];
const twoWithin = ['-0.5165', '-0.5071', '-0.5118', '-0.5163', '-0.5124'];

const check = (instrumentId: string, readings: unknown, overrides: Record<string, unknown> = {}) => ({
  instrumentId,
  analystName: 'T. Fenwick',
  checkedAt: new Date(Date.now() - 30 * MINUTE).toISOString(),
  nominal: '-0.512',
  readings,
  ...overrides,
});

async function checkCount() {
  const [[c], [a]] = await Promise.all([getDb().select({ n: count() }).from(calibrationCheck), getDb().select({ n: count() }).from(auditEvent)]);
  return { checks: c.n, audit: a.n };
}

beforeAll(async () => {
  world = await L.setUpWorld();
});

describe('calibration checks', () => {
  it('records the server’s verdict on a passing check, valid for the scheme’s hours, and makes the instrument fit until then', async () => {
    const body = check(world.plantInstrumentId, fiveWithin);
    const row = await recordCalibrationCheck(getDb(), world.actors.plant, body, { origin: 'web 198.51.100.30' });
    expect(row).toMatchObject({ pass: true, within: 5, total: 5, required: 3, toleranceTenthMilliC: 40, nominalTenthMilliC: -5120, rulesVersion: 1, checkedBy: world.actors.plant.userId });
    expect(row.sodiumChlorideGramsPerKg).toBe(8.697); // ISO 5764, Table 1
    expect(row.validUntil.getTime()).toBe(new Date(body.checkedAt).getTime() + 24 * HOUR);

    const detail = await getInstrument(getDb(), world.actors.plant, world.plantInstrumentId);
    expect(detail.status).toMatchObject({ state: 'fit', until: row.validUntil });
    expect(detail.checks[0].id).toBe(row.id);
    expect(detail.mayCheck).toBe(true);
    const [event] = await getDb().select().from(auditEvent).where(eq(auditEvent.objectId, row.id));
    expect(event).toMatchObject({ action: 'calibration.checked', origin: 'web 198.51.100.30', change: { pass: true, within: 5, total: 5, rulesVersion: 1 } });
    expect(await verifyAuditChain(getDb())).toMatchObject({ ok: true });
  });

  it('records a failed check as failed whatever the client claims, and the instrument is unfit at once', async () => {
    const [second] = await getDb().select({ id: instrument.id }).from(instrument).where(and(eq(instrument.organisationId, world.org.plant), eq(instrument.serialNumber, 'LW-CRY-02')));
    const row = await recordCalibrationCheck(getDb(), world.actors.plant, { ...check(second.id, twoWithin), pass: true, within: 5 });
    expect(row).toMatchObject({ pass: false, within: 2, total: 5 });
    const [status] = (await listInstruments(getDb(), world.actors.plant)).filter((i) => i.id === second.id);
    expect(status.status).toMatchObject({ state: 'unfit', reason: 'failed' });
    // A later passing check makes it fit again.
    await recordCalibrationCheck(getDb(), world.actors.plant, check(second.id, fiveWithin, { checkedAt: new Date(Date.now() - 5 * MINUTE).toISOString() }));
    expect((await getInstrument(getDb(), world.actors.plant, second.id)).status.state).toBe('fit');
  });

  it('answers bad input with field errors and records nothing', async () => {
    const before = await checkCount();
    const short = await L.expectAppError(recordCalibrationCheck(getDb(), world.actors.plant, check(world.plantInstrumentId, fiveWithin.slice(0, 3))), 'invalid');
    expect(short.fieldErrors).toEqual({ readings: ['The scheme’s check takes 5 readings on the standard; 3 were entered.'] });
    const bad = await L.expectAppError(recordCalibrationCheck(getDb(), world.actors.plant, check(world.plantInstrumentId, ['-0.5121', 'abc', '', '-1.2', '-0.5119'], { nominal: '-0.700', analystName: '' })), 'invalid');
    expect(bad.fieldErrors).toMatchObject({
      nominal: ['Use a standard between −0.600 and −0.400 °C (ISO 5764, Table 1).'],
      'readings.1': ['Enter the reading in °C, such as −0.5120.'],
      'readings.2': ['Enter the reading in °C, such as −0.5120.'],
      'readings.3': ['A freezing point lies between −1.000 and 0.000 °C.'],
      analystName: ['The analyst’s name needs at least 2 characters.'],
    });
    expect(await checkCount()).toEqual(before);
  });

  it('lets a laboratory check its own instruments only; another’s instrument is not there for it', async () => {
    const own = await recordCalibrationCheck(getDb(), world.actors.lab, check(world.labInstrumentId, fiveWithin));
    expect(own.pass).toBe(true);
    const before = await checkCount();
    await L.expectAppError(recordCalibrationCheck(getDb(), world.actors.lab, check(world.plantInstrumentId, fiveWithin)), 'not_found');
    await L.expectAppError(recordCalibrationCheck(getDb(), world.actors.otherLab, check(world.labInstrumentId, fiveWithin)), 'not_found');
    await L.expectAppError(getInstrument(getDb(), world.actors.plant, world.labInstrumentId), 'not_found');
    await L.expectAppError(getInstrument(getDb(), world.actors.lab, world.plantInstrumentId), 'not_found');
    expect((await listInstruments(getDb(), world.actors.lab)).map((i) => i.id)).toEqual([world.labInstrumentId]);
    expect((await listInstruments(getDb(), world.actors.plant)).every((i) => i.organisationId === world.org.plant)).toBe(true);
    // The administrator keeps the register but runs no check.
    await L.expectAppError(recordCalibrationCheck(getDb(), world.actors.admin, check(world.plantInstrumentId, fiveWithin)), 'forbidden');
    for (const key of ['supplier', 'arbiter'] as const) await L.expectAppError(listInstruments(getDb(), world.actors[key]), 'forbidden');
    expect(await checkCount()).toEqual(before);
  });
});

describe('the instrument register', () => {
  it('lets the administrator see every instrument and register one for a plant or laboratory, never for a supplier', async () => {
    const all = await listInstruments(getDb(), world.actors.admin);
    expect(new Set(all.map((i) => i.organisationId))).toEqual(new Set([world.org.plant, world.org.lab, world.org.otherLab]));
    const added = await addInstrument(getDb(), world.actors.admin, { organisationId: world.org.lab, serialNumber: 'ESK-CRY-09', description: 'Reference cryoscope, bench 3' });
    expect(added).toMatchObject({ organisationId: world.org.lab, active: true });
    expect((await getInstrument(getDb(), world.actors.lab, added.id)).status).toMatchObject({ state: 'unfit', reason: 'never_checked' });
    const admin = await getInstrument(getDb(), world.actors.admin, added.id);
    expect(admin.mayCheck).toBe(false);

    const error = await L.expectAppError(addInstrument(getDb(), world.actors.admin, { organisationId: world.org.supplier, serialNumber: 'UL-CRY-01', description: 'A farm’s own cryoscope' }), 'invalid');
    expect(error.fieldErrors).toEqual({ organisationId: ['Only a plant or a laboratory owns instruments.'] });
    const missing = await L.expectAppError(addInstrument(getDb(), world.actors.admin, { serialNumber: 'ESK-CRY-10', description: 'No owner given' }), 'invalid');
    expect(missing.fieldErrors).toEqual({ organisationId: ['Choose the organisation that owns it.'] });
  });

  it('lets a plant register its own instrument, refuses a duplicate serial number and another organisation', async () => {
    const added = await addInstrument(getDb(), world.actors.plant, { serialNumber: 'LW-CRY-03', description: 'Intake cryoscope, bay 3' });
    expect(added.organisationId).toBe(world.org.plant);
    const dup = await L.expectAppError(addInstrument(getDb(), world.actors.plant, { serialNumber: 'LW-CRY-03', description: 'Intake cryoscope, bay 3 again' }), 'conflict');
    expect(dup.fieldErrors?.serialNumber?.[0]).toContain('already registered');
    const [lab] = await getDb().select({ id: organisation.id }).from(organisation).where(eq(organisation.id, world.org.lab));
    await L.expectAppError(addInstrument(getDb(), world.actors.plant, { organisationId: lab.id, serialNumber: 'LW-CRY-04', description: 'For someone else' }), 'invalid');
    await L.expectAppError(addInstrument(getDb(), world.actors.supplier, { serialNumber: 'UL-CRY-02', description: 'A supplier’s own' }), 'forbidden');
  });
});
