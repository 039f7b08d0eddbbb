'use client';

import { receiveSchema } from '@/lib/cases/schemas';
import { transitionCase } from '@/app/(app)/cases/[caseId]/actions';
import { useServerForm } from '@/components/forms/use-server-form';
import { Button } from '@/components/ui/button';
import { Field, TextArea, TextInput } from '@/components/ui/field';
import { FormPanel, Outcome } from './form-bits';

export function ReceiveForm({ caseId, sampleCode }: { caseId: string; sampleCode: string | null }) {
  const { form, state, onSubmit } = useServerForm(receiveSchema, { sealNumber: '', sealIntact: false, frozen: false, temperature: '' as unknown as number, condition: '' }, (values) =>
    transitionCase(caseId, 'receive', values, 'awaiting_sample'),
  );
  const { register, formState } = form;
  const e = formState.errors;
  return (
    <FormPanel title="Record receipt" intro={<p>Sample {sampleCode ?? ''}: read the seal, measure the temperature and look at the container before opening anything. A broken seal or a frozen sample is recorded as found; the board weighs it.</p>}>
      <form onSubmit={onSubmit} noValidate className="grid gap-4 md:grid-cols-2">
        <div className="md:col-span-2">
          <Outcome state={state} />
        </div>
        <Field id="sealNumber" label="Seal number as read" error={e.sealNumber?.message}>
          <TextInput id="sealNumber" invalid={!!e.sealNumber} {...register('sealNumber')} />
        </Field>
        <Field id="temperature" label="Sample temperature on receipt (°C)" error={e.temperature?.message}>
          <TextInput id="temperature" inputMode="decimal" invalid={!!e.temperature} {...register('temperature')} />
        </Field>
        <label className="flex items-center gap-2 text-sm font-bold">
          <input type="checkbox" {...register('sealIntact')} /> Seal intact
        </label>
        <label className="flex items-center gap-2 text-sm font-bold">
          <input type="checkbox" {...register('frozen')} /> The sample is or has been frozen
        </label>
        <div className="md:col-span-2">
          <Field id="condition" label="Condition of container and sample (optional)" error={e.condition?.message}>
            <TextArea id="condition" rows={2} invalid={!!e.condition} {...register('condition')} />
          </Field>
        </div>
        <div>
          <Button type="submit" disabled={formState.isSubmitting}>
            {formState.isSubmitting ? 'Recording…' : 'Record receipt'}
          </Button>
        </div>
      </form>
    </FormPanel>
  );
}
