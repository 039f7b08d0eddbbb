import { formatDistanceStrict } from 'date-fns';

const dateTime = new Intl.DateTimeFormat('en-GB', { day: 'numeric', month: 'short', year: 'numeric', hour: '2-digit', minute: '2-digit', timeZone: 'UTC', hourCycle: 'h23' });
const dateOnly = new Intl.DateTimeFormat('en-GB', { day: 'numeric', month: 'short', year: 'numeric', timeZone: 'UTC' });

/** Records are shown in UTC, labelled, so every party reads the same time. */
export function formatDateTime(value: Date | string): string {
  return `${dateTime.format(new Date(value))} UTC`;
}

export function formatDate(value: Date | string): string {
  return dateOnly.format(new Date(value));
}

export type DueState = { label: string; overdue: boolean; soon: boolean };

/** "due in 5 hours" / "overdue by 2 days", and whether it is near (under a quarter of a day). */
export function dueState(due: Date | string, now: Date = new Date()): DueState {
  const dueAt = new Date(due);
  const ms = dueAt.getTime() - now.getTime();
  const distance = formatDistanceStrict(dueAt, now);
  if (ms < 0) return { label: `overdue by ${distance}`, overdue: true, soon: false };
  return { label: `${distance} left`, overdue: false, soon: ms < 6 * 3_600_000 };
}
