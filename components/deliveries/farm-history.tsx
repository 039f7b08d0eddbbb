import type { FarmHistory } from '@/lib/dal/intake-history';
import { formatCelsius } from '@/lib/temperature';
import { EmptyState } from '@/components/ui/card';
import { FarmHistoryChartLoader } from './farm-history-chart-loader';

/** A farm's recent intake results as a chart against the limit, with the counts beside it in words. */
export function FarmHistorySection({ history }: { history: FarmHistory }) {
  if (!history.limits) return <EmptyState title="No scheme rules are in force, so there is no limit to draw." />;
  if (history.points.length === 0) return <EmptyState title={`No delivery of ${history.farm.name} in the last ${history.days} days.`} />;
  const counts = { accepted: 0, deducted: 0, rejected: 0 };
  for (const p of history.points) counts[p.verdict]++;
  const disputed = history.points.filter((p) => p.disputed).length;
  return (
    <div className="grid gap-3">
      <p className="text-sm text-ink-soft">
        {history.farm.name} ({history.farm.herdCode}), last {history.days} days: {history.points.length} deliveries, {counts.accepted} accepted, {counts.deducted} deducted, {counts.rejected} rejected
        {disputed ? `, ${disputed} disputed` : ''}.
        {history.range ? ` Usual range of the herd: ${formatCelsius(history.range.low)} to ${formatCelsius(history.range.high)}.` : ''} Limit in force: {formatCelsius(Math.round(history.limits.upper * 10_000))} (rules v
        {history.limits.version}).
      </p>
      <FarmHistoryChartLoader
        points={history.points.map((p) => ({ at: new Date(p.receivedAt).getTime(), value: p.valueTenthMilliC / 10_000, verdict: p.verdict, disputed: p.disputed, reference: p.reference, rulesVersion: p.rulesVersion }))}
        upper={history.limits.upper}
        lower={history.limits.lower}
        range={history.range ? { low: history.range.low / 10_000, high: history.range.high / 10_000 } : null}
      />
      <p className="text-xs text-brine">
        A herd’s freezing point moves with season, feed, breed, stage of lactation and water access. A load above the limit is not proof of added water on its own; your supply contract and local
        regulations say what counts.
      </p>
    </div>
  );
}
