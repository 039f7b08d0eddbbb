'use client';

import { dispatchSchema } from '@/lib/cases/schemas';
import { transitionCase } from '@/app/(app)/cases/[caseId]/actions';
import { useServerForm } from '@/components/forms/use-server-form';
import { Button } from '@/components/ui/button';
import { Field, Select, TextArea, TextInput } from '@/components/ui/field';
import { FormPanel, Outcome } from './form-bits';

export function DispatchForm({ caseId, laboratories, sealNumber }: { caseId: string; laboratories: { id: string; name: string }[]; sealNumber: string | null }) {
  const { form, state, onSubmit } = useServerForm(
    dispatchSchema,
    { labOrganisationId: laboratories.length === 1 ? laboratories[0].id : '', sealNumber: '', courier: '', temperature: '' as unknown as number, sealIntact: false, answer: '' },
    (values) => transitionCase(caseId, 'dispatch', values, 'open'),
  );
  const { register, formState } = form;
  const e = formState.errors;
  return (
    <FormPanel title="Dispatch sample" intro={<p>Check the seal against the record{sealNumber ? ` (${sealNumber})` : ''}, pack the retained sample cold, and record its dispatch to the referee laboratory.</p>}>
      <form onSubmit={onSubmit} noValidate className="grid gap-4 md:grid-cols-2">
        <div className="md:col-span-2">
          <Outcome state={state} />
        </div>
        <Field id="labOrganisationId" label="Referee laboratory" error={e.labOrganisationId?.message}>
          <Select id="labOrganisationId" invalid={!!e.labOrganisationId} {...register('labOrganisationId')}>
            <option value="">Choose…</option>
            {laboratories.map((l) => (
              <option key={l.id} value={l.id}>
                {l.name}
              </option>
            ))}
          </Select>
        </Field>
        <Field id="sealNumber" label="Seal number as read on the sample" error={e.sealNumber?.message}>
          <TextInput id="sealNumber" invalid={!!e.sealNumber} {...register('sealNumber')} />
        </Field>
        <Field id="courier" label="Courier and container" hint="e.g. cool box 14 with data logger, by courier" error={e.courier?.message}>
          <TextInput id="courier" invalid={!!e.courier} {...register('courier')} />
        </Field>
        <Field id="temperature" label="Temperature at dispatch (°C)" hint="Kept at 0–6 °C; never frozen." error={e.temperature?.message}>
          <TextInput id="temperature" inputMode="decimal" invalid={!!e.temperature} {...register('temperature')} />
        </Field>
        <div className="md:col-span-2">
          <Field id="answer" label="The plant’s answer to the supplier’s grounds (optional)" error={e.answer?.message}>
            <TextArea id="answer" rows={3} invalid={!!e.answer} {...register('answer')} />
          </Field>
        </div>
        <label className="flex items-center gap-2 text-sm font-bold md:col-span-2">
          <input type="checkbox" {...register('sealIntact')} /> The seal is intact and matches the record
        </label>
        {e.sealIntact?.message ? (
          <p role="alert" className="text-sm font-bold text-rust md:col-span-2">
            ✕ {e.sealIntact.message}
          </p>
        ) : null}
        <div>
          <Button type="submit" disabled={formState.isSubmitting}>
            {formState.isSubmitting ? 'Recording…' : 'Dispatch sample'}
          </Button>
        </div>
      </form>
    </FormPanel>
  );
}
