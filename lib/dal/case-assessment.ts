import 'server-only';
import { and, desc, eq, inArray } from 'drizzle-orm';
import type { DbOrTx } from '@/db/client';
import { calibrationCheck, custodyEvent, disputeCase, intakeResult, measurementSet, reading } from '@/db/schema';
import { assess, type Assessment, type AssessmentInput } from '@/lib/arbitration';
import { assessmentRules } from '@/lib/rules/to-assessment';
import { fromTenthMilliC } from '@/lib/temperature';
import { currentSample } from './case-samples';
import { rulesVersion } from './rules';

type CaseRow = typeof disputeCase.$inferSelect;

async function readingsOf(db: DbOrTx, setId: string): Promise<number[]> {
  const rows = await db.select({ v: reading.valueTenthMilliC }).from(reading).where(eq(reading.measurementSetId, setId)).orderBy(reading.position);
  return rows.map((r) => fromTenthMilliC(r.v));
}

async function calibrationOf(db: DbOrTx, checkId: string | null) {
  if (!checkId) return undefined;
  const [check] = await db.select().from(calibrationCheck).where(eq(calibrationCheck.id, checkId));
  return check ? { nominal: fromTenthMilliC(check.nominalTenthMilliC), readings: check.readingsTenthMilliC.map(fromTenthMilliC) } : undefined;
}

/**
 * The decision module's input for a case, read from the record: the intake set and its check, the
 * latest retest and its check, and the current sample's condition from its custody events.
 */
export async function assessmentInputFor(db: DbOrTx, caseRow: CaseRow): Promise<AssessmentInput | null> {
  const rules = await rulesVersion(db, caseRow.rulesVersionId);
  const [result] = await db.select().from(intakeResult).where(eq(intakeResult.id, caseRow.intakeResultId));
  if (!rules || !result) return null;
  const [originalSet] = await db.select().from(measurementSet).where(eq(measurementSet.id, result.measurementSetId));
  const original: AssessmentInput['original'] = {
    readings: await readingsOf(db, originalSet.id),
    testedAt: originalSet.testedAt.toISOString(),
    calibration: await calibrationOf(db, originalSet.calibrationCheckId),
  };
  const input: AssessmentInput = {
    rules: assessmentRules(rules.rules),
    original,
    ...(result.verdict === 'deducted' ? { intake: { addedWaterPercent: result.addedWaterBasisPoints / 100 } } : {}),
  };

  const [retestSet] = await db
    .select()
    .from(measurementSet)
    .where(and(eq(measurementSet.caseId, caseRow.id), inArray(measurementSet.purpose, ['retest', 'further_test'])))
    .orderBy(desc(measurementSet.submittedAt))
    .limit(1);
  const sample = await currentSample(db, caseRow);
  if (!retestSet || !sample || retestSet.sampleId !== sample.id) return input;

  const custody = await db.select().from(custodyEvent).where(eq(custodyEvent.sampleId, sample.id)).orderBy(custodyEvent.at);
  const at = (kind: string) => custody.find((c) => c.kind === kind)?.at.getTime();
  const dispatched = at('dispatched');
  const received = at('received');
  // Custody holds when the sample was sealed, dispatched and then received, in that order.
  const custodyComplete = at('sealed') !== undefined && dispatched !== undefined && received !== undefined && dispatched <= received;
  return {
    ...input,
    retest: {
      readings: await readingsOf(db, retestSet.id),
      testedAt: retestSet.testedAt.toISOString(),
      calibration: await calibrationOf(db, retestSet.calibrationCheckId),
      sample: {
        sampledAt: sample.sampledAt.toISOString(),
        sealIntact: custody.every((c) => c.sealIntact !== false),
        frozen: custody.some((c) => c.frozen === true),
        custodyComplete,
        storageTemperatures: custody.filter((c) => c.tempTenthMilliC !== null && c.kind !== 'opened').map((c) => fromTenthMilliC(c.tempTenthMilliC!)),
      },
    },
  };
}

export async function proposalFor(db: DbOrTx, caseRow: CaseRow): Promise<{ input: AssessmentInput; assessment: Assessment } | null> {
  const input = await assessmentInputFor(db, caseRow);
  if (!input) return null;
  return { input, assessment: assess(input) };
}
