'use server';

import { headers } from 'next/headers';
import { revalidatePath } from 'next/cache';
import { getDb } from '@/db/client';
import { actorAction, type FormState } from '@/lib/forms/action';
import { requestOrigin } from '@/lib/http/origin';
import { createNote, editNote, replyToNote } from '@/lib/dal/notes';

// A client can send any serialisable value as an argument; String() throws on some objects
// ({ toString: 0 }), so anything but a string names no record and the data layer answers 404.
const idText = (value: unknown): string => (typeof value === 'string' ? value : '');

// The editor sends its document as structured JSON, so these go through actorAction; the data layer
// parses it with the same schema the browser checked it with.

export async function postNoteAction(caseId: string, values: unknown): Promise<FormState> {
  return actorAction(async (actor) => {
    const written = await createNote(getDb(), actor, idText(caseId), values, { origin: requestOrigin(await headers(), 'web') });
    revalidatePath(`/cases/${caseId}`);
    return { ok: true, message: written.visibility === 'parties' ? 'Note posted. The other parties have been told by e-mail.' : 'Internal note posted. Only your organisation can read it.' };
  });
}

export async function replyToNoteAction(caseId: string, parentId: string, values: unknown): Promise<FormState> {
  return actorAction(async (actor) => {
    const written = await replyToNote(getDb(), actor, idText(caseId), idText(parentId), values, { origin: requestOrigin(await headers(), 'web') });
    revalidatePath(`/cases/${caseId}`);
    return { ok: true, message: written.visibility === 'parties' ? 'Reply posted. The other parties have been told by e-mail.' : 'Internal reply posted.' };
  });
}

export async function editNoteAction(caseId: string, noteId: string, values: unknown): Promise<FormState> {
  return actorAction(async (actor) => {
    const result = await editNote(getDb(), actor, idText(caseId), idText(noteId), values, { origin: requestOrigin(await headers(), 'web') });
    revalidatePath(`/cases/${caseId}`);
    return { ok: true, message: result.changed ? 'Note edited. The earlier text is kept in its history.' : 'Nothing changed, so nothing was saved.' };
  });
}
