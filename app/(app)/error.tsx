'use client';

import { Button } from '@/components/ui/button';

export default function AppError({ error, reset }: { error: Error & { digest?: string }; reset: () => void }) {
  return (
    <div role="alert" className="rounded-card border border-rust bg-rust-soft p-6">
      <h1 className="text-xl font-bold text-rust">✕ This page could not be shown</h1>
      <p className="mt-2 text-ink">Something went wrong on our side; nothing you entered was saved by this failure.</p>
      {error.digest ? <p className="mt-1 text-xs text-brine">Reference for your administrator: {error.digest}</p> : null}
      <Button className="mt-4" onClick={reset}>
        Try again
      </Button>
    </div>
  );
}
