'use client';

import { useMemo } from 'react';
import { correctCaseDecision, signCaseDecision } from '@/app/(app)/cases/[caseId]/decision/actions';
import { useServerForm } from '@/components/forms/use-server-form';
import { Outcome, FormPanel } from '@/components/cases/forms/form-bits';
import { Button } from '@/components/ui/button';
import { Field, FormMessage, Select, TextArea, TextInput } from '@/components/ui/field';
import { decisionOutcomeChoices, isBindingOutcome } from '@/lib/decision/labels';
import { correctDecisionSchema, signDecisionSchema } from '@/lib/decision/schemas';
import type { DecisionFormData } from '@/lib/dal/decision-view';

const proposalWords: Record<string, string> = {
  uphold: 'uphold the intake result',
  reverse: 'reverse the intake result',
  adjust: 'adjust the intake result',
  further_test: 'order a further test',
  incomplete: 'no proposal yet (information is missing)',
};

/**
 * The arbiter's binding decision: the outcome (the proposal's, unless the arbiter departs from it
 * with a reason), the reasons, the settlement the server worked out for that outcome, and the
 * signature itself — printed name, time and meaning, confirmed by the password.
 */
export function DecisionForm({ caseId, data }: { caseId: string; data: DecisionFormData }) {
  const correcting = data.correcting;
  // One form for both: a correction is the same signature with two more fields.
  const schema = useMemo(
    () => (correcting ? correctDecisionSchema(data.proposalOutcome) : signDecisionSchema(data.proposalOutcome)) as ReturnType<typeof correctDecisionSchema>,
    [correcting, data.proposalOutcome],
  );
  const start = correcting?.outcome ?? data.proposalOutcome;
  const prefilled = isBindingOutcome(start) || start === 'further_test' ? start : undefined;
  const { form, state, onSubmit } = useServerForm(
    schema,
    { outcome: prefilled as never, reasons: '', departureReason: '', confirm: false, password: '', supersedesId: correcting?.decisionId ?? '', correctionReason: '' },
    async (values) => {
      const result = correcting ? await correctCaseDecision(caseId, values) : await signCaseDecision(caseId, values);
      // A password is typed again for every attempt; it never waits in the form.
      if (result && !result.ok) form.setValue('password', '');
      return result;
    },
  );
  const { register, formState, watch } = form;
  const e = formState.errors;
  const outcome = watch('outcome') as string | undefined;
  const departing = !!outcome && outcome !== 'further_test' && outcome !== data.proposalOutcome;
  const preview = outcome && isBindingOutcome(outcome) ? data.settlements[outcome] : null;

  return (
    <FormPanel
      title={correcting ? 'Correct the binding decision' : 'Sign the binding decision'}
      intro={
        correcting ? (
          <>
            A correction is a new binding decision: it is signed and sealed like the first, names the decision it supersedes, and both stay in the record and on the letters. The parties are sent the new letter.
            Use it for an error in the decision itself, not to reopen the dispute. Local regulations and the supply contract prevail.
          </>
        ) : (
        <>
          The decision module proposes to <strong>{proposalWords[data.proposalOutcome] ?? data.proposalOutcome}</strong>. The proposal supports you; you decide. Local regulations and the supply contract prevail.
          Once signed, the case is sealed and read-only for everyone; a correction is a new decision that supersedes this one, and both are kept.
        </>
        )
      }
    >
      {data.blockedBecause ? (
        <FormMessage tone="error">{data.blockedBecause}</FormMessage>
      ) : (
        <form onSubmit={onSubmit} noValidate className="grid gap-4" data-testid={correcting ? 'correction-form' : 'decision-form'}>
          <Outcome state={state} />
          {correcting ? (
            <Field id="decision-correction" label="What is corrected, and why" hint="Printed on the new letter beside the decision it supersedes." error={e.correctionReason?.message ?? e.supersedesId?.message}>
              <TextArea id="decision-correction" rows={3} invalid={!!e.correctionReason} {...register('correctionReason')} />
            </Field>
          ) : null}
          <Field id="decision-outcome" label="Outcome" error={e.outcome?.message}>
            <Select id="decision-outcome" invalid={!!e.outcome} {...register('outcome')}>
              {prefilled ? null : <option value="">Choose…</option>}
              {(['uphold', 'reverse', 'adjust', 'further_test'] as const).map((value) => (
                <option key={value} value={value}>
                  {decisionOutcomeChoices[value]}
                  {value === data.proposalOutcome ? ' — as proposed' : ''}
                </option>
              ))}
            </Select>
          </Field>

          {outcome === 'further_test' ? (
            <p className="rounded-control border border-amber bg-amber-soft px-3 py-2 text-sm text-amber" role="status">
              <span aria-hidden="true">▲ </span>A further test is not a binding decision, so nothing is signed here. Use “Order a further test” above: the case goes back for a new sample, the laboratory tests it blind, and the board decides on the new result.
            </p>
          ) : null}

          {preview ? (
            <section aria-labelledby="settlement-title" className="rounded-card border border-line bg-white p-3">
              <h3 id="settlement-title" className="mb-1 font-bold">
                Settlement
              </h3>
              {'unavailable' in preview ? (
                <p className="text-sm font-bold text-rust">
                  <span aria-hidden="true">✕ </span>
                  {preview.unavailable}
                </p>
              ) : (
                <ul className="grid gap-1 text-sm num" data-testid="settlement-lines">
                  {preview.lines.map((line) => (
                    <li key={line}>{line}</li>
                  ))}
                </ul>
              )}
              <p className="mt-2 text-xs text-brine">Worked out on the server from the delivery’s volume, the price and fee of the scheme’s rules and the accepted added water; the figures signed are recomputed at the moment of signing.</p>
            </section>
          ) : null}

          <Field id="decision-reasons" label="Reasons" hint="What the decision rests on, in words the parties can follow." error={e.reasons?.message}>
            <TextArea id="decision-reasons" rows={4} invalid={!!e.reasons} {...register('reasons')} />
          </Field>
          {departing ? (
            <Field id="decision-departure" label="Why you depart from the proposal" error={e.departureReason?.message}>
              <TextArea id="decision-departure" rows={3} invalid={!!e.departureReason} {...register('departureReason')} />
            </Field>
          ) : null}

          <fieldset className="grid gap-3 rounded-card border border-line bg-white p-3">
            <legend className="px-1 text-sm font-bold">Signature</legend>
            <dl className="grid grid-cols-1 gap-x-6 gap-y-1 text-sm sm:grid-cols-[max-content_1fr]">
              <dt className="font-bold text-brine">Signed by</dt>
              <dd>
                {data.signerName}, arbiter, {data.boardName}
              </dd>
              <dt className="font-bold text-brine">Time</dt>
              <dd>recorded in UTC at the moment of signing</dd>
              <dt className="font-bold text-brine">Meaning</dt>
              <dd>{data.meaning}</dd>
            </dl>
            <label className="flex items-start gap-2 text-sm">
              <input type="checkbox" className="mt-1" aria-invalid={!!e.confirm || undefined} {...register('confirm')} />
              <span>{correcting ? 'I sign this as the board’s binding decision on this case, superseding the decision in force.' : 'I sign this as the board’s binding decision on this case.'}</span>
            </label>
            {e.confirm?.message ? (
              <p role="alert" className="text-sm font-bold text-rust">
                <span aria-hidden="true">✕ </span>
                {e.confirm.message}
              </p>
            ) : null}
            <Field id="decision-password" label="Your password" hint="Asked again at every signature, even though you are signed in." error={e.password?.message}>
              <TextInput id="decision-password" type="password" autoComplete="current-password" invalid={!!e.password} {...register('password')} />
            </Field>
          </fieldset>

          <div>
            <Button type="submit" disabled={formState.isSubmitting || outcome === 'further_test'}>
              {formState.isSubmitting ? 'Signing and sealing…' : correcting ? 'Sign correction' : 'Sign decision'}
            </Button>
          </div>
        </form>
      )}
    </FormPanel>
  );
}
