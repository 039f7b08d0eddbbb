'use client';

import dynamic from 'next/dynamic';
import { useFieldArray, useWatch } from 'react-hook-form';
import { calibrationCheck, finalResult } from '@/lib/arbitration';
import { submitRetestSchema } from '@/lib/cases/schemas';
import { transitionCase } from '@/app/(app)/cases/[caseId]/actions';
import { errorAt, useServerForm } from '@/components/forms/use-server-form';
import { Button } from '@/components/ui/button';
import { Field, FormMessage, Select, TextInput } from '@/components/ui/field';
import { FormPanel, Outcome } from './form-bits';
import type { HortvetConversion } from '@/lib/arbitration';
import type { ReadingFlag } from '@/lib/enums';
import { matchInstrument } from '@/lib/readings-import/instrument';
import type { ImportedValues, ImportMeta } from '@/lib/readings-import';
import { localInputValue } from '@/components/intake/local-time';

// The CSV reader (papaparse and the mapping rules) is its own chunk, fetched only where a bench form
// is drawn, so the case page of every other role goes without it. Still rendered on the server.
const CsvImport = dynamic(() => import('@/components/readings/csv-import').then((m) => m.CsvImport));

export type BenchRules = {
  precision: { r: number; R: number };
  calibration: { nominal: number; readings: number; tolerance: number; required: number };
  /** The scheme's °H conversion, for readings files in °H; without it they are refused. */
  hortvetConversion?: HortvetConversion;
};

const flagGuidance: Record<string, string> = {
  early_crystallisation: 'Usually crystallised fat: warm the sample to about 45 °C for 5 minutes, cool to 20 °C and test at once.',
  no_crystallisation: 'No crystallisation often points to added salts; note it and repeat the reading.',
};

function parsed(values: unknown[]): number[] {
  const out: number[] = [];
  for (const v of values) {
    const n = typeof v === 'number' ? v : Number(String(v ?? '').replace('\u2212', '-').trim());
    if (String(v ?? '').trim() === '' || !Number.isFinite(n) || n < -1 || n > 0) break;
    out.push(n);
  }
  return out;
}

const m = (celsius: number) => `${(celsius * 1000).toFixed(1)} m°C`;

function localNow(): string {
  const d = new Date();
  d.setMinutes(d.getMinutes() - d.getTimezoneOffset());
  return d.toISOString().slice(0, 16);
}

