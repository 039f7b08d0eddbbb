'use server';

import { headers } from 'next/headers';
import { revalidatePath } from 'next/cache';
import { redirect } from 'next/navigation';
import { getDb } from '@/db/client';
import { actorAction, type FormState } from '@/lib/forms/action';
import { correctIntake } from '@/lib/dal/intake';
import { requestOrigin } from '@/lib/http/origin';

export async function correctIntakeAction(values: unknown): Promise<FormState> {
  return actorAction(async (actor) => {
    const corrected = await correctIntake(getDb(), actor, values, { origin: requestOrigin(await headers(), 'web') });
    revalidatePath('/deliveries');
    redirect(`/deliveries/${corrected.deliveryId}?done=corrected`);
  });
}
