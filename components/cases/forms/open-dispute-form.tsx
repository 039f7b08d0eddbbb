'use client';

import { disputeGrounds } from '@/lib/enums';
import { openDisputeSchema } from '@/lib/cases/schemas';
import { openDisputeAction } from '@/app/(app)/deliveries/[deliveryId]/dispute/actions';
import { useServerForm } from '@/components/forms/use-server-form';
import { Button } from '@/components/ui/button';
import { Field, TextArea } from '@/components/ui/field';
import { Outcome } from './form-bits';

const groundLabels: Record<(typeof disputeGrounds)[number], { label: string; hint: string }> = {
  sampling: { label: 'Sampling', hint: 'how or when the load was sampled' },
  instrument: { label: 'Instrument', hint: 'calibration or working of the cryoscope' },
  natural_variation: { label: 'Natural variation of the herd', hint: 'feed, season, breed or water access' },
  sample_handling: { label: 'Sample handling', hint: 'storage, temperature, time before testing' },
  other: { label: 'Other', hint: 'explain below' },
};

export function OpenDisputeForm({ intakeResultId }: { intakeResultId: string }) {
  const { form, state, onSubmit } = useServerForm(openDisputeSchema, { intakeResultId, grounds: [], explanation: '', remedy: '' }, (values) => openDisputeAction(values));
  const { register, formState } = form;
  const e = formState.errors;
  return (
    <form onSubmit={onSubmit} noValidate className="grid gap-5">
      <Outcome state={state} />
      <fieldset aria-describedby={e.grounds ? 'grounds-error' : undefined}>
        <legend className="mb-2 text-sm font-bold">Grounds</legend>
        <div className="grid gap-2 md:grid-cols-2">
          {disputeGrounds.map((g) => (
            <label key={g} className="flex items-start gap-2 rounded-control border border-line bg-white p-2 text-sm">
              <input type="checkbox" value={g} className="mt-1" {...register('grounds')} />
              <span>
                <span className="font-bold">{groundLabels[g].label}</span>
                <span className="block text-xs text-brine">{groundLabels[g].hint}</span>
              </span>
            </label>
          ))}
        </div>
        {e.grounds?.message ? (
          <p id="grounds-error" role="alert" className="mt-1 text-sm font-bold text-rust">
            ✕ {e.grounds.message}
          </p>
        ) : null}
      </fieldset>
      <Field id="explanation" label="Explanation" hint="What happened and why you believe the result is wrong. The referee laboratory reads this only after its retest." error={e.explanation?.message}>
        <TextArea id="explanation" rows={5} invalid={!!e.explanation} {...register('explanation')} />
      </Field>
      <Field id="remedy" label="Remedy you ask for" hint="e.g. pay the load in full" error={e.remedy?.message}>
        <TextArea id="remedy" rows={2} invalid={!!e.remedy} {...register('remedy')} />
      </Field>
      <div>
        <Button type="submit" disabled={formState.isSubmitting}>
          {formState.isSubmitting ? 'Opening…' : 'Open a dispute'}
        </Button>
      </div>
    </form>
  );
}
