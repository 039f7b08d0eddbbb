import 'server-only';
import { and, asc, count, desc, eq, ilike, inArray, or, sql, type SQL } from 'drizzle-orm';
import { alias, type PgSelect } from 'drizzle-orm/pg-core';
import type { DbOrTx } from '@/db/client';
import { disputeCase, intakeResult, organisation, supplierFarm, type CaseStatus } from '@/db/schema';
import type { Actor } from '@/lib/auth/actor';
import { AppError } from '@/lib/errors';
import { can } from '@/lib/auth/permissions';
import { caseVisibility, isBlindFor } from './case-scope';
import type { CaseListQuery } from './cases-query';

const supplierOrg = alias(organisation, 'supplier_org');
const labOrg = alias(organisation, 'lab_org');

/** The deadline that matters in each state: dispatch, then the sample's validity, then the board's decision. */
export const caseDueAt = sql<Date | null>`case ${disputeCase.status}
  when 'open' then ${disputeCase.dispatchDueAt}
  when 'awaiting_sample' then ${disputeCase.sampleValidUntil}
  when 'retest' then ${disputeCase.sampleValidUntil}
  when 'review' then ${disputeCase.decisionDueAt}
  else null end`;

export type CaseListItem = {
  id: string;
  number: string;
  status: CaseStatus;
  supplierName: string;
  farmName: string;
  deliveryReference: string;
  deliveredAt: string;
  verdict: 'accepted' | 'deducted' | 'rejected' | null;
  valueTenthMilliC: number | null;
  amountMinor: number | null;
  currency: string;
  labName: string | null;
  openedAt: string;
  dueAt: string | null;
  overdue: boolean;
};

export type CaseListPage = { items: CaseListItem[]; total: number; page: number; pageSize: number };

