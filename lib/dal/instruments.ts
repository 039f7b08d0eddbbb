import 'server-only';
import { and, asc, desc, eq, inArray, lte, sql, type SQL } from 'drizzle-orm';
import { z } from 'zod';
import type { Db, DbOrTx } from '@/db/client';
import { calibrationCheck, instrument, organisation, schemeRules, user } from '@/db/schema';
import { calibrationCheck as checkCalibration, sodiumChlorideFor } from '@/lib/arbitration';
import type { Actor } from '@/lib/auth/actor';
import { can } from '@/lib/auth/permissions';
import { assertCan } from '@/lib/auth/session';
import { recordAudit } from '@/lib/audit/record';
import { AppError, invalidInput, notFound } from '@/lib/errors';
import { formatDateTime } from '@/lib/format/dates';
import { instrumentStatusAt, type CheckSummary, type InstrumentStatus } from '@/lib/intake/instrument-status';
import { addInstrumentSchema, calibrationCheckInputSchema } from '@/lib/intake/schemas';
import { fromTenthMilliC, toTenthMilliC } from '@/lib/temperature';
import { rulesInForce } from './rules';

const HOUR = 3_600_000;
/** How many of an instrument's latest checks its page lists. */
export const CHECK_HISTORY = 20;

/** Which instruments an actor may see: a plant or laboratory its own, the administrator every one. */
function instrumentVisibility(actor: Actor): SQL {
  if (actor.role === 'admin') return sql`true`;
  if (actor.role === 'plant' || actor.role === 'lab') return eq(instrument.organisationId, actor.organisationId);
  return sql`false`;
}

/** The latest check of each instrument at or before `at`. */
async function latestChecks(db: DbOrTx, instrumentIds: string[], at: Date): Promise<Map<string, CheckSummary>> {
  if (instrumentIds.length === 0) return new Map();
  const rows = await db
    .selectDistinctOn([calibrationCheck.instrumentId], {
      instrumentId: calibrationCheck.instrumentId,
      id: calibrationCheck.id,
      checkedAt: calibrationCheck.checkedAt,
      pass: calibrationCheck.pass,
      within: calibrationCheck.within,
      total: sql<number>`cardinality(${calibrationCheck.readingsTenthMilliC})`,
      validUntil: calibrationCheck.validUntil,
    })
    .from(calibrationCheck)
    .where(and(inArray(calibrationCheck.instrumentId, instrumentIds), lte(calibrationCheck.checkedAt, at)))
    .orderBy(calibrationCheck.instrumentId, desc(calibrationCheck.checkedAt), desc(calibrationCheck.createdAt));
  return new Map(rows.map((r) => [r.instrumentId, { id: r.id, checkedAt: r.checkedAt, pass: r.pass, within: r.within, total: Number(r.total), validUntil: r.validUntil }]));
}

export type InstrumentListItem = {
  id: string;
  serialNumber: string;
  description: string;
  method: string;
  active: boolean;
  organisationId: string;
  organisationName: string;
  status: InstrumentStatus;
};

/** Instruments the actor may see, each with its status at `now`. */
export async function listInstruments(db: DbOrTx, actor: Actor, options: { now?: Date; activeOnly?: boolean; organisationId?: string } = {}): Promise<InstrumentListItem[]> {
  assertCan(actor, 'instrument', 'read');
  const now = options.now ?? new Date();
  const filters: SQL[] = [instrumentVisibility(actor)];
  if (options.activeOnly) filters.push(eq(instrument.active, true));
  if (options.organisationId) filters.push(eq(instrument.organisationId, options.organisationId));
  const rows = await db
    .select({
      id: instrument.id,
      serialNumber: instrument.serialNumber,
      description: instrument.description,
      method: instrument.method,
      active: instrument.active,
      organisationId: instrument.organisationId,
      organisationName: organisation.name,
    })
    .from(instrument)
    .innerJoin(organisation, eq(organisation.id, instrument.organisationId))
    .where(and(...filters))
    .orderBy(asc(organisation.name), asc(instrument.serialNumber));
  const latest = await latestChecks(db, rows.map((r) => r.id), now);
  return rows.map((r) => ({ ...r, status: instrumentStatusAt(latest.get(r.id) ?? null, now, { active: r.active }) }));
}

