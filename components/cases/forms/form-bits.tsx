'use client';

import type { ReactNode } from 'react';
import type { FormState } from '@/lib/forms/action';
import { FormMessage } from '@/components/ui/field';

/** The outcome line every case form shows after a submit. */
export function Outcome({ state }: { state: FormState }) {
  if (!state) return null;
  return <FormMessage tone={state.ok ? 'success' : 'error'}>{state.message}</FormMessage>;
}

export function FormPanel({ title, intro, children }: { title: string; intro?: ReactNode; children: ReactNode }) {
  return (
    <section className="rounded-card border-2 border-frost/40 bg-frost-soft/40 p-5">
      <h2 className="text-lg font-bold">{title}</h2>
      {intro ? <div className="mb-3 text-sm text-ink-soft">{intro}</div> : null}
      {children}
    </section>
  );
}
