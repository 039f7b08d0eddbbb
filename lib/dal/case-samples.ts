import 'server-only';
import { and, desc, eq, inArray, or, sql } from 'drizzle-orm';
import type { DbOrTx } from '@/db/client';
import { custodyEvent, disputeCase, sample } from '@/db/schema';

/**
 * The sample the case is waiting on or testing now: the latest taken for the case (a further test),
 * else the delivery's retained sample. Without the delivery's id the case row gives it, so a
 * transition can ask in the same message as it locks the case.
 */
export async function currentSample(db: DbOrTx, caseRow: { id: string; deliveryId?: string }) {
  const deliveryId = caseRow.deliveryId ?? sql`(select ${disputeCase.deliveryId} from ${disputeCase} where ${disputeCase.id} = ${caseRow.id})`;
  const [current] = await db
    .select()
    .from(sample)
    .where(or(eq(sample.caseId, caseRow.id), and(eq(sample.deliveryId, deliveryId), inArray(sample.kind, ['retained', 'counter']))))
    .orderBy(desc(sql`coalesce(${sample.caseId} = ${caseRow.id}, false)`), desc(sample.createdAt))
    .limit(1);
  return current ?? null;
}

export type CurrentSample = NonNullable<Awaited<ReturnType<typeof currentSample>>>;

export async function custodyOf(db: DbOrTx, sampleId: string) {
  return db.select().from(custodyEvent).where(eq(custodyEvent.sampleId, sampleId)).orderBy(custodyEvent.at);
}
