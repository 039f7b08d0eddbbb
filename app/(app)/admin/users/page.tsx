import type { Metadata } from 'next';
import { getDb } from '@/db/client';
import { requirePermission } from '@/lib/auth/session';
import { listOrganisations, listPeople } from '@/lib/dal/admin';
import { listInvitations } from '@/lib/dal/invitations';
import { roleLabels, isRole } from '@/lib/auth/permissions';
import { Card, PageHeader, EmptyState } from '@/components/ui/card';
import { Badge } from '@/components/ui/status';
import { InviteForm } from '@/components/admin/invite-form';
import { RevokeInvitationButton } from '@/components/admin/revoke-invitation-button';
import { formatDateTime } from '@/lib/format/dates';
import { inviteAction, revokeInvitationAction } from './actions';

export const metadata: Metadata = { title: 'People' };

export default async function PeoplePage() {
  const actor = await requirePermission('invitation', 'create');
  const db = getDb();
  const [people, organisations, invitations] = await Promise.all([listPeople(db, actor), listOrganisations(db, actor), listInvitations(db, actor)]);
  const now = Date.now();
  return (
    <>
      <PageHeader title="People and invitations" eyebrow="Administration" />
      <div className="grid gap-6">
        <Card title="Invite someone">
          <p className="mb-4 text-sm text-brine">There is no open sign-up. The invited person receives a link, valid for 7 days, to choose a password.</p>
          <InviteForm organisations={organisations} action={inviteAction} />
        </Card>
        <Card title="Invitations">
          {invitations.length === 0 ? (
            <EmptyState title="No invitations sent yet" />
          ) : (
            <table className="w-full text-sm">
              <thead>
                <tr className="border-b border-line text-left text-brine">
                  <th scope="col" className="py-2 pr-3">Person</th>
                  <th scope="col" className="py-2 pr-3">Role · organisation</th>
                  <th scope="col" className="py-2 pr-3">State</th>
                  <th scope="col" className="py-2" />
                </tr>
              </thead>
              <tbody>
                {invitations.map((i) => {
                  const open = !i.acceptedAt && !i.revokedAt && i.expiresAt.getTime() > now;
                  return (
                    <tr key={i.id} className="border-b border-line/60">
                      <td className="py-2 pr-3">
                        {i.name}
                        <span className="block text-xs text-brine">{i.email}</span>
                      </td>
                      <td className="py-2 pr-3">
                        {isRole(i.role) ? roleLabels[i.role] : i.role} · {i.organisationName}
                      </td>
                      <td className="py-2 pr-3">
                        {i.acceptedAt ? <Badge tone="success">Accepted</Badge> : i.revokedAt ? <Badge tone="neutral">Revoked</Badge> : open ? <Badge tone="action">Open until {formatDateTime(i.expiresAt)}</Badge> : <Badge tone="warning">Expired</Badge>}
                      </td>
                      <td className="py-2">{open ? <RevokeInvitationButton invitationId={i.id} action={revokeInvitationAction} /> : null}</td>
                    </tr>
                  );
                })}
              </tbody>
            </table>
          )}
        </Card>
        <Card title={`People (${people.length})`}>
          <table className="w-full text-sm">
            <thead>
              <tr className="border-b border-line text-left text-brine">
                <th scope="col" className="py-2 pr-3">Name</th>
                <th scope="col" className="py-2 pr-3">E-mail</th>
                <th scope="col" className="py-2 pr-3">Role</th>
                <th scope="col" className="py-2">Organisation</th>
              </tr>
            </thead>
            <tbody>
              {people.map((p) => (
                <tr key={p.id} className="border-b border-line/60">
                  <td className="py-2 pr-3 font-bold">{p.name}</td>
                  <td className="py-2 pr-3">{p.email}</td>
                  <td className="py-2 pr-3">{isRole(p.role) ? roleLabels[p.role] : p.role}</td>
                  <td className="py-2">{p.organisationName}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </Card>
      </div>
    </>
  );
}
