import { desc, sql } from 'drizzle-orm';
import type { DbOrTx } from '@/db/client';
import { auditEvent } from '@/db/schema';
import { auditEventSchema, type AuditEventInput } from './events';
import { GENESIS_HASH, hashAuditContent } from './chain';

export type AuditContext = { actorUserId: string | null; actorOrganisationId: string | null; origin?: string | null; at?: Date };

// One chain for the whole database: writers queue on this advisory lock, so each row links to the one before it.
const AUDIT_CHAIN_LOCK = 0x43534155; // "CSAU"

/** Appends one event to the chain. Call it inside the transaction of the change it records. */
export async function recordAudit(tx: DbOrTx, context: AuditContext, input: AuditEventInput): Promise<void> {
  const event = auditEventSchema.parse(input);
  await tx.execute(sql`select pg_advisory_xact_lock(${AUDIT_CHAIN_LOCK})`);
  const [last] = await tx.select({ hash: auditEvent.hash }).from(auditEvent).orderBy(desc(auditEvent.seq)).limit(1);
  const at = (context.at ?? new Date()).toISOString();
  const content = {
    at,
    actorUserId: context.actorUserId,
    actorOrganisationId: context.actorOrganisationId,
    action: event.action,
    objectType: event.objectType,
    objectId: event.objectId,
    caseId: event.caseId ?? null,
    change: event.change,
    origin: context.origin ?? null,
    prevHash: last?.hash ?? GENESIS_HASH,
  };
  await tx.insert(auditEvent).values({ ...content, at: new Date(at), hash: hashAuditContent(content) });
}
