'use client';

import { useId, useState, useTransition } from 'react';
import { Button } from '@/components/ui/button';
import { Field, FormMessage, TextArea, describedBy } from '@/components/ui/field';
import type { FormState } from '@/lib/forms/action';
import { REMOVAL_REASON_MAX_CHARS, removeAttachmentSchema } from '@/lib/evidence/schemas';
import { withdrawEvidence } from '@/app/(app)/cases/[caseId]/evidence-actions';

/** Withdraws one of the own organisation's files, with a reason the board will read. */
export function WithdrawEvidence({ caseId, attachmentId, fileName }: { caseId: string; attachmentId: string; fileName: string }) {
  const id = useId();
  const [reason, setReason] = useState('');
  const [fieldError, setFieldError] = useState<string | undefined>();
  const [state, setState] = useState<FormState>(null);
  const [pending, startTransition] = useTransition();

  function submit(event: React.FormEvent) {
    event.preventDefault();
    const parsed = removeAttachmentSchema.safeParse({ caseId, attachmentId, reason });
    if (!parsed.success) {
      setFieldError(parsed.error.issues.find((i) => i.path[0] === 'reason')?.message ?? 'Check the reason.');
      return;
    }
    setFieldError(undefined);
    startTransition(async () => {
      const result = await withdrawEvidence(parsed.data);
      setState(result);
      if (result && !result.ok) setFieldError(result.fieldErrors?.reason?.join(' '));
    });
  }

  return (
    <details className="text-sm">
      <summary className="cursor-pointer font-bold text-rust">Withdraw this file</summary>
      <form onSubmit={submit} className="mt-2 grid gap-2" noValidate>
        <p className="text-xs text-brine">Nothing is deleted: the file stays in the record, struck through, and the board can still open it.</p>
        <Field id={`${id}-reason`} label={`Why is ${fileName} withdrawn?`} error={fieldError}>
          <TextArea
            id={`${id}-reason`}
            rows={2}
            value={reason}
            maxLength={REMOVAL_REASON_MAX_CHARS}
            invalid={!!fieldError}
            aria-describedby={describedBy(`${id}-reason`, !!fieldError, false)}
            onChange={(e) => setReason(e.target.value)}
          />
        </Field>
        <div>
          <Button type="submit" variant="danger" disabled={pending}>
            {pending ? 'Withdrawing…' : 'Withdraw file'}
          </Button>
        </div>
        {state && !state.ok && !fieldError ? <FormMessage tone="error">{state.message}</FormMessage> : null}
        {state?.ok ? <FormMessage tone="success">{state.message}</FormMessage> : null}
      </form>
    </details>
  );
}
