'use server';

import { redirect } from 'next/navigation';
import { getDb } from '@/db/client';
import { acceptInvitationSchema } from '@/lib/auth/schemas';
import { acceptInvitation } from '@/lib/dal/invitations';
import { anonymousFormAction } from '@/lib/forms/action';

export const acceptInvitationAction = anonymousFormAction(acceptInvitationSchema, async (input) => {
  await acceptInvitation(getDb(), input);
  redirect('/sign-in?joined=1');
});