/** The referee laboratory's retest entry, with the decision module telling live what the readings allow. */
export function BenchForm({ caseId, instruments, rules, analystName, sampleCode = null }: { caseId: string; instruments: { id: string; label: string }[]; rules: BenchRules; analystName: string; sampleCode?: string | null }) {
  const { form, state, onSubmit } = useServerForm(
    submitRetestSchema,
    {
      instrumentId: instruments.length === 1 ? instruments[0].id : '',
      analystName,
      testedAt: localNow() as unknown as Date,
      sampleTemperature: '' as unknown as number,
      preparation: 'none',
      calibrationReadings: Array.from({ length: rules.calibration.readings }, () => '' as unknown as number),
      readings: [
        { value: '' as unknown as number, flag: 'none' },
        { value: '' as unknown as number, flag: 'none' },
      ],
    },
    (values) => transitionCase(caseId, 'submit_retest', values, 'retest'),
  );
  const { register, control, formState } = form;
  const e = formState.errors;
  const readings = useFieldArray({ control, name: 'readings' });
  const watchedReadings = useWatch({ control, name: 'readings' }) ?? [];
  const watchedCalibration = useWatch({ control, name: 'calibrationReadings' }) ?? [];
  const flags = watchedReadings.map((r) => r?.flag).filter((f): f is 'early_crystallisation' | 'no_crystallisation' => f === 'early_crystallisation' || f === 'no_crystallisation');

  const values = parsed(watchedReadings.map((r) => r?.value));
  const live = values.length === 0 ? null : finalResult(values, rules.precision);
  const calValues = parsed(watchedCalibration);
  const cal = calValues.length === rules.calibration.readings ? calibrationCheck({ nominal: rules.calibration.nominal, readings: calValues, tolerance: rules.calibration.tolerance, required: rules.calibration.required }) : null;
  const needed = live && live.status === 'needs_more_readings' ? live.needed : 0;
  const spare = values.length - (live?.status === 'accepted' ? live.used : values.length);

  // A readings file fills the retest's readings, its calibration check when the file has one, and what it says of the test.
  const useImport = (imported: ImportedValues, meta: ImportMeta) => {
    // The inputs hold text, as if typed; the schema coerces it on submit.
    readings.replace(imported.readings as unknown as { value: number; flag: ReadingFlag }[]);
    if (imported.calibrationReadings.length) form.setValue('calibrationReadings', imported.calibrationReadings as unknown as number[], { shouldDirty: true });
    const instrument = matchInstrument(meta.instrument, instruments);
    if (instrument) form.setValue('instrumentId', instrument, { shouldDirty: true });
    if (meta.analyst) form.setValue('analystName', meta.analyst, { shouldDirty: true });
    if (meta.firstMeasuredAt) form.setValue('testedAt', localInputValue(meta.firstMeasuredAt) as unknown as Date, { shouldDirty: true });
  };

  return (
    <FormPanel title="Bench: submit retest" intro={<p>The retest is blind: the intake result stays hidden until you submit. Enter the readings in the order you took them.</p>}>
      <form onSubmit={onSubmit} noValidate className="grid gap-5">
        <Outcome state={state} />
        <div className="grid gap-4 md:grid-cols-3">
          <Field id="instrumentId" label="Instrument" error={e.instrumentId?.message}>
            <Select id="instrumentId" invalid={!!e.instrumentId} {...register('instrumentId')}>
              <option value="">Choose…</option>
              {instruments.map((i) => (
                <option key={i.id} value={i.id}>
                  {i.label}
                </option>
              ))}
            </Select>
          </Field>
          <Field id="analystName" label="Analyst" error={e.analystName?.message}>
            <TextInput id="analystName" invalid={!!e.analystName} {...register('analystName')} />
          </Field>
          <Field id="testedAt" label="Tested at" error={e.testedAt?.message}>
            <TextInput id="testedAt" type="datetime-local" invalid={!!e.testedAt} {...register('testedAt')} />
          </Field>
          <Field id="sampleTemperature" label="Test portion temperature (°C)" hint="20 ± 2 °C expected." error={e.sampleTemperature?.message}>
            <TextInput id="sampleTemperature" inputMode="decimal" invalid={!!e.sampleTemperature} {...register('sampleTemperature')} />
          </Field>
          <Field id="preparation" label="Preparation" error={e.preparation?.message}>
            <Select id="preparation" {...register('preparation')}>
              <option value="none">None</option>
              <option value="prewarmed">Pre-warmed to melt crystallised fat</option>
            </Select>
          </Field>
        </div>

        <CsvImport target={{ calibrationReadings: rules.calibration.readings, hortvetConversion: rules.hortvetConversion ?? null, expectedSampleCode: sampleCode }} onUse={useImport} />

        <fieldset className="rounded-card border border-line bg-white p-4">
          <legend className="px-1 font-bold">Calibration check on the {rules.calibration.nominal.toFixed(3).replace('-', '−')} °C standard</legend>
          <div className="grid grid-cols-2 gap-3 md:grid-cols-5">
            {Array.from({ length: rules.calibration.readings }, (_, i) => (
              <Field key={i} id={`cal-${i}`} label={`Reading ${i + 1}`} error={errorAt(e, `calibrationReadings.${i}`)}>
                <TextInput id={`cal-${i}`} inputMode="decimal" invalid={!!errorAt(e, `calibrationReadings.${i}`)} {...register(`calibrationReadings.${i}` as const)} />
              </Field>
            ))}
          </div>
          {errorAt(e, 'calibrationReadings') ? <p role="alert" className="mt-2 text-sm font-bold text-rust">✕ {errorAt(e, 'calibrationReadings')}</p> : null}
          <p aria-live="polite" className="mt-2 text-sm">
            {cal ? (
              cal.pass ? (
                <span className="font-bold text-clover">✓ Fit for work: {cal.within} of {cal.total} within ±{m(rules.calibration.tolerance)}.</span>
              ) : (
                <span className="font-bold text-rust">✕ Not fit: {cal.within} of {cal.total} within ±{m(rules.calibration.tolerance)}; {rules.calibration.required} needed. Recalibrate first.</span>
              )
            ) : (
              <span className="text-brine">Enter all {rules.calibration.readings} readings; at least {rules.calibration.required} must lie within ±{m(rules.calibration.tolerance)}.</span>
            )}
          </p>
        </fieldset>

        <fieldset className="rounded-card border border-line bg-white p-4">
          <legend className="px-1 font-bold">Readings of the sample</legend>
          <ol className="grid gap-3">
            {readings.fields.map((field, i) => (
              <li key={field.id} className="grid grid-cols-[auto_1fr_1fr_auto] items-end gap-3">
                <span className="pb-2 font-bold num">{i + 1}.</span>
                <Field id={`reading-${i}`} label="Freezing point (°C)" error={errorAt(e, `readings.${i}.value`)}>
                  <TextInput id={`reading-${i}`} inputMode="decimal" placeholder="−0.5120" invalid={!!errorAt(e, `readings.${i}.value`)} {...register(`readings.${i}.value` as const)} />
                </Field>
                <Field id={`flag-${i}`} label="Observation">
                  <Select id={`flag-${i}`} {...register(`readings.${i}.flag` as const)}>
                    <option value="none">Normal plateau</option>
                    <option value="early_crystallisation">Early crystallisation</option>
                    <option value="no_crystallisation">No crystallisation</option>
                  </Select>
                </Field>
                {i >= 2 ? (
                  <Button type="button" variant="quiet" onClick={() => readings.remove(i)} aria-label={`Remove reading ${i + 1}`}>
                    Remove
                  </Button>
                ) : (
                  <span />
                )}
              </li>
            ))}
          </ol>
          {errorAt(e, 'readings') ? <p role="alert" className="mt-2 text-sm font-bold text-rust">✕ {errorAt(e, 'readings')}</p> : null}
          <div aria-live="polite" className="mt-3 grid gap-2">
            {live === null ? (
              <p className="text-sm text-brine">Two readings that agree within r = {m(rules.precision.r)} give the result; otherwise two more are needed.</p>
            ) : live.status === 'accepted' ? (
              <FormMessage tone="success">
                Accepted: {live.basis.replaceAll('_', ' ')} = {live.value.toFixed(4).replace('-', '−')} °C{spare > 0 ? ` (${spare} further reading${spare === 1 ? '' : 's'} not used)` : ''}.
              </FormMessage>
            ) : (
              <FormMessage tone="error">
                {live.needed} more reading{live.needed === 1 ? '' : 's'} needed{values.length >= 2 ? `: the first two differ by ${m(Math.abs(values[0] - values[1]))}, more than r = ${m(rules.precision.r)}` : ''}.
              </FormMessage>
            )}
            {flags.map((f, i) => (
              <p key={`${f}-${i}`} className="text-sm text-amber">
                ▲ {flagGuidance[f]}
              </p>
            ))}
          </div>
          {readings.fields.length < 10 ? (
            <Button type="button" variant="secondary" className="mt-3" onClick={() => readings.append({ value: '' as unknown as number, flag: 'none' })}>
              {needed > 0 ? `Add reading (${needed} more needed)` : 'Add reading'}
            </Button>
          ) : null}
        </fieldset>
        <div>
          <Button type="submit" disabled={formState.isSubmitting || needed > 0}>
            {formState.isSubmitting ? 'Submitting…' : 'Submit retest'}
          </Button>
        </div>
      </form>
    </FormPanel>
  );
}
