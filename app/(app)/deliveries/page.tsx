import type { Metadata } from 'next';
import { z } from 'zod';
import { getDb } from '@/db/client';
import { can } from '@/lib/auth/permissions';
import { requirePermission } from '@/lib/auth/session';
import { listDeliveries, deliveryListQuerySchema } from '@/lib/dal/deliveries';
import { farmHistory, listFarms } from '@/lib/dal/intake-history';
import { Card, EmptyState, PageHeader } from '@/components/ui/card';
import { DeliveryTable } from '@/components/deliveries/delivery-table';
import { FarmHistorySection } from '@/components/deliveries/farm-history';
import { Pager } from '@/components/ui/pager';
import { Button, ButtonLink } from '@/components/ui/button';

export const metadata: Metadata = { title: 'Deliveries' };

const selectClass = 'mt-1 rounded-control border border-line bg-white px-3 py-2 font-normal';

export default async function DeliveriesPage({ searchParams }: { searchParams: Promise<Record<string, string | undefined>> }) {
  const actor = await requirePermission('delivery', 'list');
  const raw = await searchParams;
  const parsed = deliveryListQuerySchema.safeParse(raw);
  const query = parsed.success ? parsed.data : deliveryListQuerySchema.parse({});
  const db = getDb();
  const farms = await listFarms(db, actor);
  // An unknown farm id (or someone else's) is simply not one of the actor's farms: nothing is filtered by it.
  const chosenFarm = z.uuid().safeParse(raw.farm).success ? farms.find((f) => f.id === raw.farm) : undefined;
  const tableQuery = { ...query, farm: chosenFarm?.id };
  const historyFarm = chosenFarm ?? (actor.role === 'supplier' ? farms[0] : undefined);
  const [result, history] = await Promise.all([listDeliveries(db, actor, tableQuery), historyFarm ? farmHistory(db, actor, historyFarm.id) : Promise.resolve(null)]);
  return (
    <>
      <PageHeader title="Deliveries" eyebrow={actor.organisationName}>
        {can(actor.role, 'intake', 'record') ? <ButtonLink href="/intake">Record an intake</ButtonLink> : null}
      </PageHeader>
      <div className="grid gap-6">
        <form method="get" className="flex flex-wrap items-end gap-3">
          <label className="flex flex-col text-sm font-bold">
            Farm
            <select name="farm" defaultValue={chosenFarm?.id ?? ''} className={selectClass}>
              <option value="">All farms</option>
              {farms.map((f) => (
                <option key={f.id} value={f.id}>
                  {f.herdCode} · {f.name}
                </option>
              ))}
            </select>
          </label>
          <label className="flex flex-col text-sm font-bold">
            Result
            <select name="verdict" defaultValue={raw.verdict ?? ''} className={selectClass}>
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
        <Card id="history" title="Freezing-point history">
          {history ? <FarmHistorySection history={history} /> : <EmptyState title="Choose a farm to see its freezing-point history against the limit." />}
        </Card>
        <Card id="deliveries" title={chosenFarm ? `Deliveries of ${chosenFarm.name}` : 'Deliveries'}>
          <DeliveryTable items={result.items} showContest={actor.role === 'supplier'} empty={{ title: 'No delivery matches.' }} />
          <Pager page={result.page} pageSize={result.pageSize} total={result.total} moreThanTotal={result.moreThanTotal} basePath="/deliveries" params={{ verdict: raw.verdict, farm: chosenFarm?.id }} />
        </Card>
      </div>
    </>
  );
}
