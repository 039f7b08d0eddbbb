'use server';

import { headers } from 'next/headers';
import { redirect } from 'next/navigation';
import { getDb } from '@/db/client';
import { actorAction, type FormState } from '@/lib/forms/action';
import { openDispute } from '@/lib/dal/open-dispute';
import { requestOrigin } from '@/lib/http/origin';

export async function openDisputeAction(values: unknown): Promise<FormState> {
  let caseId: string | null = null;
  const state = await actorAction(async (actor) => {
    const created = await openDispute(getDb(), actor, values, { origin: requestOrigin(await headers(), 'web') });
    caseId = created.id;
  });
  if (caseId) redirect(`/cases/${caseId}?opened=1`);
  return state;
}
