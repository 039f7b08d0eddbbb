import 'server-only';
import { alias } from 'drizzle-orm/pg-core';
import { and, asc, desc, eq, inArray, sql, type SQL } from 'drizzle-orm';
import { z } from 'zod';
import type { DbOrTx } from '@/db/client';
import {
  calibrationCheck,
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
import type { Actor } from '@/lib/auth/actor';
import { can } from '@/lib/auth/permissions';
import { assertCan } from '@/lib/auth/session';
import { notFound } from '@/lib/errors';
import { intakeVerdict } from '@/lib/intake/verdict';
import { contestDeadline } from '@/lib/intake/notice';
import { fromTenthMilliC } from '@/lib/temperature';

function visibility(actor: Actor): SQL {
  if (actor.role === 'supplier') return eq(delivery.supplierOrganisationId, actor.organisationId);
  if (actor.role === 'plant') return eq(delivery.plantOrganisationId, actor.organisationId);
  return sql`false`;
}

/**
 * One delivery as its record stands: the load, its samples and custody, and every intake result it
 * has had, oldest first, each with the readings, the instrument check and the rules it rests on. A
 * corrected result is kept beside the correction, never replaced.
 */
export async function getDeliveryRecord(db: DbOrTx, actor: Actor, deliveryId: string, now = new Date()) {
  assertCan(actor, 'delivery', 'read');
  if (!z.uuid().safeParse(deliveryId).success) throw notFound('That delivery');
  const [load] = await db
    .select({
      id: delivery.id,
      reference: delivery.reference,
      collectedAt: delivery.collectedAt,
      receivedAt: delivery.receivedAt,
      volumeLitres: delivery.volumeLitres,
      tanker: delivery.tanker,
      compartment: delivery.compartment,
      receiptTempTenthMilliC: delivery.receiptTempTenthMilliC,
      farmId: supplierFarm.id,
      farmName: supplierFarm.name,
      herdCode: supplierFarm.herdCode,
      supplierOrganisationId: delivery.supplierOrganisationId,
      supplierName: organisation.name,
    })
    .from(delivery)
    .innerJoin(supplierFarm, eq(supplierFarm.id, delivery.farmId))
    .innerJoin(organisation, eq(organisation.id, delivery.supplierOrganisationId))
    .where(and(eq(delivery.id, deliveryId), visibility(actor)));
  if (!load) throw notFound('That delivery');

  const decider = alias(user, 'decider');
  const [samples, results, cases] = await Promise.all([
    db.select().from(sample).where(and(eq(sample.deliveryId, load.id), inArray(sample.kind, ['routine', 'retained']))).orderBy(desc(sample.kind)),
    db
      .select({
        id: intakeResult.id,
        verdict: intakeResult.verdict,
        valueTenthMilliC: intakeResult.valueTenthMilliC,
        limitTenthMilliC: intakeResult.limitTenthMilliC,
        decisionRule: intakeResult.decisionRule,
        addedWaterBasisPoints: intakeResult.addedWaterBasisPoints,
        amountMinor: intakeResult.amountMinor,
        currency: intakeResult.currency,
        decidedAt: intakeResult.decidedAt,
        decidedByName: decider.name,
        notifiedAt: intakeResult.notifiedAt,
        supersedesId: intakeResult.supersedesId,
        supersededAt: intakeResult.supersededAt,
        correctionReason: intakeResult.correctionReason,
        rulesVersionId: schemeRules.id,
        rulesVersion: schemeRules.version,
        rules: schemeRules.rules,
        rulesEffectiveFrom: schemeRules.effectiveFrom,
        setId: measurementSet.id,
        analystName: measurementSet.analystName,
        testedAt: measurementSet.testedAt,
        sampleTempTenthMilliC: measurementSet.sampleTempTenthMilliC,
        preparation: measurementSet.preparation,
        resultBasis: measurementSet.resultBasis,
        readingsUsed: measurementSet.readingsUsed,
        calibrationWarning: measurementSet.calibrationWarning,
        instrumentId: instrument.id,
        instrumentSerial: instrument.serialNumber,
        instrumentDescription: instrument.description,
        checkId: calibrationCheck.id,
        checkedAt: calibrationCheck.checkedAt,
        checkPass: calibrationCheck.pass,
        checkWithin: calibrationCheck.within,
        checkTotal: sql<number | null>`cardinality(${calibrationCheck.readingsTenthMilliC})`,
        checkNominalTenthMilliC: calibrationCheck.nominalTenthMilliC,
        checkValidUntil: calibrationCheck.validUntil,
      })
      .from(intakeResult)
      .innerJoin(schemeRules, eq(schemeRules.id, intakeResult.rulesVersionId))
      .innerJoin(measurementSet, eq(measurementSet.id, intakeResult.measurementSetId))
      .innerJoin(instrument, eq(instrument.id, measurementSet.instrumentId))
      .leftJoin(calibrationCheck, eq(calibrationCheck.id, measurementSet.calibrationCheckId))
      .leftJoin(decider, eq(decider.id, intakeResult.decidedBy))
      .where(eq(intakeResult.deliveryId, load.id))
      .orderBy(asc(intakeResult.decidedAt), asc(intakeResult.createdAt)),
    db
      .select({ id: disputeCase.id, number: disputeCase.number, status: disputeCase.status, intakeResultId: disputeCase.intakeResultId })
      .from(disputeCase)
      .where(eq(disputeCase.deliveryId, load.id))
      .orderBy(desc(disputeCase.openedAt)),
  ]);
  const sampleIds = samples.map((s) => s.id);
  const setIds = results.map((r) => r.setId);
  const [custody, readings] = await Promise.all([
    sampleIds.length ? db.select().from(custodyEvent).where(inArray(custodyEvent.sampleId, sampleIds)).orderBy(asc(custodyEvent.at), asc(custodyEvent.createdAt)) : [],
    setIds.length ? db.select().from(reading).where(inArray(reading.measurementSetId, setIds)).orderBy(asc(reading.position)) : [],
  ]);

  const items = results.map((r) => {
    // The acceptance limit and arithmetic are recomputed from the stored value under the result's own rules version.
    const detail = intakeVerdict({ value: fromTenthMilliC(r.valueTenthMilliC), readingsUsed: r.readingsUsed ?? 2, volumeLitres: load.volumeLitres, rules: r.rules });
    const deadline = r.notifiedAt ? contestDeadline(r.notifiedAt, r.rules.deadlines.contestHours) : null;
    const dispute = cases.find((c) => c.intakeResultId === r.id && c.status !== 'withdrawn') ?? null;
    return {
      ...r,
      readings: readings.filter((x) => x.measurementSetId === r.setId).map((x) => ({ position: x.position, valueTenthMilliC: x.valueTenthMilliC, flag: x.flag })),
      acceptanceLimit: detail.acceptanceLimit,
      limitApplied: detail.limitApplied,
      arithmetic: detail.arithmetic,
      contestDeadline: deadline,
      contestOpen: !r.supersededAt && r.verdict !== 'accepted' && !dispute && deadline !== null && deadline.getTime() > now.getTime(),
      dispute,
    };
  });
  const current = items.find((r) => !r.supersededAt) ?? null;
  const everDisputed = cases.length > 0;
  return {
    ...load,
    samples: samples.map((s) => ({ ...s, custody: custody.filter((c) => c.sampleId === s.id) })),
    results: items,
    current,
    mayCorrect: can(actor.role, 'intake', 'correct') && !!current && !everDisputed,
    correctionBlockedBy: everDisputed ? cases[0].number : null,
  };
}

export type DeliveryRecord = Awaited<ReturnType<typeof getDeliveryRecord>>;
