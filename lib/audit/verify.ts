import { asc, gt } from 'drizzle-orm';
import type { Db } from '@/db/client';
import { auditEvent } from '@/db/schema';
import { GENESIS_HASH, hashAuditContent } from './chain';

export type ChainVerdict =
  | { ok: true; checked: number }
  | { ok: false; checked: number; brokenAt: number; reason: string };

/** Walks the whole chain in order, in pages, and names the first row whose links or content do not hold. */
export async function verifyAuditChain(db: Db, pageSize = 5000): Promise<ChainVerdict> {
  let prevHash = GENESIS_HASH;
  let lastSeq = 0;
  let checked = 0;
  for (;;) {
    const rows = await db.select().from(auditEvent).where(gt(auditEvent.seq, lastSeq)).orderBy(asc(auditEvent.seq)).limit(pageSize);
    if (rows.length === 0) return { ok: true, checked };
    for (const row of rows) {
      if (row.prevHash !== prevHash) {
        return { ok: false, checked, brokenAt: row.seq, reason: 'it does not link to the row before it (a row was removed, inserted or reordered)' };
      }
      const expected = hashAuditContent({
        at: row.at.toISOString(),
        actorUserId: row.actorUserId,
        actorOrganisationId: row.actorOrganisationId,
        action: row.action,
        objectType: row.objectType,
        objectId: row.objectId,
        caseId: row.caseId,
        change: row.change,
        origin: row.origin,
        prevHash: row.prevHash,
      });
      if (expected !== row.hash) {
        return { ok: false, checked, brokenAt: row.seq, reason: 'its content does not match its hash (the row was edited)' };
      }
      prevHash = row.hash;
      lastSeq = row.seq;
      checked++;
    }
  }
}
