'use server';

import { revalidatePath } from 'next/cache';
import { getDb } from '@/db/client';
import { createInvitation, revokeInvitation } from '@/lib/dal/invitations';
import { formAction } from '@/lib/forms/action';
import { inviteSchema, revokeInvitationSchema } from './schema';

export const inviteAction = formAction(inviteSchema, async (input, actor) => {
  const { mailStatus } = await createInvitation(getDb(), actor, input);
  revalidatePath('/admin/users');
  return mailStatus === 'sent'
    ? { ok: true, message: `Invitation sent to ${input.email}.` }
    : { ok: true, message: `Invitation created for ${input.email}, but the e-mail could not be sent yet; it will be retried.` };
});

export const revokeInvitationAction = formAction(revokeInvitationSchema, async (input, actor) => {
  await revokeInvitation(getDb(), actor, input.invitationId);
  revalidatePath('/admin/users');
  return { ok: true, message: 'Invitation revoked.' };
});
