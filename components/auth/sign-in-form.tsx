'use client';

import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { useRouter } from 'next/navigation';
import Link from 'next/link';
import { authClient } from '@/lib/auth/client';
import { signInSchema } from '@/lib/auth/schemas';
import { Button } from '@/components/ui/button';
import { Field, FormMessage, TextInput } from '@/components/ui/field';

type Values = z.infer<typeof signInSchema>;

function safeNext(next: string | null): string {
  // Only paths of this site: an open redirect would let a link send people elsewhere after sign-in.
  return next && next.startsWith('/') && !next.startsWith('//') ? next : '/desk';
}

export function SignInForm({ next }: { next: string | null }) {
  const router = useRouter();
  const [failure, setFailure] = useState<string | null>(null);
  const { register, handleSubmit, formState } = useForm<Values>({ resolver: zodResolver(signInSchema), defaultValues: { email: '', password: '' } });
  const { errors, isSubmitting } = formState;

  const onSubmit = handleSubmit(async (values) => {
    setFailure(null);
    const { error } = await authClient.signIn.email({ email: values.email, password: values.password });
    if (error) {
      setFailure(
        error.status === 429
          ? 'Too many sign-in attempts. Wait a minute, then try again.'
          : error.status === 401 || error.status === 400
            ? 'That e-mail address and password do not match an account.'
            : 'Signing in failed. Try again in a moment.',
      );
      return;
    }
    router.replace(safeNext(next));
    router.refresh();
  });

  return (
    <form method="post" onSubmit={onSubmit} noValidate className="flex flex-col gap-4">
      {failure ? <FormMessage tone="error">{failure}</FormMessage> : null}
      <Field id="email" label="E-mail address" error={errors.email?.message}>
        <TextInput id="email" type="email" autoComplete="username" invalid={!!errors.email} aria-describedby={errors.email ? 'email-error' : undefined} {...register('email')} />
      </Field>
      <Field id="password" label="Password" error={errors.password?.message}>
        <TextInput id="password" type="password" autoComplete="current-password" invalid={!!errors.password} aria-describedby={errors.password ? 'password-error' : undefined} {...register('password')} />
      </Field>
      <Button type="submit" disabled={isSubmitting}>
        {isSubmitting ? 'Signing in…' : 'Sign in'}
      </Button>
      <p className="text-sm">
        <Link href="/forgot-password">Forgotten your password?</Link>
      </p>
    </form>
  );
}
