'use client';

import Link from 'next/link';
import { usePathname, useRouter, useSearchParams } from 'next/navigation';
import { useQuery, keepPreviousData } from '@tanstack/react-query';
import { createColumnHelper, flexRender, getCoreRowModel, useReactTable, type SortingState } from '@tanstack/react-table';
import { useMemo, useState, type FormEvent } from 'react';
import type { CaseListItem, CaseListPage } from '@/lib/dal/cases';
import { caseStatuses } from '@/lib/enums';
import { caseStatusLabels } from '@/lib/cases/labels';
import { formatCelsius } from '@/lib/temperature';
import { formatMoney } from '@/lib/money/minor-units';
import { formatDate } from '@/lib/format/dates';
import { CaseStatusBadge } from '@/components/ui/status';
import { Deadline } from '@/components/ui/deadline';
import { EmptyState } from '@/components/ui/card';
import { Button } from '@/components/ui/button';
import { FormMessage } from '@/components/ui/field';

type Option = { id: string; name: string };
const column = createColumnHelper<CaseListItem>();
const sortable: Record<string, string> = { number: 'number', status: 'status', deliveredAt: 'deliveredAt', valueTenthMilliC: 'value', dueAt: 'dueAt', openedAt: 'openedAt' };

async function fetchCases(search: string): Promise<CaseListPage> {
  const response = await fetch(`/api/v1/cases?${search}`, { headers: { accept: 'application/json' } });
  if (!response.ok) {
    const problem = (await response.json().catch(() => null)) as { detail?: string } | null;
    throw new Error(problem?.detail ?? `The cases could not be loaded (${response.status}).`);
  }
  return response.json() as Promise<CaseListPage>;
}

