import 'server-only';
import { createElement } from 'react';
import { and, asc, eq, inArray, isNull, sql } from 'drizzle-orm';
import type { Db, DbOrTx } from '@/db/client';
import {
  custodyEvent,
  delivery,
  disputeCase,
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
import { finalResult } from '@/lib/arbitration';
import type { Actor } from '@/lib/auth/actor';
import { assertCan } from '@/lib/auth/session';
import { recordAudit } from '@/lib/audit/record';
import { env } from '@/lib/env';
import { AppError, invalidInput, notFound } from '@/lib/errors';
import { formatDateTime } from '@/lib/format/dates';
import { intakeNotice, type IntakeNoticeFacts } from '@/lib/intake/notice';
import { correctionInputSchema, intakeInputSchema } from '@/lib/intake/schemas';
import { intakeVerdict } from '@/lib/intake/verdict';
import { sendMail } from '@/lib/mail/send';
import { CaseNoticeMail } from '@/lib/mail/templates/case-notice';
import { toTenthMilliC } from '@/lib/temperature';
import { instrumentStatusFor, listInstruments } from './instruments';
import { rulesInForce, rulesVersion } from './rules';

const fieldError = (field: string, message: string, summary = 'Some fields need attention.') => new AppError('invalid', summary, { fieldErrors: { [field]: [message] } });

/** What the intake form needs: the farms, the plant's instruments with their status, and the rules in force. */
export async function intakeFormData(db: DbOrTx, actor: Actor, now = new Date()) {
  assertCan(actor, 'intake', 'record');
  const [farms, instruments, rules] = await Promise.all([
    db
      .select({ id: supplierFarm.id, name: supplierFarm.name, herdCode: supplierFarm.herdCode, organisationName: organisation.name })
      .from(supplierFarm)
      .innerJoin(organisation, eq(organisation.id, supplierFarm.organisationId))
      .where(eq(organisation.kind, 'supplier'))
      .orderBy(asc(organisation.name), asc(supplierFarm.herdCode)),
    listInstruments(db, actor, { now, activeOnly: true, organisationId: actor.organisationId }),
    rulesInForce(db, now),
  ]);
  return { farms, instruments, rules };
}

function readingsOk(values: number[], precision: { r: number; R: number }) {
  const result = finalResult(values, precision);
  if (result.status !== 'accepted') {
    throw fieldError(
      'readings',
      `${result.needed} more reading${result.needed === 1 ? '' : 's'} needed: the first two differ by more than the repeatability limit r = ${(precision.r * 1000).toFixed(1)} m°C.`,
      'The readings are not yet conclusive.',
    );
  }
  return result;
}

/**
 * Records one delivery as the plant's intake laboratory does: the load, its routine and sealed
 * retained samples with their custody, the readings on a checked instrument, and the verdict under
 * the rules in force when the sample was tested. A rejected or deducted load is notified to the
 * supplier at once; that moment opens the contest window.
 */
export async function recordIntake(db: Db, actor: Actor, rawInput: unknown, context: { origin?: string; now?: Date } = {}) {
  assertCan(actor, 'delivery', 'record');
  assertCan(actor, 'intake', 'record');
  const parsed = intakeInputSchema.safeParse(rawInput);
  if (!parsed.success) throw invalidInput(parsed.error);
  const input = parsed.data;
  const now = context.now ?? new Date();

  const recorded = await db.transaction(async (tx) => {
    const [farm] = await tx
      .select({ id: supplierFarm.id, organisationId: supplierFarm.organisationId, kind: organisation.kind })
      .from(supplierFarm)
      .innerJoin(organisation, eq(organisation.id, supplierFarm.organisationId))
      .where(eq(supplierFarm.id, input.farmId));
    if (!farm || farm.kind !== 'supplier') throw fieldError('farmId', 'That farm is not registered with the scheme.');

    const [device] = await tx.select().from(instrument).where(and(eq(instrument.id, input.instrumentId), eq(instrument.organisationId, actor.organisationId)));
    if (!device) throw fieldError('instrumentId', 'Choose one of your laboratory’s instruments.');

    const rules = await rulesInForce(tx, input.testedAt);
    if (!rules) throw new AppError('unavailable', `No scheme rules were in force on ${formatDateTime(input.testedAt)}; ask the scheme’s administrator.`);

    const status = await instrumentStatusFor(tx, device.id, input.testedAt, device.active);
    let calibrationWarning: string | null = null;
    if (status.state === 'unfit') {
      if (status.reason === 'retired') throw fieldError('instrumentId', 'This instrument is out of service.');
      if (!rules.rules.calibration.allowUnfitWithWarning) {
        throw new AppError('conflict', `Refused: instrument ${device.serialNumber} had no passing calibration check in force when the sample was tested. Run a check first, then test the sample again.`, {
          fieldErrors: { instrumentId: [`${status.label}. The scheme does not allow intake tests on such an instrument.`] },
        });
      }
      if (!input.acknowledgeUnfit) {
        throw fieldError('acknowledgeUnfit', `${status.label}. The scheme allows the result only with a warning that goes with it to the supplier and the board: confirm it.`);
      }
      calibrationWarning = `Tested on ${device.serialNumber} without a passing calibration check in force (${status.label.replace(/^Unfit: /, '')}).`;
    }

    const values = input.readings.map((r) => r.value);
    const result = readingsOk(values, rules.rules.precision);

    const routineCode = input.routineCode ?? `R-${input.reference}`;
    const retainedCode = input.retainedCode ?? `K-${input.reference}`;
    if (routineCode === retainedCode) throw fieldError('retainedCode', 'The retained sample needs a code of its own.');
    const [taken] = await tx.select({ id: delivery.id }).from(delivery).where(eq(delivery.reference, input.reference));
    if (taken) throw fieldError('reference', 'A delivery with this reference is already recorded.');
    const codes = await tx.select({ code: sample.code }).from(sample).where(inArray(sample.code, [routineCode, retainedCode]));
    for (const { code } of codes) {
      throw fieldError(code === routineCode ? 'routineCode' : 'retainedCode', `A sample with the code ${code} is already recorded.`);
    }

    const verdict = intakeVerdict({ value: result.value, readingsUsed: result.used, volumeLitres: input.volumeLitres, rules: rules.rules });
    const notifiedAt = verdict.verdict === 'accepted' ? null : now;

    const [load] = await tx
      .insert(delivery)
      .values({
        reference: input.reference,
        plantOrganisationId: actor.organisationId,
        supplierOrganisationId: farm.organisationId,
        farmId: farm.id,
        collectedAt: input.collectedAt,
        receivedAt: input.receivedAt,
        volumeLitres: input.volumeLitres,
        tanker: input.tanker,
        compartment: input.compartment,
        receiptTempTenthMilliC: toTenthMilliC(input.receiptTemperature),
      })
      .returning({ id: delivery.id });
    const [routine] = await tx
      .insert(sample)
      .values({ deliveryId: load.id, code: routineCode, kind: 'routine', sampledAt: input.collectedAt, storage: 'Intake bench' })
      .returning({ id: sample.id });
    const [retained] = await tx
      .insert(sample)
      .values({ deliveryId: load.id, code: retainedCode, kind: 'retained', sealNumber: input.sealNumber, preservative: 'None', storage: input.retainedLocation, sampledAt: input.collectedAt })
      .returning({ id: sample.id });
    // Sealed at the farm tank when the load was collected, stored cold on arrival: the chain a retest rests on.
    await tx.insert(custodyEvent).values([
      { sampleId: retained.id, kind: 'sealed', at: input.collectedAt, actorUserId: actor.userId, organisationId: actor.organisationId, location: `Tanker ${input.tanker}, compartment ${input.compartment}`, sealIntact: true, note: `Seal ${input.sealNumber}` },
      {
        sampleId: retained.id,
        kind: 'stored',
        at: input.receivedAt,
        actorUserId: actor.userId,
        organisationId: actor.organisationId,
        location: input.retainedLocation,
        tempTenthMilliC: toTenthMilliC(input.retainedTemperature),
        sealIntact: true,
        frozen: false,
      },
    ]);
    const [set] = await tx
      .insert(measurementSet)
      .values({
        sampleId: routine.id,
        organisationId: actor.organisationId,
        instrumentId: device.id,
        calibrationCheckId: status.check?.id ?? null,
        calibrationWarning,
        purpose: 'intake',
        analystName: input.analystName,
        testedAt: input.testedAt,
        sampleTempTenthMilliC: toTenthMilliC(input.sampleTemperature),
        preparation: input.preparation,
        resultTenthMilliC: toTenthMilliC(result.value),
        resultBasis: result.basis,
        readingsUsed: result.used,
        createdBy: actor.userId,
        submittedAt: now,
      })
      .returning({ id: measurementSet.id });
    await tx.insert(reading).values(input.readings.map((r, i) => ({ measurementSetId: set.id, position: i + 1, valueTenthMilliC: toTenthMilliC(r.value), flag: r.flag })));
    const [row] = await tx
      .insert(intakeResult)
      .values({
        deliveryId: load.id,
        measurementSetId: set.id,
        rulesVersionId: rules.id,
        valueTenthMilliC: toTenthMilliC(result.value),
        limitTenthMilliC: toTenthMilliC(verdict.limit),
        decisionRule: rules.rules.decisionRule,
        verdict: verdict.verdict,
        addedWaterBasisPoints: Math.round(verdict.addedWaterPercent * 100),
        amountMinor: verdict.amountMinor,
        currency: rules.rules.currency,
        decidedBy: actor.userId,
        decidedAt: now,
        notifiedAt,
      })
      .returning();
    await recordAudit(tx, { actorUserId: actor.userId, actorOrganisationId: actor.organisationId, origin: context.origin, at: now }, {
      action: 'intake.recorded',
      objectType: 'intake_result',
      objectId: row.id,
      change: {
        deliveryId: load.id,
        reference: input.reference,
        verdict: row.verdict,
        valueTenthMilliC: row.valueTenthMilliC,
        amountMinor: row.amountMinor,
        rulesVersion: rules.version,
        calibrationCheckId: status.check?.id ?? null,
        calibrationWarning,
        notifiedAt: notifiedAt?.toISOString() ?? null,
      },
    });
    return { intakeResult: row, deliveryId: load.id, verdict, calibrationWarning, rulesVersion: rules.version };
  });

  const mail = recorded.intakeResult.notifiedAt ? await sendIntakeNotice(db, recorded.intakeResult.id, verdictDetail(recorded.verdict)) : null;
  return { ...recorded, mail };
}

function verdictDetail(verdict: ReturnType<typeof intakeVerdict>) {
  return { acceptanceLimit: verdict.acceptanceLimit, limitApplied: verdict.limitApplied, arithmetic: verdict.arithmetic };
}

/**
 * Corrects an intake result before anyone disputes it. Nothing is edited: the original result and
 * its readings stay as they were, marked superseded, and a new result holds the corrected readings,
 * who corrected it, when and why (ISO/IEC 17025 7.5.2). It is judged under the rules version of the
 * original, and the supplier is told again.
 */
export async function correctIntake(db: Db, actor: Actor, rawInput: unknown, context: { origin?: string; now?: Date } = {}) {
  assertCan(actor, 'intake', 'correct');
  const parsed = correctionInputSchema.safeParse(rawInput);
  if (!parsed.success) throw invalidInput(parsed.error);
  const input = parsed.data;
  const now = context.now ?? new Date();

  const corrected = await db.transaction(async (tx) => {
    const [original] = await tx
      .select({ result: intakeResult, volumeLitres: delivery.volumeLitres, reference: delivery.reference })
      .from(intakeResult)
      .innerJoin(delivery, eq(delivery.id, intakeResult.deliveryId))
      .where(and(eq(intakeResult.id, input.intakeResultId), eq(delivery.plantOrganisationId, actor.organisationId)))
      .for('update', { of: intakeResult });
    if (!original) throw notFound('That intake result');
    if (original.result.supersededAt) throw new AppError('conflict', 'This result has already been corrected; correct the current result instead.');
    const [dispute] = await tx.select({ number: disputeCase.number }).from(disputeCase).where(eq(disputeCase.deliveryId, original.result.deliveryId)).limit(1);
    if (dispute) throw new AppError('conflict', `This result is disputed in ${dispute.number}; it can no longer be corrected here. Tell the board in the case file.`);

    const rules = await rulesVersion(tx, original.result.rulesVersionId);
    if (!rules) throw new AppError('unavailable', 'The rules this result was made under are missing.');
    const [set] = await tx.select().from(measurementSet).where(eq(measurementSet.id, original.result.measurementSetId));
    const values = input.readings.map((r) => r.value);
    const result = readingsOk(values, rules.rules.precision);
    const verdict = intakeVerdict({ value: result.value, readingsUsed: result.used, volumeLitres: original.volumeLitres, rules: rules.rules });
    const notifiedAt = verdict.verdict !== 'accepted' || original.result.notifiedAt ? now : null;

    const [newSet] = await tx
      .insert(measurementSet)
      .values({
        sampleId: set.sampleId,
        organisationId: set.organisationId,
        instrumentId: set.instrumentId,
        calibrationCheckId: set.calibrationCheckId,
        calibrationWarning: set.calibrationWarning,
        purpose: 'intake',
        analystName: set.analystName,
        testedAt: set.testedAt,
        sampleTempTenthMilliC: toTenthMilliC(input.sampleTemperature),
        preparation: input.preparation,
        resultTenthMilliC: toTenthMilliC(result.value),
        resultBasis: result.basis,
        readingsUsed: result.used,
        createdBy: actor.userId,
        submittedAt: now,
      })
      .returning({ id: measurementSet.id });
    await tx.insert(reading).values(input.readings.map((r, i) => ({ measurementSetId: newSet.id, position: i + 1, valueTenthMilliC: toTenthMilliC(r.value), flag: r.flag })));

    // Conditional on still being current, so two corrections at once cannot both supersede it.
    const superseded = await tx
      .update(intakeResult)
      .set({ supersededAt: now })
      .where(and(eq(intakeResult.id, original.result.id), isNull(intakeResult.supersededAt)))
      .returning({ id: intakeResult.id });
    if (superseded.length !== 1) throw new AppError('conflict', 'This result was corrected by someone else a moment ago; reload and check.');

    const [row] = await tx
      .insert(intakeResult)
      .values({
        deliveryId: original.result.deliveryId,
        measurementSetId: newSet.id,
        rulesVersionId: rules.id,
        valueTenthMilliC: toTenthMilliC(result.value),
        limitTenthMilliC: toTenthMilliC(verdict.limit),
        decisionRule: rules.rules.decisionRule,
        verdict: verdict.verdict,
        addedWaterBasisPoints: Math.round(verdict.addedWaterPercent * 100),
        amountMinor: verdict.amountMinor,
        currency: rules.rules.currency,
        decidedBy: actor.userId,
        decidedAt: now,
        notifiedAt,
        supersedesId: original.result.id,
        correctionReason: input.reason,
      })
      .returning();
    await recordAudit(tx, { actorUserId: actor.userId, actorOrganisationId: actor.organisationId, origin: context.origin, at: now }, {
      action: 'intake.corrected',
      objectType: 'intake_result',
      objectId: row.id,
      change: {
        deliveryId: row.deliveryId,
        supersedes: original.result.id,
        reason: input.reason,
        from: { verdict: original.result.verdict, valueTenthMilliC: original.result.valueTenthMilliC, amountMinor: original.result.amountMinor },
        to: { verdict: row.verdict, valueTenthMilliC: row.valueTenthMilliC, amountMinor: row.amountMinor },
        rulesVersion: rules.version,
        notifiedAt: notifiedAt?.toISOString() ?? null,
      },
    });
    return { intakeResult: row, original: original.result, verdict, deliveryId: row.deliveryId };
  });

  const mail = corrected.intakeResult.notifiedAt ? await sendIntakeNotice(db, corrected.intakeResult.id, verdictDetail(corrected.verdict)) : null;
  return { ...corrected, mail };
}

/** The supplier organisation's people who are told of intake results. */
async function supplierRecipients(db: DbOrTx, supplierOrganisationId: string): Promise<string[]> {
  const rows = await db.select({ email: user.email }).from(user).where(and(eq(user.organisationId, supplierOrganisationId), eq(user.role, 'supplier'), sql`coalesce(${user.banned}, false) = false`));
  return rows.map((r) => r.email);
}

/**
 * E-mails the notice of one intake result to the supplier. Sent after the result has committed; a
 * failed hand-over is kept on the outgoing mail and retried by the scheduled job, and the result
 * stays on the supplier's desk with its deadline either way.
 */
async function sendIntakeNotice(db: Db, intakeResultId: string, detail: { acceptanceLimit: number; limitApplied: 'upper' | 'lower' | null; arithmetic: string }) {
  const [row] = await db
    .select({
      result: intakeResult,
      reference: delivery.reference,
      receivedAt: delivery.receivedAt,
      volumeLitres: delivery.volumeLitres,
      supplierOrganisationId: delivery.supplierOrganisationId,
      farmName: supplierFarm.name,
      herdCode: supplierFarm.herdCode,
      resultBasis: measurementSet.resultBasis,
      calibrationWarning: measurementSet.calibrationWarning,
      instrumentSerial: instrument.serialNumber,
      rules: schemeRules.rules,
      rulesVersion: schemeRules.version,
    })
    .from(intakeResult)
    .innerJoin(delivery, eq(delivery.id, intakeResult.deliveryId))
    .innerJoin(supplierFarm, eq(supplierFarm.id, delivery.farmId))
    .innerJoin(measurementSet, eq(measurementSet.id, intakeResult.measurementSetId))
    .innerJoin(instrument, eq(instrument.id, measurementSet.instrumentId))
    .innerJoin(schemeRules, eq(schemeRules.id, intakeResult.rulesVersionId))
    .where(eq(intakeResult.id, intakeResultId));
  if (!row?.result.notifiedAt) return null;
  const readings = await db.select({ value: reading.valueTenthMilliC }).from(reading).where(eq(reading.measurementSetId, row.result.measurementSetId)).orderBy(asc(reading.position));
  const previous = row.result.supersedesId ? (await db.select().from(intakeResult).where(eq(intakeResult.id, row.result.supersedesId)))[0] : undefined;

  const facts: IntakeNoticeFacts = {
    reference: row.reference,
    farmName: row.farmName,
    herdCode: row.herdCode,
    receivedAt: row.receivedAt,
    volumeLitres: row.volumeLitres,
    verdict: row.result.verdict,
    valueTenthMilliC: row.result.valueTenthMilliC,
    readingsTenthMilliC: readings.map((r) => r.value),
    resultBasis: row.resultBasis ?? 'mean_of_2',
    limitTenthMilliC: row.result.limitTenthMilliC,
    acceptanceLimitTenthMilliC: toTenthMilliC(detail.acceptanceLimit),
    limitApplied: detail.limitApplied,
    decisionRule: row.rules.decisionRule,
    rulesName: row.rules.name,
    rulesVersion: row.rulesVersion,
    addedWaterBasisPoints: row.result.addedWaterBasisPoints,
    referenceTenthMilliC: toTenthMilliC(row.rules.referenceFreezingPoint),
    amountMinor: row.result.amountMinor,
    currency: row.result.currency,
    arithmetic: detail.arithmetic,
    instrumentSerial: row.instrumentSerial,
    calibrationWarning: row.calibrationWarning,
    notifiedAt: row.result.notifiedAt,
    contestHours: row.rules.deadlines.contestHours,
    correction: previous && row.result.correctionReason ? { reason: row.result.correctionReason, previousVerdict: previous.verdict, previousValueTenthMilliC: previous.valueTenthMilliC } : undefined,
  };
  const to = await supplierRecipients(db, row.supplierOrganisationId);
  if (to.length === 0) return null;
  const notice = intakeNotice(facts);
  const url = `${env().BETTER_AUTH_URL}/deliveries/${row.result.deliveryId}`;
  return sendMail({
    to,
    subject: notice.subject,
    template: previous ? 'intake-corrected' : 'intake-notice',
    body: createElement(CaseNoticeMail, { greeting: 'Hello,', headline: notice.headline, lines: notice.lines, url, actionLabel: `Open delivery ${row.reference}` }),
  });
}
