import type { Metadata } from 'next';
import { getDb } from '@/db/client';
import { findOpenInvitation } from '@/lib/dal/invitations';
import { roleLabels, isRole } from '@/lib/auth/permissions';
import { AcceptInvitationForm } from '@/components/auth/accept-invitation-form';
import { FormMessage } from '@/components/ui/field';
import { acceptInvitationAction } from './actions';

export const metadata: Metadata = { title: 'Accept your invitation' };

export default async function InvitationPage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  const invitation = token.length >= 20 && token.length <= 200 ? await findOpenInvitation(getDb(), token) : null;
  if (!invitation) {
    return (
      <>
        <h1 className="mb-4 text-xl font-bold">Invitation</h1>
        <FormMessage tone="error">This invitation has expired, was revoked or was already used. Ask your administrator for a new one.</FormMessage>
      </>
    );
  }
  return (
    <>
      <h1 className="mb-2 text-xl font-bold">Set up your account</h1>
      <p className="mb-4 text-sm text-brine">
        {invitation.email} · {isRole(invitation.role) ? roleLabels[invitation.role] : invitation.role} for {invitation.organisationName}
      </p>
      <AcceptInvitationForm token={token} name={invitation.name} action={acceptInvitationAction} />
    </>
  );
}