function listFilters(actor: Actor, query: CaseListQuery, now: Date): SQL {
  const filters: SQL[] = [caseVisibility(actor)];
  if (query.status?.length) filters.push(inArray(disputeCase.status, query.status));
  if (query.supplier) filters.push(eq(disputeCase.supplierOrganisationId, query.supplier));
  if (query.lab) filters.push(eq(disputeCase.labOrganisationId, query.lab));
  if (query.overdue === true) filters.push(sql`${caseDueAt} < ${now}`);
  if (query.overdue === false) filters.push(sql`(${caseDueAt} is null or ${caseDueAt} >= ${now})`);
  if (query.q) {
    const pattern = `%${query.q.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
    // Farm and supplier names are matched in their own small tables; the delivery's reference and farm are on the case.
    filters.push(
      or(
        ilike(disputeCase.number, pattern),
        ilike(disputeCase.deliveryReference, pattern),
        sql`${disputeCase.farmId} in (select ${supplierFarm.id} from ${supplierFarm} where ${supplierFarm.name} ilike ${pattern})`,
        sql`${disputeCase.supplierOrganisationId} in (select ${organisation.id} from ${organisation} where ${organisation.name} ilike ${pattern})`,
      )!,
    );
  }
  return and(...filters)!;
}

const sortColumns = {
  openedAt: disputeCase.openedAt,
  number: disputeCase.number,
  status: disputeCase.status,
  dueAt: caseDueAt,
  deliveredAt: disputeCase.deliveredAt,
  value: intakeResult.valueTenthMilliC,
} as const;

/**
 * The cases an actor may see, filtered, sorted and paged in the database. First the page's ids and
 * the total, joining only what the filters and the sort read; then the columns of those rows alone.
 * With thousands of visible cases, joining every one to its delivery, farm, supplier and result to
 * keep fifty (and again to count them) was most of the time.
 */
export async function listCases(db: DbOrTx, actor: Actor, query: CaseListQuery, now = new Date()): Promise<CaseListPage> {
  if (!can(actor.role, 'case', 'list')) throw new AppError('forbidden', 'Your role does not work on cases.');
  const where = listFilters(actor, query, now);
  // The selections are fixed before joining, so a join changes which rows come back, not their type.
  const joinsFor = <T extends PgSelect>(select: T): T => {
    const joined = query.sort === 'value' ? (select.innerJoin(intakeResult, eq(intakeResult.id, disputeCase.intakeResultId)) as unknown as T) : select;
    return joined.where(where) as T;
  };

  const sortColumn: SQL | (typeof sortColumns)[Exclude<keyof typeof sortColumns, 'dueAt'>] = sortColumns[query.sort];
  const page = await joinsFor(db.select({ id: disputeCase.id, total: sql<number>`count(*) over ()`.mapWith(Number) }).from(disputeCase).$dynamic())
    .orderBy(query.order === 'asc' ? asc(sortColumn) : desc(sortColumn), desc(disputeCase.number))
    .limit(query.pageSize)
    .offset((query.page - 1) * query.pageSize);
  // A page past the end has no row to carry the total.
  const total = page.length ? page[0].total : query.page > 1 ? (await joinsFor(db.select({ total: count() }).from(disputeCase).$dynamic()))[0].total : 0;
  const position = new Map(page.map((p, index) => [p.id, index]));
  const rows = page.length
    ? (
        await db
          .select({
            id: disputeCase.id,
            number: disputeCase.number,
            status: disputeCase.status,
            supplierName: supplierOrg.name,
            farmName: supplierFarm.name,
            deliveryReference: disputeCase.deliveryReference,
            deliveredAt: disputeCase.deliveredAt,
            verdict: intakeResult.verdict,
            valueTenthMilliC: intakeResult.valueTenthMilliC,
            amountMinor: intakeResult.amountMinor,
            currency: intakeResult.currency,
            labName: labOrg.name,
            openedAt: disputeCase.openedAt,
            dueAt: caseDueAt,
            retestSubmittedAt: disputeCase.retestSubmittedAt,
          })
          .from(disputeCase)
          .innerJoin(supplierFarm, eq(supplierFarm.id, disputeCase.farmId))
          .innerJoin(supplierOrg, eq(supplierOrg.id, disputeCase.supplierOrganisationId))
          .innerJoin(intakeResult, eq(intakeResult.id, disputeCase.intakeResultId))
          .leftJoin(labOrg, eq(labOrg.id, disputeCase.labOrganisationId))
          .where(inArray(disputeCase.id, [...position.keys()]))
      ).sort((a, b) => position.get(a.id)! - position.get(b.id)!)
    : [];

  return {
    items: rows.map(({ retestSubmittedAt, ...row }) => {
      const blind = isBlindFor(actor, retestSubmittedAt);
      const dueAt = row.dueAt ? new Date(row.dueAt) : null;
      return {
        ...row,
        verdict: blind ? null : row.verdict,
        valueTenthMilliC: blind ? null : row.valueTenthMilliC,
        amountMinor: blind ? null : row.amountMinor,
        deliveredAt: row.deliveredAt.toISOString(),
        openedAt: row.openedAt.toISOString(),
        dueAt: dueAt ? dueAt.toISOString() : null,
        overdue: dueAt !== null && dueAt.getTime() < now.getTime(),
      };
    }),
    total,
    page: query.page,
    pageSize: query.pageSize,
  };
}

/** The bare case row if the actor may see it; otherwise not found, exactly as for a missing id. */
export async function findVisibleCase(db: DbOrTx, actor: Actor, caseId: string) {
  if (!can(actor.role, 'case', 'read')) throw new AppError('not_found', 'That case was not found.');
  const [row] = await db
    .select()
    .from(disputeCase)
    .where(and(eq(disputeCase.id, caseId), caseVisibility(actor)));
  if (!row) throw new AppError('not_found', 'That case was not found.');
  return row;
}

/** The suppliers and laboratories that appear on the actor's cases, for the list's filters. */
export async function caseFilterOptions(db: DbOrTx, actor: Actor) {
  if (!can(actor.role, 'case', 'list')) return { suppliers: [], laboratories: [] };
  const [suppliers, laboratories] = await Promise.all([
    db.selectDistinct({ id: supplierOrg.id, name: supplierOrg.name }).from(disputeCase).innerJoin(supplierOrg, eq(supplierOrg.id, disputeCase.supplierOrganisationId)).where(caseVisibility(actor)).orderBy(supplierOrg.name),
    db.selectDistinct({ id: labOrg.id, name: labOrg.name }).from(disputeCase).innerJoin(labOrg, eq(labOrg.id, disputeCase.labOrganisationId)).where(caseVisibility(actor)).orderBy(labOrg.name),
  ]);
  return { suppliers, laboratories };
}
