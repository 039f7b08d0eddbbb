import { closeDb, getDb } from '../db/client';
import { migrate } from '../db/migrate';
import { sendDueReminders } from '../lib/dal/reminders';
import { mailSettled } from '../lib/mail/outbox';

// One run of the reminder job. With the embedded database, run it only while no server holds the
// data folder (the server runs the same job itself every ten minutes).
await migrate();
const result = await sendDueReminders(getDb());
// The reminders were queued; the delivery worker hands them over before the folder is let go.
await mailSettled();
await closeDb();
console.log(`Reminders: ${result.sent} sent, ${result.checked} deadlines looked at.`);
