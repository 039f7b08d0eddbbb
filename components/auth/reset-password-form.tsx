'use client';

import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { useRouter } from 'next/navigation';
import { authClient } from '@/lib/auth/client';
import { setPasswordSchema, PASSWORD_MIN } from '@/lib/auth/schemas';
import { Button } from '@/components/ui/button';
import { Field, FormMessage, TextInput } from '@/components/ui/field';

type Values = z.infer<typeof setPasswordSchema>;

export function ResetPasswordForm({ token }: { token: string }) {
  const router = useRouter();
  const [failure, setFailure] = useState<string | null>(null);
  const { register, handleSubmit, formState } = useForm<Values>({ resolver: zodResolver(setPasswordSchema), defaultValues: { password: '', confirm: '' } });
  const { errors, isSubmitting } = formState;

  const onSubmit = handleSubmit(async ({ password }) => {
    setFailure(null);
    const { error } = await authClient.resetPassword({ newPassword: password, token });
    if (error) {
      setFailure(error.status === 400 ? 'This link has expired or was already used. Ask for a new one.' : 'The password could not be changed. Try again in a moment.');
      return;
    }
    router.replace('/sign-in?reset=1');
  });

  return (
    <form method="post" onSubmit={onSubmit} noValidate className="flex flex-col gap-4">
      {failure ? <FormMessage tone="error">{failure}</FormMessage> : null}
      <Field id="password" label="New password" hint={`At least ${PASSWORD_MIN} characters. A short sentence is easy to remember.`} error={errors.password?.message}>
        <TextInput id="password" type="password" autoComplete="new-password" invalid={!!errors.password} aria-describedby={errors.password ? 'password-error' : 'password-hint'} {...register('password')} />
      </Field>
      <Field id="confirm" label="The same password again" error={errors.confirm?.message}>
        <TextInput id="confirm" type="password" autoComplete="new-password" invalid={!!errors.confirm} aria-describedby={errors.confirm ? 'confirm-error' : undefined} {...register('confirm')} />
      </Field>
      <Button type="submit" disabled={isSubmitting}>
        {isSubmitting ? 'Saving…' : 'Set the new password'}
      </Button>
    </form>
  );
}
