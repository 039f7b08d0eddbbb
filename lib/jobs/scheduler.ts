import { getDb } from '@/db/client';
import { sendDueReminders } from '@/lib/dal/reminders';

const INTERVAL_MS = 10 * 60_000;
const globalForJobs = globalThis as unknown as { __countersampleJobs?: NodeJS.Timeout };

/** Runs the reminder job in the server process every ten minutes; with the embedded database no other process may. */
export function startScheduler(): void {
  if (globalForJobs.__countersampleJobs) return;
  const run = () =>
    sendDueReminders(getDb()).then(
      (result) => result.sent && console.log(`Reminders: ${result.sent} sent.`),
      (error) => console.error('Reminder job failed:', error),
    );
  globalForJobs.__countersampleJobs = setInterval(run, INTERVAL_MS);
  globalForJobs.__countersampleJobs.unref();
  setTimeout(run, 15_000).unref();
}
