import { asc, eq } from 'drizzle-orm';
import { closeDb, getDb } from '../db/client';
import { migrate } from '../db/migrate';
import { decision, disputeCase } from '../db/schema';
import { verifySealedDecision } from '../lib/dal/decision-verify';

// Rebuilds the sealed record of a decision from the database, recomputes its SHA-256 and checks the
// signature with the server's key. Give a decision id, or a case number for all of its decisions.
// With the embedded database, stop the server first: only one process may open its data folder.
const target = process.argv[2]?.trim();
if (!target) {
  console.error('Usage: npm run verify:decision <decision id | case number, e.g. CS-2026-0004>');
  process.exit(2);
}

await migrate();
const db = getDb();
let ids: string[];
if (/^CS-\d{4}-\d{4,}$/i.test(target)) {
  const rows = await db.select({ id: decision.id }).from(decision).innerJoin(disputeCase, eq(disputeCase.id, decision.caseId)).where(eq(disputeCase.number, target.toUpperCase())).orderBy(asc(decision.signedAt));
  ids = rows.map((r) => r.id);
} else {
  ids = [target];
}

let failed = ids.length === 0;
if (ids.length === 0) console.error(`No decision found for ${target}.`);
for (const id of ids) {
  const result = /^[0-9a-f-]{36}$/i.test(id) ? await verifySealedDecision(db, id) : null;
  if (!result) {
    console.error(`No decision ${id}.`);
    failed = true;
    continue;
  }
  const label = `${result.caseNumber} decision ${result.decisionId}${result.supersededBy ? ` (superseded by ${result.supersededBy.id})` : ' (current)'}`;
  if (result.ok) {
    console.log(`OK      ${label}\n        record SHA-256 ${result.recomputedSha256} recomputed from the database matches the seal; Ed25519 signature valid (key ${result.signingKeyId}).`);
  } else {
    failed = true;
    console.error(`FAILED  ${label}\n        sealed   ${result.storedSha256 ?? 'none'}\n        now      ${result.recomputedSha256}\n        ${result.problems.join('; ')}.`);
  }
}
await closeDb();
process.exit(failed ? 1 : 0);
