'use client';

import { useFieldArray, useWatch, type FieldValues, type UseFormReturn } from 'react-hook-form';
import type { Precision } from '@/lib/arbitration';
import { readingFlags, type ReadingFlag } from '@/lib/enums';
import { flagGuidance, flagLabels } from '@/lib/intake/practice';
import { errorAt } from '@/components/forms/use-server-form';
import { Button } from '@/components/ui/button';
import { Field, FormMessage, Select, TextInput } from '@/components/ui/field';
import { describeReadings, typedReadings } from './live';
import { CsvImport } from './csv-import';
import type { ImportedValues, ImportMeta, ImportTarget } from '@/lib/readings-import';

/** Offers the CSV import above the readings; `onUse` fills the form's other fields from the file. */
export type ReadingsCsvImport = { target: ImportTarget; onUse?: (values: ImportedValues, meta: ImportMeta) => void };

type ReadingsShape = { readings: { value: unknown; flag: ReadingFlag }[] };

const MAX_READINGS = 10;

/**
 * The readings of one sample, entered one at a time in the order taken, with the decision module
 * saying live whether they give a result or how many more are needed. Any form whose values hold
 * `readings: { value, flag }[]` can use it.
 */
export function ReadingsEntry<T extends FieldValues>({ form, precision, legend = 'Readings of the sample', csvImport }: { form: UseFormReturn<T, any, any>; precision: Precision; legend?: string; csvImport?: ReadingsCsvImport }) {
  const { control, register, formState } = form as unknown as UseFormReturn<ReadingsShape>;
  const readings = useFieldArray({ control, name: 'readings' });
  const watched = useWatch({ control, name: 'readings' }) ?? [];
  const values = typedReadings(watched.map((r) => r?.value));
  const live = describeReadings(values, precision);
  const needed = live.state === 'more' ? live.needed : 0;
  const flags = [...new Set(watched.map((r) => r?.flag).filter((f): f is Exclude<ReadingFlag, 'none'> => !!f && f !== 'none'))];
  const e = formState.errors;
  const listError = errorAt(e, 'readings') ?? errorAt(e, 'readings.root');

  return (
    <fieldset className="rounded-card border border-line bg-white p-4">
      <legend className="px-1 font-bold">{legend}</legend>
      {csvImport ? (
        <CsvImport
          target={csvImport.target}
          onUse={(values, meta) => {
            readings.replace(values.readings);
            csvImport.onUse?.(values, meta);
          }}
        />
      ) : null}
      <ol className="grid gap-3">
        {readings.fields.map((field, i) => (
          <li key={field.id} className="grid grid-cols-[2rem_1fr_1fr_5.5rem] items-end gap-3">
            <span className="pb-2 font-bold num">{i + 1}.</span>
            <Field id={`reading-${i}`} label="Freezing point (°C)" error={errorAt(e, `readings.${i}.value`)}>
              <TextInput id={`reading-${i}`} inputMode="decimal" autoComplete="off" placeholder="−0.5120" invalid={!!errorAt(e, `readings.${i}.value`)} {...register(`readings.${i}.value` as const)} />
            </Field>
            <Field id={`flag-${i}`} label="Observation">
              <Select id={`flag-${i}`} {...register(`readings.${i}.flag` as const)}>
                {readingFlags.map((f) => (
                  <option key={f} value={f}>
                    {flagLabels[f]}
                  </option>
                ))}
              </Select>
            </Field>
            {i >= 1 && i === readings.fields.length - 1 ? (
              <Button type="button" variant="quiet" onClick={() => readings.remove(i)} aria-label={`Remove reading ${i + 1}`}>
                Remove
              </Button>
            ) : (
              <span />
            )}
          </li>
        ))}
      </ol>
      {listError ? (
        <p role="alert" className="mt-2 text-sm font-bold text-rust">
          ✕ {listError}
        </p>
      ) : null}
      <div aria-live="polite" data-testid="readings-live" className="mt-3 grid gap-2">
        {live.state === 'empty' ? (
          <p className="text-sm text-brine">{live.message}</p>
        ) : live.state === 'accepted' ? (
          <FormMessage tone="success">{live.message}</FormMessage>
        ) : (
          <p role="status" className="flex items-start gap-2 rounded-control border border-amber bg-amber-soft px-3 py-2 text-sm font-bold text-amber">
            <span aria-hidden="true">▲</span>
            <span>{live.message}</span>
          </p>
        )}
        {flags.map((f) => (
          <p key={f} className="text-sm text-amber">
            <span aria-hidden="true">▲ </span>
            <strong>{flagLabels[f]}:</strong> {flagGuidance[f]}
          </p>
        ))}
      </div>
      {readings.fields.length < MAX_READINGS ? (
        <Button type="button" variant="secondary" className="mt-3" onClick={() => readings.append({ value: '', flag: 'none' })}>
          {needed > 0 ? `Add reading (${needed} more needed)` : 'Add reading'}
        </Button>
      ) : null}
    </fieldset>
  );
}

/** Whether the readings typed so far give a final result: forms hold their submit until they do. */
export function useReadingsConclusive<T extends FieldValues>(form: UseFormReturn<T, any, any>, precision: Precision): boolean {
  const { control } = form as unknown as UseFormReturn<ReadingsShape>;
  const watched = useWatch({ control, name: 'readings' }) ?? [];
  return describeReadings(typedReadings(watched.map((r) => r?.value)), precision).state === 'accepted';
}
