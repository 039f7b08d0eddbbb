import type { Metadata } from 'next';
import Link from 'next/link';
import { ResetPasswordForm } from '@/components/auth/reset-password-form';
import { FormMessage } from '@/components/ui/field';

export const metadata: Metadata = { title: 'Choose a new password' };

export default async function ResetPasswordPage({ searchParams }: { searchParams: Promise<Record<string, string | undefined>> }) {
  const { token, error } = await searchParams;
  return (
    <>
      <h1 className="mb-4 text-xl font-bold">Choose a new password</h1>
      {error || !token ? (
        <div className="flex flex-col gap-3">
          <FormMessage tone="error">This link has expired or is not valid.</FormMessage>
          <Link href="/forgot-password">Ask for a new link</Link>
        </div>
      ) : (
        <ResetPasswordForm token={token} />
      )}
    </>
  );
}
