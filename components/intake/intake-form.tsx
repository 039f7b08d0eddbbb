'use client';

import Link from 'next/link';
import { useWatch } from 'react-hook-form';
import { preparations } from '@/lib/enums';
import type { InstrumentStatus } from '@/lib/intake/instrument-status';
import { preparationLabels, sampleTemperatureCheck, SAMPLE_TEMPERATURE } from '@/lib/intake/practice';
import { intakeInputSchema } from '@/lib/intake/schemas';
import type { SchemeRules } from '@/lib/rules/schema';
import { recordIntakeAction } from '@/app/(app)/intake/actions';
import { useServerForm } from '@/components/forms/use-server-form';
import { Button } from '@/components/ui/button';
import { Field, FormMessage, Select, TextInput } from '@/components/ui/field';
import { Badge } from '@/components/ui/status';
import { InstrumentStatusBadge } from '@/components/instruments/instrument-status';
import { ReadingsEntry } from '@/components/readings/readings-entry';
import { matchInstrument, type ImportMeta } from '@/lib/readings-import';
import { describeReadings, typedReadings } from '@/components/readings/live';
import { localInputValue } from './local-time';
import { VerdictPreview } from './verdict-preview';

export type IntakeFarm = { id: string; name: string; herdCode: string; organisationName: string };
export type IntakeInstrument = { id: string; serialNumber: string; description: string; status: InstrumentStatus };

function Section({ title, children }: { title: string; children: React.ReactNode }) {
  return (
    <fieldset className="rounded-card border border-line bg-white p-4">
      <legend className="px-1 font-bold">{title}</legend>
      <div className="grid gap-4 md:grid-cols-3">{children}</div>
    </fieldset>
  );
}

function typedNumber(value: unknown): number | null {
  const text = String(value ?? '').trim().replace(/[\u2212\u2013]/g, '-').replace(',', '.');
  const n = Number(text);
  return text === '' || !Number.isFinite(n) ? null : n;
}

