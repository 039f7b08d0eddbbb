import type { OrganisationKind } from '@/lib/enums';
import type { Role } from './permissions';

/** Who is acting: what every data-access function takes and scopes by. Never the whole user row. */
export type Actor = {
  userId: string;
  sessionId: string;
  name: string;
  email: string;
  role: Role;
  organisationId: string;
  organisationName: string;
  organisationKind: OrganisationKind;
};
