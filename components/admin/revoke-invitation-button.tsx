'use client';

import { useActionState } from 'react';
import type { FormState } from '@/lib/forms/action';
import { Button } from '@/components/ui/button';

export function RevokeInvitationButton({ invitationId, action }: { invitationId: string; action: (state: FormState, data: FormData) => Promise<FormState> }) {
  const [state, formAction, pending] = useActionState(action, null);
  return (
    <form action={formAction} className="flex items-center gap-2">
      <input type="hidden" name="invitationId" value={invitationId} />
      <Button type="submit" variant="secondary" disabled={pending}>
        {pending ? 'Revoking…' : 'Revoke'}
      </Button>
      {state && !state.ok ? <span role="alert" className="text-xs font-bold text-rust">{state.message}</span> : null}
    </form>
  );
}
