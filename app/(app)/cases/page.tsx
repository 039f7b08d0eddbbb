import type { Metadata } from 'next';
import { Suspense } from 'react';
import { getDb } from '@/db/client';
import { requirePermission } from '@/lib/auth/session';
import { caseFilterOptions, listCases } from '@/lib/dal/cases';
import { caseListQuerySchema } from '@/lib/dal/cases-query';
import { Card, PageHeader } from '@/components/ui/card';
import { CasesExplorer } from '@/components/cases/cases-explorer';
import { FormMessage } from '@/components/ui/field';

export const metadata: Metadata = { title: 'Cases' };

export default async function CasesPage({ searchParams }: { searchParams: Promise<Record<string, string | undefined>> }) {
  const actor = await requirePermission('case', 'list');
  const raw = await searchParams;
  const parsed = caseListQuerySchema.safeParse(raw);
  const db = getDb();
  const [initial, options] = await Promise.all([listCases(db, actor, parsed.success ? parsed.data : caseListQuerySchema.parse({})), caseFilterOptions(db, actor)]);
  const initialSearch = new URLSearchParams(Object.entries(raw).filter((e): e is [string, string] => typeof e[1] === 'string')).toString();
  return (
    <>
      <PageHeader title="Cases" eyebrow={actor.organisationName} />
      <Card>
        {!parsed.success ? <FormMessage tone="error">Some filters in the address were not understood; showing all cases instead.</FormMessage> : null}
        <Suspense>
          <CasesExplorer initial={initial} initialSearch={parsed.success ? initialSearch : ''} suppliers={options.suppliers} laboratories={options.laboratories} />
        </Suspense>
      </Card>
    </>
  );
}
