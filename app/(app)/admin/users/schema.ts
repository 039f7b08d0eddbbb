import { z } from 'zod';
import { emailSchema } from '@/lib/auth/schemas';

export const inviteSchema = z.object({
  email: emailSchema,
  name: z.string().trim().min(2, 'Enter the person’s name.').max(120),
  role: z.enum(['supplier', 'plant', 'lab', 'arbiter', 'admin'], { error: 'Choose a role.' }),
  organisationId: z.uuid('Choose an organisation.'),
});

export const revokeInvitationSchema = z.object({ invitationId: z.uuid() });
