'use server';

import { headers } from 'next/headers';
import { revalidatePath } from 'next/cache';
import { getDb } from '@/db/client';
import { actorAction, type FormState } from '@/lib/forms/action';
import { removeAttachment } from '@/lib/dal/attachments';
import { requestOrigin } from '@/lib/http/origin';

/** A party withdraws a file it added; the file stays in the record, struck through, for the board. */
export async function withdrawEvidence(values: unknown): Promise<FormState> {
  return actorAction(async (actor) => {
    const removed = await removeAttachment(getDb(), actor, values, { origin: requestOrigin(await headers(), 'web') });
    revalidatePath(`/cases/${removed.caseId}`);
    return { ok: true, message: `${removed.fileName} is withdrawn. It stays in the case record, struck through, and the board can still open it.` };
  });
}
