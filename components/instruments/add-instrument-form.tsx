'use client';

import { addInstrumentSchema } from '@/lib/intake/schemas';
import { addInstrumentAction } from '@/app/(app)/instruments/actions';
import { useServerForm } from '@/components/forms/use-server-form';
import { Button } from '@/components/ui/button';
import { Field, FormMessage, Select, TextInput } from '@/components/ui/field';

export function AddInstrumentForm({ owners }: { owners: { id: string; name: string }[] }) {
  const { form, state, onSubmit } = useServerForm(addInstrumentSchema, { organisationId: owners.length === 1 ? owners[0].id : '', serialNumber: '', description: '' }, async (values) => {
    const result = await addInstrumentAction(values);
    if (result?.ok) form.reset({ organisationId: owners.length === 1 ? owners[0].id : '', serialNumber: '', description: '' });
    return result;
  });
  const { register, formState } = form;
  const e = formState.errors;
  return (
    <form onSubmit={onSubmit} noValidate className="grid gap-4 md:grid-cols-3">
      <div className="md:col-span-3">{state ? <FormMessage tone={state.ok ? 'success' : 'error'}>{state.message}</FormMessage> : null}</div>
      {owners.length > 1 ? (
        <Field id="organisationId" label="Owner" error={e.organisationId?.message}>
          <Select id="organisationId" invalid={!!e.organisationId} {...register('organisationId')}>
            <option value="">Choose…</option>
            {owners.map((o) => (
              <option key={o.id} value={o.id}>
                {o.name}
              </option>
            ))}
          </Select>
        </Field>
      ) : null}
      <Field id="serialNumber" label="Serial number" error={e.serialNumber?.message}>
        <TextInput id="serialNumber" autoComplete="off" invalid={!!e.serialNumber} {...register('serialNumber')} />
      </Field>
      <Field id="description" label="Description" hint="Where it stands and what it is, e.g. “Intake cryoscope, bay 3”." error={e.description?.message}>
        <TextInput id="description" autoComplete="off" invalid={!!e.description} {...register('description')} />
      </Field>
      <div className="md:col-span-3">
        <Button type="submit" disabled={formState.isSubmitting}>
          {formState.isSubmitting ? 'Registering…' : 'Register instrument'}
        </Button>
      </div>
    </form>
  );
}
