'use server';

import { headers } from 'next/headers';
import { revalidatePath } from 'next/cache';
import { redirect } from 'next/navigation';
import { getDb } from '@/db/client';
import { actorAction, type FormState } from '@/lib/forms/action';
import { publishRulesVersion } from '@/lib/dal/rules';
import { requestOrigin } from '@/lib/http/origin';

export async function publishRulesAction(values: unknown): Promise<FormState> {
  return actorAction(async (actor) => {
    const row = await publishRulesVersion(getDb(), actor, values, { origin: requestOrigin(await headers(), 'web') });
    revalidatePath('/admin/rules');
    revalidatePath('/rules');
    redirect(`/admin/rules?published=${row.version}`);
  });
}
