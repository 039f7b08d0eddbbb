import type { Metadata } from 'next';
import { getDb } from '@/db/client';
import { requirePermission } from '@/lib/auth/session';
import { boardOverview, type OutcomeCounts } from '@/lib/dal/decision-board';
import { Card, EmptyState, PageHeader } from '@/components/ui/card';
import { DecisionsByLaboratoryChart, DecisionsByMonthChart, InstrumentChart, SupplierHistoryChart } from '@/components/decision/board-charts-loader';

export const metadata: Metadata = { title: 'Board overview' };

function share(counts: OutcomeCounts): string {
  const total = counts.uphold + counts.reverse + counts.adjust;
  return total === 0 ? '—' : `${Math.round(((counts.reverse + counts.adjust) / total) * 100)} %`;
}

/** A table of the same numbers as the chart beside it: for screen readers, and for anyone who prefers figures. */
function CountsTable({ rows, label }: { rows: ({ key: string } & OutcomeCounts)[]; label: string }) {
  return (
    <table className="mt-3 w-full text-sm">
      <thead>
        <tr className="border-b border-line text-left text-brine">
          <th scope="col" className="py-1 pr-3">{label}</th>
          <th scope="col" className="py-1 pr-3">Upheld</th>
          <th scope="col" className="py-1 pr-3">Reversed</th>
          <th scope="col" className="py-1 pr-3">Adjusted</th>
          <th scope="col" className="py-1">Reversed or adjusted</th>
        </tr>
      </thead>
      <tbody>
        {rows.map((r) => (
          <tr key={r.key} className="border-b border-line/60">
            <th scope="row" className="py-1 pr-3 text-left font-normal">{r.key}</th>
            <td className="py-1 pr-3">{r.uphold}</td>
            <td className="py-1 pr-3">{r.reverse}</td>
            <td className="py-1 pr-3">{r.adjust}</td>
            <td className="py-1">{share(r)}</td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}

export default async function BoardPage() {
  const actor = await requirePermission('case', 'decide');
  const overview = await boardOverview(getDb(), actor);
  const noDecisions = overview.decided === 0;
  return (
    <>
      <PageHeader eyebrow={`Board overview · ${overview.boardName}`} title="How the board’s decisions fall" />
      <div className="grid gap-6">
        <p className="text-sm text-ink-soft">
          {overview.decided} binding decision{overview.decided === 1 ? '' : 's'} of this board, counting a corrected decision once, as corrected. How often intake results are reversed is a quality signal for the plant’s laboratory, not a verdict on it: each case stands on its own record.
        </p>
        <div className="grid gap-6 lg:grid-cols-2">
          <Card id="by-outcome" title="Decisions by outcome, by month">
            {noDecisions ? <EmptyState title="No decisions yet" /> : <DecisionsByMonthChart data={overview.byMonth} />}
            <CountsTable rows={overview.byMonth.map(({ month, ...c }) => ({ key: month, ...c }))} label="Month (UTC)" />
          </Card>
          <Card id="by-laboratory" title="Decisions by referee laboratory">
            {noDecisions ? <EmptyState title="No decisions yet" /> : <DecisionsByLaboratoryChart data={overview.byLaboratory} />}
            <CountsTable rows={overview.byLaboratory.map(({ laboratory, ...c }) => ({ key: laboratory, ...c }))} label="Laboratory" />
          </Card>
        </div>
        <Card id="by-instrument" title="Plant instruments: contested intake results reversed or adjusted, by month">
          {noDecisions ? <EmptyState title="No decisions yet" /> : <InstrumentChart data={overview.byInstrument} />}
          <CountsTable rows={overview.byInstrument.map(({ instrument, total }) => ({ key: instrument, ...total }))} label="Instrument that made the intake result" />
        </Card>
        <Card id="suppliers" title={`Suppliers’ freezing points, last ${overview.historyDays} days, against the limit`}>
          <p className="mb-3 text-sm text-brine">Suppliers with a case before this board. Daily mean and warmest load of the intake results of their farms (corrected results replace the ones they correct).</p>
          {overview.suppliers.length === 0 ? (
            <EmptyState title="No supplier has a case before this board" />
          ) : (
            <div className="grid gap-6 lg:grid-cols-2">
              {overview.suppliers.map((s) => (
                <section key={s.id} aria-labelledby={`supplier-${s.id}`}>
                  <h3 id={`supplier-${s.id}`} className="mb-1 font-bold">
                    {s.name}
                  </h3>
                  {s.days.length === 0 ? <EmptyState title="No intake results in this period" /> : <SupplierHistoryChart supplier={s} limit={overview.upperLimit} />}
                  <p className="mt-1 text-xs text-brine">
                    {s.days.reduce((n, d) => n + d.loads, 0)} loads on {s.days.length} days; disputed: {s.disputed.length ? s.disputed.map((d) => `${d.caseNumber} (${d.day})`).join(', ') : 'none in this period'}.
                  </p>
                </section>
              ))}
            </div>
          )}
        </Card>
      </div>
    </>
  );
}
