import { sql, type SQL } from 'drizzle-orm';
import { custodyEvent, disputeCase, sample } from '@/db/schema';
import type { Actor } from '@/lib/auth/actor';

/**
 * The cases an actor may read, as a WHERE condition: the party's own organisation on the case.
 * A laboratory keeps reading a case it once took a sample of, after the board has sent a further
 * portion elsewhere: its retest and its lab sheets stay part of the record it answers for.
 * An administrator is no party to any case (separation of duties), so sees none.
 */
export function caseVisibility(actor: Actor): SQL {
  switch (actor.role) {
    case 'supplier':
      return sql`${disputeCase.supplierOrganisationId} = ${actor.organisationId}`;
    case 'plant':
      return sql`${disputeCase.plantOrganisationId} = ${actor.organisationId}`;
    case 'lab':
      return sql`(${disputeCase.labOrganisationId} = ${actor.organisationId} or exists (
        select 1 from ${sample} inner join ${custodyEvent} on ${custodyEvent.sampleId} = ${sample.id}
        where ${sample.deliveryId} = ${disputeCase.deliveryId} and ${custodyEvent.kind} = 'received' and ${custodyEvent.organisationId} = ${actor.organisationId}))`;
    case 'arbiter':
      return sql`${disputeCase.boardOrganisationId} = ${actor.organisationId}`;
    default:
      return sql`false`;
  }
}

type CaseParties = { supplierOrganisationId: string; plantOrganisationId: string; labOrganisationId: string | null; boardOrganisationId: string };

/**
 * Whether the actor's organisation holds its role on the case now. Only the current holder acts:
 * a former laboratory reads its old work but cannot receive or retest another laboratory's sample.
 */
export function holdsRoleOn(actor: Actor, row: CaseParties): boolean {
  switch (actor.role) {
    case 'supplier':
      return row.supplierOrganisationId === actor.organisationId;
    case 'plant':
      return row.plantOrganisationId === actor.organisationId;
    case 'lab':
      return row.labOrganisationId === actor.organisationId;
    case 'arbiter':
      return row.boardOrganisationId === actor.organisationId;
    default:
      return false;
  }
}

/**
 * The referee laboratory tests blind: until it has submitted its retest it may not see the
 * original readings, the intake value or the supplier's account of the values.
 */
export function isBlindFor(actor: Actor, retestSubmittedAt: Date | null): boolean {
  return actor.role === 'lab' && retestSubmittedAt === null;
}
