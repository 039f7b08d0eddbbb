import 'server-only';
import { eq } from 'drizzle-orm';
import type { DbOrTx } from '@/db/client';
import { disputeCase } from '@/db/schema';
import { AppError } from '@/lib/errors';

export const SEALED_CASE_MESSAGE = 'This case is decided and its record is sealed: nothing can be added or changed. A correction is made by the board as a new decision.';

/**
 * For every write that touches a case's record (notes, evidence, custody, readings): refuses once the
 * case is decided, because the sealed record's hash covers all of it. Call it inside the write's
 * transaction, after locking the case row (`select … for update`), so a decision cannot land between
 * the check and the write.
 */
export async function assertCaseNotSealed(tx: DbOrTx, caseId: string): Promise<void> {
  const [row] = await tx.select({ status: disputeCase.status }).from(disputeCase).where(eq(disputeCase.id, caseId));
  if (row?.status === 'decided') throw new AppError('conflict', SEALED_CASE_MESSAGE);
}
