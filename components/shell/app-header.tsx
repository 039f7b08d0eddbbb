import Link from 'next/link';
import type { Actor } from '@/lib/auth/actor';
import { roleLabels } from '@/lib/auth/permissions';
import { navigationFor } from './navigation';
import { NavLinks } from './nav-links';
import { SignOutButton } from './sign-out-button';

export function AppHeader({ actor }: { actor: Actor }) {
  return (
    <header className="border-b border-line bg-white/80">
      <div className="mx-auto flex max-w-7xl flex-wrap items-center justify-between gap-3 px-4 py-3">
        <Link href="/desk" className="flex items-center gap-2 text-lg font-bold text-ink hover:no-underline">
          <span aria-hidden="true" className="inline-block h-5 w-5 rounded-sm border-2 border-frost bg-frost-soft" />
          Countersample
        </Link>
        <nav aria-label="Main">
          <NavLinks items={navigationFor(actor)} />
        </nav>
        <div className="flex items-center gap-3 text-sm">
          <Link href="/account" className="text-right leading-tight text-ink">
            <span className="block font-bold">{actor.name}</span>
            <span className="block text-xs text-brine">
              {roleLabels[actor.role]} · {actor.organisationName}
            </span>
          </Link>
          <SignOutButton />
        </div>
      </div>
    </header>
  );
}
