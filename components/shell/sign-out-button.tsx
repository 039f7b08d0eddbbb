'use client';

import { useRouter } from 'next/navigation';
import { useState } from 'react';
import { Button } from '@/components/ui/button';

export function SignOutButton() {
  const router = useRouter();
  const [pending, setPending] = useState(false);
  return (
    <Button
      variant="secondary"
      disabled={pending}
      onClick={async () => {
        setPending(true);
        // Revokes this session on the server, not just the cookie. The auth client is fetched on the
        // click: every signed-in page carries this button, few of its views end in signing out.
        const { authClient } = await import('@/lib/auth/client');
        await authClient.signOut();
        router.replace('/sign-in?signedOut=1');
        router.refresh();
      }}
    >
      {pending ? 'Signing out…' : 'Sign out'}
    </Button>
  );
}
