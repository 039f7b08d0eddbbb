'use server';

import { headers } from 'next/headers';
import { revalidatePath } from 'next/cache';
import { redirect } from 'next/navigation';
import { getDb } from '@/db/client';
import { actorAction, type FormState } from '@/lib/forms/action';
import { addInstrument, recordCalibrationCheck } from '@/lib/dal/instruments';
import { requestOrigin } from '@/lib/http/origin';

export async function addInstrumentAction(values: unknown): Promise<FormState> {
  return actorAction(async (actor) => {
    const row = await addInstrument(getDb(), actor, values, { origin: requestOrigin(await headers(), 'web') });
    revalidatePath('/instruments');
    return { ok: true, message: `Instrument ${row.serialNumber} is registered. Run a calibration check before its first intake test.` };
  });
}

export async function recordCalibrationCheckAction(values: unknown): Promise<FormState> {
  return actorAction(async (actor) => {
    const check = await recordCalibrationCheck(getDb(), actor, values, { origin: requestOrigin(await headers(), 'web') });
    revalidatePath('/instruments');
    revalidatePath('/desk');
    revalidatePath('/intake');
    redirect(`/instruments/${check.instrumentId}?done=${check.pass ? 'passed' : 'failed'}`);
  });
}
