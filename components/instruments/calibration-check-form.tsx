'use client';

import { useWatch } from 'react-hook-form';
import { calibrationCheck, sodiumChlorideFor } from '@/lib/arbitration';
import { calibrationCheckInputSchema } from '@/lib/intake/schemas';
import { recordCalibrationCheckAction } from '@/app/(app)/instruments/actions';
import { errorAt, useServerForm } from '@/components/forms/use-server-form';
import { Button } from '@/components/ui/button';
import { Field, FormMessage, TextInput } from '@/components/ui/field';
import { typedReadings } from '@/components/readings/live';
import { localInputValue } from '@/components/intake/local-time';

export type CalibrationRule = { nominal: number; readings: number; tolerance: number; required: number; validHours: number };

const m = (celsius: number) => `${(celsius * 1000).toFixed(1)} m°C`;
const c3 = (celsius: number) => `${celsius.toFixed(3).replace('-', '−')} °C`;

function typedNominal(value: unknown): number | null {
  const [n] = typedReadings([value]);
  return n === undefined ? null : n;
}

/** Salt for the standard, from ISO 5764 Table 1, or why it cannot be given. */
function saltFor(nominal: number | null): string {
  if (nominal === null) return 'Enter the standard’s freezing point to see the salt it takes.';
  try {
    return `Prepare it with ${sodiumChlorideFor(nominal).toFixed(3)} g of sodium chloride per kg of water (ISO 5764, Table 1${[-0.4, -0.408, -0.45, -0.5, -0.51, -0.512, -0.52, -0.53, -0.54, -0.55, -0.557, -0.6].some((v) => Math.abs(v - nominal) < 1e-9) ? '' : ', interpolated between its rows'}).`;
  } catch {
    return 'ISO 5764 Table 1 gives standards from −0.400 to −0.600 °C only.';
  }
}

/**
 * A routine check on a sodium chloride standard. The live verdict is the same k-of-n rule the server
 * applies; the server's verdict is the one recorded.
 */
export function CalibrationCheckForm({ instrumentId, rule, rulesVersion, analystName }: { instrumentId: string; rule: CalibrationRule; rulesVersion: number; analystName: string }) {
  const { form, state, onSubmit } = useServerForm(
    calibrationCheckInputSchema,
    { instrumentId, analystName, checkedAt: localInputValue(), nominal: String(rule.nominal), readings: Array.from({ length: rule.readings }, () => '') },
    (values) => recordCalibrationCheckAction(values),
  );
  const { register, control, formState } = form;
  const e = formState.errors;
  const [nominalTyped, readingsTyped] = useWatch({ control, name: ['nominal', 'readings'] });
  const nominal = typedNominal(nominalTyped);
  const values = typedReadings((readingsTyped as unknown[] | undefined) ?? []);
  const live = nominal !== null && values.length === rule.readings ? calibrationCheck({ nominal, readings: values, tolerance: rule.tolerance, required: rule.required }) : null;

  return (
    <form onSubmit={onSubmit} noValidate className="grid gap-5">
      {state ? <FormMessage tone={state.ok ? 'success' : 'error'}>{state.message}</FormMessage> : null}
      <div className="grid gap-4 md:grid-cols-3">
        <Field id="analystName" label="Analyst" error={e.analystName?.message}>
          <TextInput id="analystName" invalid={!!e.analystName} {...register('analystName')} />
        </Field>
        <Field id="checkedAt" label="Checked at (your local time)" error={e.checkedAt?.message}>
          <TextInput id="checkedAt" type="datetime-local" invalid={!!e.checkedAt} {...register('checkedAt')} />
        </Field>
        <Field id="nominal" label="Standard’s freezing point (°C)" hint={`The scheme’s standard is ${c3(rule.nominal)}.`} error={e.nominal?.message}>
          <TextInput id="nominal" inputMode="decimal" invalid={!!e.nominal} {...register('nominal')} />
        </Field>
      </div>
      <p className="text-sm text-ink-soft" data-testid="sodium-chloride">
        {saltFor(nominal)}
      </p>
      <fieldset className="rounded-card border border-line bg-white p-4">
        <legend className="px-1 font-bold">Readings on the standard</legend>
        <div className="grid grid-cols-2 gap-3 md:grid-cols-5">
          {Array.from({ length: rule.readings }, (_, i) => (
            <Field key={i} id={`cal-${i}`} label={`Reading ${i + 1}`} error={errorAt(e, `readings.${i}`)}>
              <TextInput id={`cal-${i}`} inputMode="decimal" autoComplete="off" placeholder="−0.5120" invalid={!!errorAt(e, `readings.${i}`)} {...register(`readings.${i}` as const)} />
            </Field>
          ))}
        </div>
        {errorAt(e, 'readings') ?? errorAt(e, 'readings.root') ? (
          <p role="alert" className="mt-2 text-sm font-bold text-rust">
            ✕ {errorAt(e, 'readings') ?? errorAt(e, 'readings.root')}
          </p>
        ) : null}
        <div aria-live="polite" className="mt-3 text-sm">
          {live ? (
            live.pass ? (
              <FormMessage tone="success">
                Fit for work: {live.within} of {live.total} within ±{m(rule.tolerance)} of the standard; valid {rule.validHours} h.
              </FormMessage>
            ) : (
              <FormMessage tone="error">
                Not fit: {live.within} of {live.total} within ±{m(rule.tolerance)}; {rule.required} needed. Recalibrate the instrument and check again.
              </FormMessage>
            )
          ) : (
            <p className="text-brine">
              Enter all {rule.readings} readings; at least {rule.required} must lie within ±{m(rule.tolerance)} of the standard (rules v{rulesVersion}).
            </p>
          )}
        </div>
      </fieldset>
      <div>
        <Button type="submit" disabled={formState.isSubmitting}>
          {formState.isSubmitting ? 'Recording…' : 'Record check'}
        </Button>
      </div>
    </form>
  );
}
