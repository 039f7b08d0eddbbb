import type { Metadata } from 'next';
import { getDb } from '@/db/client';
import { requirePermission } from '@/lib/auth/session';
import { listRulesVersions, rulesInForce } from '@/lib/dal/rules';
import { Card, PageHeader } from '@/components/ui/card';
import { FormMessage } from '@/components/ui/field';
import { RulesView } from '@/components/rules/rules-view';
import { RulesEditor } from '@/components/rules/rules-editor';
import { defaultSchemeRules } from '@/lib/rules/defaults';
import { formatDateTime } from '@/lib/format/dates';

export const metadata: Metadata = { title: 'Rules' };

export default async function RulesAdminPage({ searchParams }: { searchParams: Promise<{ published?: string }> }) {
  await requirePermission('rules', 'edit');
  const db = getDb();
  const [{ published }, current, versions] = await Promise.all([searchParams, rulesInForce(db), listRulesVersions(db)]);
  const latest = versions[0] ?? null;
  const publishedRow = published ? versions.find((v) => String(v.version) === published) : undefined;
  // A new version starts from the newest one, even one not yet in force, so a scheduled change is not lost.
  const base = latest ?? current;
  return (
    <>
      <PageHeader title="Rules" eyebrow="The scheme’s rules: in force, and their versions" />
      <div className="grid gap-6">
        {publishedRow ? (
          <FormMessage tone="success">
            Version {publishedRow.version} is published, in force from {formatDateTime(publishedRow.effectiveFrom)}. Results and cases made before keep their own version.
          </FormMessage>
        ) : null}
        <RulesView current={current} versions={versions} />
        <Card id="edit" title="Edit the rules">
          <p className="mb-4 text-sm text-ink-soft">
            Saving never changes a version: it publishes a new one, in force from the time you give. Every intake result, calibration check and case keeps the version it was made under, and every screen
            that shows a verdict names it. The form starts from version {base ? base.version : 0}
            {base && current && base.id !== current.id ? ' (scheduled, not yet in force)' : ''}.
          </p>
          {!base ? <p className="mb-4 text-sm text-brine">No version exists yet: the first starts from the product’s example rules.</p> : null}
          <RulesEditor key={latest?.id ?? 'first'} current={base?.rules ?? defaultSchemeRules} currentVersion={latest?.version ?? 0} />
        </Card>
      </div>
    </>
  );
}
