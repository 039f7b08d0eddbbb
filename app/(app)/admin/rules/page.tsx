import type { Metadata } from 'next';
import { getDb } from '@/db/client';
import { requirePermission } from '@/lib/auth/session';
import { listRulesVersions, rulesInForce } from '@/lib/dal/rules';
import { PageHeader } from '@/components/ui/card';
import { RulesView } from '@/components/rules/rules-view';

export const metadata: Metadata = { title: 'Rules' };

export default async function RulesPage() {
  await requirePermission('rules', 'edit');
  const db = getDb();
  const [current, versions] = await Promise.all([rulesInForce(db), listRulesVersions(db)]);
  return (
    <>
      <PageHeader title="Rules" eyebrow="The scheme’s rules in force" />
      <RulesView current={current} versions={versions} />
    </>
  );
}
