'use client';

import { useState } from 'react';
import { useForm, useWatch, type Path } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { publishRulesSchema, rulesErrorMap } from '@/lib/intake/rules-input';
import type { SchemeRules } from '@/lib/rules/schema';
import type { FormState } from '@/lib/forms/action';
import { publishRulesAction } from '@/app/(app)/admin/rules/actions';
import { errorAt } from '@/components/forms/use-server-form';
import { Button } from '@/components/ui/button';
import { Field, FormMessage, Select, TextArea, TextInput } from '@/components/ui/field';
import { localInputValue } from '@/components/intake/local-time';
import { changedLeaves, rulesLeaves, type RulesLeaf } from './rules-fields';
import { groupOf, groupTitles, rulesExplained, type RulesGroup } from './rules-explained';

type Input = z.input<typeof publishRulesSchema>;
type Output = z.output<typeof publishRulesSchema>;

const leaves = rulesLeaves();

function typedNumber(value: unknown): unknown {
  if (typeof value !== 'string') return value;
  const cleaned = value.trim().replace(/[\u2212\u2013]/g, '-').replace(',', '.');
  // Empty stays missing (an optional limit left blank); anything else the schema judges as a number.
  return cleaned === '' ? undefined : Number(cleaned);
}

function show(value: unknown, leaf: RulesLeaf): string {
  if (value === undefined || value === null || value === '') return 'none';
  const options = rulesExplained[leaf.path].options;
  if (typeof value === 'string' && options?.[value]) return options[value];
  if (typeof value === 'boolean') return value ? 'yes' : 'no';
  return `${String(value).replace('-', '−')}${rulesExplained[leaf.path].unit ? ` ${rulesExplained[leaf.path].unit}` : ''}`;
}

function range(leaf: RulesLeaf): string {
  const unit = rulesExplained[leaf.path].unit ? ` ${rulesExplained[leaf.path].unit}` : '';
  if (leaf.min !== null && leaf.max !== null) return ` From ${leaf.min} to ${leaf.max}${unit}${leaf.integer ? ', whole numbers' : ''}.`;
  return '';
}

/**
 * The scheme's rules as a form drawn from their schema, each field with what it means. Publishing
 * makes a new version from a given time; the versions before it, and everything made under them, stay.
 */
export function RulesEditor({ current, currentVersion }: { current: SchemeRules; currentVersion: number }) {
  const form = useForm<Input, unknown, Output>({
    resolver: zodResolver(publishRulesSchema, { error: rulesErrorMap }),
    defaultValues: { effectiveFrom: localInputValue(), note: '', rules: current },
  });
  const [state, setState] = useState<FormState>(null);
  const { register, control, formState } = form;
  const e = formState.errors;
  const watched = useWatch({ control, name: 'rules' });
  const changes = changedLeaves(current, watched, leaves);

  const onSubmit = form.handleSubmit(async (values) => {
    setState(null);
    const result = await publishRulesAction(values);
    setState(result);
    if (result && !result.ok && result.fieldErrors) {
      for (const [path, messages] of Object.entries(result.fieldErrors)) if (path !== '_') form.setError(path as Path<Input>, { type: 'server', message: messages.join(' ') });
    }
  });

  const groups = (Object.keys(groupTitles) as RulesGroup[]).map((g) => ({ id: g, leaves: leaves.filter((l) => groupOf[l.section] === g) }));

  const control_ = (leaf: RulesLeaf) => {
    const name = `rules.${leaf.path}` as Path<Input>;
    const id = `rules-${leaf.path.replaceAll('.', '-')}`;
    const explained = rulesExplained[leaf.path];
    const error = errorAt(e, name);
    const label = explained.unit ? `${explained.label} (${explained.unit})` : explained.label;
    if (leaf.kind === 'boolean') {
      return (
        <div key={leaf.path} className="flex flex-col gap-1 md:col-span-2">
          <label htmlFor={id} className="flex items-start gap-2 text-sm font-bold">
            <input id={id} type="checkbox" className="mt-1" {...register(name)} />
            {explained.label}
          </label>
          <p className="text-xs text-brine">{explained.help}</p>
          {error ? (
            <p role="alert" className="text-sm font-bold text-rust">
              ✕ {error}
            </p>
          ) : null}
        </div>
      );
    }
    return (
      <Field key={leaf.path} id={id} label={label} hint={`${explained.help}${range(leaf)}`} error={error}>
        {leaf.kind === 'enum' ? (
          <Select id={id} invalid={!!error} {...register(name)}>
            {leaf.options.map((o) => (
              <option key={o} value={o}>
                {explained.options?.[o] ?? o}
              </option>
            ))}
          </Select>
        ) : leaf.kind === 'number' ? (
          <TextInput id={id} inputMode="decimal" autoComplete="off" invalid={!!error} {...register(name, { setValueAs: typedNumber })} />
        ) : (
          <TextInput id={id} autoComplete="off" invalid={!!error} {...register(name)} />
        )}
      </Field>
    );
  };

  return (
    <form onSubmit={onSubmit} noValidate className="grid gap-5">
      {state ? <FormMessage tone={state.ok ? 'success' : 'error'}>{state.message}</FormMessage> : null}
      {Object.keys(e).length > 0 && !state ? <FormMessage tone="error">Some fields need attention; nothing was published.</FormMessage> : null}
      {groups.map((g) => (
        <fieldset key={g.id} className="rounded-card border border-line bg-white p-4">
          <legend className="px-1 font-bold">{groupTitles[g.id]}</legend>
          <div className="grid gap-4 md:grid-cols-2">{g.leaves.map(control_)}</div>
        </fieldset>
      ))}
      <fieldset className="rounded-card border-2 border-frost/40 bg-frost-soft/40 p-4">
        <legend className="px-1 font-bold">Publish as version {currentVersion + 1}</legend>
        <div aria-live="polite" className="mb-4 text-sm">
          {changes.length === 0 ? (
            <p className="text-brine">No field differs from version {currentVersion} yet.</p>
          ) : (
            <>
              <p className="font-bold">Changes against version {currentVersion}:</p>
              <ul className="list-disc pl-5">
                {changes.map((c) => {
                  const leaf = leaves.find((l) => l.path === c.path)!;
                  return (
                    <li key={c.path}>
                      {rulesExplained[c.path].label}: {show(c.before, leaf)} → {show(c.after, leaf)}
                    </li>
                  );
                })}
              </ul>
            </>
          )}
        </div>
        <div className="grid gap-4 md:grid-cols-2">
          <Field id="effectiveFrom" label="In force from (your local time)" hint="Now or later. Results and cases made before keep the version they were made under." error={e.effectiveFrom?.message}>
            <TextInput id="effectiveFrom" type="datetime-local" invalid={!!e.effectiveFrom} {...register('effectiveFrom')} />
          </Field>
          <Field id="note" label="What changes and why" hint="Recorded with the version, e.g. “Upper limit raised to −0.512 °C as agreed at the board’s spring meeting”." error={e.note?.message}>
            <TextArea id="note" rows={2} invalid={!!e.note} {...register('note')} />
          </Field>
        </div>
        <p className="mt-3 text-xs text-brine">The supply contract and local regulations prevail: these rules must say what they say, not less.</p>
        <div className="mt-3">
          <Button type="submit" disabled={formState.isSubmitting}>
            {formState.isSubmitting ? 'Publishing…' : `Publish version ${currentVersion + 1}`}
          </Button>
        </div>
      </fieldset>
    </form>
  );
}
