import { closeDb, getDb } from '../db/client';
import { migrate } from '../db/migrate';
import { verifyAuditChain } from '../lib/audit/verify';

// Walks the whole audit chain and names the first row that does not hold. With the embedded
// database, stop the server first: only one process may open its data folder.
await migrate();
const verdict = await verifyAuditChain(getDb());
await closeDb();
if (verdict.ok) {
  console.log(`Audit chain intact: ${verdict.checked} events checked.`);
} else {
  console.error(`Audit chain BROKEN at event #${verdict.brokenAt}: ${verdict.reason}. ${verdict.checked} events before it verified.`);
  process.exit(1);
}
