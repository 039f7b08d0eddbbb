'use client';

import { useActionState } from 'react';
import type { FormState } from '@/lib/forms/action';
import { PASSWORD_MIN } from '@/lib/auth/schemas';
import { Button } from '@/components/ui/button';
import { Field, FormMessage, TextInput } from '@/components/ui/field';

export function AcceptInvitationForm({ token, name, action }: { token: string; name: string; action: (state: FormState, data: FormData) => Promise<FormState> }) {
  const [state, formAction, pending] = useActionState(action, null);
  const errors = state?.fieldErrors ?? {};
  return (
    <form action={formAction} className="flex flex-col gap-4" noValidate>
      {state && !state.ok ? <FormMessage tone="error">{state.message}</FormMessage> : null}
      <input type="hidden" name="token" value={token} />
      <Field id="name" label="Your name" hint="As it should appear on records and signatures." error={errors.name}>
        <TextInput id="name" name="name" defaultValue={state?.values?.name ?? name} autoComplete="name" invalid={!!errors.name} aria-describedby={errors.name ? 'name-error' : 'name-hint'} />
      </Field>
      <Field id="password" label="Password" hint={`At least ${PASSWORD_MIN} characters.`} error={errors.password}>
        <TextInput id="password" name="password" type="password" autoComplete="new-password" invalid={!!errors.password} aria-describedby={errors.password ? 'password-error' : 'password-hint'} />
      </Field>
      <Field id="confirm" label="The same password again" error={errors.confirm}>
        <TextInput id="confirm" name="confirm" type="password" autoComplete="new-password" invalid={!!errors.confirm} aria-describedby={errors.confirm ? 'confirm-error' : undefined} />
      </Field>
      <Button type="submit" disabled={pending}>
        {pending ? 'Creating your account…' : 'Create my account'}
      </Button>
    </form>
  );
}
