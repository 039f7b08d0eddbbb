import { desc, sql } from 'drizzle-orm';
import { databaseKind, type DbOrTx } from '@/db/client';
import { auditEvent } from '@/db/schema';
import { auditEventSchema, type AuditEventInput } from './events';
import { GENESIS_HASH, hashAuditContent } from './chain';

export type AuditContext = { actorUserId: string | null; actorOrganisationId: string | null; origin?: string | null; at?: Date };

// One chain for the whole database: on a PostgreSQL server, writers queue on this advisory lock, so
// each row links to the one before it. The embedded database runs one transaction at a time for its
// only process (the folder's lock file refuses a second), so there the order is serial already.
const AUDIT_CHAIN_LOCK = 0x43534155; // "CSAU"

/**
 * The row an event becomes when it follows `prevHash` in the chain: its content and that content's
 * hash. The one definition of what is chained, for live writes and for bulk-built datasets alike.
 */
export function chainedRow(context: AuditContext & { at: Date }, input: AuditEventInput, prevHash: string) {
  const event = auditEventSchema.parse(input);
  const content = {
    at: context.at.toISOString(),
    actorUserId: context.actorUserId,
    actorOrganisationId: context.actorOrganisationId,
    action: event.action,
    objectType: event.objectType,
    objectId: event.objectId,
    caseId: event.caseId ?? null,
    change: event.change,
    origin: context.origin ?? null,
    prevHash,
  };
  return { ...content, at: context.at, hash: hashAuditContent(content) };
}

// The hash this process last appended. It may be stale: its transaction rolled back, or another
// server wrote since. It is only ever a guess that the insert below checks.
let lastAppended: string | null = null;

/**
 * Appends one event to the chain. Call it inside the transaction of the change it records. With the
 * head this process last wrote, that is one statement, an insert on condition that the head is
 * still that; otherwise, or when it is not, the head is read first. Every statement saved here is
 * one the case's lock is held for less.
 */
export async function recordAudit(tx: DbOrTx, context: AuditContext, input: AuditEventInput): Promise<void> {
  if (databaseKind() === 'postgres') await tx.execute(sql`select pg_advisory_xact_lock(${AUDIT_CHAIN_LOCK})`);
  const at = context.at ?? new Date();
  const guess = lastAppended;
  if (guess !== null) {
    const row = chainedRow({ ...context, at }, input, guess);
    const appended = await tx.execute(sql`
      insert into ${auditEvent} (at, actor_user_id, actor_organisation_id, action, object_type, object_id, case_id, change, origin, prev_hash, hash)
      select ${row.at.toISOString()}::timestamptz, ${row.actorUserId}, ${row.actorOrganisationId}::uuid, ${row.action}, ${row.objectType}, ${row.objectId},
        ${row.caseId}::uuid, ${JSON.stringify(row.change)}::jsonb, ${row.origin}, ${row.prevHash}, ${row.hash}
      where (select ${auditEvent.hash} from ${auditEvent} order by ${auditEvent.seq} desc limit 1) = ${guess}
      returning seq`);
    if (appended.rows.length === 1) {
      lastAppended = row.hash;
      return;
    }
  }
  const [last] = await tx.select({ hash: auditEvent.hash }).from(auditEvent).orderBy(desc(auditEvent.seq)).limit(1);
  const row = chainedRow({ ...context, at }, input, last?.hash ?? GENESIS_HASH);
  await tx.insert(auditEvent).values(row);
  lastAppended = row.hash;
}
