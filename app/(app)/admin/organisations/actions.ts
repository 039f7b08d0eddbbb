'use server';

import { revalidatePath } from 'next/cache';
import { getDb } from '@/db/client';
import { addOrganisation } from '@/lib/dal/admin';
import { formAction } from '@/lib/forms/action';
import { addOrganisationSchema } from './schema';

export const addOrganisationAction = formAction(addOrganisationSchema, async (input, actor) => {
  const row = await addOrganisation(getDb(), actor, input);
  revalidatePath('/admin/organisations');
  return { ok: true, message: `${row.name} was added.` };
});
