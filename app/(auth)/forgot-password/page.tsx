import type { Metadata } from 'next';
import Link from 'next/link';
import { ForgotPasswordForm } from '@/components/auth/forgot-password-form';

export const metadata: Metadata = { title: 'Reset your password' };

export default function ForgotPasswordPage() {
  return (
    <>
      <h1 className="mb-2 text-xl font-bold">Reset your password</h1>
      <p className="mb-4 text-sm text-brine">We send a link to your e-mail address. Resetting signs you out on every device.</p>
      <ForgotPasswordForm />
      <p className="mt-4 text-sm">
        <Link href="/sign-in">Back to sign-in</Link>
      </p>
    </>
  );
}
