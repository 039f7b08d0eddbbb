'use client';

import { useState } from 'react';
import { useForm, type DefaultValues, type FieldValues, type Path } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import type { FormState } from '@/lib/forms/action';

/**
 * A form validated in the browser by the same zod schema the server uses; the server's own field
 * errors (for rules only it can check) land beside the same fields.
 */
export function useServerForm<S extends z.ZodType<FieldValues, FieldValues>>(
  schema: S,
  defaultValues: DefaultValues<z.input<S>>,
  submit: (values: z.output<S>) => Promise<FormState>,
) {
  const form = useForm<z.input<S>, unknown, z.output<S>>({ resolver: zodResolver(schema as never) as never, defaultValues });
  const [state, setState] = useState<FormState>(null);
  const onSubmit = form.handleSubmit(async (values) => {
    setState(null);
    const result = await submit(values);
    setState(result);
    if (result && !result.ok && result.fieldErrors) {
      for (const [path, messages] of Object.entries(result.fieldErrors)) {
        if (path !== '_') form.setError(path as Path<z.input<S>>, { type: 'server', message: messages.join(' ') });
      }
    }
  });
  return { form, state, onSubmit };
}

/** The message of a field, nested paths included (readings.2.value). */
export function errorAt(errors: unknown, path: string): string | undefined {
  let node: unknown = errors;
  for (const key of path.split('.')) {
    if (!node || typeof node !== 'object') return undefined;
    node = (node as Record<string, unknown>)[key];
  }
  const message = (node as { message?: unknown } | undefined)?.message;
  return typeof message === 'string' ? message : undefined;
}
