import 'server-only';
import { and, desc, eq, inArray, or, sql } from 'drizzle-orm';
import type { DbOrTx } from '@/db/client';
import { custodyEvent, sample } from '@/db/schema';

/**
 * The sample the case is waiting on or testing now: the latest taken for the case (a further test),
 * else the delivery's retained sample.
 */
export async function currentSample(db: DbOrTx, caseRow: { id: string; deliveryId: string }) {
  // One statement for both: transitions call this with the case locked, and each statement there holds the lock longer.
  const [current] = await db
    .select()
    .from(sample)
    .where(or(eq(sample.caseId, caseRow.id), and(eq(sample.deliveryId, caseRow.deliveryId), inArray(sample.kind, ['retained', 'counter']))))
    .orderBy(desc(sql`coalesce(${sample.caseId} = ${caseRow.id}, false)`), desc(sample.createdAt))
    .limit(1);
  return current ?? null;
}

export async function custodyOf(db: DbOrTx, sampleId: string) {
  return db.select().from(custodyEvent).where(eq(custodyEvent.sampleId, sampleId)).orderBy(custodyEvent.at);
}
