import type { Metadata } from 'next';
import { getDb } from '@/db/client';
import { requirePermission } from '@/lib/auth/session';
import { listOrganisations } from '@/lib/dal/admin';
import { Card, PageHeader } from '@/components/ui/card';
import { AddOrganisationForm } from '@/components/admin/add-organisation-form';
import { formatDate } from '@/lib/format/dates';
import { addOrganisationAction } from './actions';

export const metadata: Metadata = { title: 'Organisations' };

const kindLabels: Record<string, string> = { plant: 'Plant', supplier: 'Supplier', lab: 'Referee laboratory', board: 'Board' };

export default async function OrganisationsPage() {
  const actor = await requirePermission('organisation', 'manage');
  const organisations = await listOrganisations(getDb(), actor);
  return (
    <>
      <PageHeader title="Organisations" eyebrow="Administration" />
      <div className="grid gap-6">
        <Card title="Add an organisation">
          <AddOrganisationForm action={addOrganisationAction} />
        </Card>
        <Card title={`All organisations (${organisations.length})`}>
          <table className="w-full text-sm">
            <thead>
              <tr className="border-b border-line text-left text-brine">
                <th scope="col" className="py-2 pr-3">Name</th>
                <th scope="col" className="py-2 pr-3">Kind</th>
                <th scope="col" className="py-2 pr-3">Contact</th>
                <th scope="col" className="py-2 pr-3 text-right">People</th>
                <th scope="col" className="py-2">Since</th>
              </tr>
            </thead>
            <tbody>
              {organisations.map((o) => (
                <tr key={o.id} className="border-b border-line/60">
                  <td className="py-2 pr-3 font-bold">{o.name}</td>
                  <td className="py-2 pr-3">{kindLabels[o.kind]}</td>
                  <td className="py-2 pr-3">{o.contactEmail ?? '—'}</td>
                  <td className="py-2 pr-3 text-right num">{o.members ?? 0}</td>
                  <td className="py-2 num">{formatDate(o.createdAt)}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </Card>
      </div>
    </>
  );
}
