import Link from 'next/link';
import type { InstrumentStatus } from '@/lib/intake/instrument-status';
import { Badge } from '@/components/ui/status';

/** Fit until a time, or unfit and why: shown wherever an instrument is chosen or named. */
export function InstrumentStatusBadge({ status }: { status: InstrumentStatus }) {
  if (status.state === 'fit') return <Badge tone="success">{status.label}</Badge>;
  return <Badge tone="failure">{status.label}</Badge>;
}

/** The owner's instruments and whether each may be used now, with the way to its checks. */
export function InstrumentStatusList({ instruments }: { instruments: { id: string; serialNumber: string; description: string; status: InstrumentStatus }[] }) {
  if (instruments.length === 0) {
    return (
      <p className="text-sm text-brine">
        No instrument is registered. <Link href="/instruments">Register one</Link> and run its calibration check before the first intake test.
      </p>
    );
  }
  return (
    <ul className="grid gap-2 text-sm">
      {instruments.map((i) => (
        <li key={i.id} className="flex flex-wrap items-center gap-2">
          <Link href={`/instruments/${i.id}`} className="font-bold num">
            {i.serialNumber}
          </Link>
          <span className="text-brine">{i.description}</span>
          <InstrumentStatusBadge status={i.status} />
          {i.status.state === 'unfit' ? <Link href={`/instruments/${i.id}#check`}>Run a check</Link> : null}
        </li>
      ))}
    </ul>
  );
}