/** One instrument with its check history, or not found when the actor may not see it. */
export async function getInstrument(db: DbOrTx, actor: Actor, instrumentId: string, now = new Date()) {
  assertCan(actor, 'instrument', 'read');
  if (!z.uuid().safeParse(instrumentId).success) throw notFound('That instrument');
  const [row] = await db
    .select({
      id: instrument.id,
      serialNumber: instrument.serialNumber,
      description: instrument.description,
      method: instrument.method,
      active: instrument.active,
      organisationId: instrument.organisationId,
      organisationName: organisation.name,
    })
    .from(instrument)
    .innerJoin(organisation, eq(organisation.id, instrument.organisationId))
    .where(and(eq(instrument.id, instrumentId), instrumentVisibility(actor)));
  if (!row) throw notFound('That instrument');
  const checks = await db
    .select({
      id: calibrationCheck.id,
      checkedAt: calibrationCheck.checkedAt,
      analystName: calibrationCheck.analystName,
      checkedByName: user.name,
      nominalTenthMilliC: calibrationCheck.nominalTenthMilliC,
      readingsTenthMilliC: calibrationCheck.readingsTenthMilliC,
      toleranceTenthMilliC: calibrationCheck.toleranceTenthMilliC,
      required: calibrationCheck.required,
      within: calibrationCheck.within,
      pass: calibrationCheck.pass,
      validUntil: calibrationCheck.validUntil,
      rulesVersion: schemeRules.version,
    })
    .from(calibrationCheck)
    .leftJoin(user, eq(user.id, calibrationCheck.checkedBy))
    .leftJoin(schemeRules, eq(schemeRules.id, calibrationCheck.rulesVersionId))
    .where(eq(calibrationCheck.instrumentId, row.id))
    .orderBy(desc(calibrationCheck.checkedAt), desc(calibrationCheck.createdAt))
    .limit(CHECK_HISTORY);
  const latest = await latestChecks(db, [row.id], now);
  return {
    ...row,
    status: instrumentStatusAt(latest.get(row.id) ?? null, now, { active: row.active }),
    // Only the owner's analysts run checks on an instrument; the administrator looks after the register.
    mayCheck: can(actor.role, 'instrument', 'check') && row.organisationId === actor.organisationId && row.active,
    checks,
  };
}

export type InstrumentDetail = Awaited<ReturnType<typeof getInstrument>>;

/** The status of one instrument at a moment, for the intake that wants to use it. */
export async function instrumentStatusFor(db: DbOrTx, instrumentId: string, at: Date, active: boolean): Promise<InstrumentStatus> {
  const latest = await latestChecks(db, [instrumentId], at);
  return instrumentStatusAt(latest.get(instrumentId) ?? null, at, { active });
}

/** Organisations an administrator may register an instrument for: plants and laboratories. */
export async function instrumentOwners(db: DbOrTx, actor: Actor) {
  assertCan(actor, 'instrument', 'manage');
  if (actor.role !== 'admin') return [{ id: actor.organisationId, name: actor.organisationName }];
  return db
    .select({ id: organisation.id, name: organisation.name })
    .from(organisation)
    .where(inArray(organisation.kind, ['plant', 'lab']))
    .orderBy(asc(organisation.name));
}

