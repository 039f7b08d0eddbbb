import type { Metadata } from 'next';
import { getDb } from '@/db/client';
import { requirePermission } from '@/lib/auth/session';
import { listDeliveries, deliveryListQuerySchema } from '@/lib/dal/deliveries';
import { Card, PageHeader } from '@/components/ui/card';
import { DeliveryTable } from '@/components/deliveries/delivery-table';
import { Pager } from '@/components/ui/pager';
import { Button } from '@/components/ui/button';

export const metadata: Metadata = { title: 'Deliveries' };

export default async function DeliveriesPage({ searchParams }: { searchParams: Promise<Record<string, string | undefined>> }) {
  const actor = await requirePermission('delivery', 'list');
  const raw = await searchParams;
  const parsed = deliveryListQuerySchema.safeParse(raw);
  const query = parsed.success ? parsed.data : deliveryListQuerySchema.parse({});
  const result = await listDeliveries(getDb(), actor, query);
  return (
    <>
      <PageHeader title="Deliveries" eyebrow={actor.organisationName} />
      <Card>
        <form method="get" className="mb-4 flex flex-wrap items-end gap-3">
          <label className="flex flex-col text-sm font-bold">
            Result
            <select name="verdict" defaultValue={raw.verdict ?? ''} className="mt-1 rounded-control border border-line bg-white px-3 py-2 font-normal">
              <option value="">Any</option>
              <option value="rejected,deducted">Rejected or deducted</option>
              <option value="rejected">Rejected</option>
              <option value="deducted">Deducted</option>
              <option value="accepted">Accepted</option>
            </select>
          </label>
          <Button type="submit" variant="secondary">
            Apply
          </Button>
        </form>
        <DeliveryTable items={result.items} showContest={actor.role === 'supplier'} empty={{ title: 'No delivery matches.' }} />
        <Pager page={result.page} pageSize={result.pageSize} total={result.total} basePath="/deliveries" params={{ verdict: raw.verdict }} />
      </Card>
    </>
  );
}
