import type { Metadata } from 'next';
import Link from 'next/link';
import { getDb } from '@/db/client';
import { requirePermission } from '@/lib/auth/session';
import { intakeFormData } from '@/lib/dal/intake';
import { Card, EmptyState, PageHeader } from '@/components/ui/card';
import { IntakeForm } from '@/components/intake/intake-form';
import { formatDateTime } from '@/lib/format/dates';

export const metadata: Metadata = { title: 'Record an intake' };

export default async function IntakePage() {
  const actor = await requirePermission('intake', 'record');
  const { farms, instruments, rules } = await intakeFormData(getDb(), actor);
  return (
    <>
      <PageHeader title="Record an intake" eyebrow={actor.organisationName} />
      {!rules ? (
        <EmptyState title="No scheme rules are in force">An administrator must publish the scheme’s rules before intake results can be recorded.</EmptyState>
      ) : instruments.length === 0 ? (
        <EmptyState title="No instrument is registered for your laboratory">
          Register a cryoscope on the <Link href="/instruments">Instruments</Link> page and run its calibration check first.
        </EmptyState>
      ) : (
        <Card>
          <p className="mb-4 text-sm text-ink-soft">
            Judged under <Link href="/rules">{rules.rules.name}, version {rules.version}</Link> (in force since {formatDateTime(rules.effectiveFrom)}) unless the sample was tested under an earlier version. Every
            result records the instrument check and the rules it rests on.
          </p>
          <IntakeForm farms={farms} instruments={instruments} rules={rules.rules} rulesVersion={rules.version} analystName={actor.name} />
        </Card>
      )}
    </>
  );
}