export async function addInstrument(db: Db, actor: Actor, rawInput: unknown, context: { origin?: string } = {}) {
  assertCan(actor, 'instrument', 'manage');
  const parsed = addInstrumentSchema.safeParse(rawInput);
  if (!parsed.success) throw invalidInput(parsed.error);
  const input = parsed.data;
  let organisationId = actor.organisationId;
  if (actor.role === 'admin') {
    if (!input.organisationId) throw new AppError('invalid', 'Some fields need attention.', { fieldErrors: { organisationId: ['Choose the organisation that owns it.'] } });
    const [owner] = await db.select({ id: organisation.id, kind: organisation.kind }).from(organisation).where(eq(organisation.id, input.organisationId));
    if (!owner || (owner.kind !== 'plant' && owner.kind !== 'lab')) {
      throw new AppError('invalid', 'Some fields need attention.', { fieldErrors: { organisationId: ['Only a plant or a laboratory owns instruments.'] } });
    }
    organisationId = owner.id;
  } else if (input.organisationId && input.organisationId !== actor.organisationId) {
    // A plant or laboratory registers its own instruments only; someone else's organisation is not there for it.
    throw new AppError('invalid', 'Some fields need attention.', { fieldErrors: { organisationId: ['You can register instruments of your own organisation only.'] } });
  }
  return db.transaction(async (tx) => {
    const [existing] = await tx.select({ id: instrument.id }).from(instrument).where(and(eq(instrument.organisationId, organisationId), eq(instrument.serialNumber, input.serialNumber)));
    if (existing) throw new AppError('conflict', 'That instrument is already registered.', { fieldErrors: { serialNumber: ['An instrument with this serial number is already registered for the organisation.'] } });
    const [row] = await tx.insert(instrument).values({ organisationId, serialNumber: input.serialNumber, description: input.description }).returning();
    await recordAudit(tx, { actorUserId: actor.userId, actorOrganisationId: actor.organisationId, origin: context.origin }, {
      action: 'instrument.created',
      objectType: 'instrument',
      objectId: row.id,
      change: { serialNumber: row.serialNumber, organisationId },
    });
    return row;
  });
}

/**
 * A routine check of an instrument on a sodium chloride standard. The verdict is the decision
 * module's k-of-n rule with the tolerance and count of the scheme's rules in force at the check,
 * never the client's; the check stays valid for the hours the scheme says.
 */
export async function recordCalibrationCheck(db: Db, actor: Actor, rawInput: unknown, context: { origin?: string; now?: Date } = {}) {
  assertCan(actor, 'instrument', 'check');
  const parsed = calibrationCheckInputSchema.safeParse(rawInput);
  if (!parsed.success) throw invalidInput(parsed.error);
  const input = parsed.data;
  return db.transaction(async (tx) => {
    const [device] = await tx
      .select()
      .from(instrument)
      .where(and(eq(instrument.id, input.instrumentId), eq(instrument.organisationId, actor.organisationId)));
    if (!device) throw notFound('That instrument');
    if (!device.active) throw new AppError('conflict', 'This instrument is out of service; it cannot be checked for work.');
    const rules = await rulesInForce(tx, input.checkedAt);
    if (!rules) throw new AppError('unavailable', `No scheme rules were in force on ${formatDateTime(input.checkedAt)}; ask the scheme’s administrator.`);
    const rule = rules.rules.calibration;
    if (input.readings.length !== rule.readings) {
      throw new AppError('invalid', 'Some fields need attention.', {
        fieldErrors: { readings: [`The scheme’s check takes ${rule.readings} readings on the standard; ${input.readings.length} were entered.`] },
      });
    }
    const verdict = checkCalibration({ nominal: input.nominal, readings: input.readings, tolerance: rule.tolerance, required: rule.required });
    const [row] = await tx
      .insert(calibrationCheck)
      .values({
        instrumentId: device.id,
        checkedAt: input.checkedAt,
        checkedBy: actor.userId,
        analystName: input.analystName,
        nominalTenthMilliC: toTenthMilliC(input.nominal),
        readingsTenthMilliC: input.readings.map(toTenthMilliC),
        toleranceTenthMilliC: toTenthMilliC(rule.tolerance),
        required: rule.required,
        within: verdict.within,
        pass: verdict.pass,
        validUntil: new Date(input.checkedAt.getTime() + rule.validHours * HOUR),
        rulesVersionId: rules.id,
      })
      .returning();
    await recordAudit(tx, { actorUserId: actor.userId, actorOrganisationId: actor.organisationId, origin: context.origin, at: context.now }, {
      action: 'calibration.checked',
      objectType: 'calibration_check',
      objectId: row.id,
      change: { instrumentId: device.id, nominalTenthMilliC: row.nominalTenthMilliC, within: verdict.within, total: verdict.total, pass: verdict.pass, rulesVersion: rules.version },
    });
    return { ...row, total: verdict.total, rulesVersion: rules.version, sodiumChlorideGramsPerKg: sodiumChlorideFor(fromTenthMilliC(row.nominalTenthMilliC)) };
  });
}
