import { dueState, formatDateTime } from '@/lib/format/dates';
import { Badge } from './status';

/** A due time with the time left; overdue and near deadlines say so in words and shape, not colour alone. */
export function Deadline({ label, due, now }: { label: string; due: Date | string | null; now?: Date }) {
  if (!due) return null;
  const state = dueState(due, now);
  const tone = state.overdue ? 'failure' : state.soon ? 'warning' : 'neutral';
  return (
    <div className="flex flex-wrap items-center gap-2 text-sm">
      <span className="font-bold text-brine">{label}</span>
      <time dateTime={new Date(due).toISOString()} className="num">
        {formatDateTime(due)}
      </time>
      <Badge tone={tone}>{state.overdue ? `Overdue · ${state.label.replace('overdue by ', '')}` : state.label}</Badge>
    </div>
  );
}
