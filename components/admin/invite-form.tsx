'use client';

import { useActionState } from 'react';
import type { FormState } from '@/lib/forms/action';
import { Button } from '@/components/ui/button';
import { Field, FormMessage, Select, TextInput } from '@/components/ui/field';

const roles = [
  { value: 'supplier', label: 'Supplier' },
  { value: 'plant', label: 'Plant laboratory' },
  { value: 'lab', label: 'Referee laboratory' },
  { value: 'arbiter', label: 'Arbiter' },
  { value: 'admin', label: 'Administrator' },
];

export function InviteForm({ organisations, action }: { organisations: { id: string; name: string; kind: string }[]; action: (state: FormState, data: FormData) => Promise<FormState> }) {
  const [state, formAction, pending] = useActionState(action, null);
  const errors = state?.fieldErrors ?? {};
  const values = state?.ok ? {} : (state?.values ?? {});
  return (
    <form action={formAction} className="grid gap-4 md:grid-cols-2" noValidate key={state?.ok ? state.message : 'form'}>
      <div className="md:col-span-2">{state ? <FormMessage tone={state.ok ? 'success' : 'error'}>{state.message}</FormMessage> : null}</div>
      <Field id="invite-name" label="Name" error={errors.name}>
        <TextInput id="invite-name" name="name" defaultValue={values.name} invalid={!!errors.name} aria-describedby={errors.name ? 'invite-name-error' : undefined} />
      </Field>
      <Field id="invite-email" label="E-mail address" error={errors.email}>
        <TextInput id="invite-email" name="email" type="email" defaultValue={values.email} invalid={!!errors.email} aria-describedby={errors.email ? 'invite-email-error' : undefined} />
      </Field>
      <Field id="invite-org" label="Organisation" error={errors.organisationId}>
        <Select id="invite-org" name="organisationId" defaultValue={values.organisationId ?? ''} invalid={!!errors.organisationId} aria-describedby={errors.organisationId ? 'invite-org-error' : undefined}>
          <option value="" disabled>
            Choose…
          </option>
          {organisations.map((o) => (
            <option key={o.id} value={o.id}>
              {o.name} ({o.kind})
            </option>
          ))}
        </Select>
      </Field>
      <Field id="invite-role" label="Role" hint="Suppliers belong to supplier organisations, arbiters to a board, and so on." error={errors.role}>
        <Select id="invite-role" name="role" defaultValue={values.role ?? ''} invalid={!!errors.role} aria-describedby={errors.role ? 'invite-role-error' : 'invite-role-hint'}>
          <option value="" disabled>
            Choose…
          </option>
          {roles.map((r) => (
            <option key={r.value} value={r.value}>
              {r.label}
            </option>
          ))}
        </Select>
      </Field>
      <div>
        <Button type="submit" disabled={pending}>
          {pending ? 'Sending…' : 'Send invitation'}
        </Button>
      </div>
    </form>
  );
}
