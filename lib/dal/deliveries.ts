import 'server-only';
import { and, count, desc, eq, gte, inArray, isNull, ne, sql, type SQL } from 'drizzle-orm';
import { z } from 'zod';
import type { DbOrTx } from '@/db/client';
import { delivery, disputeCase, intakeResult, schemeRules, supplierFarm, intakeVerdicts } from '@/db/schema';
import type { Actor } from '@/lib/auth/actor';
import { assertCan } from '@/lib/auth/session';

export const deliveryListQuerySchema = z.object({
  page: z.coerce.number().int().min(1).max(100_000).default(1),
  pageSize: z.coerce.number().int().min(1).max(100).default(25),
  verdict: z
    .string()
    .optional()
    .transform((v) => (v ? v.split(',').filter(Boolean) : undefined))
    .pipe(z.array(z.enum(intakeVerdicts)).optional()),
  farm: z.uuid().optional(),
  sinceDays: z.coerce.number().int().min(1).max(3660).optional(),
});
export type DeliveryListQuery = z.infer<typeof deliveryListQuerySchema>;

function deliveryVisibility(actor: Actor): SQL {
  if (actor.role === 'supplier') return sql`${delivery.supplierOrganisationId} = ${actor.organisationId}`;
  if (actor.role === 'plant') return sql`${delivery.plantOrganisationId} = ${actor.organisationId}`;
  return sql`false`;
}

/**
 * A plant sees every delivery of the year; counting them all on each page view was most of the
 * page's time. The count stops here, and the list says "more than" this many.
 */
export const DELIVERY_COUNT_CAP = 5_000;

/** Deliveries with their current intake result, the contest deadline and any live dispute. */
export async function listDeliveries(db: DbOrTx, actor: Actor, query: DeliveryListQuery, now = new Date(), only?: { deliveryId: string }) {
  assertCan(actor, 'delivery', 'list');
  const filters: SQL[] = [deliveryVisibility(actor), isNull(intakeResult.supersededAt)];
  if (only) filters.push(eq(delivery.id, only.deliveryId));
  if (query.verdict?.length) filters.push(inArray(intakeResult.verdict, query.verdict));
  if (query.farm) filters.push(eq(delivery.farmId, query.farm));
  if (query.sinceDays) filters.push(gte(delivery.receivedAt, new Date(now.getTime() - query.sinceDays * 86_400_000)));
  const where = and(...filters);
  const contestDeadline = sql<string | null>`${intakeResult.notifiedAt} + make_interval(hours => (${schemeRules.rules}->'deadlines'->>'contestHours')::int)`;

  const [rows, [{ total }]] = await Promise.all([
    db
      .select({
        id: delivery.id,
        reference: delivery.reference,
        farmName: supplierFarm.name,
        herdCode: supplierFarm.herdCode,
        receivedAt: delivery.receivedAt,
        volumeLitres: delivery.volumeLitres,
        intakeResultId: intakeResult.id,
        verdict: intakeResult.verdict,
        valueTenthMilliC: intakeResult.valueTenthMilliC,
        limitTenthMilliC: intakeResult.limitTenthMilliC,
        addedWaterBasisPoints: intakeResult.addedWaterBasisPoints,
        amountMinor: intakeResult.amountMinor,
        currency: intakeResult.currency,
        notifiedAt: intakeResult.notifiedAt,
        rulesVersion: schemeRules.version,
        contestDeadline,
        caseId: disputeCase.id,
        caseNumber: disputeCase.number,
      })
      .from(delivery)
      .innerJoin(supplierFarm, eq(supplierFarm.id, delivery.farmId))
      .innerJoin(intakeResult, eq(intakeResult.deliveryId, delivery.id))
      .innerJoin(schemeRules, eq(schemeRules.id, intakeResult.rulesVersionId))
      .leftJoin(disputeCase, and(eq(disputeCase.intakeResultId, intakeResult.id), ne(disputeCase.status, 'withdrawn')))
      .where(where)
      .orderBy(desc(delivery.receivedAt), desc(delivery.reference))
      .limit(query.pageSize)
      .offset((query.page - 1) * query.pageSize),
    db
      .select({ total: count() })
      .from(
        db
          .select({ one: sql`1`.as('one') })
          .from(delivery)
          .innerJoin(intakeResult, eq(intakeResult.deliveryId, delivery.id))
          .where(where)
          .limit(DELIVERY_COUNT_CAP + 1)
          .as('counted'),
      ),
  ]);
  return {
    items: rows.map((row) => {
      const deadline = row.contestDeadline ? new Date(row.contestDeadline) : null;
      return {
        ...row,
        contestDeadline: deadline,
        contestable: row.verdict !== 'accepted' && !row.caseId && deadline !== null && deadline.getTime() > now.getTime(),
      };
    }),
    total: Math.min(total, DELIVERY_COUNT_CAP),
    moreThanTotal: total > DELIVERY_COUNT_CAP,
    page: query.page,
    pageSize: query.pageSize,
  };
}

export type DeliveryListItem = Awaited<ReturnType<typeof listDeliveries>>['items'][number];

/** One delivery as the list shows it, or null when the actor may not see it. */
export async function findDelivery(db: DbOrTx, actor: Actor, deliveryId: string, now = new Date()): Promise<DeliveryListItem | null> {
  const page = await listDeliveries(db, actor, deliveryListQuerySchema.parse({ pageSize: 1 }), now, { deliveryId });
  return page.items[0] ?? null;
}
