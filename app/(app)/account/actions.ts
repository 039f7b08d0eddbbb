'use server';

import { revalidatePath } from 'next/cache';
import { getDb } from '@/db/client';
import { revokeOtherSessions, revokeOwnSession } from '@/lib/dal/sessions';
import { formAction } from '@/lib/forms/action';
import { AppError } from '@/lib/errors';
import { endOtherSessionsSchema, endSessionSchema } from './schema';

export const endSessionAction = formAction(endSessionSchema, async ({ sessionId }, actor) => {
  if (sessionId === actor.sessionId) throw new AppError('conflict', 'To end this session, use “Sign out”.');
  await revokeOwnSession(getDb(), actor, sessionId);
  revalidatePath('/account');
  return { ok: true, message: 'That session has ended.' };
});

export const endOtherSessionsAction = formAction(endOtherSessionsSchema, async (_input, actor) => {
  const ended = await revokeOtherSessions(getDb(), actor);
  revalidatePath('/account');
  return { ok: true, message: ended === 0 ? 'There was no other session.' : `${ended} other session${ended === 1 ? '' : 's'} ended.` };
});
