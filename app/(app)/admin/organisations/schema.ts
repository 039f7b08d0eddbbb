import { z } from 'zod';
import { organisationKinds } from '@/lib/enums';

export const addOrganisationSchema = z.object({
  name: z.string().trim().min(3, 'Give the organisation’s name (at least 3 characters).').max(160),
  kind: z.enum(organisationKinds, { error: 'Choose what kind of organisation it is.' }),
  contactEmail: z
    .string()
    .trim()
    .optional()
    .transform((v) => (v ? v : undefined))
    .pipe(z.email('Enter a valid e-mail address, or leave it empty.').optional()),
});
