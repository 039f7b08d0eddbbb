'use server';

import { headers } from 'next/headers';
import { revalidatePath } from 'next/cache';
import { redirect } from 'next/navigation';
import { getDb } from '@/db/client';
import { actorAction, type FormState } from '@/lib/forms/action';
import { recordIntake } from '@/lib/dal/intake';
import { requestOrigin } from '@/lib/http/origin';

/** The intake form sends structured values (readings, dates); the data layer validates them with the form's own schema. */
export async function recordIntakeAction(values: unknown): Promise<FormState> {
  return actorAction(async (actor) => {
    const recorded = await recordIntake(getDb(), actor, values, { origin: requestOrigin(await headers(), 'web') });
    revalidatePath('/deliveries');
    revalidatePath('/desk');
    redirect(`/deliveries/${recorded.deliveryId}?done=recorded`);
  });
}
