'use client';

import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { authClient } from '@/lib/auth/client';
import { forgotPasswordSchema } from '@/lib/auth/schemas';
import { Button } from '@/components/ui/button';
import { Field, FormMessage, TextInput } from '@/components/ui/field';

type Values = z.infer<typeof forgotPasswordSchema>;

export function ForgotPasswordForm() {
  const [outcome, setOutcome] = useState<{ tone: 'error' | 'success'; text: string } | null>(null);
  const { register, handleSubmit, formState } = useForm<Values>({ resolver: zodResolver(forgotPasswordSchema), defaultValues: { email: '' } });
  const { errors, isSubmitting } = formState;

  const onSubmit = handleSubmit(async ({ email }) => {
    setOutcome(null);
    const { error } = await authClient.requestPasswordReset({ email, redirectTo: '/reset-password' });
    if (error) {
      setOutcome({ tone: 'error', text: error.status === 429 ? 'Too many requests. Wait a few minutes, then try again.' : 'The request could not be sent. Try again in a moment.' });
      return;
    }
    // The same answer whether or not the address has an account, so the form reveals nobody.
    setOutcome({ tone: 'success', text: 'If that address has an account, a link to choose a new password is on its way. It works for one hour.' });
  });

  return (
    <form method="post" onSubmit={onSubmit} noValidate className="flex flex-col gap-4">
      {outcome ? <FormMessage tone={outcome.tone}>{outcome.text}</FormMessage> : null}
      <Field id="email" label="E-mail address" error={errors.email?.message}>
        <TextInput id="email" type="email" autoComplete="username" invalid={!!errors.email} aria-describedby={errors.email ? 'email-error' : undefined} {...register('email')} />
      </Field>
      <Button type="submit" disabled={isSubmitting}>
        {isSubmitting ? 'Sending…' : 'Send the reset link'}
      </Button>
    </form>
  );
}
