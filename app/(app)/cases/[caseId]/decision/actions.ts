'use server';

import { headers } from 'next/headers';
import { revalidatePath } from 'next/cache';
import { redirect } from 'next/navigation';
import { z } from 'zod';
import { getDb } from '@/db/client';
import { actorAction, type FormState } from '@/lib/forms/action';
import { correctDecision, signDecision } from '@/lib/dal/decision-sign';
import { requestOrigin } from '@/lib/http/origin';
import { AppError } from '@/lib/errors';

/** The decision form: the same signing the data layer does for any caller, password and all. */
export async function signCaseDecision(caseId: string, values: unknown): Promise<FormState> {
  return actorAction(async (actor) => {
    if (!z.uuid().safeParse(caseId).success) throw new AppError('not_found', 'That case was not found.');
    await signDecision(getDb(), actor, caseId, values, { origin: requestOrigin(await headers(), 'web') });
    revalidatePath(`/cases/${caseId}`);
    // The form goes away with the sealed case; the page itself says what happened.
    redirect(`/cases/${caseId}?signed=1#decision`);
  });
}

/** A correction: a new decision, signed the same way, that supersedes the one in force. */
export async function correctCaseDecision(caseId: string, values: unknown): Promise<FormState> {
  return actorAction(async (actor) => {
    if (!z.uuid().safeParse(caseId).success) throw new AppError('not_found', 'That case was not found.');
    await correctDecision(getDb(), actor, caseId, values, { origin: requestOrigin(await headers(), 'web') });
    revalidatePath(`/cases/${caseId}`);
    redirect(`/cases/${caseId}?corrected=1#decision`);
  });
}
