import 'server-only';
import { and, asc, eq, gte, isNull, sql, type SQL } from 'drizzle-orm';
import { z } from 'zod';
import type { DbOrTx } from '@/db/client';
import { delivery, disputeCase, intakeResult, organisation, schemeRules, supplierFarm } from '@/db/schema';
import type { Actor } from '@/lib/auth/actor';
import { assertCan } from '@/lib/auth/session';
import { notFound } from '@/lib/errors';
import { rulesInForce } from './rules';

const DAY = 86_400_000;

/** Farms whose history the actor may see: a supplier its own, the plant those that deliver to it. */
function farmVisibility(actor: Actor): SQL {
  if (actor.role === 'supplier') return eq(supplierFarm.organisationId, actor.organisationId);
  if (actor.role === 'plant') {
    return sql`exists (select 1 from ${delivery} where ${delivery.farmId} = ${supplierFarm.id} and ${delivery.plantOrganisationId} = ${actor.organisationId})`;
  }
  return sql`false`;
}

export async function listFarms(db: DbOrTx, actor: Actor) {
  assertCan(actor, 'delivery', 'list');
  return db
    .select({ id: supplierFarm.id, name: supplierFarm.name, herdCode: supplierFarm.herdCode, organisationName: organisation.name })
    .from(supplierFarm)
    .innerJoin(organisation, eq(organisation.id, supplierFarm.organisationId))
    .where(farmVisibility(actor))
    .orderBy(asc(organisation.name), asc(supplierFarm.herdCode));
}

export type FarmHistoryPoint = {
  deliveryId: string;
  reference: string;
  receivedAt: Date;
  valueTenthMilliC: number;
  limitTenthMilliC: number;
  verdict: 'accepted' | 'deducted' | 'rejected';
  rulesVersion: number;
  disputed: boolean;
};

/**
 * The current intake result of every delivery of one farm over the last `days`, oldest first, for
 * a chart of the herd's freezing point against the limit. Someone else's farm answers not found.
 */
export async function farmHistory(db: DbOrTx, actor: Actor, farmId: string, options: { days?: number; now?: Date } = {}) {
  assertCan(actor, 'delivery', 'list');
  if (!z.uuid().safeParse(farmId).success) throw notFound('That farm');
  const now = options.now ?? new Date();
  const days = options.days ?? 60;
  const [farm] = await db
    .select({ id: supplierFarm.id, name: supplierFarm.name, herdCode: supplierFarm.herdCode })
    .from(supplierFarm)
    .where(and(eq(supplierFarm.id, farmId), farmVisibility(actor)));
  if (!farm) throw notFound('That farm');
  const scope = actor.role === 'supplier' ? eq(delivery.supplierOrganisationId, actor.organisationId) : eq(delivery.plantOrganisationId, actor.organisationId);
  const rows = await db
    .select({
      deliveryId: delivery.id,
      reference: delivery.reference,
      receivedAt: delivery.receivedAt,
      valueTenthMilliC: intakeResult.valueTenthMilliC,
      limitTenthMilliC: intakeResult.limitTenthMilliC,
      verdict: intakeResult.verdict,
      rulesVersion: schemeRules.version,
      disputed: sql<boolean>`exists (select 1 from ${disputeCase} where ${disputeCase.intakeResultId} = ${intakeResult.id} and ${disputeCase.status} <> 'withdrawn')`,
    })
    .from(delivery)
    .innerJoin(intakeResult, and(eq(intakeResult.deliveryId, delivery.id), isNull(intakeResult.supersededAt)))
    .innerJoin(schemeRules, eq(schemeRules.id, intakeResult.rulesVersionId))
    .where(and(eq(delivery.farmId, farm.id), scope, gte(delivery.receivedAt, new Date(now.getTime() - days * DAY))))
    .orderBy(asc(delivery.receivedAt));
  const rules = await rulesInForce(db, now);
  const points: FarmHistoryPoint[] = rows.map((r) => ({ ...r, disputed: Boolean(r.disputed) }));
  const accepted = points.filter((p) => p.verdict === 'accepted').map((p) => p.valueTenthMilliC).sort((a, b) => a - b);
  // The herd's own range from its accepted loads: the middle 90 %, so one odd load does not stretch it.
  const range = accepted.length >= 5 ? { low: accepted[Math.floor(accepted.length * 0.05)], high: accepted[Math.ceil(accepted.length * 0.95) - 1] } : null;
  return {
    farm,
    days,
    points,
    range,
    limits: rules ? { upper: rules.rules.limits.upper, lower: rules.rules.limits.lower ?? null, version: rules.version } : null,
  };
}

export type FarmHistory = Awaited<ReturnType<typeof farmHistory>>;
