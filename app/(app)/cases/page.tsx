import type { Metadata } from 'next';
import { getDb } from '@/db/client';
import { requirePermission } from '@/lib/auth/session';
import { listCases } from '@/lib/dal/cases';
import { caseListQuerySchema } from '@/lib/dal/cases-query';
import { caseStatuses } from '@/db/schema';
import { Card, PageHeader } from '@/components/ui/card';
import { CaseTable } from '@/components/cases/case-table';
import { Pager } from '@/components/ui/pager';
import { caseStatusLabels } from '@/components/ui/status';
import { Button } from '@/components/ui/button';
import { FormMessage } from '@/components/ui/field';

export const metadata: Metadata = { title: 'Cases' };

export default async function CasesPage({ searchParams }: { searchParams: Promise<Record<string, string | undefined>> }) {
  const actor = await requirePermission('case', 'list');
  const raw = await searchParams;
  const parsed = caseListQuerySchema.safeParse(raw);
  const query = parsed.success ? parsed.data : caseListQuerySchema.parse({});
  const result = await listCases(getDb(), actor, query);
  return (
    <>
      <PageHeader title="Cases" eyebrow={actor.organisationName} />
      <Card>
        <form method="get" className="mb-4 flex flex-wrap items-end gap-3" role="search">
          <label className="flex flex-col text-sm font-bold">
            Search
            <input name="q" defaultValue={raw.q ?? ''} placeholder="Case, delivery, farm or supplier" className="mt-1 w-64 rounded-control border border-line bg-white px-3 py-2 font-normal" />
          </label>
          <label className="flex flex-col text-sm font-bold">
            Status
            <select name="status" defaultValue={raw.status ?? ''} className="mt-1 rounded-control border border-line bg-white px-3 py-2 font-normal">
              <option value="">Any</option>
              {caseStatuses.map((s) => (
                <option key={s} value={s}>
                  {caseStatusLabels[s]}
                </option>
              ))}
            </select>
          </label>
          <label className="flex items-center gap-2 text-sm font-bold">
            <input type="checkbox" name="overdue" value="true" defaultChecked={raw.overdue === 'true'} /> Overdue only
          </label>
          <Button type="submit" variant="secondary">
            Apply
          </Button>
        </form>
        {!parsed.success ? <FormMessage tone="error">Some filters were not understood and were ignored.</FormMessage> : null}
        <CaseTable items={result.items} empty={{ title: 'No case matches.', detail: query.q || query.status ? 'Clear the filters to see every case.' : 'Cases appear here when a supplier contests an intake result.' }} />
        <Pager page={result.page} pageSize={result.pageSize} total={result.total} basePath="/cases" params={{ q: raw.q, status: raw.status, overdue: raw.overdue }} />
      </Card>
    </>
  );
}
