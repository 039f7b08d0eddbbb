import type { Metadata } from 'next';
import Link from 'next/link';
import { getDb } from '@/db/client';
import { can } from '@/lib/auth/permissions';
import { requirePermission } from '@/lib/auth/session';
import { instrumentOwners, listInstruments } from '@/lib/dal/instruments';
import { Card, EmptyState, PageHeader } from '@/components/ui/card';
import { InstrumentStatusBadge } from '@/components/instruments/instrument-status';
import { AddInstrumentForm } from '@/components/instruments/add-instrument-form';
import { formatDateTime } from '@/lib/format/dates';

export const metadata: Metadata = { title: 'Instruments' };

export default async function InstrumentsPage() {
  const actor = await requirePermission('instrument', 'read');
  const db = getDb();
  const mayManage = can(actor.role, 'instrument', 'manage');
  const [instruments, owners] = await Promise.all([listInstruments(db, actor), mayManage ? instrumentOwners(db, actor) : Promise.resolve([])]);
  const showOwner = actor.role === 'admin';
  return (
    <>
      <PageHeader title="Instruments" eyebrow={showOwner ? 'Every plant’s and laboratory’s cryoscopes' : actor.organisationName} />
      <div className="grid gap-6">
        <Card title="Cryoscopes and their calibration status">
          <p className="mb-3 text-sm text-ink-soft">
            An instrument is fit for work while its latest calibration check on a sodium chloride standard passed and has not run out. A failed check makes it unfit until it passes again.
          </p>
          {instruments.length === 0 ? (
            <EmptyState title="No instrument is registered yet." />
          ) : (
            <div className="overflow-x-auto">
              <table className="w-full text-sm">
                <thead>
                  <tr className="border-b border-line text-left text-brine">
                    <th scope="col" className="py-2 pr-3">Serial number</th>
                    <th scope="col" className="py-2 pr-3">Description</th>
                    {showOwner ? <th scope="col" className="py-2 pr-3">Owner</th> : null}
                    <th scope="col" className="py-2 pr-3">Status</th>
                    <th scope="col" className="py-2">Last check</th>
                  </tr>
                </thead>
                <tbody>
                  {instruments.map((i) => (
                    <tr key={i.id} className="border-b border-line/60 align-top">
                      <td className="py-2 pr-3 font-bold num">
                        <Link href={`/instruments/${i.id}`}>{i.serialNumber}</Link>
                      </td>
                      <td className="py-2 pr-3">{i.description}</td>
                      {showOwner ? <td className="py-2 pr-3">{i.organisationName}</td> : null}
                      <td className="py-2 pr-3">
                        <InstrumentStatusBadge status={i.status} />
                      </td>
                      <td className="py-2 num">{i.status.check ? `${formatDateTime(i.status.check.checkedAt)} · ${i.status.check.pass ? 'passed' : 'failed'}` : '—'}</td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </div>
          )}
        </Card>
        {mayManage ? (
          <Card title="Register an instrument">
            <AddInstrumentForm owners={owners} />
          </Card>
        ) : null}
      </div>
    </>
  );
}
