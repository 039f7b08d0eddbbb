import 'server-only';
import { and, inArray, isNotNull, lte } from 'drizzle-orm';
import type { Db } from '@/db/client';
import { disputeCase, reminderSent } from '@/db/schema';
import type { Audience } from '@/lib/cases/lifecycle';
import { formatDateTime } from '@/lib/format/dates';
import { notifyCase } from '@/lib/mail/case-mails';
import { mailAfterCommit } from '@/lib/mail/outbox';

const HOUR = 3_600_000;

/** Each deadline: the state it applies in, who must act, and how long before it a "due soon" reminder goes out. */
const deadlines = [
  { kind: 'dispatch', status: 'open', column: 'dispatchDueAt', audience: ['plant'], soonHours: 2, what: 'dispatch the retained sample' },
  { kind: 'sample_validity', status: 'awaiting_sample', column: 'sampleValidUntil', audience: ['lab', 'plant'], soonHours: 12, what: 'receive and retest the sample before it expires' },
  { kind: 'sample_validity', status: 'retest', column: 'sampleValidUntil', audience: ['lab'], soonHours: 12, what: 'retest the sample before it expires' },
  { kind: 'decision', status: 'review', column: 'decisionDueAt', audience: ['board'], soonHours: 24, what: 'decide the case' },
] as const;

export type ReminderRun = { sent: number; checked: number };

/**
 * Sends the reminders that are due: once when a deadline draws near, once when it has passed. The
 * unique row in reminder_sent is claimed in the transaction that queues the notice, so two runs (or two server
 * instances) never send the same reminder twice.
 */
export async function sendDueReminders(db: Db, now: Date = new Date()): Promise<ReminderRun> {
  let sent = 0;
  let checked = 0;
  for (const d of deadlines) {
    const column = disputeCase[d.column];
    const horizon = new Date(now.getTime() + d.soonHours * HOUR);
    const cases = await db
      .select()
      .from(disputeCase)
      .where(and(inArray(disputeCase.status, [d.status]), isNotNull(column), lte(column, horizon)));
    for (const row of cases) {
      checked++;
      const dueAt = row[d.column]!;
      const overdue = dueAt.getTime() <= now.getTime();
      const kind = `${d.kind}:${overdue ? 'overdue' : 'soon'}`;
      // The claim and the queued notice are one transaction: a crash leaves both or neither.
      const claimed = await db.transaction(async (tx) => {
        const rows = await tx.insert(reminderSent).values({ caseId: row.id, kind, dueAt, sentAt: now }).onConflictDoNothing().returning({ id: reminderSent.id });
        if (rows.length === 0) return false;
        await notifyCase(tx, row, d.audience as readonly Audience[], {
          template: `reminder-${d.kind}`,
          subject: overdue ? `overdue: ${d.what}` : `due soon: ${d.what}`,
          headline: overdue ? `The deadline to ${d.what} passed on ${formatDateTime(dueAt)}.` : `Please ${d.what} by ${formatDateTime(dueAt)}.`,
          lines: [overdue ? 'The case is flagged as overdue in every list until it moves on.' : 'This is the only reminder before the deadline; another follows if it passes.'],
        });
        return true;
      });
      if (!claimed) continue;
      sent++;
    }
  }
  if (sent > 0) await mailAfterCommit();
  return { sent, checked };
}
