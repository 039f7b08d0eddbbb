import { and, desc, eq, lte, sql } from 'drizzle-orm';
import type { Db, DbOrTx } from '@/db/client';
import { schemeRules } from '@/db/schema';
import type { Actor } from '@/lib/auth/actor';
import { assertCan } from '@/lib/auth/session';
import { recordAudit } from '@/lib/audit/record';
import { invalidInput } from '@/lib/errors';
import { publishRulesSchema, rulesErrorMap } from '@/lib/intake/rules-input';

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

// A published version is never edited (publishRulesVersion only adds), so a version read once can be
// kept for the life of the process: every transition of a case asks for the same one.
const versionsById = new Map<string, RulesVersion>();

export async function rulesVersion(db: DbOrTx, id: string): Promise<RulesVersion | null> {
  const known = versionsById.get(id);
  if (known) return known;
  const [row] = await db.select().from(schemeRules).where(and(eq(schemeRules.id, id))).limit(1);
  if (row) versionsById.set(id, row);
  return row ?? null;
}

export async function listRulesVersions(db: DbOrTx): Promise<RulesVersion[]> {
  return db.select().from(schemeRules).orderBy(desc(schemeRules.version));
}

const RULES_VERSION_LOCK = 0x43535256; // "CSRV": one publisher at a time picks the next version number

/**
 * Publishes a new version of the scheme's rules, in force from `effectiveFrom`. Earlier versions are
 * never edited, so every intake result and case keeps the rules it was made under.
 */
export async function publishRulesVersion(db: Db, actor: Actor, rawInput: unknown, context: { origin?: string; now?: Date } = {}) {
  assertCan(actor, 'rules', 'edit');
  const parsed = publishRulesSchema.safeParse(rawInput, { error: rulesErrorMap });
  if (!parsed.success) throw invalidInput(parsed.error);
  const input = parsed.data;
  return db.transaction(async (tx) => {
    await tx.execute(sql`select pg_advisory_xact_lock(${RULES_VERSION_LOCK})`);
    const [{ next }] = await tx.select({ next: sql<number>`coalesce(max(${schemeRules.version}), 0) + 1` }).from(schemeRules);
    const [row] = await tx
      .insert(schemeRules)
      .values({ version: Number(next), effectiveFrom: input.effectiveFrom, rules: input.rules, note: input.note, createdBy: actor.userId })
      .returning();
    await recordAudit(tx, { actorUserId: actor.userId, actorOrganisationId: actor.organisationId, origin: context.origin, at: context.now }, {
      action: 'rules.version_created',
      objectType: 'scheme_rules',
      objectId: row.id,
      change: { version: row.version, effectiveFrom: row.effectiveFrom.toISOString() },
    });
    return row;
  });
}