/** The plant's intake of one delivery: the load, its samples, the readings and the verdict, in one record. */
export function IntakeForm({ farms, instruments, rules, rulesVersion, analystName }: { farms: IntakeFarm[]; instruments: IntakeInstrument[]; rules: SchemeRules; rulesVersion: number; analystName: string }) {
  const now = localInputValue();
  const { form, state, onSubmit } = useServerForm(
    intakeInputSchema,
    {
      farmId: '',
      reference: '',
      collectedAt: '',
      receivedAt: now,
      volumeLitres: '',
      tanker: '',
      compartment: '',
      receiptTemperature: '',
      routineCode: '',
      retainedCode: '',
      sealNumber: '',
      retainedLocation: 'Retained-sample refrigerator',
      retainedTemperature: '',
      instrumentId: instruments.find((i) => i.status.state === 'fit')?.id ?? '',
      analystName,
      testedAt: now,
      sampleTemperature: '',
      preparation: 'none',
      readings: [{ value: '', flag: 'none' }],
      acknowledgeUnfit: false,
    },
    (values) => recordIntakeAction(values),
  );
  const { register, control, formState } = form;
  const e = formState.errors;
  const [instrumentId, reference, volume, sampleTemp, watchedReadings] = useWatch({ control, name: ['instrumentId', 'reference', 'volumeLitres', 'sampleTemperature', 'readings'] });
  const chosen = instruments.find((i) => i.id === instrumentId) ?? null;
  const unfit = chosen?.status.state === 'unfit';
  const live = describeReadings(typedReadings(((watchedReadings as { value: unknown }[] | undefined) ?? []).map((r) => r?.value)), rules.precision);
  const temp = typedNumber(sampleTemp);
  const tempCheck = temp === null ? null : sampleTemperatureCheck(temp);
  const refText = typeof reference === 'string' && reference.trim() ? reference.trim() : '<reference>';
  const err = (name: string) => (e as Record<string, { message?: string } | undefined>)[name]?.message;

  // What the readings file says of the test fills the fields still empty or at their defaults; the analyst reviews them.
  const fillFromImport = (meta: ImportMeta) => {
    const instrument = matchInstrument(meta.instrument, instruments.map((i) => ({ id: i.id, label: `${i.serialNumber} · ${i.description}` })));
    if (instrument) form.setValue('instrumentId', instrument, { shouldDirty: true });
    if (meta.analyst) form.setValue('analystName', meta.analyst, { shouldDirty: true });
    if (meta.firstMeasuredAt) form.setValue('testedAt', localInputValue(meta.firstMeasuredAt) as never, { shouldDirty: true });
    if (meta.sampleCode && !String(form.getValues('routineCode') ?? '').trim()) form.setValue('routineCode', meta.sampleCode, { shouldDirty: true });
  };

  const text = (name: keyof typeof e & string, label: string, props: { hint?: React.ReactNode; placeholder?: string; type?: string; inputMode?: 'decimal' | 'numeric' } = {}) => (
    <Field id={name} label={label} hint={props.hint} error={err(name)}>
      <TextInput id={name} type={props.type} inputMode={props.inputMode} placeholder={props.placeholder} autoComplete="off" invalid={!!err(name)} {...register(name as never)} />
    </Field>
  );

  return (
    <form onSubmit={onSubmit} noValidate className="grid gap-5">
      {state ? <FormMessage tone={state.ok ? 'success' : 'error'}>{state.message}</FormMessage> : null}
      <Section title="The load">
        <Field id="farmId" label="Farm" error={err('farmId')}>
          <Select id="farmId" invalid={!!err('farmId')} {...register('farmId')}>
            <option value="">Choose…</option>
            {[...new Set(farms.map((f) => f.organisationName))].map((group) => (
              <optgroup key={group} label={group}>
                {farms
                  .filter((f) => f.organisationName === group)
                  .map((f) => (
                    <option key={f.id} value={f.id}>
                      {f.herdCode} · {f.name}
                    </option>
                  ))}
              </optgroup>
            ))}
          </Select>
        </Field>
        {text('reference', 'Delivery reference', { hint: 'As on the collection note; unique.', placeholder: 'LW-20260314-UL-104' })}
        {text('volumeLitres', 'Volume (litres)', { inputMode: 'numeric' })}
        {text('collectedAt', 'Collected at (your local time)', { type: 'datetime-local' })}
        {text('receivedAt', 'Received at (your local time)', { type: 'datetime-local' })}
        {text('receiptTemperature', 'Temperature on receipt (°C)', { inputMode: 'decimal', hint: 'Of the milk in the compartment.' })}
        {text('tanker', 'Tanker')}
        {text('compartment', 'Compartment')}
      </Section>

      <Section title="Samples">
        {text('routineCode', 'Routine sample code', { hint: `Leave empty for R-${refText}.` })}
        {text('retainedCode', 'Retained sample code', { hint: `Leave empty for K-${refText}.` })}
        {text('sealNumber', 'Seal number of the retained sample', { hint: 'Sealed at the farm tank; the supplier’s evidence if the result is disputed.' })}
        {text('retainedLocation', 'Retained sample stored in')}
        {text('retainedTemperature', 'Storage temperature (°C)', { inputMode: 'decimal', hint: `The scheme keeps retained samples at ${rules.sample.storageRange.min}–${rules.sample.storageRange.max} °C.` })}
      </Section>

      <Section title="The test">
        <div className="md:col-span-3">
          <Field id="instrumentId" label="Instrument" error={err('instrumentId')}>
            <Select id="instrumentId" invalid={!!err('instrumentId')} {...register('instrumentId')}>
              <option value="">Choose…</option>
              {instruments.map((i) => (
                <option key={i.id} value={i.id}>
                  {i.serialNumber} · {i.description} — {i.status.state === 'fit' ? 'fit' : 'UNFIT'}
                </option>
              ))}
            </Select>
          </Field>
          {chosen ? (
            <div className="mt-2 flex flex-wrap items-center gap-2 text-sm">
              <InstrumentStatusBadge status={chosen.status} />
              <Link href={`/instruments/${chosen.id}`}>{unfit ? 'Run a calibration check' : 'Checks of this instrument'}</Link>
            </div>
          ) : null}
          {unfit ? (
            rules.calibration.allowUnfitWithWarning ? (
              <div className="mt-3 rounded-control border border-amber bg-amber-soft p-3 text-sm text-amber">
                <p className="font-bold">▲ The scheme allows a result on this instrument only with a warning that goes to the supplier and the board.</p>
                <label className="mt-2 flex items-start gap-2 font-bold text-ink">
                  <input type="checkbox" className="mt-1" {...register('acknowledgeUnfit')} />I record this test knowing the instrument had no passing check in force.
                </label>
                {err('acknowledgeUnfit') ? (
                  <p role="alert" className="mt-1 font-bold text-rust">
                    ✕ {err('acknowledgeUnfit')}
                  </p>
                ) : null}
              </div>
            ) : (
              <p role="alert" className="mt-3 rounded-control border border-rust bg-rust-soft p-3 text-sm font-bold text-rust">
                ✕ The scheme refuses intake tests on an instrument without a passing check in force. Run a calibration check first, or choose another instrument.
              </p>
            )
          ) : null}
        </div>
        {text('analystName', 'Analyst')}
        {text('testedAt', 'Tested at (your local time)', { type: 'datetime-local' })}
        <Field id="preparation" label="Preparation" error={err('preparation')}>
          <Select id="preparation" {...register('preparation')}>
            {preparations.map((p) => (
              <option key={p} value={p}>
                {preparationLabels[p]}
              </option>
            ))}
          </Select>
        </Field>
        <div>
          {text('sampleTemperature', 'Test portion temperature (°C)', { inputMode: 'decimal', hint: `${SAMPLE_TEMPERATURE.targetCelsius} ± ${SAMPLE_TEMPERATURE.toleranceCelsius} °C expected.` })}
          {tempCheck && !tempCheck.ok ? (
            <p className="mt-1 text-sm text-amber">
              <Badge tone="warning">Flagged</Badge> {tempCheck.message}
            </p>
          ) : null}
        </div>
      </Section>

      <ReadingsEntry
        form={form}
        precision={rules.precision}
        csvImport={{ target: { calibrationReadings: null, hortvetConversion: rules.display.hortvetConversion }, onUse: (_values, meta) => fillFromImport(meta) }}
      />

      <section aria-labelledby="verdict-preview-title" className="rounded-card border border-line bg-paper-deep/60 p-4">
        <h2 id="verdict-preview-title" className="mb-2 font-bold">
          Verdict under the rules in force
        </h2>
        <VerdictPreview value={live.state === 'accepted' ? live.result.value : null} used={live.state === 'accepted' ? live.result.used : 2} volumeLitres={typedNumber(volume)} rules={rules} version={rulesVersion} />
        <p className="mt-2 text-xs text-brine">
          A rejection or deduction is e-mailed to the supplier as soon as it is recorded, with a {rules.deadlines.contestHours} h window to contest. The supply contract and local regulations prevail over
          the scheme’s rules where they differ.
        </p>
      </section>

      <div className="flex flex-wrap items-center gap-3">
        <Button type="submit" disabled={formState.isSubmitting || live.state !== 'accepted'}>
          {formState.isSubmitting ? 'Recording…' : 'Record intake'}
        </Button>
        {live.state !== 'accepted' ? <span className="text-sm text-brine">Enter readings until they give a final result.</span> : null}
      </div>
    </form>
  );
}
