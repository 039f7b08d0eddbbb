'use client';

import { useActionState } from 'react';
import type { FormState } from '@/lib/forms/action';
import { Button } from '@/components/ui/button';
import { Field, FormMessage, Select, TextInput } from '@/components/ui/field';

const kinds = [
  { value: 'supplier', label: 'Supplier (farm or producer group)' },
  { value: 'plant', label: 'Plant (dairy and its intake laboratory)' },
  { value: 'lab', label: 'Referee laboratory' },
  { value: 'board', label: 'Arbitration board' },
];

export function AddOrganisationForm({ action }: { action: (state: FormState, data: FormData) => Promise<FormState> }) {
  const [state, formAction, pending] = useActionState(action, null);
  const errors = state?.fieldErrors ?? {};
  const values = state?.ok ? {} : (state?.values ?? {});
  return (
    <form action={formAction} className="grid gap-4 md:grid-cols-3" noValidate key={state?.ok ? state.message : 'form'}>
      <div className="md:col-span-3">{state ? <FormMessage tone={state.ok ? 'success' : 'error'}>{state.message}</FormMessage> : null}</div>
      <Field id="org-name" label="Name" error={errors.name}>
        <TextInput id="org-name" name="name" defaultValue={values.name} invalid={!!errors.name} aria-describedby={errors.name ? 'org-name-error' : undefined} />
      </Field>
      <Field id="org-kind" label="Kind" error={errors.kind}>
        <Select id="org-kind" name="kind" defaultValue={values.kind ?? ''} invalid={!!errors.kind} aria-describedby={errors.kind ? 'org-kind-error' : undefined}>
          <option value="" disabled>
            Choose…
          </option>
          {kinds.map((k) => (
            <option key={k.value} value={k.value}>
              {k.label}
            </option>
          ))}
        </Select>
      </Field>
      <Field id="org-email" label="Contact e-mail (optional)" error={errors.contactEmail}>
        <TextInput id="org-email" name="contactEmail" type="email" defaultValue={values.contactEmail} invalid={!!errors.contactEmail} aria-describedby={errors.contactEmail ? 'org-email-error' : undefined} />
      </Field>
      <div>
        <Button type="submit" disabled={pending}>
          {pending ? 'Adding…' : 'Add organisation'}
        </Button>
      </div>
    </form>
  );
}