/** The cases table: filtering, sorting and paging happen on the server; the filters live in the URL. */
export function CasesExplorer({ initial, initialSearch, suppliers, laboratories }: { initial: CaseListPage; initialSearch: string; suppliers: Option[]; laboratories: Option[] }) {
  const router = useRouter();
  const pathname = usePathname();
  const params = useSearchParams();
  const search = params.toString();
  const [text, setText] = useState(params.get('q') ?? '');

  const query = useQuery({
    queryKey: ['cases', search],
    queryFn: () => fetchCases(search),
    initialData: search === initialSearch ? initial : undefined,
    placeholderData: keepPreviousData,
  });

  const setParams = (changes: Record<string, string | null>) => {
    const next = new URLSearchParams(params);
    for (const [key, value] of Object.entries(changes)) {
      if (value === null || value === '') next.delete(key);
      else next.set(key, value);
    }
    if (!('page' in changes)) next.delete('page');
    router.replace(`${pathname}?${next.toString()}`, { scroll: false });
  };

  const sort = params.get('sort') ?? 'openedAt';
  const order = params.get('order') ?? 'desc';
  const sorting: SortingState = Object.entries(sortable).filter(([, v]) => v === sort).map(([id]) => ({ id, desc: order === 'desc' }));

  const columns = useMemo(
    () => [
      column.accessor('number', { header: 'Case', cell: (c) => <Link className="whitespace-nowrap font-bold" href={`/cases/${c.row.original.id}`}>{c.getValue()}</Link> }),
      column.accessor('status', { header: 'Status', cell: (c) => <CaseStatusBadge status={c.getValue()} /> }),
      column.accessor('supplierName', { header: 'Supplier · farm', enableSorting: false, cell: (c) => <>{c.getValue()}<span className="block text-xs text-brine">{c.row.original.farmName}</span></> }),
      column.accessor('deliveredAt', { header: 'Delivered', cell: (c) => <span className="num">{formatDate(c.getValue())}</span> }),
      column.accessor('valueTenthMilliC', { header: 'Intake result', cell: (c) => (c.getValue() === null ? <span className="text-brine">withheld until retest</span> : <span className="num">{formatCelsius(c.getValue()!)}</span>) }),
      column.accessor('amountMinor', { header: 'At stake', enableSorting: false, cell: (c) => (c.getValue() === null ? '—' : <span className="num">{formatMoney(c.getValue()!, c.row.original.currency)}</span>) }),
      column.accessor('labName', { header: 'Laboratory', enableSorting: false, cell: (c) => c.getValue() ?? <span className="text-brine">not yet</span> }),
      column.accessor('dueAt', { header: 'Next deadline', cell: (c) => (c.getValue() ? <Deadline label="" due={c.getValue()} /> : <span className="text-brine">none</span>) }),
    ],
    [],
  );

  const data = query.data ?? initial;
  const table = useReactTable({
    data: data.items,
    columns,
    getCoreRowModel: getCoreRowModel(),
    manualSorting: true,
    manualPagination: true,
    rowCount: data.total,
    state: { sorting },
  });

  const pages = Math.max(1, Math.ceil(data.total / data.pageSize));
  const onSearch = (event: FormEvent) => {
    event.preventDefault();
    setParams({ q: text.trim() || null });
  };

  return (
    <div>
      <div className="mb-4 flex flex-wrap items-end gap-3">
        <form onSubmit={onSearch} role="search" className="flex items-end gap-2">
          <label className="flex flex-col text-sm font-bold">
            Search
            <input value={text} onChange={(e) => setText(e.target.value)} placeholder="Case, delivery, farm or supplier" className="mt-1 w-64 rounded-control border border-line bg-white px-3 py-2 font-normal" />
          </label>
          <Button type="submit" variant="secondary">Search</Button>
        </form>
        <label className="flex flex-col text-sm font-bold">
          Status
          <select value={params.get('status') ?? ''} onChange={(e) => setParams({ status: e.target.value })} className="mt-1 rounded-control border border-line bg-white px-3 py-2 font-normal">
            <option value="">Any</option>
            <option value="open,awaiting_sample,retest,review">In progress</option>
            {caseStatuses.map((s) => (
              <option key={s} value={s}>{caseStatusLabels[s]}</option>
            ))}
          </select>
        </label>
        {suppliers.length > 1 ? (
          <label className="flex flex-col text-sm font-bold">
            Supplier
            <select value={params.get('supplier') ?? ''} onChange={(e) => setParams({ supplier: e.target.value })} className="mt-1 rounded-control border border-line bg-white px-3 py-2 font-normal">
              <option value="">Any</option>
              {suppliers.map((s) => <option key={s.id} value={s.id}>{s.name}</option>)}
            </select>
          </label>
        ) : null}
        {laboratories.length > 1 ? (
          <label className="flex flex-col text-sm font-bold">
            Laboratory
            <select value={params.get('lab') ?? ''} onChange={(e) => setParams({ lab: e.target.value })} className="mt-1 rounded-control border border-line bg-white px-3 py-2 font-normal">
              <option value="">Any</option>
              {laboratories.map((s) => <option key={s.id} value={s.id}>{s.name}</option>)}
            </select>
          </label>
        ) : null}
        <label className="flex items-center gap-2 pb-2 text-sm font-bold">
          <input type="checkbox" checked={params.get('overdue') === 'true'} onChange={(e) => setParams({ overdue: e.target.checked ? 'true' : null })} /> Overdue only
        </label>
        <span aria-live="polite" className="pb-2 text-sm text-brine">{query.isFetching ? 'Loading…' : `${data.total} case${data.total === 1 ? '' : 's'}`}</span>
      </div>
      {query.isError ? <FormMessage tone="error">{(query.error as Error).message}</FormMessage> : null}
      {data.items.length === 0 ? (
        <EmptyState title="No case matches.">{search ? 'Change or clear the filters to see more.' : 'Cases appear here when a supplier contests an intake result.'}</EmptyState>
      ) : (
        <div className="overflow-x-auto">
          <table className="w-full border-collapse text-sm">
            <thead>
              {table.getHeaderGroups().map((group) => (
                <tr key={group.id} className="border-b border-line text-left text-brine">
                  {group.headers.map((header) => {
                    const key = sortable[header.column.id];
                    const active = key === sort;
                    return (
                      <th key={header.id} scope="col" className="py-2 pr-3" aria-sort={active ? (order === 'asc' ? 'ascending' : 'descending') : undefined}>
                        {key ? (
                          <button type="button" className="font-bold hover:underline" onClick={() => setParams({ sort: key, order: active && order === 'desc' ? 'asc' : 'desc' })}>
                            {flexRender(header.column.columnDef.header, header.getContext())} {active ? (order === 'asc' ? '▲' : '▼') : ''}
                          </button>
                        ) : (
                          flexRender(header.column.columnDef.header, header.getContext())
                        )}
                      </th>
                    );
                  })}
                </tr>
              ))}
            </thead>
            <tbody>
              {table.getRowModel().rows.map((row) => (
                <tr key={row.id} className={`border-b border-line/60 align-top ${row.original.overdue ? 'bg-rust-soft/30' : ''}`}>
                  {row.getVisibleCells().map((cell) => (
                    <td key={cell.id} className="py-2 pr-3">{flexRender(cell.column.columnDef.cell, cell.getContext())}</td>
                  ))}
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
      <nav aria-label="Pages" className="mt-4 flex items-center justify-between text-sm">
        <span className="num text-brine">Page {data.page} of {pages}</span>
        <span className="flex gap-2">
          <Button variant="secondary" disabled={data.page <= 1} onClick={() => setParams({ page: String(data.page - 1) })}>← Previous</Button>
          <Button variant="secondary" disabled={data.page >= pages} onClick={() => setParams({ page: String(data.page + 1) })}>Next →</Button>
        </span>
      </nav>
    </div>
  );
}
