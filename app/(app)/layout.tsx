import type { ReactNode } from 'react';
import { requireActor } from '@/lib/auth/session';
import { AppHeader } from '@/components/shell/app-header';

export default async function AppLayout({ children }: { children: ReactNode }) {
  const actor = await requireActor();
  return (
    <>
      <AppHeader actor={actor} />
      <main id="main" className="mx-auto max-w-7xl px-4 py-6">
        {children}
      </main>
    </>
  );
}
