import type { Tx } from '@/db/client';
import type { disputeCase } from '@/db/schema';
import type { Actor } from '@/lib/auth/actor';
import type { SchemeRules } from '@/lib/rules/schema';
import type { CaseNotice } from '@/lib/mail/case-mails';
import type { Audience } from '@/lib/cases/lifecycle';

export type CaseRow = typeof disputeCase.$inferSelect;

/** What each transition's effect gets: the open transaction, the locked case row and the rules it was opened under. */
export type EffectContext<I> = { tx: Tx; actor: Actor; caseRow: CaseRow; input: I; now: Date; rules: SchemeRules };

export type EffectResult = {
  /** Columns of the case to change besides its status. */
  caseChanges?: Partial<Omit<CaseRow, 'id' | 'status'>>;
  /** Recorded in the audit event; never secrets. */
  detail: Record<string, unknown>;
  notice: CaseNotice | ((audience: Audience) => CaseNotice);
};
