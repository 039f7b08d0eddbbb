import Link from 'next/link';
import type { DeliveryListItem } from '@/lib/dal/deliveries';
import { formatCelsius } from '@/lib/temperature';
import { formatMoney } from '@/lib/money/minor-units';
import { formatDateTime } from '@/lib/format/dates';
import { VerdictBadge } from '@/components/ui/status';
import { Deadline } from '@/components/ui/deadline';
import { EmptyState } from '@/components/ui/card';

export function DeliveryTable({ items, empty, showContest }: { items: DeliveryListItem[]; empty: { title: string; detail?: string }; showContest: boolean }) {
  if (items.length === 0) return <EmptyState title={empty.title}>{empty.detail}</EmptyState>;
  return (
    <div className="overflow-x-auto">
      <table className="w-full border-collapse text-sm">
        <thead>
          <tr className="border-b border-line text-left text-brine">
            <th scope="col" className="py-2 pr-3">Delivery</th>
            <th scope="col" className="py-2 pr-3">Farm</th>
            <th scope="col" className="py-2 pr-3">Received</th>
            <th scope="col" className="py-2 pr-3 text-right">Volume</th>
            <th scope="col" className="py-2 pr-3 text-right">Freezing point</th>
            <th scope="col" className="py-2 pr-3">Result</th>
            <th scope="col" className="py-2 pr-3 text-right">Withheld</th>
            <th scope="col" className="py-2">Dispute</th>
          </tr>
        </thead>
        <tbody>
          {items.map((item) => (
            <tr key={item.id} className="border-b border-line/60 align-top">
              <td className="py-2 pr-3 font-bold num">
                <Link href={`/deliveries/${item.id}`}>{item.reference}</Link>
              </td>
              <td className="py-2 pr-3">
                {item.farmName}
                <span className="block text-xs text-brine">{item.herdCode}</span>
              </td>
              <td className="py-2 pr-3 num">{formatDateTime(item.receivedAt)}</td>
              <td className="py-2 pr-3 text-right num">{item.volumeLitres.toLocaleString('en-GB')} l</td>
              <td className="py-2 pr-3 text-right num">{formatCelsius(item.valueTenthMilliC)}</td>
              <td className="py-2 pr-3">
                <VerdictBadge verdict={item.verdict} />
                <span className="mt-1 block text-xs text-brine">
                  limit {formatCelsius(item.limitTenthMilliC)} · rules v{item.rulesVersion}
                </span>
              </td>
              <td className="py-2 pr-3 text-right num">{item.amountMinor ? formatMoney(item.amountMinor, item.currency) : '—'}</td>
              <td className="py-2">
                {item.caseId ? (
                  <Link href={`/cases/${item.caseId}`}>{item.caseNumber}</Link>
                ) : item.contestable && item.contestDeadline ? (
                  <div className="grid gap-1">
                    {showContest ? (
                      <Link href={`/deliveries/${item.id}/dispute`} className="font-bold">
                        Open a dispute
                      </Link>
                    ) : null}
                    <Deadline label="Contest by" due={item.contestDeadline} />
                  </div>
                ) : item.verdict !== 'accepted' ? (
                  <span className="text-xs text-brine">{item.contestDeadline ? 'contest window closed' : 'supplier not yet told'}</span>
                ) : null}
              </td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
