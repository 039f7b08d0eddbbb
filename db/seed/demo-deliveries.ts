import type { Db } from '@/db/client';
import { calibrationCheck, custodyEvent, delivery, intakeResult, measurementSet, reading, sample } from '@/db/schema';
import { calibrationCheck as checkCalibration, finalResult } from '@/lib/arbitration';
import { intakeVerdict } from '@/lib/intake/verdict';
import type { SchemeRules } from '@/lib/rules/schema';
import { toTenthMilliC } from '@/lib/temperature';
import type { Random } from './random';

const HOUR = 3_600_000;
const DAY = 24 * HOUR;

export type DemoFarm = { id: string; organisationId: string; herdCode: string; baseline: number };
/** A delivery whose readings the scenario fixes, because a case is built on it. */
export type Incident = { key: string; daysAgo: number; farmIndex: number; readings: number[] };

export type SeededDelivery = {
  key: string;
  deliveryId: string;
  reference: string;
  farm: DemoFarm;
  collectedAt: Date;
  receivedAt: Date;
  volumeLitres: number;
  routineSampleId: string;
  retainedSampleId: string | null;
  retainedCode: string | null;
  sealNumber: string | null;
  intakeSetId: string;
  intakeResultId: string;
  verdict: 'accepted' | 'deducted' | 'rejected';
  value: number;
  readings: number[];
  calibrationCheckId: string;
  calibrationReadings: number[];
  notifiedAt: Date | null;
  testedAt: Date;
};

async function insertChunked<T>(rows: T[], insert: (chunk: T[]) => Promise<unknown>, size = 400) {
  for (let i = 0; i < rows.length; i += size) await insert(rows.slice(i, i + size));
}

const round4 = (x: number) => Math.round(x * 10_000) / 10_000;

/** Two (or, when they disagree, four) readings around a true freezing point, as an intake analyst takes them. */
function readingsAround(truth: number, random: Random, rules: SchemeRules): number[] {
  const first = [round4(random.normal(truth, 0.0012)), round4(random.normal(truth, 0.0012))];
  const result = finalResult(first, rules.precision);
  if (result.status === 'accepted') return first;
  return [...first, round4(random.normal(truth, 0.0012)), round4(random.normal(truth, 0.0012))];
}

