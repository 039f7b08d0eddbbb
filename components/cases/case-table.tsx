import Link from 'next/link';
import type { CaseListItem } from '@/lib/dal/cases';
import { formatCelsius } from '@/lib/temperature';
import { formatMoney } from '@/lib/money/minor-units';
import { formatDate } from '@/lib/format/dates';
import { CaseStatusBadge } from '@/components/ui/status';
import { Deadline } from '@/components/ui/deadline';
import { EmptyState } from '@/components/ui/card';

export function CaseTable({ items, empty, now }: { items: CaseListItem[]; empty: { title: string; detail?: string }; now?: Date }) {
  if (items.length === 0) return <EmptyState title={empty.title}>{empty.detail}</EmptyState>;
  return (
    <div className="overflow-x-auto">
      <table className="w-full border-collapse text-sm">
        <thead>
          <tr className="border-b border-line text-left text-brine">
            <th scope="col" className="py-2 pr-3">Case</th>
            <th scope="col" className="py-2 pr-3">Status</th>
            <th scope="col" className="py-2 pr-3">Supplier · farm</th>
            <th scope="col" className="py-2 pr-3">Delivered</th>
            <th scope="col" className="py-2 pr-3 text-right">Intake result</th>
            <th scope="col" className="py-2 pr-3 text-right">At stake</th>
            <th scope="col" className="py-2">Next deadline</th>
          </tr>
        </thead>
        <tbody>
          {items.map((item) => (
            <tr key={item.id} className="border-b border-line/60 align-top">
              <td className="py-2 pr-3 font-bold">
                <Link href={`/cases/${item.id}`}>{item.number}</Link>
              </td>
              <td className="py-2 pr-3">
                <CaseStatusBadge status={item.status} />
              </td>
              <td className="py-2 pr-3">
                {item.supplierName}
                <span className="block text-xs text-brine">{item.farmName}</span>
              </td>
              <td className="py-2 pr-3 num">{formatDate(item.deliveredAt)}</td>
              <td className="py-2 pr-3 text-right num">{item.valueTenthMilliC === null ? <span className="text-brine">withheld until retest</span> : formatCelsius(item.valueTenthMilliC)}</td>
              <td className="py-2 pr-3 text-right num">{item.amountMinor === null ? '—' : formatMoney(item.amountMinor, item.currency)}</td>
              <td className="py-2">{item.dueAt ? <Deadline label="" due={item.dueAt} now={now} /> : <span className="text-brine">none</span>}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
