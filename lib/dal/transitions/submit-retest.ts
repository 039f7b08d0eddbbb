import { addBusinessDays } from 'date-fns';
import { and, desc, eq } from 'drizzle-orm';
import { formatDateTime } from '@/lib/format/dates';
import { calibrationCheck, custodyEvent, instrument, measurementSet, reading } from '@/db/schema';
import { calibrationCheck as checkCalibration, finalResult } from '@/lib/arbitration';
import type { TransitionInputs } from '@/lib/cases/schemas';
import { AppError } from '@/lib/errors';
import { formatCelsius, toTenthMilliC } from '@/lib/temperature';
import type { EffectContext, EffectResult } from './context';

/**
 * The referee laboratory's readings, with the calibration check it ran before them. The final result
 * is the decision module's, never the client's; an unfinished set or an unfit instrument is refused.
 */
export async function submitRetestEffect({ tx, actor, caseRow, sample, input, now, rules }: EffectContext<TransitionInputs['submit_retest']>): Promise<EffectResult> {
  const [device] = await tx.select().from(instrument).where(and(eq(instrument.id, input.instrumentId), eq(instrument.organisationId, actor.organisationId), eq(instrument.active, true)));
  if (!device) throw new AppError('invalid', 'Choose one of your laboratory’s instruments.', { fieldErrors: { instrumentId: ['That instrument is not one of your laboratory’s.'] } });

  const calibration = checkCalibration({ nominal: rules.calibration.nominal, readings: input.calibrationReadings, tolerance: rules.calibration.tolerance, required: rules.calibration.required });
  if (!calibration.pass) {
    throw new AppError('invalid', 'The instrument failed its calibration check; recalibrate it and check again before the retest.', {
      fieldErrors: { calibrationReadings: [`${calibration.within} of ${calibration.total} readings within tolerance; ${rules.calibration.required} needed.`] },
    });
  }
  const values = input.readings.map((r) => r.value);
  const result = finalResult(values, rules.precision);
  if (result.status !== 'accepted') {
    throw new AppError('invalid', 'The readings are not yet conclusive.', {
      fieldErrors: { readings: [`${result.needed} more reading${result.needed === 1 ? '' : 's'} needed: the first two differ by more than the repeatability limit.`] },
    });
  }
  if (!sample) throw new AppError('conflict', 'No sample was received for this case.');
  const [receipt] = await tx
    .select({ at: custodyEvent.at })
    .from(custodyEvent)
    .where(and(eq(custodyEvent.sampleId, sample.id), eq(custodyEvent.kind, 'received')))
    .orderBy(desc(custodyEvent.at))
    .limit(1);
  // The form gives minutes only: a test in the minute of receipt counts as after it; earlier is refused.
  const receivedMinute = receipt ? Math.floor(receipt.at.getTime() / 60_000) * 60_000 : null;
  if (receivedMinute !== null && input.testedAt.getTime() < receivedMinute) {
    throw new AppError('invalid', 'The test cannot be dated before the sample was received.', {
      fieldErrors: { testedAt: [`The sample was received at ${formatDateTime(receipt!.at)}.`] },
    });
  }
  const testedAt = receipt && input.testedAt.getTime() < receipt.at.getTime() ? receipt.at : input.testedAt;

  const [check] = await tx
    .insert(calibrationCheck)
    .values({
      instrumentId: device.id,
      checkedAt: testedAt,
      checkedBy: actor.userId,
      analystName: input.analystName,
      nominalTenthMilliC: toTenthMilliC(rules.calibration.nominal),
      readingsTenthMilliC: input.calibrationReadings.map(toTenthMilliC),
      toleranceTenthMilliC: toTenthMilliC(rules.calibration.tolerance),
      required: rules.calibration.required,
      within: calibration.within,
      pass: calibration.pass,
      validUntil: new Date(testedAt.getTime() + rules.calibration.validHours * 3_600_000),
      rulesVersionId: caseRow.rulesVersionId,
    })
    .returning({ id: calibrationCheck.id });
  const purpose = sample.caseId ? 'further_test' : 'retest';
  const [set] = await tx
    .insert(measurementSet)
    .values({
      sampleId: sample.id,
      caseId: caseRow.id,
      organisationId: actor.organisationId,
      instrumentId: device.id,
      calibrationCheckId: check.id,
      purpose,
      analystName: input.analystName,
      testedAt: testedAt,
      sampleTempTenthMilliC: toTenthMilliC(input.sampleTemperature),
      preparation: input.preparation,
      resultTenthMilliC: toTenthMilliC(result.value),
      resultBasis: result.basis,
      readingsUsed: result.used,
      createdBy: actor.userId,
      submittedAt: now,
    })
    .returning({ id: measurementSet.id });
  const readings = tx.insert(reading).values(input.readings.map((r, i) => ({ measurementSetId: set.id, position: i + 1, valueTenthMilliC: toTenthMilliC(r.value), flag: r.flag })));
  const opened = tx.insert(custodyEvent).values({ sampleId: sample.id, kind: 'opened', at: testedAt, actorUserId: actor.userId, organisationId: actor.organisationId, location: device.description, sealIntact: null, note: 'Opened for the retest.' });

  return {
    writes: [readings, opened],
    caseChanges: { retestSubmittedAt: now, decisionDueAt: addBusinessDays(now, rules.deadlines.decisionWorkingDays) },
    detail: { measurementSetId: set.id, readings: values.length, used: result.used, basis: result.basis, result: result.value, calibrationWithin: calibration.within },
    notice: (audience) => ({
      template: 'case-retested',
      subject: 'the retest is in',
      headline: audience === 'board' ? 'The referee laboratory has submitted its retest; the case is ready for review.' : 'The referee laboratory has submitted its retest.',
      lines: [`Final result ${formatCelsius(toTenthMilliC(result.value))} (${result.basis.replaceAll('_', ' ')}). The board decides within ${rules.deadlines.decisionWorkingDays} working days.`],
    }),
  };
}
