'use client';

import { preparations, type Preparation, type ReadingFlag } from '@/lib/enums';
import type { Precision } from '@/lib/arbitration';
import { preparationLabels } from '@/lib/intake/practice';
import { correctionInputSchema } from '@/lib/intake/schemas';
import { correctIntakeAction } from '@/app/(app)/deliveries/[deliveryId]/actions';
import { useServerForm } from '@/components/forms/use-server-form';
import { Button } from '@/components/ui/button';
import { Field, FormMessage, Select, TextArea, TextInput } from '@/components/ui/field';
import { ReadingsEntry, useReadingsConclusive } from '@/components/readings/readings-entry';

/**
 * A correction of the current intake result, before any dispute: the corrected readings and the
 * reason. The original stays on record beside it.
 */
export function CorrectionForm({
  intakeResultId,
  precision,
  current,
}: {
  intakeResultId: string;
  precision: Precision;
  current: { readings: { value: string; flag: ReadingFlag }[]; sampleTemperature: string; preparation: Preparation };
}) {
  const { form, state, onSubmit } = useServerForm(
    correctionInputSchema,
    { intakeResultId, reason: '', sampleTemperature: current.sampleTemperature, preparation: current.preparation, readings: current.readings },
    (values) => correctIntakeAction(values),
  );
  const { register, formState } = form;
  const e = formState.errors;
  const conclusive = useReadingsConclusive(form, precision);
  return (
    <form onSubmit={onSubmit} noValidate className="grid gap-4">
      {state ? <FormMessage tone={state.ok ? 'success' : 'error'}>{state.message}</FormMessage> : null}
      <Field id="reason" label="Why the result is corrected" hint="e.g. a reading was transcribed wrongly from the instrument’s print-out. Kept with the record and shown to the supplier." error={e.reason?.message}>
        <TextArea id="reason" rows={3} invalid={!!e.reason} {...register('reason')} />
      </Field>
      <div className="grid gap-4 md:grid-cols-2">
        <Field id="c-sampleTemperature" label="Test portion temperature (°C)" error={e.sampleTemperature?.message}>
          <TextInput id="c-sampleTemperature" inputMode="decimal" invalid={!!e.sampleTemperature} {...register('sampleTemperature')} />
        </Field>
        <Field id="c-preparation" label="Preparation" error={e.preparation?.message}>
          <Select id="c-preparation" {...register('preparation')}>
            {preparations.map((p) => (
              <option key={p} value={p}>
                {preparationLabels[p]}
              </option>
            ))}
          </Select>
        </Field>
      </div>
      <ReadingsEntry form={form} precision={precision} legend="Corrected readings, in the order taken" />
      <div>
        <Button type="submit" variant="danger" disabled={formState.isSubmitting || !conclusive}>
          {formState.isSubmitting ? 'Recording…' : 'Record correction'}
        </Button>
      </div>
    </form>
  );
}
