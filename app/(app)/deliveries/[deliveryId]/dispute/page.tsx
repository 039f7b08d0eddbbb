import type { Metadata } from 'next';
import Link from 'next/link';
import { notFound } from 'next/navigation';
import { z } from 'zod';
import { getDb } from '@/db/client';
import { requirePermission } from '@/lib/auth/session';
import { findDelivery } from '@/lib/dal/deliveries';
import { Card, DefinitionList, PageHeader } from '@/components/ui/card';
import { VerdictBadge } from '@/components/ui/status';
import { Deadline } from '@/components/ui/deadline';
import { FormMessage } from '@/components/ui/field';
import { OpenDisputeForm } from '@/components/cases/forms/open-dispute-form';
import { formatCelsius } from '@/lib/temperature';
import { formatMoney } from '@/lib/money/minor-units';
import { formatDateTime } from '@/lib/format/dates';

export const metadata: Metadata = { title: 'Open a dispute' };

export default async function OpenDisputePage({ params }: { params: Promise<{ deliveryId: string }> }) {
  const actor = await requirePermission('case', 'open');
  const { deliveryId } = await params;
  if (!z.uuid().safeParse(deliveryId).success) notFound();
  const item = await findDelivery(getDb(), actor, deliveryId);
  if (!item) notFound();

  const refusal =
    item.verdict === 'accepted'
      ? 'This delivery was accepted: there is nothing to contest.'
      : item.caseId
        ? null
        : !item.contestable
          ? `The contest window for this result closed${item.contestDeadline ? ` on ${formatDateTime(item.contestDeadline)}` : ''}. It can no longer be disputed here; your supply contract may offer other ways.`
          : null;

  return (
    <>
      <PageHeader title="Open a dispute" eyebrow={`Delivery ${item.reference}`} />
      <div className="grid gap-6 md:grid-cols-[1fr_2fr]">
        <Card title="The result you contest">
          <DefinitionList
            items={[
              { term: 'Farm', detail: `${item.farmName} (${item.herdCode})` },
              { term: 'Received', detail: formatDateTime(item.receivedAt) },
              { term: 'Volume', detail: `${item.volumeLitres.toLocaleString('en-GB')} l` },
              { term: 'Freezing point', detail: <span className="num">{formatCelsius(item.valueTenthMilliC)}</span> },
              { term: 'Result', detail: <VerdictBadge verdict={item.verdict} /> },
              { term: 'Limit', detail: `${formatCelsius(item.limitTenthMilliC)} (rules v${item.rulesVersion})` },
              { term: 'Withheld', detail: item.amountMinor ? formatMoney(item.amountMinor, item.currency) : '—' },
            ]}
          />
          {item.contestable && item.contestDeadline ? (
            <div className="mt-4">
              <Deadline label="Contest by" due={item.contestDeadline} />
            </div>
          ) : null}
        </Card>
        <Card title="Your dispute">
          {item.caseId ? (
            <FormMessage tone="success">
              This result is already disputed in <Link href={`/cases/${item.caseId}`}>{item.caseNumber}</Link>.
            </FormMessage>
          ) : refusal ? (
            <FormMessage tone="error">{refusal}</FormMessage>
          ) : (
            <>
              <p className="mb-4 text-sm text-ink-soft">
                The sealed retained sample of this load will be retested by the referee laboratory, which does not see the intake value until its own readings are in. The board then decides; its decision is binding under the supply contract.
              </p>
              <OpenDisputeForm intakeResultId={item.intakeResultId} />
            </>
          )}
        </Card>
      </div>
    </>
  );
}
