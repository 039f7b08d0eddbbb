import type { ReactNode } from 'react';
import Link from 'next/link';

export default function AuthLayout({ children }: { children: ReactNode }) {
  return (
    <main id="main" className="mx-auto flex min-h-screen max-w-md flex-col justify-center px-4 py-10">
      <Link href="/" className="mb-6 flex items-center gap-2 text-xl font-bold text-ink hover:no-underline">
        <span aria-hidden="true" className="inline-block h-6 w-6 rounded-sm border-2 border-frost bg-frost-soft" />
        Countersample
      </Link>
      <div className="rounded-card border border-line bg-white p-6 shadow-sm">{children}</div>
      <p className="mt-6 text-xs text-brine">
        Case files for contested freezing-point results. <Link href="/about/method">About the method and its cautions</Link>.
      </p>
    </main>
  );
}