export async function seedDeliveries(
  db: Db,
  input: {
    now: Date;
    days: number;
    farms: DemoFarm[];
    plantOrganisationId: string;
    instrumentIds: string[];
    rules: SchemeRules;
    rulesVersionId: string;
    plantUserId: string;
    random: Random;
    incidents: Incident[];
  },
): Promise<{ byKey: Map<string, SeededDelivery>; total: number }> {
  const { now, farms, rules, random } = input;
  const deliveries: (typeof delivery.$inferInsert)[] = [];
  const samples: (typeof sample.$inferInsert)[] = [];
  const sets: (typeof measurementSet.$inferInsert)[] = [];
  const readings: (typeof reading.$inferInsert)[] = [];
  const results: (typeof intakeResult.$inferInsert)[] = [];
  const checks: (typeof calibrationCheck.$inferInsert)[] = [];
  const custody: (typeof custodyEvent.$inferInsert)[] = [];
  const byKey = new Map<string, SeededDelivery>();
  const incidentAt = new Map(input.incidents.map((incident) => [`${incident.daysAgo}:${incident.farmIndex}`, incident]));

  // A morning check on each instrument before the day's intake.
  const checkIds = new Map<string, { id: string; readings: number[] }>();
  for (let daysAgo = input.days - 1; daysAgo >= 0; daysAgo--) {
    const checkedAt = new Date(now.getTime() - daysAgo * DAY - 13 * HOUR);
    for (const instrumentId of input.instrumentIds) {
      const calibrationReadings = Array.from({ length: rules.calibration.readings }, () =>
        round4(random.normal(rules.calibration.nominal, 0.0013)),
      );
      const verdict = checkCalibration({
        nominal: rules.calibration.nominal,
        readings: calibrationReadings,
        tolerance: rules.calibration.tolerance,
        required: rules.calibration.required,
      });
      const id = crypto.randomUUID();
      checkIds.set(`${daysAgo}:${instrumentId}`, { id, readings: calibrationReadings });
      checks.push({
        id,
        instrumentId,
        checkedAt,
        checkedBy: input.plantUserId,
        analystName: 'T. Fenwick',
        nominalTenthMilliC: toTenthMilliC(rules.calibration.nominal),
        readingsTenthMilliC: calibrationReadings.map(toTenthMilliC),
        toleranceTenthMilliC: toTenthMilliC(rules.calibration.tolerance),
        required: rules.calibration.required,
        within: verdict.within,
        pass: verdict.pass,
        validUntil: new Date(checkedAt.getTime() + rules.calibration.validHours * HOUR),
        rulesVersionId: input.rulesVersionId,
      });
    }
  }

  for (let daysAgo = input.days - 1; daysAgo >= 0; daysAgo--) {
    farms.forEach((farm, farmIndex) => {
      const incident = incidentAt.get(`${daysAgo}:${farmIndex}`);
      const collectedAt = new Date(now.getTime() - daysAgo * DAY - 12 * HOUR + farmIndex * 6 * 60_000);
      const receivedAt = new Date(collectedAt.getTime() + random.int(70, 150) * 60_000);
      const testedAt = new Date(receivedAt.getTime() + random.int(15, 40) * 60_000);
      const volumeLitres = random.int(18, 70) * 200;
      const reference = `LW-${collectedAt.toISOString().slice(0, 10).replaceAll('-', '')}-${farm.herdCode}`;

      // Most loads sit near the herd's own baseline; now and then one is watered or has solutes added.
      let truth = random.normal(farm.baseline, 0.0025);
      const roll = random.next();
      if (roll < 0.008) truth = random.between(-0.508, -0.497);
      else if (roll < 0.012) truth = random.between(-0.513, -0.51);
      else if (roll < 0.014) truth = random.between(-0.575, -0.565);
      const values = incident?.readings ?? readingsAround(truth, random, rules);
      const outcome = finalResult(values, rules.precision);
      if (outcome.status !== 'accepted') throw new Error(`Demo readings for ${reference} are not conclusive`);
      const verdict = intakeVerdict({ value: outcome.value, readingsUsed: outcome.used, volumeLitres, rules });

      const instrumentId = input.instrumentIds[farmIndex % input.instrumentIds.length];
      const check = checkIds.get(`${daysAgo}:${instrumentId}`)!;
      const deliveryId = crypto.randomUUID();
      const routineSampleId = crypto.randomUUID();
      const setId = crypto.randomUUID();
      const resultId = crypto.randomUUID();
      const needsRetained = verdict.verdict !== 'accepted';
      const retainedSampleId = needsRetained ? crypto.randomUUID() : null;
      const sealNumber = needsRetained ? `LVS-${String(random.int(100000, 999999))}` : null;
      const retainedCode = needsRetained ? `K-${reference}` : null;

      deliveries.push({
        id: deliveryId,
        reference,
        plantOrganisationId: input.plantOrganisationId,
        supplierOrganisationId: farm.organisationId,
        farmId: farm.id,
        collectedAt,
        receivedAt,
        volumeLitres,
        tanker: `LV-T${1 + (farmIndex % 4)}`,
        compartment: String(1 + (farmIndex % 3)),
        receiptTempTenthMilliC: toTenthMilliC(round4(random.between(3.2, 5.6))),
      });
      samples.push({ id: routineSampleId, deliveryId, code: `R-${reference}`, kind: 'routine', sampledAt: collectedAt, storage: 'Intake rack, 4 °C' });
      if (retainedSampleId) {
        samples.push({
          id: retainedSampleId,
          deliveryId,
          code: retainedCode!,
          kind: 'retained',
          sealNumber,
          preservative: 'None',
          storage: 'Retained-sample refrigerator B, 0–6 °C',
          sampledAt: collectedAt,
        });
        // The driver seals the retained portion at the farm; the plant stores it cold on arrival.
        custody.push(
          { sampleId: retainedSampleId, kind: 'sealed', at: collectedAt, organisationId: input.plantOrganisationId, actorUserId: input.plantUserId, location: 'Farm tank, by the tanker driver', sealIntact: true },
          { sampleId: retainedSampleId, kind: 'stored', at: receivedAt, organisationId: input.plantOrganisationId, actorUserId: input.plantUserId, location: 'Retained-sample refrigerator B', tempTenthMilliC: toTenthMilliC(round4(random.between(3.4, 4.6))), sealIntact: true, frozen: false },
        );
      }
      sets.push({
        id: setId,
        sampleId: routineSampleId,
        organisationId: input.plantOrganisationId,
        instrumentId,
        calibrationCheckId: check.id,
        purpose: 'intake',
        analystName: 'T. Fenwick',
        testedAt,
        sampleTempTenthMilliC: toTenthMilliC(round4(random.between(19.2, 20.8))),
        preparation: 'none',
        resultTenthMilliC: toTenthMilliC(outcome.value),
        resultBasis: outcome.basis,
        readingsUsed: outcome.used,
        createdBy: input.plantUserId,
        submittedAt: testedAt,
      });
      values.forEach((value, index) =>
        readings.push({ measurementSetId: setId, position: index + 1, valueTenthMilliC: toTenthMilliC(value) }),
      );
      const notifiedAt = needsRetained ? new Date(testedAt.getTime() + 20 * 60_000) : null;
      results.push({
        id: resultId,
        deliveryId,
        measurementSetId: setId,
        rulesVersionId: input.rulesVersionId,
        valueTenthMilliC: toTenthMilliC(outcome.value),
        limitTenthMilliC: toTenthMilliC(verdict.limit),
        decisionRule: rules.decisionRule,
        verdict: verdict.verdict,
        addedWaterBasisPoints: Math.round(verdict.addedWaterPercent * 100),
        amountMinor: verdict.amountMinor,
        currency: rules.currency,
        decidedBy: input.plantUserId,
        decidedAt: testedAt,
        notifiedAt,
      });
      if (incident) {
        byKey.set(incident.key, {
          key: incident.key,
          deliveryId,
          reference,
          farm,
          collectedAt,
          receivedAt,
          volumeLitres,
          routineSampleId,
          retainedSampleId,
          retainedCode,
          sealNumber,
          intakeSetId: setId,
          intakeResultId: resultId,
          verdict: verdict.verdict,
          value: outcome.value,
          readings: values,
          calibrationCheckId: check.id,
          calibrationReadings: check.readings,
          notifiedAt,
          testedAt,
        });
      }
    });
  }

  await insertChunked(checks, (chunk) => db.insert(calibrationCheck).values(chunk));
  await insertChunked(deliveries, (chunk) => db.insert(delivery).values(chunk));
  await insertChunked(samples, (chunk) => db.insert(sample).values(chunk));
  await insertChunked(custody, (chunk) => db.insert(custodyEvent).values(chunk));
  await insertChunked(sets, (chunk) => db.insert(measurementSet).values(chunk));
  await insertChunked(readings, (chunk) => db.insert(reading).values(chunk), 1000);
  await insertChunked(results, (chunk) => db.insert(intakeResult).values(chunk));
  return { byKey, total: deliveries.length };
}
