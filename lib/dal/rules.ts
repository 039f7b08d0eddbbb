import { and, desc, eq, lte } from 'drizzle-orm';
import type { DbOrTx } from '@/db/client';
import { schemeRules } from '@/db/schema';

export type RulesVersion = typeof schemeRules.$inferSelect;

/** The version in force at a moment: the latest that took effect at or before it. */
export async function rulesInForce(db: DbOrTx, at: Date = new Date()): Promise<RulesVersion | null> {
  const [row] = await db
    .select()
    .from(schemeRules)
    .where(lte(schemeRules.effectiveFrom, at))
    .orderBy(desc(schemeRules.effectiveFrom), desc(schemeRules.version))
    .limit(1);
  return row ?? null;
}

export async function rulesVersion(db: DbOrTx, id: string): Promise<RulesVersion | null> {
  const [row] = await db.select().from(schemeRules).where(and(eq(schemeRules.id, id))).limit(1);
  return row ?? null;
}

export async function listRulesVersions(db: DbOrTx): Promise<RulesVersion[]> {
  return db.select().from(schemeRules).orderBy(desc(schemeRules.version));
}
