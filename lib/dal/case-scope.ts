import { sql, type SQL } from 'drizzle-orm';
import { disputeCase } from '@/db/schema';
import type { Actor } from '@/lib/auth/actor';

/**
 * The cases an actor may see, as a WHERE condition: the party's own organisation on the case.
 * An administrator is no party to any case (separation of duties), so sees none.
 */
export function caseVisibility(actor: Actor): SQL {
  switch (actor.role) {
    case 'supplier':
      return sql`${disputeCase.supplierOrganisationId} = ${actor.organisationId}`;
    case 'plant':
      return sql`${disputeCase.plantOrganisationId} = ${actor.organisationId}`;
    case 'lab':
      return sql`${disputeCase.labOrganisationId} = ${actor.organisationId}`;
    case 'arbiter':
      return sql`${disputeCase.boardOrganisationId} = ${actor.organisationId}`;
    default:
      return sql`false`;
  }
}

/**
 * The referee laboratory tests blind: until it has submitted its retest it may not see the
 * original readings, the intake value or the supplier's account of the values.
 */
export function isBlindFor(actor: Actor, retestSubmittedAt: Date | null): boolean {
  return actor.role === 'lab' && retestSubmittedAt === null;
}
