import { getDb } from '@/db/client';
import { sendDueReminders } from '@/lib/dal/reminders';
import { deliverQueuedSoon } from '@/lib/mail/outbox';
import { retryFailedMail } from '@/lib/mail/send';

const INTERVAL_MS = 10 * 60_000;
const globalForJobs = globalThis as unknown as { __countersampleJobs?: NodeJS.Timeout };

/**
 * Runs the mail retry and the reminder job in the server process every ten minutes; with the
 * embedded database no other process may. Each run also delivers queued mail whose delivery was cut
 * short (the process died after the commit, or in the hand-over).
 */
export function startScheduler(): void {
  if (globalForJobs.__countersampleJobs) return;
  const run = async () => {
    try {
      await deliverQueuedSoon();
      const retry = await retryFailedMail();
      if (retry.retried) console.log(`Mail retry: ${retry.sent} of ${retry.retried} sent.`);
      const reminders = await sendDueReminders(getDb());
      if (reminders.sent) console.log(`Reminders: ${reminders.sent} sent.`);
    } catch (error) {
      console.error('Scheduled job failed:', error);
    }
  };
  globalForJobs.__countersampleJobs = setInterval(run, INTERVAL_MS);
  globalForJobs.__countersampleJobs.unref();
  setTimeout(run, 15_000).unref();
}
