import type { Metadata } from 'next';
import { redirect } from 'next/navigation';
import { getActor } from '@/lib/auth/session';
import { SignInForm } from '@/components/auth/sign-in-form';
import { FormMessage } from '@/components/ui/field';

export const metadata: Metadata = { title: 'Sign in' };

export default async function SignInPage({ searchParams }: { searchParams: Promise<Record<string, string | undefined>> }) {
  const params = await searchParams;
  if (await getActor()) redirect('/desk');
  return (
    <>
      <h1 className="mb-4 text-xl font-bold">Sign in</h1>
      <div className="mb-4 flex flex-col gap-2">
        {params.signedOut ? <FormMessage tone="success">You are signed out; this session has ended.</FormMessage> : null}
        {params.reset ? <FormMessage tone="success">Your password has been changed. Sign in with the new one.</FormMessage> : null}
        {params.joined ? <FormMessage tone="success">Your account is ready. Sign in with your new password.</FormMessage> : null}
      </div>
      <SignInForm next={params.next ?? null} />
      <p className="mt-4 text-xs text-brine">Accounts are created by invitation from your scheme’s administrator.</p>
    </>
  );
}
