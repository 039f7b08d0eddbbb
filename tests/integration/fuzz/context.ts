import { getDb } from '@/db/client';
import { decision } from '@/db/schema';
import { demoKeys, seedDemoForTests, signIn, demoUser } from '../helpers';
import { realIdsByTable, watchConsoleErrors } from './harness';
import type { FuzzContext } from './registry';

const paramTables: Record<string, string> = { caseId: 'dispute_case', deliveryId: 'delivery', decisionId: 'decision', attachmentId: 'attachment', noteId: 'note', instrumentId: 'instrument' };

/** Seeds the demo, signs every demo account in once, and collects real ids to aim at. */
export async function createFuzzContext(): Promise<FuzzContext & { restoreConsole(): void }> {
  await seedDemoForTests();
  const cookies: Record<string, string | undefined> = { anonymous: undefined };
  for (const key of demoKeys) cookies[key] = await signIn(demoUser(key).email);
  const ids = await realIdsByTable();
  ids.decision_case = (await getDb().select({ caseId: decision.caseId }).from(decision)).map((r) => r.caseId);
  const allIds = [...new Set(Object.values(ids).flat())].sort();
  const watcher = watchConsoleErrors();
  return {
    callerNames: Object.keys(cookies),
    cookieOf: (caller) => cookies[caller],
    anyCookie: cookies[demoKeys[0]]!,
    ids,
    allIds,
    allIdSet: new Set(allIds),
    idsForParam: (name) => ids[paramTables[name] ?? ''] ?? allIds,
    consoleErrors: () => watcher.take(),
    restoreConsole: () => watcher.restore(),
  };
}
