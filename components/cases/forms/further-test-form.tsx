'use client';

import { orderFurtherTestSchema } from '@/lib/cases/schemas';
import { transitionCase } from '@/app/(app)/cases/[caseId]/actions';
import { useServerForm } from '@/components/forms/use-server-form';
import { Button } from '@/components/ui/button';
import { Field, Select, TextArea, TextInput } from '@/components/ui/field';
import { Outcome } from './form-bits';

export function FurtherTestForm({ caseId, laboratories, suggestedCode }: { caseId: string; laboratories: { id: string; name: string }[]; suggestedCode: string }) {
  const { form, state, onSubmit } = useServerForm(
    orderFurtherTestSchema,
    { kind: 'third_laboratory', labOrganisationId: '', sampleCode: suggestedCode, sealNumber: '', sampledAt: '' as unknown as Date, reasons: '' },
    (values) => transitionCase(caseId, 'order_further_test', values, 'review'),
  );
  const { register, formState } = form;
  const e = formState.errors;
  return (
    <details className="rounded-card border border-line bg-white p-4">
      <summary className="cursor-pointer font-bold">Order a further test</summary>
      <form onSubmit={onSubmit} noValidate className="mt-3 grid gap-4 md:grid-cols-2">
        <p className="text-sm text-brine md:col-span-2">The case returns to “sample in transit” with a new sample and its own custody; the laboratory tests it blind.</p>
        <div className="md:col-span-2">
          <Outcome state={state} />
        </div>
        <Field id="kind" label="Kind of test" error={e.kind?.message}>
          <Select id="kind" {...register('kind')}>
            <option value="third_laboratory">A third laboratory on a further portion</option>
            <option value="authentic">A supervised authentic herd sample</option>
          </Select>
        </Field>
        <Field id="ft-lab" label="Laboratory" error={e.labOrganisationId?.message}>
          <Select id="ft-lab" invalid={!!e.labOrganisationId} {...register('labOrganisationId')}>
            <option value="">Choose…</option>
            {laboratories.map((l) => (
              <option key={l.id} value={l.id}>
                {l.name}
              </option>
            ))}
          </Select>
        </Field>
        <Field id="sampleCode" label="New sample code" error={e.sampleCode?.message}>
          <TextInput id="sampleCode" invalid={!!e.sampleCode} {...register('sampleCode')} />
        </Field>
        <Field id="ft-seal" label="Seal number" error={e.sealNumber?.message}>
          <TextInput id="ft-seal" invalid={!!e.sealNumber} {...register('sealNumber')} />
        </Field>
        <Field id="sampledAt" label="Sampled at" error={e.sampledAt?.message}>
          <TextInput id="sampledAt" type="datetime-local" invalid={!!e.sampledAt} {...register('sampledAt')} />
        </Field>
        <div className="md:col-span-2">
          <Field id="reasons" label="Reasons" error={e.reasons?.message}>
            <TextArea id="reasons" rows={3} invalid={!!e.reasons} {...register('reasons')} />
          </Field>
        </div>
        <div>
          <Button type="submit" disabled={formState.isSubmitting}>
            {formState.isSubmitting ? 'Ordering…' : 'Order a further test'}
          </Button>
        </div>
      </form>
    </details>
  );
}
