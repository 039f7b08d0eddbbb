'use client';

import { useActionState } from 'react';
import type { FormState } from '@/lib/forms/action';
import { Button } from '@/components/ui/button';
import { FormMessage } from '@/components/ui/field';

type Action = (state: FormState, data: FormData) => Promise<FormState>;

export function EndSessionButton({ sessionId, action }: { sessionId: string; action: Action }) {
  const [state, formAction, pending] = useActionState(action, null);
  return (
    <form action={formAction} className="flex items-center gap-2">
      <input type="hidden" name="sessionId" value={sessionId} />
      <Button type="submit" variant="secondary" disabled={pending}>
        {pending ? 'Ending…' : 'End this session'}
      </Button>
      {state && !state.ok ? <span role="alert" className="text-xs font-bold text-rust">{state.message}</span> : null}
    </form>
  );
}

export function EndOtherSessionsButton({ action }: { action: Action }) {
  const [state, formAction, pending] = useActionState(action, null);
  return (
    <form action={formAction} className="flex flex-col gap-2">
      <Button type="submit" variant="danger" disabled={pending}>
        {pending ? 'Ending…' : 'Sign out everywhere else'}
      </Button>
      {state ? <FormMessage tone={state.ok ? 'success' : 'error'}>{state.message}</FormMessage> : null}
    </form>
  );
}
