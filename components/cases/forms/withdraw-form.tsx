'use client';

import type { CaseStatus } from '@/lib/enums';
import { withdrawSchema } from '@/lib/cases/schemas';
import { transitionCase } from '@/app/(app)/cases/[caseId]/actions';
import { useServerForm } from '@/components/forms/use-server-form';
import { Button } from '@/components/ui/button';
import { Field, TextInput } from '@/components/ui/field';
import { Outcome } from './form-bits';

export function WithdrawForm({ caseId, status }: { caseId: string; status: CaseStatus }) {
  const { form, state, onSubmit } = useServerForm(withdrawSchema, { reason: '' }, (values) => transitionCase(caseId, 'withdraw', values, status));
  const e = form.formState.errors;
  return (
    <details className="rounded-card border border-line bg-white p-4">
      <summary className="cursor-pointer font-bold">Withdraw the dispute</summary>
      <form onSubmit={onSubmit} noValidate className="mt-3 grid gap-3">
        <p className="text-sm text-brine">Withdrawing ends the dispute; the intake result then stands as recorded.</p>
        <Outcome state={state} />
        <Field id="reason" label="Reason" error={e.reason?.message}>
          <TextInput id="reason" invalid={!!e.reason} {...form.register('reason')} />
        </Field>
        <div>
          <Button type="submit" variant="danger" disabled={form.formState.isSubmitting}>
            {form.formState.isSubmitting ? 'Withdrawing…' : 'Withdraw the dispute'}
          </Button>
        </div>
      </form>
    </details>
  );
}
