'use client';

import Link from 'next/link';
import { usePathname } from 'next/navigation';
import type { NavItem } from './navigation';

export function NavLinks({ items }: { items: NavItem[] }) {
  const pathname = usePathname();
  return (
    <ul className="flex flex-wrap gap-1">
      {items.map((item) => {
        const current = pathname === item.href || pathname.startsWith(`${item.href}/`);
        return (
          <li key={item.href}>
            <Link
              href={item.href}
              aria-current={current ? 'page' : undefined}
              className={`block rounded-control px-3 py-1.5 text-sm font-bold hover:no-underline ${current ? 'bg-ink text-paper' : 'text-ink-soft hover:bg-paper-deep'}`}
            >
              {item.label}
            </Link>
          </li>
        );
      })}
    </ul>
  );
}
