import type { SQLWrapper } from 'drizzle-orm';
import type { Tx } from '@/db/client';
import type { disputeCase } from '@/db/schema';
import type { Actor } from '@/lib/auth/actor';
import type { SchemeRules } from '@/lib/rules/schema';
import type { CaseNotice } from '@/lib/mail/case-mails';
import type { Audience } from '@/lib/cases/lifecycle';
import type { CurrentSample } from '../case-samples';

export type CaseRow = typeof disputeCase.$inferSelect;

/**
 * What each transition's effect gets: the open transaction, the locked case row, the sample the case
 * is on (read with the lock) and the rules it was opened under.
 */
export type EffectContext<I> = { tx: Tx; actor: Actor; caseRow: CaseRow; sample: CurrentSample | null; input: I; now: Date; rules: SchemeRules };

export type EffectResult = {
  /** Columns of the case to change besides its status. */
  caseChanges?: Partial<Omit<CaseRow, 'id' | 'status'>>;
  /** Recorded in the audit event; never secrets. */
  detail: Record<string, unknown>;
  notice: CaseNotice | ((audience: Audience) => CaseNotice);
  /**
   * Inserts whose answers nobody needs, such as custody events: they become part of the one
   * statement that updates the case and queues its notices, so the lock waits for them once.
   */
  writes?: SQLWrapper[];
};
