'use server';

import { headers } from 'next/headers';
import { revalidatePath } from 'next/cache';
import { redirect } from 'next/navigation';
import { getDb } from '@/db/client';
import { actorAction, type FormState } from '@/lib/forms/action';
import { isTransitionName, type TransitionName } from '@/lib/cases/lifecycle';
import { runTransition } from '@/lib/dal/case-transition';
import { requestOrigin } from '@/lib/http/origin';
import { AppError } from '@/lib/errors';
import { caseStatuses, type CaseStatus } from '@/db/schema/cases';


/** Every lifecycle form of the case file goes through here, to the same transition the API uses. */
export async function transitionCase(caseId: string, name: TransitionName, values: unknown, seenStatus?: CaseStatus): Promise<FormState> {
  return actorAction(async (actor) => {
    if (typeof caseId !== 'string' || !isTransitionName(name)) throw new AppError('not_found', 'That case was not found.');
    const expectedStatus = seenStatus && (caseStatuses as readonly string[]).includes(seenStatus) ? seenStatus : undefined;
    await runTransition(getDb(), actor, caseId, name, values, { origin: requestOrigin(await headers(), 'web'), expectedStatus });
    revalidatePath(`/cases/${caseId}`);
    // The form that made the change goes away with the new state, so the page itself says what happened.
    redirect(`/cases/${caseId}?done=${name}`);
  });
}
