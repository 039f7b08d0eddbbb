import 'server-only';
import { and, desc, eq, inArray } from 'drizzle-orm';
import type { DbOrTx } from '@/db/client';
import { custodyEvent, sample } from '@/db/schema';

/**
 * The sample the case is waiting on or testing now: the latest taken for the case (a further test),
 * else the delivery's retained sample.
 */
export async function currentSample(db: DbOrTx, caseRow: { id: string; deliveryId: string }) {
  const [further] = await db.select().from(sample).where(eq(sample.caseId, caseRow.id)).orderBy(desc(sample.createdAt)).limit(1);
  if (further) return further;
  const [retained] = await db
    .select()
    .from(sample)
    .where(and(eq(sample.deliveryId, caseRow.deliveryId), inArray(sample.kind, ['retained', 'counter'])))
    .orderBy(desc(sample.createdAt))
    .limit(1);
  return retained ?? null;
}

export async function custodyOf(db: DbOrTx, sampleId: string) {
  return db.select().from(custodyEvent).where(eq(custodyEvent.sampleId, sampleId)).orderBy(custodyEvent.at);
}
